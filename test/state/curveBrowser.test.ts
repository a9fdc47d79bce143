import { describe, expect, it } from 'vitest';
import { analyzeCurve, type CurveResult } from '../../src/analysis/index.ts';
import { importText } from '../../src/io/index.ts';
import { browserRows, curveLabel, keyResult, neighbourCurve, runsOf, type FileColumns } from '../../src/state/curveBrowser.ts';
import { DEFAULT_FILTERS } from '../../src/state/types.ts';

function file(name: string, run: string, curves: number) {
  const rows = [`# run: ${run}`, 'curve,z (nm),I (pA)'];
  for (let c = 1; c <= curves; c++) for (let i = 0; i < 12; i++) rows.push(`${c},${(0.02 * i).toFixed(2)},${(1000 * Math.exp(-20 * 0.02 * i) * (1 + 0.01 * ((i * 7) % 3))).toFixed(3)}`);
  return importText(rows.join('\n') + '\n', name);
}

const a = file('a.csv', 'A-gold', 2);
const b = file('b.csv', 'B-gold', 1);
const curves = [...a.curves, ...b.curves];
const results = new Map<string, CurveResult>(curves.map((c) => [c.id, analyzeCurve(c)]));
const files = new Map<string, FileColumns>([
  ['a.csv', { columns: a.columns, curveCount: 2, currentColumns: 1 }],
  ['b.csv', { columns: b.columns, curveCount: 1, currentColumns: 1 }],
]);

describe('state/curveBrowser', () => {
  it('browserRows groups curves by run, then file, in order of first appearance', () => {
    const rows = browserRows({ curves, results, files, manualIds: new Set(['b.csv#0/single']), filters: { ...DEFAULT_FILTERS } });
    expect(rows.map((r) => r.type)).toEqual(['run', 'file', 'curve', 'curve', 'run', 'file', 'curve']);
    expect(rows[0]).toMatchObject({ type: 'run', run: 'A-gold', curves: 2 });
    const last = rows[6];
    expect(last.type === 'curve' && last.manual).toBe(true);
    expect(last.type === 'curve' && last.keyResult.startsWith('φap ')).toBe(true);
  });

  it('browserRows filters by kind, run, flag and text, dropping empty groups', () => {
    const only = (filters: Partial<typeof DEFAULT_FILTERS>) =>
      browserRows({ curves, results, files, manualIds: new Set(), filters: { ...DEFAULT_FILTERS, ...filters } }).filter((r) => r.type === 'curve').length;
    expect(only({ run: 'B-gold' })).toBe(1);
    expect(only({ kind: 'iv' })).toBe(0);
    expect(only({ text: 'b.csv' })).toBe(1);
    expect(only({ flag: 'none' }) + only({ flag: 'any' })).toBe(3);
    expect(browserRows({ curves, results, files, manualIds: new Set(), filters: { ...DEFAULT_FILTERS, kind: 'iv' } })).toEqual([]);
  });

  it('neighbourCurve moves over curve rows only and stops at the ends', () => {
    const rows = browserRows({ curves, results, files, manualIds: new Set(), filters: { ...DEFAULT_FILTERS } });
    expect(neighbourCurve(rows, 'a.csv#0/single', 1)).toBe('a.csv#1/single');
    expect(neighbourCurve(rows, 'a.csv#1/single', 1)).toBe('b.csv#0/single');
    expect(neighbourCurve(rows, 'b.csv#0/single', 1)).toBe('b.csv#0/single');
    expect(neighbourCurve(rows, 'a.csv#0/single', -1)).toBe('a.csv#0/single');
    expect(neighbourCurve(rows, null, -1)).toBe('b.csv#0/single');
    expect(neighbourCurve([], null, 1)).toBeNull();
  });

  it('curveLabel uses the curve id column, the current column of multi-column files, or the number', () => {
    expect(curveLabel(a.curves[1], files.get('a.csv'))).toBe('curve 2');
    const wide = importText('bias (V)\tI site 1 (nA)\tI site 2 (nA)\n' + Array.from({ length: 10 }, (_, i) => `${i / 10}\t${i}\t${2 * i}`).join('\n'), 'w.tsv');
    expect(curveLabel(wide.curves[1], { columns: wide.columns, curveCount: 2, currentColumns: 2 })).toBe('I site 2');
    expect(runsOf(curves)).toEqual(['A-gold', 'B-gold']);
    expect(keyResult(undefined)).toBe('not fitted');
  });
});
