import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { mannWhitneyU } from '../../src/analysis/index.ts';
import { expectRelClose } from '../helpers.ts';

const x = [4.92, 5.13, 5.05, 4.88, 5.21, 5.02, 4.97, 5.1];
const y = [5.31, 5.18, 5.45, 5.6, 5.27, 5.39, 5.52, 5.12, 5.66, 5.34, 5.41, 5.23];
// Printed by test/analysis/reference/runComparison_reference.py (numpy default_rng(20240611), 4 decimals)
const big1 = [4.9789, 4.9482, 5.015, 4.821, 5.0284, 4.9678, 4.9274, 5.0099, 4.8049, 4.9842, 4.9269, 5.041, 5.0442, 4.9072, 4.9067];
const big2 = [4.923, 4.9912, 5.1019, 5.1557, 5.0929, 5.0735, 4.9833, 5.0896, 4.9884, 5.094, 5.0497, 5.1556, 5.0902, 5.2069, 5.0292, 5.1456, 5.0925, 5.2397, 4.8738, 5.1574];
const tied1 = [1, 2, 2, 3, 4, 4, 4, 5];
const tied2 = [3, 4, 5, 5, 6, 6, 7];

describe('mannWhitneyU', () => {
  it('mannWhitneyU (exact, small samples without ties) matches scipy.stats.mannwhitneyu(method="exact")', () => {
    const r = mannWhitneyU(x, y);
    expect(r.method).toBe('exact');
    // scipy 1.17.1: mannwhitneyu(x, y, method='exact'): U = 3
    expect(r.uStatisticA).toBe(3);
    expect(r.uStatisticB).toBe(93);
    expectRelClose(r.pValue, 0.000111137572437882, 1e-11);
    // scipy 1.17.1: mannwhitneyu([1, 2, 3], [4, 5, 6], method='exact'): p = 2/20
    expectRelClose(mannWhitneyU([1, 2, 3], [4, 5, 6]).pValue, 0.1, 1e-14);
  });

  it('mannWhitneyU (exact) on 15 against 20 values matches scipy', () => {
    const r = mannWhitneyU(big1, big2);
    expect(r.method).toBe('exact');
    // scipy 1.17.1: mannwhitneyu(big1, big2, method='exact')
    expect(r.uStatisticA).toBe(42);
    expectRelClose(r.pValue, 0.0001515377504328, 1e-10);
  });

  it('mannWhitneyU (normal) matches scipy method="asymptotic" with the continuity correction', () => {
    // scipy 1.17.1: mannwhitneyu(..., method='asymptotic', use_continuity=True)
    expectRelClose(mannWhitneyU(x, y, { method: 'normal' }).pValue, 0.000596392934071916, 1e-10);
    expectRelClose(mannWhitneyU(big1, big2, { method: 'normal' }).pValue, 0.000339237249301237, 1e-10);
  });

  it('mannWhitneyU with ties uses the tie-corrected normal approximation, as scipy does', () => {
    const r = mannWhitneyU(tied1, tied2);
    expect(r.method).toBe('normal');
    expect(r.hasTies).toBe(true);
    expect(r.methodNote).toBe('normal approximation with tie correction and continuity correction');
    // scipy 1.17.1: mannwhitneyu(t1, t2) (auto → asymptotic because of ties): U = 8
    expect(r.uStatisticA).toBe(8);
    expectRelClose(r.pValue, 0.0219206558647695, 1e-10);
    // scipy 1.17.1: mannwhitneyu(t1, t2, use_continuity=False)
    expectRelClose(mannWhitneyU(tied1, tied2, { continuityCorrection: false }).pValue, 0.0187480830474502, 1e-10);
  });

  it('mannWhitneyU: uStatisticA + uStatisticB = nA·nB, p is symmetric in the samples and within (0, 1]', () => {
    const sample = fc.array(fc.integer({ min: -30, max: 30 }), { minLength: 1, maxLength: 14 });
    fc.assert(
      fc.property(sample, sample, (a, b) => {
        const ab = mannWhitneyU(a, b);
        const ba = mannWhitneyU(b, a);
        expect(ab.uStatisticA + ab.uStatisticB).toBe(a.length * b.length);
        expect(ba.uStatisticA).toBe(ab.uStatisticB);
        expect(ba.pValue).toBeCloseTo(ab.pValue, 12);
        expect(ab.pValue).toBeGreaterThan(0);
        expect(ab.pValue).toBeLessThanOrEqual(1);
      }),
      { seed: 5, numRuns: 200 },
    );
  });

  it('mannWhitneyU refuses an exact test with ties or too many values', () => {
    expect(() => mannWhitneyU(tied1, tied2, { method: 'exact' })).toThrow('mannWhitneyU: method exact needs samples without ties, got tied values');
    const many = Array.from({ length: 30 }, (_, i) => i);
    expect(() => mannWhitneyU(many, many.map((v) => v + 0.5), { method: 'exact' })).toThrow('mannWhitneyU: method exact needs nA + nB ≤ 50, got 60');
    expect(() => mannWhitneyU([], [1])).toThrow('mannWhitneyU: sampleA must hold at least 1 value, got 0');
  });
});
