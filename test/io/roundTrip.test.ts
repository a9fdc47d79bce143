import { describe, expect, it } from 'vitest';
import { importChunks, importText, type Curve } from '../../src/io/index.ts';
import { expectRelClose } from '../helpers.ts';
import { writeDialect, type ColumnSpec, type DialectSpec } from './writeDialect.ts';

// mulberry32, a small public-domain 32-bit generator (T. Ettinger), from memory; local to this test.
function seededRandom(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** I(z) = I0·exp(−2κz) on a gap grid, with 1 % multiplicative noise: SI values (m, A). */
function approachCurve(random: () => number, points: number): { gapM: number[]; currentA: number[] } {
  const decayPerM = 0.9e10 + 0.2e10 * random();
  const currentAtZeroA = 1e-6 * (0.5 + random());
  const gapM: number[] = [];
  const currentA: number[] = [];
  for (let i = 0; i < points; i++) {
    const g = 3e-10 + (6e-10 * i) / (points - 1) + 1e-12 * random();
    gapM.push(g);
    currentA.push(currentAtZeroA * Math.exp(-2 * decayPerM * g) * (1 + 0.01 * (random() - 0.5)));
  }
  return { gapM, currentA };
}

/** Cubic I(V) = g1·V + g3·V³ with noise: SI values (V, A). */
function spectrum(random: () => number, points: number): { biasV: number[]; currentA: number[] } {
  const g1 = 1e-10 * (1 + random());
  const g3 = 3e-10 * (1 + random());
  const biasV: number[] = [];
  const currentA: number[] = [];
  for (let i = 0; i < points; i++) {
    const v = -0.8 + (1.6 * i) / (points - 1) + 1e-6 * random();
    biasV.push(v);
    currentA.push(g1 * v + g3 * v ** 3 + 1e-13 * (random() - 0.5));
  }
  return { biasV, currentA };
}

function expectSameValues(actual: Float64Array, expected: readonly number[]): void {
  expect(actual.length).toBe(expected.length);
  for (let i = 0; i < expected.length; i++) expectRelClose(actual[i], expected[i], 1e-12);
}

const DIALECTS: Record<string, DialectSpec> = {
  comma: { delimiter: ',', decimalMark: '.' },
  'semicolon, decimal comma': { delimiter: ';', decimalMark: ',', unitStyle: 'brackets' },
  tab: { delimiter: '\t', decimalMark: '.', unitStyle: 'slash' },
  'tab, decimal comma': { delimiter: '\t', decimalMark: ',' },
  'runs of spaces': { delimiter: 'spaces', decimalMark: '.', unitStyle: 'underscore' },
  'all quoted': { delimiter: ',', decimalMark: '.', quoteAll: true },
  'BOM and CRLF': { delimiter: ',', decimalMark: '.', bom: true, lineEnding: '\r\n' },
  'CR only': { delimiter: ';', decimalMark: '.', lineEnding: '\r' },
  'metadata block': {
    delimiter: ';',
    decimalMark: ',',
    lineEnding: '\r\n',
    metadataLines: ['# written by the round-trip test', 'setpoint: 80 pA', 'bias = 0,3 V', '% temperature: 5,1 K', ''],
  },
};

const UNITS: { distance: [string, number]; current: [string, number]; bias: [string, number] }[] = [
  { distance: ['nm', 1e-9], current: ['pA', 1e-12], bias: ['mV', 1e-3] },
  { distance: ['pm', 1e-12], current: ['nA', 1e-9], bias: ['V', 1] },
  { distance: ['Å', 1e-10], current: ['fA', 1e-15], bias: ['mV', 1e-3] },
  { distance: ['m', 1], current: ['A', 1], bias: ['V', 1] },
];

describe('round trip: simulate → write in a dialect → import gives the same SI values', () => {
  let seed = 11;
  for (const [dialectName, spec] of Object.entries(DIALECTS)) {
    for (const units of UNITS) {
      it(`importText(${dialectName}, ${units.distance[0]}/${units.current[0]}) returns I(z) within 1e-12`, () => {
        const random = seededRandom(seed++);
        const { gapM, currentA } = approachCurve(random, 25);
        const columns: ColumnSpec[] = [
          { name: 'gap', unit: units.distance[0], scaleToSI: units.distance[1], values: gapM },
          { name: 'current', unit: units.current[0], scaleToSI: units.current[1], values: currentA },
        ];
        const text = writeDialect(columns, spec);
        const file = importText(text, 'written.csv');
        expect(file.problems).toEqual([]);
        expect(file.curves).toHaveLength(1);
        expect(file.curves[0].kind).toBe('iz');
        expectSameValues(file.curves[0].x, gapM);
        expectSameValues(file.curves[0].current, currentA);
      });
    }
    it(`importText(${dialectName}) returns a cubic I(V) within 1e-12`, () => {
      const random = seededRandom(seed++);
      const { biasV, currentA } = spectrum(random, 41);
      const columns: ColumnSpec[] = [
        { name: 'bias', unit: 'mV', scaleToSI: 1e-3, values: biasV },
        { name: 'I', unit: 'pA', scaleToSI: 1e-12, values: currentA },
      ];
      const file = importText(writeDialect(columns, spec), 'iv.txt');
      expect(file.problems).toEqual([]);
      expect(file.curves.map((c) => c.kind)).toEqual(['iv']);
      expectSameValues(file.curves[0].x, biasV);
      expectSameValues(file.curves[0].current, currentA);
    });
  }
});

describe('round trip through each layout', () => {
  const random = seededRandom(2024);
  const a = approachCurve(random, 12);
  const b = approachCurve(random, 12);
  const nmScale = 1e-9;
  const pAScale = 1e-12;

  function check(curve: Curve | undefined, gapM: readonly number[], currentA: readonly number[]): void {
    expect(curve).toBeDefined();
    expectSameValues(curve!.x, gapM);
    expectSameValues(curve!.current, currentA);
  }

  it('wide file: one gap column, two current columns → two curves', () => {
    const text = writeDialect(
      [
        { name: 'gap', unit: 'nm', scaleToSI: nmScale, values: a.gapM },
        { name: 'I first', unit: 'pA', scaleToSI: pAScale, values: a.currentA },
        { name: 'I second', unit: 'pA', scaleToSI: pAScale, values: b.currentA },
      ],
      DIALECTS.comma,
    );
    const file = importText(text, 'wide.csv');
    expect(file.problems).toEqual([]);
    check(file.curves[0], a.gapM, a.currentA);
    check(file.curves[1], a.gapM, b.currentA);
  });

  it('repeated x/current pairs with a shorter second curve → two curves of their own lengths', () => {
    const shortGap = [...b.gapM.slice(0, 8), null, null, null, null];
    const shortCurrent = [...b.currentA.slice(0, 8), null, null, null, null];
    const text = writeDialect(
      [
        { name: 'gap 1', unit: 'nm', scaleToSI: nmScale, values: a.gapM },
        { name: 'I 1', unit: 'pA', scaleToSI: pAScale, values: a.currentA },
        { name: 'gap 2', unit: 'nm', scaleToSI: nmScale, values: shortGap },
        { name: 'I 2', unit: 'pA', scaleToSI: pAScale, values: shortCurrent },
      ],
      DIALECTS['semicolon, decimal comma'],
    );
    const file = importText(text, 'pairs.csv');
    expect(file.problems).toEqual([]);
    check(file.curves[0], a.gapM, a.currentA);
    check(file.curves[1], b.gapM.slice(0, 8), b.currentA.slice(0, 8));
  });

  it('long file with a curve id column → one curve per id', () => {
    const ids = [...a.gapM.map(() => 'p1'), ...b.gapM.map(() => 'p2')];
    const text = writeDialect(
      [
        { name: 'curve', values: ids },
        { name: 'gap', unit: 'nm', scaleToSI: nmScale, values: [...a.gapM, ...b.gapM] },
        { name: 'current', unit: 'pA', scaleToSI: pAScale, values: [...a.currentA, ...b.currentA] },
      ],
      DIALECTS.tab,
    );
    const file = importText(text, 'long.tsv');
    expect(file.problems).toEqual([]);
    expect(file.curves.map((c) => c.metadata.curveLabel?.raw)).toEqual(['p1', 'p2']);
    check(file.curves[0], a.gapM, a.currentA);
    check(file.curves[1], b.gapM, b.currentA);
  });

  it('approach and retract by sweep reversal → the pair, each in file order', () => {
    const down = [...a.gapM].reverse();
    const downCurrent = [...a.currentA].reverse();
    // The retract starts 20 pm above the turning point, so the turn is the approach's last point.
    const up = b.gapM.map((g) => g + 2e-11);
    const text = writeDialect(
      [
        { name: 'gap', unit: 'pm', scaleToSI: 1e-12, values: [...down, ...up] },
        { name: 'I', unit: 'pA', scaleToSI: pAScale, values: [...downCurrent, ...b.currentA] },
      ],
      DIALECTS['metadata block'],
    );
    const file = importText(text, 'pair.txt');
    expect(file.problems).toEqual([]);
    expect(file.curves.map((c) => c.segment)).toEqual(['approach', 'retract']);
    check(file.curves[0], down, downCurrent);
    check(file.curves[1], up, b.currentA);
  });

  it('grid file with x/y positions → one curve per position, positions in metres', () => {
    const xs = [...a.gapM.map(() => 2), ...b.gapM.map(() => 4)];
    const ys = [...a.gapM.map(() => 1), ...b.gapM.map(() => 1)];
    const text = writeDialect(
      [
        { name: 'x', unit: 'nm', scaleToSI: 1, values: xs },
        { name: 'y', unit: 'nm', scaleToSI: 1, values: ys },
        { name: 'gap', unit: 'nm', scaleToSI: nmScale, values: [...a.gapM, ...b.gapM] },
        { name: 'current', unit: 'pA', scaleToSI: pAScale, values: [...a.currentA, ...b.currentA] },
      ],
      DIALECTS['runs of spaces'],
    );
    const file = importText(text, 'grid.dat');
    expect(file.problems).toEqual([]);
    expect(file.curves.map((c) => c.position)).toEqual([
      { xM: 2e-9, yM: 1e-9 },
      { xM: 4e-9, yM: 1e-9 },
    ]);
    check(file.curves[0], a.gapM, a.currentA);
    check(file.curves[1], b.gapM, b.currentA);
  });

  it('importChunks in pieces of 7 characters gives the same values as importText', async () => {
    const text = writeDialect(
      [
        { name: 'gap', unit: 'nm', scaleToSI: nmScale, values: a.gapM },
        { name: 'I', unit: 'pA', scaleToSI: pAScale, values: a.currentA },
      ],
      DIALECTS['BOM and CRLF'],
    );
    const pieces: string[] = [];
    for (let i = 0; i < text.length; i += 7) pieces.push(text.slice(i, i + 7));
    const streamed = await importChunks(pieces, 'pieces.csv');
    const whole = importText(text, 'pieces.csv');
    expect(streamed.problems).toEqual([]);
    expect(streamed.dialect).toEqual(whole.dialect);
    expect(Array.from(streamed.curves[0].x)).toEqual(Array.from(whole.curves[0].x));
    check(streamed.curves[0], a.gapM, a.currentA);
  });
});
