import { dirname } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import type { ImportedFile, ImportProblem } from '../../src/io/index.ts';
import { importPaths } from '../../src/io/readFileNode.ts';
import { expectRelClose } from '../helpers.ts';

const fixtureDir = dirname(fileURLToPath(new URL('../fixtures/import/comma-single.csv', import.meta.url)));

async function load(name: string): Promise<ImportedFile> {
  const [file] = await importPaths([name], { cwd: fixtureDir });
  return file;
}

function roles(file: ImportedFile): string[] {
  return file.columns.map((c) => c.role);
}

function units(file: ImportedFile): string[] {
  return file.columns.map((c) => c.unit);
}

function located(problems: readonly ImportProblem[]): string[] {
  return problems.map((p) => `${p.severity} ${p.code} ${p.line}:${p.column}`);
}

describe('fixtures: good files import without problems', () => {
  it('comma-single.csv: comma, nm and nA, one I(z) sweep', async () => {
    const file = await load('comma-single.csv');
    expect(file.dialect).toMatchObject({ delimiter: ',', decimalMark: '.', headerLine: 1, dataStartLine: 2, hasBOM: false, lineEnding: 'lf', quoted: false });
    expect(roles(file)).toEqual(['distance', 'current']);
    expect(units(file)).toEqual(['nm', 'nA']);
    expect(file.problems).toEqual([]);
    expect(file.curves).toHaveLength(1);
    const [curve] = file.curves;
    expect(curve).toMatchObject({ id: 'comma-single.csv#0/single', kind: 'iz', segment: 'single', xRole: 'distance', sourceColumns: [1, 2], firstLine: 2 });
    expect(curve.x).toHaveLength(10);
    expectRelClose(curve.x[0], 0.4e-9, 1e-12);
    expectRelClose(curve.current[0], 1e-9, 1e-12);
    expectRelClose(curve.x[9], 0.85e-9, 1e-12);
    expectRelClose(curve.current[9], 0.00012341e-9, 1e-12);
  });

  it('semicolon-decimal-comma.csv: semicolon, decimal comma, [Å] and [pA]', async () => {
    const file = await load('semicolon-decimal-comma.csv');
    expect(file.dialect).toMatchObject({ delimiter: ';', decimalMark: ',', headerLine: 1 });
    expect(roles(file)).toEqual(['distance', 'current']);
    expect(units(file)).toEqual(['Å', 'pA']);
    // BIPM SI Brochure, 8th ed., Table 8: 1 Å = 1e-10 m
    expect(file.columns[0].scaleToSI).toBe(1e-10);
    expect(file.problems).toEqual([]);
    const [curve] = file.curves;
    expectRelClose(curve.x[1], 4.5e-10, 1e-12);
    expectRelClose(curve.current[1], 367.8794e-12, 1e-12);
    expectRelClose(curve.current[7], 0.9119e-12, 1e-12);
  });

  it('tab-iv.tsv: tab, units after a slash, I(V) with a conductance column', async () => {
    const file = await load('tab-iv.tsv');
    expect(file.dialect).toMatchObject({ delimiter: '\t', decimalMark: '.' });
    expect(roles(file)).toEqual(['bias', 'current', 'conductance']);
    expect(units(file)).toEqual(['mV', 'pA', 'nS']);
    expect(file.columns.map((c) => c.name)).toEqual(['bias', 'current', 'dI/dV']);
    expect(file.problems).toEqual([]);
    expect(file.curves).toHaveLength(1);
    const [curve] = file.curves;
    expect(curve).toMatchObject({ kind: 'iv', xRole: 'bias', segment: 'single' });
    expectRelClose(curve.x[0], -0.5, 1e-12);
    expectRelClose(curve.current[0], -137.5e-12, 1e-12);
    expect(curve.x[5]).toBe(0);
    expect(curve.current[5]).toBe(0);
    expect(curve.metadata.sweepDirection.raw).toBe('increasing');
  });

  it('spaces-si.dat: runs of spaces, Z_m and I_A headers in SI', async () => {
    const file = await load('spaces-si.dat');
    expect(file.dialect).toMatchObject({ delimiter: 'whitespace', headerLine: 1 });
    expect(file.columns.map((c) => [c.name, c.unit, c.role, c.scaleToSI])).toEqual([
      ['Z', 'm', 'distance', 1],
      ['I', 'A', 'current', 1],
    ]);
    expect(file.problems).toEqual([]);
    const [curve] = file.curves;
    expect(curve.x).toHaveLength(9);
    expect(curve.x[0]).toBe(4.5e-10);
    expect(curve.current[8]).toBe(1.2341e-13);
  });

  it('quoted.csv: RFC 4180 quotes with commas and doubled quotes inside', async () => {
    const file = await load('quoted.csv');
    expect(file.dialect.quoted).toBe(true);
    expect(file.columns.map((c) => c.header)).toEqual(['gap, tip to surface (nm)', 'current "raw" (pA)', 'remark']);
    expect(roles(file)).toEqual(['distance', 'current', 'ignore']);
    expect(file.columns[2].valueType).toBe('text');
    expect(file.problems).toEqual([]);
    const [curve] = file.curves;
    expect(curve.x).toHaveLength(7);
    expectRelClose(curve.current[0], 135.335e-12, 1e-12);
  });

  it('bom-crlf.csv: byte order mark and CRLF, I(V) in V and nA', async () => {
    const file = await load('bom-crlf.csv');
    expect(file.dialect).toMatchObject({ hasBOM: true, lineEnding: 'crlf', headerLine: 1 });
    expect(file.columns[0].header).toBe('bias (V)');
    expect(roles(file)).toEqual(['bias', 'current']);
    expect(file.problems).toEqual([]);
    const [curve] = file.curves;
    expect(curve.kind).toBe('iv');
    expectRelClose(curve.x[0], -0.4, 1e-12);
    expectRelClose(curve.current[0], -0.0992e-9, 1e-12);
  });

  it('metadata-block.txt: every metadata form above the header, known quantities in SI', async () => {
    const file = await load('metadata-block.txt');
    expect(file.dialect).toMatchObject({ headerLine: 13, dataStartLine: 14 });
    const m = file.metadata;
    expect(m.note1).toMatchObject({ raw: 'Burrow demo export, invented numbers', line: 1 });
    expect(m.temperature).toMatchObject({ value: 4.6, unit: 'K', line: 2, label: 'temperature' });
    expect(m.tip).toMatchObject({ raw: 'PtIr, cut', line: 3 });
    expect(m.setpointCurrent.unit).toBe('A');
    expectRelClose(m.setpointCurrent.value!, 1e-10, 1e-12);
    expect(m.biasVoltage).toMatchObject({ value: -0.5, unit: 'V', label: 'bias' });
    expect(m.date).toMatchObject({ raw: '2024-03-05 14:22', line: 6 });
    expect(m.sample.raw).toBe('Au(111) film on mica');
    expectRelClose(m.positionX.value!, 12.5e-9, 1e-12);
    expectRelClose(m.positionY.value!, -3e-9, 1e-12);
    expect(m['operator note'].raw).toBe('drift corrected');
    expect(m.note2.raw).toBe('Recorded after two hours of settling');
    expect(Object.keys(m)).toHaveLength(11);
    expect(file.problems).toEqual([]);
    const [curve] = file.curves;
    expect(curve.fixedBiasV).toBe(-0.5);
    expectRelClose(curve.position!.xM, 12.5e-9, 1e-12);
    expect(curve.metadata.tip.raw).toBe('PtIr, cut');
  });

  it('units-forms.csv: "in ms", "(angstrom)", a bare SI name and [fA]; a constant bias column', async () => {
    const file = await load('units-forms.csv');
    expect(file.columns.map((c) => [c.name, c.unit, c.role, c.unitAssumed])).toEqual([
      ['time', 'ms', 'time', false],
      ['height', 'angstrom', 'distance', false],
      ['Bias', '', 'bias', true],
      ['I', 'fA', 'current', false],
    ]);
    expect(file.problems).toEqual([]);
    const [curve] = file.curves;
    expect(curve.kind).toBe('iz');
    expect(curve.fixedBiasV).toBe(0.1);
    expect(curve.sourceColumns).toEqual([2, 4, 3]);
    expectRelClose(curve.x[0], 5e-10, 1e-12);
    expectRelClose(curve.current[0], 135335.3e-15, 1e-12);
  });

  it('units-row.csv: units in their own row under the header', async () => {
    const file = await load('units-row.csv');
    expect(file.dialect).toMatchObject({ headerLine: 1, unitsLine: 2, dataStartLine: 3, decimalMark: ',' });
    expect(units(file)).toEqual(['Å', 'pA']);
    expect(file.problems).toEqual([]);
    expectRelClose(file.curves[0].x[0], 4.5e-10, 1e-12);
  });

  it('wide-shared-x.csv: one z column and three current columns → three curves', async () => {
    const file = await load('wide-shared-x.csv');
    expect(roles(file)).toEqual(['distance', 'current', 'current', 'current']);
    expect(file.problems).toEqual([]);
    expect(file.curves.map((c) => c.id)).toEqual(['wide-shared-x.csv#0/single', 'wide-shared-x.csv#1/single', 'wide-shared-x.csv#2/single']);
    expect(file.curves.map((c) => c.sourceColumns)).toEqual([
      [1, 2],
      [1, 3],
      [1, 4],
    ]);
    expectRelClose(file.curves[2].current[1], 487.884e-12, 1e-12);
  });

  it('wide-pairs.csv: repeated bias/current pairs, the second shorter (empty cells at the end)', async () => {
    const file = await load('wide-pairs.csv');
    expect(roles(file)).toEqual(['bias', 'current', 'bias', 'current']);
    expect(file.problems).toEqual([]);
    expect(file.curves.map((c) => [c.kind, c.x.length, c.sourceColumns])).toEqual([
      ['iv', 9, [1, 2]],
      ['iv', 6, [3, 4]],
    ]);
    expectRelClose(file.curves[1].x[0], -0.25, 1e-12);
    expectRelClose(file.curves[1].current[0], -0.08203e-9, 1e-12);
  });

  it('long-curve-id.csv: a curve id column → one curve per site', async () => {
    const file = await load('long-curve-id.csv');
    expect(roles(file)).toEqual(['curveId', 'distance', 'current']);
    expect(file.problems).toEqual([]);
    expect(file.curves.map((c) => [c.index, c.metadata.curveLabel.raw, c.x.length, c.firstLine])).toEqual([
      [0, 'site-A', 6, 2],
      [1, 'site-B', 6, 8],
      [2, 'site-C', 6, 14],
    ]);
  });

  it('direction-column.csv: approach/retract words in a direction column', async () => {
    // common practice, no source: 'approach' and 'retract' name the two legs of an I(z) sweep
    const file = await load('direction-column.csv');
    expect(roles(file)).toEqual(['segment', 'distance', 'current']);
    expect(file.problems).toEqual([]);
    expect(file.curves.map((c) => [c.id, c.x.length, c.firstLine])).toEqual([
      ['direction-column.csv#0/approach', 7, 2],
      ['direction-column.csv#0/retract', 7, 9],
    ]);
    expectRelClose(file.curves[0].x[0], 0.8e-9, 1e-12);
    expectRelClose(file.curves[1].x[0], 0.44e-9, 1e-12);
  });

  it('sweep-reversal.csv: the gap shrinks then grows → approach then retract', async () => {
    // common practice, no source: one table holds both legs; the leg where the gap shrinks is the approach
    const file = await load('sweep-reversal.csv');
    expect(file.problems).toEqual([]);
    expect(file.curves.map((c) => [c.segment, c.index, c.x.length, c.firstLine])).toEqual([
      ['approach', 0, 9, 2],
      ['retract', 0, 8, 11],
    ]);
  });

  it('grid-xy.csv: x/y position columns → four curves with positions in metres', async () => {
    const file = await load('grid-xy.csv');
    expect(roles(file)).toEqual(['positionX', 'positionY', 'distance', 'current']);
    expect(file.problems).toEqual([]);
    expect(file.curves.map((c) => c.position)).toEqual([
      { xM: 0, yM: 0 },
      { xM: 5e-9, yM: 0 },
      { xM: 0, yM: 5e-9 },
      { xM: 5e-9, yM: 5e-9 },
    ]);
    expect(file.curves.every((c) => c.x.length === 6)).toBe(true);
  });

  it('messy.txt: metadata, ";" with decimal commas, pm and pA, CRLF, an approach/retract pair — no problems', async () => {
    // common practice, no source: a decimal comma goes with ';' or tab delimiters
    const file = await load('messy.txt');
    expect(file.dialect).toMatchObject({ delimiter: ';', decimalMark: ',', headerLine: 9, dataStartLine: 10, lineEnding: 'crlf' });
    expect(file.mappingSource).toBe('detected');
    expect(units(file)).toEqual(['pm', 'pA']);
    expect(file.problems).toEqual([]);
    expect(file.metadata.setpointCurrent).toMatchObject({ raw: '50 pA', unit: 'A', line: 3 });
    expectRelClose(file.metadata.setpointCurrent.value!, 5e-11, 1e-12);
    expect(file.metadata.biasVoltage.value).toBe(0.25);
    expect(file.metadata.temperature.value).toBe(77.4);
    expect(file.metadata['Operator initials'].raw).toBe('QX');
    expect(file.curves.map((c) => [c.id, c.kind, c.x.length, c.fixedBiasV])).toEqual([
      ['messy.txt#0/approach', 'iz', 10, 0.25],
      ['messy.txt#0/retract', 'iz', 9, 0.25],
    ]);
    expectRelClose(file.curves[0].x[0], 900e-12, 1e-12);
    expectRelClose(file.curves[0].current[0], 0.0456e-12, 1e-12);
    expectRelClose(file.curves[1].x[8], 950e-12, 1e-12);
  });

  it('blank-line-blocks.dat: blocks separated by a blank line and a comment → two curves', async () => {
    // common practice (plotting-program style data blocks), no source: a blank line ends a curve
    const file = await load('blank-line-blocks.dat');
    expect(file.columns.map((c) => [c.name, c.unit])).toEqual([
      ['z', 'nm'],
      ['I', 'pA'],
    ]);
    expect(file.problems).toEqual([]);
    expect(file.curves.map((c) => [c.index, c.firstLine, c.metadata.blockLabel?.raw])).toEqual([
      [0, 2, undefined],
      [1, 9, 'second spot'],
    ]);
  });

  it('piezo-volts.csv: piezo in volts, calibrated by the metadata (1.8 nm/V)', async () => {
    const file = await load('piezo-volts.csv');
    expect(roles(file)).toEqual(['piezo', 'current']);
    expectRelClose(file.metadata.piezoZCalibration.value!, 1.8e-9, 1e-12);
    expectRelClose(file.columns[0].scaleToSI, 1.8e-9, 1e-12);
    expect(file.problems).toEqual([]);
    const [curve] = file.curves;
    expect(curve.xRole).toBe('piezo');
    expectRelClose(curve.x[0], 0.2 * 1.8e-9, 1e-12);
  });
});

describe('fixtures: files that need a mapping answer return a proposal', () => {
  it('no-header.dat: no header → a noHeader ambiguity over both columns', async () => {
    const file = await load('no-header.dat');
    expect(file.curves).toEqual([]);
    expect(file.proposal?.ambiguities.map((a) => [a.kind, a.columns])).toEqual([['noHeader', [1, 2]]]);
    expect(file.proposal?.suggested.columnRoles).toEqual({ 1: 'distance', 2: 'current' });
    expect(file.proposal?.columns[1].samples[0]).toBe('135.335');
    expect(located(file.problems)).toEqual(['error needsMapping 1:1']);
    expect(file.headerSignature).toBe('whitespace|2|no header');
  });

  it('two-distance-columns.csv: piezo and gap both plausible → a role ambiguity naming both', async () => {
    const file = await load('two-distance-columns.csv');
    expect(roles(file)).toEqual(['piezo', 'distance', 'current']);
    expect(file.proposal?.ambiguities.map((a) => [a.kind, a.columns, a.candidates])).toEqual([['role', [1, 2], ['piezo', 'ignore']]]);
    expect(located(file.problems)).toEqual(['error needsMapping 1:1']);
  });

  it('unknown-unit.csv: a unit that is not known → a unit ambiguity with length candidates', async () => {
    const file = await load('unknown-unit.csv');
    expect(file.proposal?.ambiguities.map((a) => [a.kind, a.columns, a.candidates])).toEqual([['unit', [1], ['nm', 'pm', 'Å', 'm']]]);
    expect(located(file.problems)).toEqual(['error needsMapping 1:1']);
  });
});

describe('fixtures: bad input gives located problems and keeps what is usable', () => {
  it('bad-empty.csv: empty file', async () => {
    const file = await load('bad-empty.csv');
    expect(located(file.problems)).toEqual(['error empty 1:1']);
    expect(file.curves).toEqual([]);
  });

  it('bad-binary.bin: binary bytes, located at the first NUL', async () => {
    const file = await load('bad-binary.bin');
    expect(located(file.problems)).toEqual(['error binary 3:1']);
    expect(file.problems[0].message).toContain('binary');
  });

  it('bad-header-only.csv: a header but no data rows', async () => {
    const file = await load('bad-header-only.csv');
    expect(located(file.problems)).toEqual(['error noData 2:1']);
  });

  it('bad-ragged.csv: a row too wide and a row too short are left out and listed', async () => {
    const file = await load('bad-ragged.csv');
    expect(located(file.problems)).toEqual(['error ragged 4:3', 'error ragged 7:2']);
    expect(file.problems[0].message).toContain('row has 3 cells');
    expect(file.problems[1].message).toContain('row has 1 cell but');
    expect(file.curves[0].x).toHaveLength(6);
  });

  it('bad-non-numeric.csv: text cells are named with their column and the point is left out', async () => {
    const file = await load('bad-non-numeric.csv');
    expect(located(file.problems)).toEqual(['error nonNumeric 4:2', 'error nonNumeric 6:1']);
    expect(file.problems[0].message).toContain("'n/a' in column 2 'current (pA)'");
    expect(file.curves[0].x).toHaveLength(5);
  });

  it('bad-nan-inf.csv: NaN and infinities merge into one problem with a count and lines', async () => {
    const file = await load('bad-nan-inf.csv');
    expect(located(file.problems)).toEqual(['error notFinite 3:2']);
    expect(file.problems[0]).toMatchObject({ count: 3, lines: [3, 5, 7] });
    expect(file.problems[0].message).toContain('(3 times, lines 3, 5, 7)');
    expect(file.curves[0].x).toHaveLength(4);
  });

  it('bad-one-point.csv: a single point is not a curve', async () => {
    const file = await load('bad-one-point.csv');
    expect(located(file.problems)).toEqual(['error onePoint 2:2']);
    expect(file.curves).toEqual([]);
  });

  it('bad-zero-current.csv: a current of 0 everywhere is reported and the curve left out', async () => {
    const file = await load('bad-zero-current.csv');
    expect(located(file.problems)).toEqual(['error zeroCurrent 2:2']);
    expect(file.curves).toEqual([]);
  });

  it('bad-non-monotonic.csv: the gap reverses several times; located at the second reversal', async () => {
    const file = await load('bad-non-monotonic.csv');
    expect(located(file.problems)).toEqual(['error nonMonotonic 5:1']);
    expect(file.curves).toHaveLength(1);
    expect(file.curves[0].segment).toBe('single');
  });
});
