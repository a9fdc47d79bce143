import { FLAG_THRESHOLDS } from './flagThresholds.ts';
import type { QualityMetrics } from './qualityMetrics.ts';
import { chiSquareUpperTailProbability, normalLowerTailProbability } from './tailProbabilities.ts';
import { describeValue } from './validate.ts';

/** One goodness-of-fit test that failed. */
export interface PoorFitFailure {
  readonly test: 'r-squared' | 'reduced-chi-square' | 'durbin-watson';
  /** The measured figure: R², χ²/ν or d. */
  readonly value: number;
  /** The limit it crossed (minimum for R² and d, maximum for χ²/ν). */
  readonly limit: number;
  /** One-sided p-value of the test (NaN for R², which has none). */
  readonly pValue: number;
}

/** What {@link checkPoorFit} found. */
export interface PoorFitFinding {
  readonly failures: PoorFitFailure[];
}

/**
 * Decide whether a fit is poor. Three rules, any one is enough:
 * 1. R² < FLAG_THRESHOLDS.poorFitMinimumRSquared (0.95) on the fitted scale;
 * 2. only when the noise is known (weights = 1/σ_i): χ²/ν > poorFitMaximumReducedChiSquare (1.5) AND
 *    P(χ²_ν ≥ χ²) < poorFitSignificance (1e-3) — residuals larger than the noise, and surely so;
 * 3. Durbin–Watson d < poorFitMinimumDurbinWatson (1, i.e. lag-1 residual correlation > 0.5) AND
 *    Φ((d − 2)/(2/√n)) < poorFitSignificance, from the large-sample null d ≈ N(2, 4/n) [from memory] —
 *    so short curves need a lower d.
 * Source: Durbin & Watson, Biometrika 37, 409–428 (1950); χ² test of the residuals, e.g. P. R.
 * Bevington & D. K. Robinson, Data Reduction and Error Analysis, 3rd ed. (2003), ch. 11 [from memory].
 * @example checkPoorFit({ r2: 0.9, reducedChi2: 1, rmsResidual: 0.1, durbinWatson: 2, pointsUsed: 64, degreesOfFreedom: 62, points: 64 }, { noiseKnown: false })?.failures[0].test // 'r-squared'
 */
export function checkPoorFit(metrics: QualityMetrics, options: { readonly noiseKnown: boolean }): PoorFitFinding | null {
  const name = 'checkPoorFit';
  if (metrics === null || typeof metrics !== 'object') throw new TypeError(`${name}: metrics must be a QualityMetrics object, got ${describeValue(metrics)}`);
  if (options === null || typeof options !== 'object' || typeof options.noiseKnown !== 'boolean') {
    throw new TypeError(`${name}: options.noiseKnown must be a boolean, got ${describeValue(options?.noiseKnown)}`);
  }
  const failures: PoorFitFailure[] = [];
  const minimumRSquared = FLAG_THRESHOLDS.poorFitMinimumRSquared.value;
  if (metrics.r2 < minimumRSquared) failures.push({ test: 'r-squared', value: metrics.r2, limit: minimumRSquared, pValue: NaN });

  const significance = FLAG_THRESHOLDS.poorFitSignificance.value;
  const maximumReduced = FLAG_THRESHOLDS.poorFitMaximumReducedChiSquare.value;
  if (options.noiseKnown && metrics.degreesOfFreedom > 0 && metrics.reducedChi2 > maximumReduced) {
    const pValue = chiSquareUpperTailProbability(metrics.reducedChi2 * metrics.degreesOfFreedom, metrics.degreesOfFreedom);
    if (pValue < significance) failures.push({ test: 'reduced-chi-square', value: metrics.reducedChi2, limit: maximumReduced, pValue });
  }

  const minimumDurbinWatson = FLAG_THRESHOLDS.poorFitMinimumDurbinWatson.value;
  if (metrics.durbinWatson < minimumDurbinWatson && metrics.pointsUsed > 1) {
    const pValue = normalLowerTailProbability((metrics.durbinWatson - 2) / (2 / Math.sqrt(metrics.pointsUsed)));
    if (pValue < significance) failures.push({ test: 'durbin-watson', value: metrics.durbinWatson, limit: minimumDurbinWatson, pValue });
  }
  return failures.length > 0 ? { failures } : null;
}
