import { describe, expect, it } from 'vitest';
import { weightedMean } from '../../src/analysis/index.ts';
import { expectRelClose } from '../helpers.ts';

const errors = [0.02, 0.03, 0.02, 0.04, 0.025, 0.03];

describe('weightedMean', () => {
  it('weightedMean matches statsmodels WLS on a constant: mean, 1/√Σw, χ², Birge ratio and χ² p', () => {
    const w = weightedMean([5.62, 5.66, 5.59, 5.71, 5.64, 5.6], errors);
    // statsmodels 0.15.0: WLS(v, 1, weights=1/σ²).fit(): params[0], ssr; bse/(1/√Σw) is the Birge ratio
    expectRelClose(w.weightedMean, 5.62375477800647, 1e-13);
    expectRelClose(w.standardError, 0.0102884022194578, 1e-12);
    expectRelClose(w.chiSquare, 10.0415319023817, 1e-11);
    expectRelClose(w.birgeRatio as number, 1.41714726845037, 1e-11);
    expectRelClose(w.scaledStandardError, 0.0145801811020234, 1e-11);
    // scipy 1.17.1: chi2.sf(10.0415319023817, 5)
    expectRelClose(w.chiSquarePValue as number, 0.0740669748694726, 1e-10);
    expect(w.degreesOfFreedom).toBe(5);
    expect(w.spreadExceedsErrors).toBe(false);
    expect(w.verdict).toContain('consistent with the fit errors');
  });

  it('weightedMean of values closer than their errors has a Birge ratio below 1 and keeps the unscaled error', () => {
    const w = weightedMean([5.63, 5.642, 5.628, 5.655, 5.637, 5.621], errors);
    // statsmodels 0.15.0: WLS as above; scipy chi2.sf
    expectRelClose(w.weightedMean, 5.63266304028227, 1e-13);
    expectRelClose(w.birgeRatio as number, 0.363875622953384, 1e-10);
    expectRelClose(w.chiSquarePValue as number, 0.984987527421577, 1e-10);
    expect(w.scaledStandardError).toBe(w.standardError);
  });

  it('weightedMean says the spread exceeds the errors when curves differ by many error bars', () => {
    const w = weightedMean([5.5, 5.7, 5.45, 5.75, 5.6, 5.52], errors);
    expect(w.spreadExceedsErrors).toBe(true);
    expect(w.birgeRatio as number).toBeGreaterThan(3);
    expect(w.verdict).toContain('larger than the fit errors');
  });

  it('weightedMean of one value has no χ² test', () => {
    const w = weightedMean([5.6], [0.02]);
    expect(w.weightedMean).toBe(5.6);
    expectRelClose(w.standardError, 0.02, 1e-15);
    expect(w.birgeRatio).toBeNull();
  });

  it('weightedMean rejects zero errors and mismatched lengths', () => {
    expect(() => weightedMean([1, 2], [0.1, 0])).toThrow('weightedMean: standardErrors[1] must be > 0, got 0');
    expect(() => weightedMean([1, 2], [0.1])).toThrow('weightedMean: standardErrors must have length 2 (one per point), got 1');
  });
});
