import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { welchTTest } from '../../src/analysis/index.ts';
import { expectRelClose } from '../helpers.ts';

const x = [4.92, 5.13, 5.05, 4.88, 5.21, 5.02, 4.97, 5.1];
const y = [5.31, 5.18, 5.45, 5.6, 5.27, 5.39, 5.52, 5.12, 5.66, 5.34, 5.41, 5.23];
const lakensA = [9, 7, 8, 9, 8, 9, 9, 10, 9, 9];
const lakensB = [9, 6, 7, 8, 7, 9, 8, 8, 8, 7];

describe('welchTTest', () => {
  it('welchTTest matches scipy.stats.ttest_ind(equal_var=False): t, df, p and the 95 % CI', () => {
    const w = welchTTest(x, y);
    // scipy 1.17.1: ttest_ind(x, y, equal_var=False) and .confidence_interval(0.95)
    expectRelClose(w.tStatistic, -5.48243127939453, 1e-12);
    expectRelClose(w.degreesOfFreedom, 17.9863764537358, 1e-12);
    expectRelClose(w.pValue, 3.31700380039173e-5, 1e-10);
    expectRelClose(w.confidenceInterval.low, -0.467993061761547, 1e-11);
    expectRelClose(w.confidenceInterval.high, -0.20867360490512, 1e-11);
    expectRelClose(w.differenceOfMeans, 5.035 - 5.373333333333333, 1e-12);
  });

  it('welchTTest at 99 % on the Lakens (2013) worked example matches scipy', () => {
    const w = welchTTest(lakensA, lakensB, 0.99);
    // scipy 1.17.1: ttest_ind(a, b, equal_var=False), .confidence_interval(0.99)
    expectRelClose(w.tStatistic, 2.51754407489006, 1e-12);
    expectRelClose(w.degreesOfFreedom, 17.6498735654542, 1e-12);
    expectRelClose(w.pValue, 0.0217199209512624, 1e-10);
    expectRelClose(w.confidenceInterval.low, -0.145992931748073, 1e-10);
    expectRelClose(w.confidenceInterval.high, 2.14599293174807, 1e-11);
  });

  it('welchTTest: swapping the samples flips the sign and keeps p; the CI holds the difference', () => {
    const sample = fc.array(fc.double({ min: -10, max: 10, noNaN: true }), { minLength: 2, maxLength: 20 });
    fc.assert(
      fc.property(sample, sample, (a, b) => {
        fc.pre(new Set(a).size > 1 || new Set(b).size > 1);
        const ab = welchTTest(a, b);
        const ba = welchTTest(b, a);
        expect(ba.tStatistic).toBeCloseTo(-ab.tStatistic, 9);
        expect(ba.pValue).toBeCloseTo(ab.pValue, 12);
        expect(ab.confidenceInterval.low).toBeLessThanOrEqual(ab.differenceOfMeans);
        expect(ab.confidenceInterval.high).toBeGreaterThanOrEqual(ab.differenceOfMeans);
      }),
      { seed: 11, numRuns: 150 },
    );
  });

  it('welchTTest with no spread at all is degenerate but defined', () => {
    expect(welchTTest([1, 1], [2, 2]).pValue).toBe(0);
    expect(welchTTest([1, 1], [1, 1]).pValue).toBe(1);
  });

  it('welchTTest rejects a sample of one', () => {
    expect(() => welchTTest([1], [1, 2])).toThrow('welchTTest: sampleA must hold at least 2 values, got 1');
  });
});
