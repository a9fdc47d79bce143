import { mean, sampleVariance } from 'simple-statistics';
import { requireFiniteArray } from './validate.ts';

/** Standardised difference of two group means, from {@link cohensD}. */
export interface EffectSizeResult {
  /** Cohen's d = (x̄_A − x̄_B)/s_pooled (dimensionless); null when s_pooled = 0. */
  readonly cohensD: number | null;
  /** Hedges' g = J·d with J = 1 − 3/(4(n_A + n_B) − 9), less biased for small groups; null with d. */
  readonly hedgesG: number | null;
  /** s_pooled = √(((n_A − 1)s_A² + (n_B − 1)s_B²)/(n_A + n_B − 2)) (unit of the values). */
  readonly pooledStandardDeviation: number;
  /** The small-sample correction factor J. */
  readonly correctionFactor: number;
}

/**
 * Cohen's d (pooled standard deviation) and Hedges' g of two groups: the difference of means in
 * units of the within-group spread. |d| ≈ 0.2 is small, 0.5 medium, 0.8 large in Cohen's words;
 * curves of one run often differ by several SD between samples, so large values are common here.
 * Formula: d = (x̄_A − x̄_B)/s_p, s_p² = ((n_A − 1)s_A² + (n_B − 1)s_B²)/(n_A + n_B − 2),
 * g = d·(1 − 3/(4(n_A + n_B) − 9)). Each sample needs ≥ 2 values; any unit (both the same).
 * Source: J. Cohen, Statistical Power Analysis for the Behavioral Sciences, 2nd ed. (1988), §2.2;
 * L. V. Hedges, J. Educ. Stat. 6, 107–128 (1981), the approximate J; worked example in D. Lakens,
 * Front. Psychol. 4, 863 (2013) [from memory]; checked against statsmodels effectsize_smd.
 * @example cohensD([9, 7, 8, 9, 8, 9, 9, 10, 9, 9], [9, 6, 7, 8, 7, 9, 8, 8, 8, 7]).cohensD // 1.12588
 */
export function cohensD(sampleA: ArrayLike<number>, sampleB: ArrayLike<number>): EffectSizeResult {
  const name = 'cohensD';
  const a = requireFiniteArray(name, 'sampleA', sampleA, 2);
  const b = requireFiniteArray(name, 'sampleB', sampleB, 2);
  const nA = a.length;
  const nB = b.length;
  const pooledVariance = ((nA - 1) * sampleVariance(a) + (nB - 1) * sampleVariance(b)) / (nA + nB - 2);
  const pooledStandardDeviation = Math.sqrt(pooledVariance);
  const correctionFactor = 1 - 3 / (4 * (nA + nB) - 9);
  if (!(pooledStandardDeviation > 0)) return { cohensD: null, hedgesG: null, pooledStandardDeviation, correctionFactor };
  const d = (mean(a) - mean(b)) / pooledStandardDeviation;
  return { cohensD: d, hedgesG: d * correctionFactor, pooledStandardDeviation, correctionFactor };
}
