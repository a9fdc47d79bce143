import { describe, expect, it } from 'vitest';
import type { CurveResult } from '../../src/analysis/index.ts';
import { RESULT_COLUMNS } from '../../src/io/resultColumns.ts';
import { nextSort, tableCell, tableRows, TABLE_HEADERS } from '../../src/state/batchTable.ts';

function record(curve: string, kind: 'iz' | 'iv', barrier: number | null, flags: string[] = []): CurveResult {
  return {
    file: curve.split('#')[0], curve, index: 0, segment: 'single', kind, model: kind === 'iz' ? 'iz-exponential' : 'wkb', status: 'ok', message: '', run: 'r',
    apparentBarrierEV: kind === 'iz' ? barrier : null, apparentBarrierErrEV: null, prefactorCorrectedBarrierEV: null, decayPerNm: null, decayErrPerNm: null,
    gapToContactNm: null, gapToContactErrNm: null, phi1EV: null, phi1ErrEV: null, phi2EV: null, phi2ErrEV: null, meanBarrierEV: kind === 'iv' ? barrier : null,
    meanBarrierErrEV: null, asymmetryEV: null, asymmetryErrEV: null, widthNm: null, widthErrNm: null, areaNm2: null, areaErrNm2: null,
    quality: { r2: 0.99, reducedChi2: 1.1, durbinWatson: 2, rmsResidual: 0.01, pointsUsed: 10, points: 12 },
    flags: flags.map((code) => ({ code: code as CurveResult['flags'][number]['code'], reason: `${code} reason` })),
    position: null, line: null, spectrum: null, conditions: { biasV: 0.1, temperatureK: 300 },
  };
}

const records = [record('a.csv#0/single', 'iz', 4.5), record('b.csv#0/single', 'iz', null, ['poor-fit']), record('c.csv#0/single', 'iz', 3.9), record('d.tsv#0/single', 'iv', 5.1)];
const barrierColumn = TABLE_HEADERS.indexOf('apparent barrier (eV)');

describe('state/batchTable', () => {
  it('TABLE_HEADERS are exactly the CSV export columns', () => {
    expect(TABLE_HEADERS).toEqual(RESULT_COLUMNS.map((c) => c.header));
  });

  it('tableRows sorts numbers either way with empty cells last', () => {
    const up = tableRows(records, { column: barrierColumn, descending: false }, { text: '', kind: 'all', flag: 'all' });
    expect(up.map((r) => r.curve)).toEqual(['c.csv#0/single', 'a.csv#0/single', 'b.csv#0/single', 'd.tsv#0/single']);
    const down = tableRows(records, { column: barrierColumn, descending: true }, { text: '', kind: 'all', flag: 'all' });
    expect(down.map((r) => r.curve)).toEqual(['a.csv#0/single', 'c.csv#0/single', 'b.csv#0/single', 'd.tsv#0/single']);
  });

  it('tableRows filters by text, kind and flag', () => {
    expect(tableRows(records, null, { text: 'C.CSV', kind: 'all', flag: 'all' }).map((r) => r.curve)).toEqual(['c.csv#0/single']);
    expect(tableRows(records, null, { text: '', kind: 'iv', flag: 'all' }).length).toBe(1);
    expect(tableRows(records, null, { text: '', kind: 'all', flag: 'poor-fit' }).map((r) => r.curve)).toEqual(['b.csv#0/single']);
    expect(tableRows(records, null, { text: '', kind: 'all', flag: 'none' }).length).toBe(3);
  });

  it('tableCell shows four significant figures, integers as they are; nextSort flips the same column', () => {
    expect(tableCell(records[0], barrierColumn)).toBe('4.5');
    expect(tableCell(records[0], TABLE_HEADERS.indexOf('points'))).toBe('12');
    expect(tableCell(records[1], barrierColumn)).toBe('');
    expect(nextSort(null, 3)).toEqual({ column: 3, descending: false });
    expect(nextSort({ column: 3, descending: false }, 3)).toEqual({ column: 3, descending: true });
  });
});
