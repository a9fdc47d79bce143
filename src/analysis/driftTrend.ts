import { median } from 'simple-statistics';
import { normalQuantile } from './runStatQuantiles.ts';
import { describeValue, requireFiniteArray, requireSameLength } from './validate.ts';

/** A robust straight line through (x, y), from {@link theilSenTrend}. */
export interface TheilSenTrend {
  /** Median of the pairwise slopes (unit of y per unit of x). */
  readonly slope: number;
  /** median(y) − slope·median(x) (unit of y). */
  readonly intercept: number;
  readonly confidenceLevel: number;
  /** Distribution-free CI of the slope from Kendall's τ (Sen 1968); null when too few pairs. */
  readonly slopeConfidenceInterval: { readonly low: number; readonly high: number } | null;
  /** Number of points. */
  readonly n: number;
  /** Number of pairs with different x (the slopes the median is taken over). */
  readonly pairs: number;
}

function repeatCounts(values: readonly number[]): number[] {
  const sorted = [...values].sort((a, b) => a - b);
  const counts: number[] = [];
  for (let i = 0; i < sorted.length; ) {
    let j = i + 1;
    while (j < sorted.length && sorted[j] === sorted[i]) j++;
    if (j - i > 1) counts.push(j - i);
    i = j;
  }
  return counts;
}

/**
 * Theil–Sen line: the median of the slopes (y_j − y_i)/(x_j − x_i) over all pairs with x_j > x_i,
 * robust to a minority of outliers (breakdown ≈ 29 %), with Sen's confidence interval of the slope.
 * Formula: N pairs, slopes sorted; σ² = [n(n−1)(2n+5) − Σ_x t(t−1)(2t+5) − Σ_y t(t−1)(2t+5)]/18
 * (Kendall's S variance with ties in x and y), z = Φ⁻¹((1 + c)/2); the CI is the slopes of
 * (1-based) ranks round((N − zσ)/2) and round((N + zσ)/2) + 1, clamped to 1 … N.
 * Intercept median(y) − slope·median(x) (as scipy's 'separate'). x and y in any units, ≥ 2 points,
 * x not all equal.
 * Source: H. Theil, Proc. K. Ned. Akad. Wet. 53, 386–392 (1950) [from memory]; P. K. Sen,
 * J. Am. Stat. Assoc. 63, 1379–1389 (1968), eq. 2.6 [from memory]; checked against
 * scipy.stats.theilslopes.
 * @example theilSenTrend([0, 1, 2, 3], [1, 3, 5, 7]).slope // 2
 */
export function theilSenTrend(x: ArrayLike<number>, y: ArrayLike<number>, confidenceLevel = 0.95): TheilSenTrend {
  const name = 'theilSenTrend';
  const xs = requireFiniteArray(name, 'x', x, 2);
  const ys = requireFiniteArray(name, 'y', y, 2);
  requireSameLength(name, 'y', ys.length, xs.length);
  if (typeof confidenceLevel !== 'number' || !(confidenceLevel > 0 && confidenceLevel < 1)) {
    throw new RangeError(`${name}: confidenceLevel must be within (0, 1), got ${describeValue(confidenceLevel)}`);
  }
  const slopes: number[] = [];
  for (let i = 0; i < xs.length; i++) {
    for (let j = 0; j < xs.length; j++) {
      const dx = xs[j] - xs[i];
      if (dx > 0) slopes.push((ys[j] - ys[i]) / dx);
    }
  }
  if (slopes.length === 0) throw new RangeError(`${name}: x must hold at least 2 distinct values, got all equal to ${xs[0]}`);
  slopes.sort((a, b) => a - b);
  const slope = median(slopes);
  const intercept = median(ys) - slope * median(xs);
  const n = xs.length;
  const pairs = slopes.length;
  let tieSum = 0;
  for (const t of [...repeatCounts(xs), ...repeatCounts(ys)]) tieSum += t * (t - 1) * (2 * t + 5);
  const variance = (n * (n - 1) * (2 * n + 5) - tieSum) / 18;
  let slopeConfidenceInterval: TheilSenTrend['slopeConfidenceInterval'] = null;
  if (variance > 0) {
    const spread = normalQuantile((1 + confidenceLevel) / 2) * Math.sqrt(variance);
    // 0-based indices into the sorted slopes.
    const lowIndex = Math.max(Math.round((pairs - spread) / 2) - 1, 0);
    const highIndex = Math.min(Math.round((pairs + spread) / 2), pairs - 1);
    if (lowIndex <= highIndex) slopeConfidenceInterval = { low: slopes[lowIndex], high: slopes[highIndex] };
  }
  return { slope, intercept, confidenceLevel, slopeConfidenceInterval, n, pairs };
}
