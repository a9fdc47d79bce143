import { mean, sampleVariance } from 'simple-statistics';
import { studentTQuantile } from './runStatQuantiles.ts';
import { studentTTwoSidedPValue } from './tailProbabilities.ts';
import { describeValue, requireFiniteArray } from './validate.ts';

/** Welch's unequal-variance t-test of two groups and the confidence interval of their difference. */
export interface WelchTTestResult {
  readonly nA: number;
  readonly nB: number;
  readonly meanA: number;
  readonly meanB: number;
  /** meanA − meanB (unit of the values). */
  readonly differenceOfMeans: number;
  /** √(s_A²/n_A + s_B²/n_B) (unit of the values). */
  readonly standardError: number;
  /** differenceOfMeans / standardError (dimensionless). */
  readonly tStatistic: number;
  /** Welch–Satterthwaite degrees of freedom (not an integer in general). */
  readonly degreesOfFreedom: number;
  /** Two-sided p-value, P(|T_ν| ≥ |t|). */
  readonly pValue: number;
  readonly confidenceLevel: number;
  /** differenceOfMeans ± t_{(1+level)/2}(ν) · standardError (unit of the values). */
  readonly confidenceInterval: { readonly low: number; readonly high: number };
}

/**
 * Welch's t-test of mean(A) = mean(B) without assuming equal variances, with the confidence
 * interval of the difference. Uses simple-statistics `mean` and `sampleVariance`; its own
 * `tTestTwoSample` pools the variances, which is not Welch's test.
 * Formula: SE² = s_A²/n_A + s_B²/n_B, t = (x̄_A − x̄_B)/SE,
 * ν = SE⁴ / ((s_A²/n_A)²/(n_A − 1) + (s_B²/n_B)²/(n_B − 1)), p = I_{ν/(ν+t²)}(ν/2, ½),
 * CI = (x̄_A − x̄_B) ± t_{(1+c)/2}(ν)·SE. Both samples need ≥ 2 values; any unit (both the same).
 * When both variances are 0 the test is degenerate: tStatistic = ±∞ (p = 0) for different means, tStatistic = 0
 * (p = 1) for equal ones, ν = n_A + n_B − 2.
 * Source: B. L. Welch, Biometrika 34, 28–35 (1947); F. E. Satterthwaite, Biometrics Bull. 2,
 * 110–114 (1946); checked against scipy.stats.ttest_ind(equal_var=False).
 * @example welchTTest([4.92, 5.13, 5.05, 4.88, 5.21, 5.02, 4.97, 5.10], [5.31, 5.18, 5.45, 5.60, 5.27, 5.39, 5.52, 5.12, 5.66, 5.34, 5.41, 5.23]).pValue // 3.317e-5
 */
export function welchTTest(sampleA: ArrayLike<number>, sampleB: ArrayLike<number>, confidenceLevel = 0.95): WelchTTestResult {
  const name = 'welchTTest';
  const a = requireFiniteArray(name, 'sampleA', sampleA, 2);
  const b = requireFiniteArray(name, 'sampleB', sampleB, 2);
  if (typeof confidenceLevel !== 'number' || !(confidenceLevel > 0 && confidenceLevel < 1)) {
    throw new RangeError(`${name}: confidenceLevel must be within (0, 1), got ${describeValue(confidenceLevel)}`);
  }
  const nA = a.length;
  const nB = b.length;
  const meanA = mean(a);
  const meanB = mean(b);
  const shareA = sampleVariance(a) / nA;
  const shareB = sampleVariance(b) / nB;
  const variance = shareA + shareB;
  const differenceOfMeans = meanA - meanB;
  const standardError = Math.sqrt(variance);
  if (!(variance > 0)) {
    const t = differenceOfMeans === 0 ? 0 : Math.sign(differenceOfMeans) * Infinity;
    return {
      nA,
      nB,
      meanA,
      meanB,
      differenceOfMeans,
      standardError: 0,
      tStatistic: t,
      degreesOfFreedom: nA + nB - 2,
      pValue: differenceOfMeans === 0 ? 1 : 0,
      confidenceLevel,
      confidenceInterval: { low: differenceOfMeans, high: differenceOfMeans },
    };
  }
  // ν written with the shares of the variance, so tiny variances cannot underflow to 0/0.
  const fractionA = shareA / variance;
  const fractionB = shareB / variance;
  const degreesOfFreedom = 1 / ((fractionA * fractionA) / (nA - 1) + (fractionB * fractionB) / (nB - 1));
  const t = differenceOfMeans / standardError;
  const halfWidth = studentTQuantile((1 + confidenceLevel) / 2, degreesOfFreedom) * standardError;
  return {
    nA,
    nB,
    meanA,
    meanB,
    differenceOfMeans,
    standardError,
    tStatistic: t,
    degreesOfFreedom,
    pValue: studentTTwoSidedPValue(t, degreesOfFreedom),
    confidenceLevel,
    confidenceInterval: { low: differenceOfMeans - halfWidth, high: differenceOfMeans + halfWidth },
  };
}
