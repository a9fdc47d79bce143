import { describe, expect, it } from 'vitest';
import { GROUP_QUANTITY_NAMES, groupQuantity, groupValues, quantityOf, type CurveResult } from '../../src/analysis/index.ts';

function result(curve: string, fields: Partial<CurveResult>): CurveResult {
  return { curve, run: 'r', file: 'f.csv', index: 0, kind: 'iz', status: 'ok', flags: [], position: null, apparentBarrierEV: null, apparentBarrierErrEV: null, phi2EV: null, phi2ErrEV: null, ...fields } as unknown as CurveResult;
}

const flag = [{ code: 'tip-change' as const, reason: 'a step' }];
const results = [
  result('a', { apparentBarrierEV: 5.6, apparentBarrierErrEV: 0.02 }),
  result('b', { apparentBarrierEV: 5.7, apparentBarrierErrEV: 0.03, flags: flag }),
  result('c', { status: 'failed' }),
  result('d', { kind: 'iv', phi2EV: 5.1, phi2ErrEV: 0.1 }),
  result('e', { apparentBarrierEV: 5.65, apparentBarrierErrEV: null }),
];
const group = { key: 'r', label: 'r', curveIds: ['a', 'b', 'c', 'd', 'e', 'missing'] };

describe('groupValues', () => {
  it('groupValues leaves flagged curves out by default and counts what it left out', () => {
    const values = groupValues(results, group, 'apparentBarrierEV');
    expect(values.values).toEqual([5.6, 5.65]);
    expect(values.standardErrors).toEqual([0.02, null]);
    expect(values.usedCurveIds).toEqual(['a', 'e']);
    expect(values.excluded).toEqual({ flagged: 1, noValue: 1 });
    expect(values.nExcluded).toBe(2);
    expect(values.otherKind).toBe(1);
    expect(values.points.map((p) => [p.curveId, p.used, p.flagged])).toEqual([
      ['a', true, false],
      ['b', false, true],
      ['e', true, false],
    ]);
  });

  it('groupValues(includeFlagged) uses flagged curves too', () => {
    const values = groupValues(results, group, 'apparentBarrierEV', { includeFlagged: true });
    expect(values.values).toEqual([5.6, 5.7, 5.65]);
    expect(values.excluded).toEqual({ flagged: 0, noValue: 1 });
  });

  it('groupValues takes spectrum quantities from I(V) curves only', () => {
    const values = groupValues(results, group, 'phi2EV');
    expect(values.values).toEqual([5.1]);
    expect(values.otherKind).toBe(4);
  });

  it('quantityOf and groupQuantity describe every quantity and reject unknown names', () => {
    expect(GROUP_QUANTITY_NAMES).toEqual(['apparentBarrierEV', 'gapToContactNm', 'phi1EV', 'phi2EV', 'asymmetryEV', 'meanBarrierEV']);
    expect(quantityOf(results[0], 'apparentBarrierEV')).toEqual({ value: 5.6, standardError: 0.02 });
    expect(quantityOf(results[3], 'apparentBarrierEV')).toEqual({ value: null, standardError: null });
    expect(() => groupQuantity('workFunction')).toThrow(
      'groupQuantity: quantity must be one of apparentBarrierEV, gapToContactNm, phi1EV, phi2EV, asymmetryEV, meanBarrierEV, got "workFunction"',
    );
  });

  it('groupValues rejects duplicate curve ids in the results', () => {
    expect(() => groupValues([results[0], results[0]], group, 'apparentBarrierEV')).toThrow("resultsByCurveId: results must have unique curve ids, got 'a' twice");
  });
});
