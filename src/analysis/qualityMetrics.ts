import { requireFiniteArray, requireSameLength, describeValue } from './validate.ts';

/** Input of {@link qualityMetrics}. All arrays have one entry per recorded point, in sweep order. */
export interface QualityMetricsInput {
  /** Measured values on the fitted scale (ln I for an I(z) fit, current in A for I(V)). */
  readonly observed: ArrayLike<number>;
  /** Model values at the best fit, same scale and order. */
  readonly fitted: ArrayLike<number>;
  /**
   * Residual weights w_i, typically 1/σ_i as in src/fit (the residual is (observed − fitted)·w);
   * finite and ≥ 0. Default: all 1.
   */
  readonly weights?: ArrayLike<number>;
  /** Number of varying (fitted) parameters p, an integer ≥ 0. */
  readonly nParams: number;
  /** Which points entered the fit (true = used). Default: all. Excluded points are ignored here. */
  readonly used?: ArrayLike<boolean>;
}

/** Goodness-of-fit figures of one fit over the used points. */
export interface QualityMetrics {
  /** Coefficient of determination on the scale passed (weighted when weights are given). */
  readonly r2: number;
  /** χ²/(n − p) with χ² = Σ(w_i e_i)²; NaN when n ≤ p. Near 1 when the weights are 1/σ_i and σ is right. */
  readonly reducedChi2: number;
  /** √(Σe_i²/n) of the unweighted residuals, in the unit of observed. */
  readonly rmsResidual: number;
  /** Durbin–Watson d of the weighted residuals in sweep order (0 … 4, ≈ 2 for independent residuals); NaN if all are 0. */
  readonly durbinWatson: number;
  /** Points that entered the fit (used and with weight > 0). */
  readonly pointsUsed: number;
  /** Degrees of freedom pointsUsed − nParams of the χ². */
  readonly degreesOfFreedom: number;
  /** Points recorded. */
  readonly points: number;
}

/**
 * Goodness of fit of one curve over the points that entered it.
 * With residuals e_i = observed_i − fitted_i, weights w_i (1/σ_i) and ȳ_w = Σw_i²y_i/Σw_i²:
 * - R² = 1 − Σw_i²e_i² / Σw_i²(y_i − ȳ_w)² (the weighted R² of weighted least squares; plain R² for unit weights);
 * - reduced χ² = Σ(w_i e_i)²/(n − p);
 * - rms residual = √(Σe_i²/n), unit of observed;
 * - Durbin–Watson d = Σ_{t≥2}(r_t − r_{t−1})²/Σr_t², r_t = w_t e_t over the used points in order.
 * Source: Durbin & Watson, "Testing for serial correlation in least squares regression. I",
 * Biometrika 37, 409–428 (1950); the weighted R² as statsmodels' WLS `rsquared` (weights = w²).
 * @example
 * qualityMetrics({ observed: [1, 2, 3, 4], fitted: [1.1, 1.9, 3.1, 3.9], nParams: 2 })
 * // { r2: 0.992, reducedChi2: 0.02, rmsResidual: 0.1, durbinWatson: 3, pointsUsed: 4, degreesOfFreedom: 2, points: 4 }
 */
export function qualityMetrics(input: QualityMetricsInput): QualityMetrics {
  const name = 'qualityMetrics';
  if (input === null || typeof input !== 'object') throw new TypeError(`${name}: input must be an object, got ${describeValue(input)}`);
  const observed = requireFiniteArray(name, 'observed', input.observed, 1);
  const fitted = requireFiniteArray(name, 'fitted', input.fitted, 0);
  requireSameLength(name, 'fitted', fitted.length, observed.length);
  const points = observed.length;
  let weights: number[];
  if (input.weights === undefined) {
    weights = new Array<number>(points).fill(1);
  } else {
    weights = requireFiniteArray(name, 'weights', input.weights, 0);
    requireSameLength(name, 'weights', weights.length, points);
    for (let i = 0; i < points; i++) {
      if (weights[i] < 0) throw new RangeError(`${name}: weights[${i}] must be ≥ 0, got ${weights[i]}`);
    }
  }
  const { nParams } = input;
  if (!Number.isInteger(nParams) || nParams < 0) {
    throw new RangeError(`${name}: nParams must be an integer ≥ 0, got ${describeValue(nParams)}`);
  }
  const used = input.used;
  if (used !== undefined) {
    if (used === null || typeof used !== 'object' || typeof used.length !== 'number') {
      throw new TypeError(`${name}: used must be an array of booleans, got ${describeValue(used)}`);
    }
    requireSameLength(name, 'used', used.length, points);
  }

  const indices: number[] = [];
  for (let i = 0; i < points; i++) {
    if ((used === undefined || used[i]) && weights[i] > 0) indices.push(i);
  }
  const pointsUsed = indices.length;
  if (pointsUsed === 0) throw new RangeError(`${name}: used must select at least 1 point with weight > 0, got 0`);

  let weightSum = 0;
  let weightedMean = 0;
  for (const i of indices) {
    const weightSquared = weights[i] * weights[i];
    weightSum += weightSquared;
    weightedMean += weightSquared * observed[i];
  }
  weightedMean /= weightSum;

  let chiSquare = 0;
  let totalSumOfSquares = 0;
  let plainSumOfSquares = 0;
  let durbinWatsonNumerator = 0;
  let previousWeightedResidual = NaN;
  for (const i of indices) {
    const residual = observed[i] - fitted[i];
    const weightedResidual = weights[i] * residual;
    const weightedDeviation = weights[i] * (observed[i] - weightedMean);
    chiSquare += weightedResidual * weightedResidual;
    totalSumOfSquares += weightedDeviation * weightedDeviation;
    plainSumOfSquares += residual * residual;
    if (!Number.isNaN(previousWeightedResidual)) {
      const difference = weightedResidual - previousWeightedResidual;
      durbinWatsonNumerator += difference * difference;
    }
    previousWeightedResidual = weightedResidual;
  }

  let r2: number;
  if (totalSumOfSquares > 0) r2 = 1 - chiSquare / totalSumOfSquares;
  else r2 = chiSquare === 0 ? 1 : -Infinity;
  const degreesOfFreedom = pointsUsed - nParams;
  return {
    r2,
    reducedChi2: degreesOfFreedom > 0 ? chiSquare / degreesOfFreedom : NaN,
    rmsResidual: Math.sqrt(plainSumOfSquares / pointsUsed),
    durbinWatson: chiSquare > 0 ? durbinWatsonNumerator / chiSquare : NaN,
    pointsUsed,
    degreesOfFreedom,
    points,
  };
}
