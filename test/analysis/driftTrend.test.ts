import { describe, expect, it } from 'vitest';
import { theilSenTrend } from '../../src/analysis/index.ts';
import { expectRelClose } from '../helpers.ts';

describe('theilSenTrend', () => {
  it('theilSenTrend matches scipy.stats.theilslopes: slope, intercept and the 95 % interval', () => {
    const y = [5.61, 5.64, 5.6, 5.66, 5.65, 5.7, 5.63, 5.69, 5.72, 5.68, 5.74, 5.71, 5.77, 5.73, 5.76];
    const r = theilSenTrend(y.map((_, i) => i), y);
    // scipy 1.17.1: theilslopes(y, arange(15), 0.95)
    expectRelClose(r.slope, 0.0109999999999999, 1e-9);
    expectRelClose(r.intercept, 5.613, 1e-12);
    expectRelClose(r.slopeConfidenceInterval!.low, 0.00700000000000003, 1e-9);
    expectRelClose(r.slopeConfidenceInterval!.high, 0.0149999999999999, 1e-9);
    expect(r.pairs).toBe(105);
  });

  it('theilSenTrend with ties in x matches scipy at 90 %', () => {
    const x = [0, 1, 1, 2, 3, 3, 3, 4, 5, 6];
    const y = [2.0, 2.4, 2.1, 2.9, 3.3, 3.0, 3.5, 3.9, 4.1, 4.6];
    const r = theilSenTrend(x, y, 0.9);
    // scipy 1.17.1: theilslopes(y, x, 0.90)
    expectRelClose(r.slope, 0.45, 1e-12);
    expectRelClose(r.intercept, 1.8, 1e-12);
    expectRelClose(r.slopeConfidenceInterval!.low, 0.4, 1e-12);
    expectRelClose(r.slopeConfidenceInterval!.high, 0.5, 1e-12);
  });

  it('theilSenTrend ignores one wild point that would tilt least squares', () => {
    const x = [0, 1, 2, 3, 4, 5, 6, 7, 8, 9];
    const y = x.map((v) => 1 + 0.5 * v);
    y[9] = 100;
    expectRelClose(theilSenTrend(x, y).slope, 0.5, 1e-12);
  });

  it('theilSenTrend rejects x with one value', () => {
    expect(() => theilSenTrend([2, 2, 2], [1, 2, 3])).toThrow('theilSenTrend: x must hold at least 2 distinct values, got all equal to 2');
  });
});
