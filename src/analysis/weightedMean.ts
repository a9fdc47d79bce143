import { weightedMean as simpleWeightedMean } from 'simple-statistics';
import { chiSquareUpperTailProbability } from './tailProbabilities.ts';
import { describeValue, requireFiniteArray, requireSameLength } from './validate.ts';

/** The inverse-variance weighted mean of a run and what its scatter says, from {@link weightedMean}. */
export interface WeightedMeanResult {
  readonly n: number;
  /** Σ w_i x_i / Σ w_i with w_i = 1/σ_i² (unit of the values). */
  readonly weightedMean: number;
  /** 1/√Σw_i: the uncertainty if the fit errors alone explained the scatter (unit of the values). */
  readonly standardError: number;
  /** χ² = Σ w_i (x_i − x̄_w)² (dimensionless). */
  readonly chiSquare: number;
  /** n − 1. */
  readonly degreesOfFreedom: number;
  /** χ²/(n − 1); null for n = 1. */
  readonly reducedChiSquare: number | null;
  /** Birge ratio R_B = √(χ²/(n − 1)); ≈ 1 when the spread matches the fit errors; null for n = 1. */
  readonly birgeRatio: number | null;
  /** P(χ²_{n−1} ≥ χ²): the chance of a scatter this large from the fit errors alone; null for n = 1. */
  readonly chiSquarePValue: number | null;
  /** Uncertainty scaled up by the Birge ratio when it exceeds 1: standardError · max(1, R_B). */
  readonly scaledStandardError: number;
  /** True when chiSquarePValue < significanceLevel: the curve-to-curve spread exceeds the fit errors. */
  readonly spreadExceedsErrors: boolean;
  /** The significance level used for spreadExceedsErrors. */
  readonly significanceLevel: number;
  /** One sentence for the user, e.g. 'spread larger than the fit errors (Birge ratio 1.42, p = 0.074)'. */
  readonly verdict: string;
}

/** Options of {@link weightedMean}. */
export interface WeightedMeanOptions {
  /** Level below which the χ² test calls the spread larger than the fit errors (default 0.05). */
  readonly significanceLevel?: number;
}

function formatShort(value: number): string {
  if (value !== 0 && Math.abs(value) < 1e-3) return value.toExponential(1);
  return Number(value.toPrecision(2)).toString();
}

/**
 * Inverse-variance weighted mean of per-curve values with their fit standard errors, its
 * uncertainty, and the Birge ratio of the scatter about it, which says whether the curves differ
 * by more than their error bars (real site-to-site variation, or tip instability).
 * Formula: w_i = 1/σ_i², x̄_w = Σw_i x_i/Σw_i (simple-statistics `weightedMean`), σ_x̄ = 1/√Σw_i,
 * χ² = Σw_i(x_i − x̄_w)², R_B = √(χ²/(n − 1)), p = Q_χ²(χ²; n − 1); scaled error σ_x̄·max(1, R_B)
 * (the Particle Data Group's scale factor). Values and standard errors in the same unit.
 * Source: R. T. Birge, Phys. Rev. 40, 207–227 (1932); P. R. Bevington & D. K. Robinson, Data
 * Reduction and Error Analysis, 3rd ed. (2003), §4.1 [from memory]; PDG Review of Particle Physics,
 * Introduction, "averages and fits" [from memory]; checked against statsmodels WLS on a constant.
 * @example weightedMean([5.62, 5.66, 5.59, 5.71, 5.64, 5.60], [0.02, 0.03, 0.02, 0.04, 0.025, 0.03]).birgeRatio // 1.41715
 */
export function weightedMean(values: ArrayLike<number>, standardErrors: ArrayLike<number>, options: WeightedMeanOptions = {}): WeightedMeanResult {
  const name = 'weightedMean';
  const data = requireFiniteArray(name, 'values', values, 1);
  const errors = requireFiniteArray(name, 'standardErrors', standardErrors, 1);
  requireSameLength(name, 'standardErrors', errors.length, data.length);
  for (let i = 0; i < errors.length; i++) {
    if (!(errors[i] > 0)) throw new RangeError(`${name}: standardErrors[${i}] must be > 0, got ${errors[i]}`);
  }
  const significanceLevel = options.significanceLevel ?? 0.05;
  if (typeof significanceLevel !== 'number' || !(significanceLevel > 0 && significanceLevel < 1)) {
    throw new RangeError(`${name}: significanceLevel must be within (0, 1), got ${describeValue(significanceLevel)}`);
  }
  const weights = errors.map((error) => 1 / (error * error));
  let totalWeight = 0;
  for (const weight of weights) totalWeight += weight;
  const average = simpleWeightedMean(data, weights);
  let chiSquare = 0;
  for (let i = 0; i < data.length; i++) chiSquare += weights[i] * (data[i] - average) ** 2;
  const n = data.length;
  const degreesOfFreedom = n - 1;
  const standardError = 1 / Math.sqrt(totalWeight);
  if (degreesOfFreedom === 0) {
    return {
      n,
      weightedMean: average,
      standardError,
      chiSquare,
      degreesOfFreedom,
      reducedChiSquare: null,
      birgeRatio: null,
      chiSquarePValue: null,
      scaledStandardError: standardError,
      spreadExceedsErrors: false,
      significanceLevel,
      verdict: 'one curve: no spread to judge',
    };
  }
  const reducedChiSquare = chiSquare / degreesOfFreedom;
  const birgeRatio = Math.sqrt(reducedChiSquare);
  const chiSquarePValue = chiSquareUpperTailProbability(chiSquare, degreesOfFreedom);
  const spreadExceedsErrors = chiSquarePValue < significanceLevel;
  const figures = `Birge ratio ${formatShort(birgeRatio)}, χ² p = ${formatShort(chiSquarePValue)}`;
  const verdict = spreadExceedsErrors
    ? `curve-to-curve spread larger than the fit errors (${figures}): real variation between sites or an unstable tip`
    : birgeRatio < 1
      ? `spread within the fit errors (${figures})`
      : `spread consistent with the fit errors (${figures})`;
  return {
    n,
    weightedMean: average,
    standardError,
    chiSquare,
    degreesOfFreedom,
    reducedChiSquare,
    birgeRatio,
    chiSquarePValue,
    scaledStandardError: standardError * Math.max(1, birgeRatio),
    spreadExceedsErrors,
    significanceLevel,
    verdict,
  };
}
