import { describe, expect, it } from 'vitest';
import { importText, MappingMemory } from '../../src/io/index.ts';

const headerless = '0.50 135.3\n0.55 49.8\n0.60 18.3\n0.65 6.7\n';

describe('MappingMemory', () => {
  it('MappingMemory round-trips through toJSON/fromJSON and copies answers', () => {
    const memory = new MappingMemory();
    const answer = { columnRoles: { 1: 'distance' as const, 2: 'current' as const }, units: { 1: 'nm', 2: 'pA' } };
    memory.remember('whitespace|2|no header', answer);
    answer.units[1] = 'pm';
    const restored = MappingMemory.fromJSON(JSON.parse(JSON.stringify(memory.toJSON())));
    expect(restored.get('whitespace|2|no header')).toEqual({ columnRoles: { 1: 'distance', 2: 'current' }, units: { 1: 'nm', 2: 'pA' } });
    expect(restored.size).toBe(1);
    expect(restored.signatures()).toEqual(['whitespace|2|no header']);
    expect(restored.forget('whitespace|2|no header')).toBe(true);
    expect(restored.get('whitespace|2|no header')).toBeUndefined();
  });

  it('MappingMemory.fromJSON(malformed) throws naming the problem', () => {
    expect(() => MappingMemory.fromJSON(null)).toThrow('MappingMemory.fromJSON: expected an object, got null');
    expect(() => MappingMemory.fromJSON({ version: 2, answers: {} })).toThrow('version must be 1, got 2');
    expect(() => MappingMemory.fromJSON({ version: 1, answers: { s: { columnRoles: { 1: 'height' } } } })).toThrow("got 'height'");
  });

  it('importText with a remembered answer imports the next file of that shape without asking', () => {
    const first = importText(headerless, 'day1.dat');
    expect(first.proposal).toBeDefined();
    const memory = new MappingMemory();
    memory.remember(first.proposal!.headerSignature, { columnRoles: { 1: 'distance', 2: 'current' }, units: { 1: 'nm', 2: 'pA' } });
    const second = importText('0.40 990\n0.45 370\n0.50 135\n', 'day2.dat', { memory });
    expect(second.mappingSource).toBe('memory');
    expect(second.proposal).toBeUndefined();
    expect(second.problems).toEqual([]);
    expect(second.curves[0].x[0]).toBeCloseTo(4e-10, 20);
    expect(second.curves[0].current[0]).toBeCloseTo(9.9e-10, 20);
  });

  it('importText with an explicit answer wins over memory; a malformed answer throws MappingError', () => {
    const memory = new MappingMemory();
    memory.remember('whitespace|2|no header', { columnRoles: { 1: 'current', 2: 'distance' } });
    const file = importText(headerless, 'a.dat', { memory, mapping: { columnRoles: { 1: 'distance', 2: 'current' }, units: { 1: 'nm', 2: 'pA' } } });
    expect(file.mappingSource).toBe('answer');
    expect(file.curves[0].xRole).toBe('distance');
    expect(() => importText(headerless, 'a.dat', { mapping: { columnRoles: { 3: 'current' } } })).toThrow('mapping: columnRoles column must be 1..2, got 3');
    expect(() => importText(headerless, 'a.dat', { mapping: { units: { 1: 'parsec' } } })).toThrow("got 'parsec'");
  });

  it('importText answers a piezo calibration and a two-distance ambiguity', () => {
    const piezo = importText('piezo (V),I (nA)\n0.2,1.0\n0.3,0.1\n0.4,0.01\n', 'p.csv');
    expect(piezo.proposal?.ambiguities.map((a) => a.kind)).toEqual(['calibration']);
    const calibrated = importText('piezo (V),I (nA)\n0.2,1.0\n0.3,0.1\n0.4,0.01\n', 'p.csv', { mapping: { piezoCalibrationMPerV: 2e-9 } });
    expect(calibrated.curves[0].x[1]).toBeCloseTo(6e-10, 20);
    const two = importText('z piezo (nm),gap (nm),I (pA)\n10.5,0.5,100\n10.6,0.6,30\n10.7,0.7,9\n', 't.csv', { mapping: { columnRoles: { 1: 'ignore' } } });
    expect(two.problems).toEqual([]);
    expect(two.curves[0].sourceColumns).toEqual([2, 3]);
  });
});
