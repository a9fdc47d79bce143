import { max, mean, median, min, quantileSorted, sampleStandardDeviation } from 'simple-statistics';
import { studentTQuantile } from './runStatQuantiles.ts';
import { describeValue, requireFiniteArray } from './validate.ts';

/** Descriptive statistics of one group's values, all in the unit of the values. */
export interface RunSummary {
  readonly n: number;
  readonly mean: number;
  /** Sample standard deviation (n − 1 in the denominator); null for n = 1. */
  readonly standardDeviation: number | null;
  /** SD/√n; null for n = 1. */
  readonly standardErrorOfMean: number | null;
  /** Confidence level of the interval, e.g. 0.95. */
  readonly confidenceLevel: number;
  /** mean ± t_{(1+level)/2, n−1} · SD/√n (Student); null for n = 1. */
  readonly meanConfidenceInterval: { readonly low: number; readonly high: number } | null;
  readonly median: number;
  /** Quartiles by linear interpolation between order statistics (Hyndman–Fan type 7). */
  readonly firstQuartile: number;
  readonly thirdQuartile: number;
  readonly interquartileRange: number;
  readonly minimum: number;
  readonly maximum: number;
}

/**
 * Summarise a group of values: n, mean with its Student-t confidence interval, SD, median,
 * quartiles, IQR, extremes. mean, median, SD, min, max and the type-7 quantiles come from
 * simple-statistics; the t quantile from studentTQuantile.
 * Formula: CI = x̄ ± t_{(1+c)/2}(n − 1) · s/√n, s² = Σ(x − x̄)²/(n − 1); Q_p = x_(⌊h⌋) + (h − ⌊h⌋)(x_(⌊h⌋+1) − x_(⌊h⌋)),
 * h = (n − 1)p (0-based order statistics). Values in any unit; the results share it.
 * Source: Student, Biometrika 6, 1–25 (1908); R. J. Hyndman & Y. Fan, Am. Stat. 50, 361–365 (1996),
 * type 7; checked against scipy.stats.ttest_1samp(...).confidence_interval and numpy.percentile.
 * @example summarizeRun([4.92, 5.13, 5.05, 4.88, 5.21, 5.02, 4.97, 5.10]).meanConfidenceInterval // { low: 4.94244, high: 5.12756 }
 */
export function summarizeRun(values: ArrayLike<number>, confidenceLevel = 0.95): RunSummary {
  const name = 'summarizeRun';
  const data = requireFiniteArray(name, 'values', values, 1);
  if (typeof confidenceLevel !== 'number' || !(confidenceLevel > 0 && confidenceLevel < 1)) {
    throw new RangeError(`${name}: confidenceLevel must be within (0, 1), got ${describeValue(confidenceLevel)}`);
  }
  const n = data.length;
  const sorted = [...data].sort((a, b) => a - b);
  const average = mean(data);
  let standardDeviation: number | null = null;
  let standardErrorOfMean: number | null = null;
  let meanConfidenceInterval: RunSummary['meanConfidenceInterval'] = null;
  if (n >= 2) {
    standardDeviation = sampleStandardDeviation(data);
    standardErrorOfMean = standardDeviation / Math.sqrt(n);
    const halfWidth = studentTQuantile((1 + confidenceLevel) / 2, n - 1) * standardErrorOfMean;
    meanConfidenceInterval = { low: average - halfWidth, high: average + halfWidth };
  }
  const firstQuartile = quantileSorted(sorted, 0.25);
  const thirdQuartile = quantileSorted(sorted, 0.75);
  return {
    n,
    mean: average,
    standardDeviation,
    standardErrorOfMean,
    confidenceLevel,
    meanConfidenceInterval,
    median: median(data),
    firstQuartile,
    thirdQuartile,
    interquartileRange: thirdQuartile - firstQuartile,
    minimum: min(data),
    maximum: max(data),
  };
}
