import { FLAG_THRESHOLDS } from './flagThresholds.ts';
import { normalTwoSidedPValue, studentTTwoSidedPValue } from './tailProbabilities.ts';
import { describeValue, requireFiniteArray, requirePositive, requireSameLength } from './validate.ts';

/** Options of {@link stepChangeStatistic} and {@link detectStepChange}. */
export interface StepChangeOptions {
  /**
   * Degree of the smooth trend allowed under "no step": 0 (a constant mean, the classic mean-shift
   * test, default), 1 (a line) or 2 (a parabola, so gentle curvature is not taken for a step).
   */
  readonly trendDegree?: 0 | 1 | 2;
  /** Abscissa of the trend (e.g. z in nm), one per entry; default the index 0, 1, 2, … */
  readonly x?: ArrayLike<number>;
}

/** The best single step in a series, from {@link stepChangeStatistic}. */
export interface StepChangeStatistic {
  /** First index of the second segment: the step lies between index − 1 and index. */
  readonly index: number;
  /** Size of the step (after minus before, the trend removed), in the unit of the series. */
  readonly stepSize: number;
  /** Noise σ used: the given sigma, or the residual standard deviation of the model with the step. */
  readonly sigma: number;
  /** The standardised step: z (sigma given) or the t of the step coefficient (sigma estimated), signed like stepSize. */
  readonly statistic: number;
  /** 'z' with a known sigma (normal reference), 't' with n − trendDegree − 2 degrees of freedom otherwise. */
  readonly statisticKind: 'z' | 't';
  /** Two-sided p-value of the statistic at the best split, as if that split had been chosen in advance. */
  readonly pValue: number;
  /** Number of split positions searched (each segment ≥ FLAG_THRESHOLDS.stepMinimumSegment points). */
  readonly positionsSearched: number;
  /** Bonferroni-corrected p = min(1, pValue × positionsSearched): an upper bound on the false-alarm probability. */
  readonly adjustedPValue: number;
  /** The trend degree used. */
  readonly trendDegree: 0 | 1 | 2;
}

/** A step found by {@link detectStepChange}: the statistic plus the points on the shorter side. */
export interface StepChangeFinding extends StepChangeStatistic {
  /** Indices of the shorter segment (the points displaced by the step), ascending. */
  readonly pointIndices: number[];
  /** Length of the series. */
  readonly points: number;
}

/** Orthonormal columns spanning {1, u, …, u^degree} over the points (modified Gram–Schmidt), u scaled to [−1, 1]. */
function orthonormalTrendBasis(abscissa: readonly number[], degree: number): number[][] {
  const n = abscissa.length;
  let minimum = Infinity;
  let maximum = -Infinity;
  for (const value of abscissa) {
    minimum = Math.min(minimum, value);
    maximum = Math.max(maximum, value);
  }
  const middle = (minimum + maximum) / 2;
  const half = (maximum - minimum) / 2 || 1;
  const basis: number[][] = [];
  for (let power = 0; power <= degree; power++) {
    const column = abscissa.map((value) => ((value - middle) / half) ** power);
    for (const previous of basis) {
      let projection = 0;
      for (let i = 0; i < n; i++) projection += previous[i] * column[i];
      for (let i = 0; i < n; i++) column[i] -= projection * previous[i];
    }
    let norm = 0;
    for (let i = 0; i < n; i++) norm += column[i] * column[i];
    norm = Math.sqrt(norm);
    if (!(norm > 1e-9 * Math.sqrt(n))) {
      throw new RangeError(`stepChangeStatistic: x must hold at least ${degree + 1} distinct values for trendDegree ${degree}, got fewer`);
    }
    basis.push(column.map((value) => value / norm));
  }
  return basis;
}

/**
 * The most likely single step in a sequence, and how surprising it is.
 * Model: x_i = trend(i) + δ·[i ≥ k] + noise, trend a polynomial of degree d (0, 1 or 2) in `x`.
 * With r the residuals of the trend-only least-squares fit and h_k the step indicator made
 * orthogonal to the trend, the least-squares step is δ_k = Σ_{i≥k} r_i / ‖h_k‖², its sum of squares
 * B_k = (Σ_{i≥k} r_i)²/‖h_k‖², and its statistic z_k = δ_k‖h_k‖/σ (sigma given) or
 * t_k = δ_k‖h_k‖/s_k with s_k² = (Σr² − B_k)/(n − d − 2). For d = 0 this is the two-sample t with
 * pooled variance, ‖h_k‖² = k(n − k)/n. The split maximising B_k is the likelihood-ratio estimate
 * of the change point for normal errors; its p-value is Bonferroni-corrected for the search over
 * positions. Series in any unit (e.g. ln I), sigma in the same unit.
 * Source: D. M. Hawkins, "Testing a sequence of observations for a shift in location", J. Am. Stat.
 * Assoc. 72, 180–186 (1977) (likelihood ratio = maximum two-sample t); D. V. Hinkley, Biometrika 57,
 * 1–17 (1970) [from memory]; Bonferroni bound for this search, K. J. Worsley, J. Am. Stat. Assoc. 74,
 * 365–367 (1979) [from memory]; the trend term is the ordinary linear-model t test of a step regressor.
 * @example stepChangeStatistic([0, 0.1, -0.1, 0, 5, 5.1, 4.9, 5]).index // 4
 */
export function stepChangeStatistic(series: ArrayLike<number>, sigma?: number, options: StepChangeOptions = {}): StepChangeStatistic {
  const name = 'stepChangeStatistic';
  if (options === null || typeof options !== 'object') throw new TypeError(`${name}: options must be an object, got ${describeValue(options)}`);
  const trendDegree = options.trendDegree ?? 0;
  if (trendDegree !== 0 && trendDegree !== 1 && trendDegree !== 2) {
    throw new RangeError(`${name}: trendDegree must be 0, 1 or 2, got ${describeValue(trendDegree)}`);
  }
  const minimumSegment = FLAG_THRESHOLDS.stepMinimumSegment.value;
  const values = requireFiniteArray(name, 'series', series, Math.max(2 * minimumSegment + 1, trendDegree + 4));
  if (sigma !== undefined) requirePositive(name, 'sigma', sigma);
  const n = values.length;
  let abscissa: number[];
  if (options.x === undefined) abscissa = values.map((_, i) => i);
  else {
    abscissa = requireFiniteArray(name, 'x', options.x, 0);
    requireSameLength(name, 'x', abscissa.length, n);
  }
  const basis = orthonormalTrendBasis(abscissa, trendDegree);

  const residuals = [...values];
  for (const column of basis) {
    let projection = 0;
    for (let i = 0; i < n; i++) projection += column[i] * values[i];
    for (let i = 0; i < n; i++) residuals[i] -= projection * column[i];
  }
  let residualSumOfSquares = 0;
  for (const value of residuals) residualSumOfSquares += value * value;

  // Suffix sums from the end: Σ_{i≥k} r_i and Σ_{i≥k} q_ij for each basis column j.
  let suffixResidual = 0;
  const suffixBasis = new Array<number>(basis.length).fill(0);
  for (let i = n - 1; i >= n - minimumSegment + 1; i--) {
    suffixResidual += residuals[i];
    for (let j = 0; j < basis.length; j++) suffixBasis[j] += basis[j][i];
  }
  let bestIndex = minimumSegment;
  let bestReduction = -1;
  let bestNormSquared = 1;
  let bestSum = 0;
  for (let k = n - minimumSegment; k >= minimumSegment; k--) {
    suffixResidual += residuals[k];
    for (let j = 0; j < basis.length; j++) suffixBasis[j] += basis[j][k];
    let projectedSquared = 0;
    for (const value of suffixBasis) projectedSquared += value * value;
    const normSquared = n - k - projectedSquared;
    if (!(normSquared > 1e-12 * (n - k))) continue;
    const reduction = (suffixResidual * suffixResidual) / normSquared;
    if (reduction >= bestReduction) {
      bestReduction = reduction;
      bestIndex = k;
      bestNormSquared = normSquared;
      bestSum = suffixResidual;
    }
  }
  const positionsSearched = n - 2 * minimumSegment + 1;
  const stepSize = bestSum / bestNormSquared;
  const norm = Math.sqrt(bestNormSquared);
  let statistic: number;
  let pValue: number;
  let usedSigma: number;
  if (sigma !== undefined) {
    usedSigma = sigma;
    statistic = (stepSize * norm) / sigma;
    pValue = normalTwoSidedPValue(statistic);
  } else {
    const degreesOfFreedom = n - trendDegree - 2;
    usedSigma = Math.sqrt(Math.max(residualSumOfSquares - Math.max(bestReduction, 0), 0) / degreesOfFreedom);
    if (usedSigma > 0) statistic = (stepSize * norm) / usedSigma;
    else statistic = stepSize === 0 ? 0 : Math.sign(stepSize) * Infinity;
    pValue = studentTTwoSidedPValue(statistic, degreesOfFreedom);
  }
  return {
    index: bestIndex,
    stepSize,
    sigma: usedSigma,
    statistic,
    statisticKind: sigma !== undefined ? 'z' : 't',
    pValue,
    positionsSearched,
    adjustedPValue: Math.min(1, pValue * positionsSearched),
    trendDegree,
  };
}

/**
 * Detect a tip change: a sudden offset in a sequence (ln I of a sweep, the residuals of a fit, or a
 * sequence of per-curve results). Raised when the Bonferroni-corrected p-value of the best single
 * step (see {@link stepChangeStatistic}) is below FLAG_THRESHOLDS.stepFalseAlarmProbability (1e-3),
 * so clean white noise raises it in at most 1 series in 1000. For an I(z) curve pass ln I with
 * { trendDegree: 2, x: zNm }, so that the exponential and any gentle curvature are not taken for a
 * step. sigma: the known noise σ in the series' unit, if any.
 * Source: as stepChangeStatistic (Hawkins 1977; Worsley 1979 [from memory]).
 * @example detectStepChange([0, 0.1, -0.1, 0, 0.05, 5, 5.1, 4.9, 5, 5.05], 0.1)?.index // 5
 */
export function detectStepChange(series: ArrayLike<number>, sigma?: number, options: StepChangeOptions = {}): StepChangeFinding | null {
  const statistic = stepChangeStatistic(series, sigma, options);
  if (!(statistic.adjustedPValue < FLAG_THRESHOLDS.stepFalseAlarmProbability.value)) return null;
  const n = series.length;
  const pointIndices: number[] = [];
  if (statistic.index >= n - statistic.index) {
    for (let i = statistic.index; i < n; i++) pointIndices.push(i);
  } else {
    for (let i = 0; i < statistic.index; i++) pointIndices.push(i);
  }
  return { ...statistic, pointIndices, points: n };
}
