import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { summarizeRun } from '../../src/analysis/index.ts';
import { expectRelClose } from '../helpers.ts';

const x = [4.92, 5.13, 5.05, 4.88, 5.21, 5.02, 4.97, 5.1];
const y = [5.31, 5.18, 5.45, 5.6, 5.27, 5.39, 5.52, 5.12, 5.66, 5.34, 5.41, 5.23];

describe('summarizeRun', () => {
  it('summarizeRun matches scipy and numpy: mean, SD, median, type-7 quartiles and the Student CI', () => {
    const s = summarizeRun(x);
    expect(s.n).toBe(8);
    // numpy 2.4.6: x.mean(), x.std(ddof=1), np.median, np.percentile(x, 25 / 75) (linear = type 7)
    expectRelClose(s.mean, 5.035, 1e-14);
    expectRelClose(s.standardDeviation as number, 0.110711981542843, 1e-12);
    expectRelClose(s.median, 5.035, 1e-14);
    expectRelClose(s.firstQuartile, 4.9575, 1e-13);
    expectRelClose(s.thirdQuartile, 5.1075, 1e-13);
    expectRelClose(s.interquartileRange, 0.15, 1e-12);
    // scipy 1.17.1: ttest_1samp(x, 0).confidence_interval(0.95)
    expectRelClose(s.meanConfidenceInterval!.low, 4.9424424671551, 1e-12);
    expectRelClose(s.meanConfidenceInterval!.high, 5.1275575328449, 1e-12);
    expect([s.minimum, s.maximum]).toEqual([4.88, 5.21]);
  });

  it('summarizeRun gives the interval at another confidence level', () => {
    const s = summarizeRun(y, 0.9);
    // scipy 1.17.1: ttest_1samp(y, 0).confidence_interval(0.90); numpy percentile 25 / 75
    expectRelClose(s.meanConfidenceInterval!.low, 5.2876513199538, 1e-12);
    expectRelClose(s.meanConfidenceInterval!.high, 5.45901534671287, 1e-12);
    expectRelClose(s.firstQuartile, 5.26, 1e-13);
    expectRelClose(s.thirdQuartile, 5.4675, 1e-13);
    expectRelClose(s.median, 5.365, 1e-14);
  });

  it('summarizeRun of one value has no spread and no interval', () => {
    const s = summarizeRun([5.6]);
    expect(s.standardDeviation).toBeNull();
    expect(s.meanConfidenceInterval).toBeNull();
    expect(s.median).toBe(5.6);
    expect(s.interquartileRange).toBe(0);
  });

  it('summarizeRun keeps order: min ≤ Q1 ≤ median ≤ Q3 ≤ max, and the CI holds the mean', () => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: -100, max: 100, noNaN: true }), { minLength: 2, maxLength: 40 }), (values) => {
        const s = summarizeRun(values);
        expect(s.minimum).toBeLessThanOrEqual(s.firstQuartile);
        expect(s.firstQuartile).toBeLessThanOrEqual(s.median + 1e-12);
        expect(s.median).toBeLessThanOrEqual(s.thirdQuartile + 1e-12);
        expect(s.thirdQuartile).toBeLessThanOrEqual(s.maximum);
        expect(s.meanConfidenceInterval!.low).toBeLessThanOrEqual(s.mean);
        expect(s.meanConfidenceInterval!.high).toBeGreaterThanOrEqual(s.mean);
      }),
      { seed: 7, numRuns: 200 },
    );
  });

  it('summarizeRun rejects empty input, non-finite values and a bad level', () => {
    expect(() => summarizeRun([])).toThrow('summarizeRun: values must hold at least 1 value, got 0');
    expect(() => summarizeRun([1, Number.NaN])).toThrow('summarizeRun: values[1] must be a finite number, got NaN');
    expect(() => summarizeRun([1, 2], 95)).toThrow('summarizeRun: confidenceLevel must be within (0, 1), got 95');
  });
});
