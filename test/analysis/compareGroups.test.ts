import { describe, expect, it } from 'vitest';
import { compareGroupPairs, compareGroups, groupValues, type CurveResult } from '../../src/analysis/index.ts';
import { expectRelClose } from '../helpers.ts';

function run(name: string, values: readonly number[], flaggedValues: readonly number[] = []): CurveResult[] {
  const make = (value: number, i: number, flagged: boolean) =>
    ({
      curve: `${name}#${i}${flagged ? 'f' : ''}`,
      run: name,
      file: `${name}.csv`,
      index: i,
      kind: 'iz',
      status: 'ok',
      apparentBarrierEV: value,
      apparentBarrierErrEV: 0.02,
      flags: flagged ? [{ code: 'batch-outlier', reason: 'test' }] : [],
      position: null,
    }) as unknown as CurveResult;
  return [...values.map((v, i) => make(v, i, false)), ...flaggedValues.map((v, i) => make(v, i, true))];
}

function valuesOf(results: CurveResult[]) {
  return groupValues(results, { key: results[0].run, label: results[0].run, curveIds: results.map((r) => r.curve) }, 'apparentBarrierEV');
}

const x = [4.92, 5.13, 5.05, 4.88, 5.21, 5.02, 4.97, 5.1];
const y = [5.31, 5.18, 5.45, 5.6, 5.27, 5.39, 5.52, 5.12, 5.66, 5.34, 5.41, 5.23];

describe('compareGroups', () => {
  it('compareGroups reports Welch, Mann–Whitney and Cohen on the used curves, with counts left out', () => {
    const row = compareGroups(valuesOf(run('X', x, [9.9])), valuesOf(run('Y', y)));
    expect([row.labelA, row.labelB, row.unit, row.nUsedA, row.nExcludedA, row.nUsedB, row.nExcludedB]).toEqual(['X', 'Y', 'eV', 8, 1, 12, 0]);
    // scipy 1.17.1: ttest_ind(x, y, equal_var=False); mannwhitneyu(x, y, method='exact'); statsmodels effectsize_smd
    expectRelClose(row.welch!.pValue, 3.31700380039173e-5, 1e-10);
    expectRelClose(row.welch!.confidenceInterval.low, -0.467993061761547, 1e-11);
    expectRelClose(row.mannWhitney!.pValue, 0.000111137572437882, 1e-11);
    expectRelClose(row.effectSize!.hedgesG as number, -2.21201459510276, 1e-12);
    expect(row.note).toBeNull();
  });

  it('compareGroups leaves out tests a group is too small for, and says why', () => {
    const row = compareGroups(valuesOf(run('X', [5.1])), valuesOf(run('Y', y)));
    expect(row.welch).toBeNull();
    expect(row.effectSize).toBeNull();
    expect(row.mannWhitney).not.toBeNull();
    expect(row.note).toBe("Welch's test and Cohen's d need ≥ 2 curves in each group (have 1 and 12)");
  });

  it('compareGroupPairs compares every pair once and Holm-adjusts the Welch p-values', () => {
    const groups = [valuesOf(run('X', x)), valuesOf(run('Y', y)), valuesOf(run('Z', x.map((v) => v + 0.01)))];
    const rows = compareGroupPairs(groups);
    expect(rows.map((r) => `${r.keyA}-${r.keyB}`)).toEqual(['X-Y', 'X-Z', 'Y-Z']);
    const raw = rows.map((r) => r.welch!.pValue);
    // Holm (1979) by hand: the smallest p times 3, the next times 2 (never below the previous), the largest times 1
    const order = [...raw].sort((a, b) => a - b);
    const expected = [Math.min(1, 3 * order[0]), Math.max(Math.min(1, 3 * order[0]), Math.min(1, 2 * order[1])), 0];
    expected[2] = Math.max(expected[1], order[2]);
    expect(rows.map((r) => r.welchPValueHolm).sort((a, b) => (a as number) - (b as number))).toEqual(expected);
  });

  it('compareGroups rejects groups of different quantities', () => {
    const a = valuesOf(run('X', x));
    const b = { ...valuesOf(run('Y', y)), quantity: 'phi2EV' as const };
    expect(() => compareGroups(a, b)).toThrow('compareGroups: groupB.quantity must equal groupA.quantity (apparentBarrierEV), got "phi2EV"');
  });
});
