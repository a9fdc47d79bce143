import { requireFiniteArray } from './validate.ts';

/**
 * Holm's step-down adjustment of p-values for many comparisons at once (e.g. every pair of runs):
 * reject where the adjusted p < α and the family-wise error rate stays ≤ α, with more power than
 * Bonferroni. Formula: sort p ascending, p̃_(i) = max_{j ≤ i} min(1, (m − j + 1)·p_(j)), i = 1 … m;
 * returned in the input order. Probabilities in [0, 1].
 * Source: S. Holm, Scand. J. Stat. 6, 65–70 (1979); checked against statsmodels
 * multipletests(method='holm').
 * @example holmAdjust([0.01, 0.04, 0.03, 0.005, 0.2]) // [0.04, 0.09, 0.09, 0.025, 0.2]
 */
export function holmAdjust(pValues: ArrayLike<number>): number[] {
  const values = requireFiniteArray('holmAdjust', 'pValues', pValues, 0);
  values.forEach((p, i) => {
    if (!(p >= 0 && p <= 1)) throw new RangeError(`holmAdjust: pValues[${i}] must be within [0, 1], got ${p}`);
  });
  const m = values.length;
  const order = values.map((_, i) => i).sort((i, j) => values[i] - values[j] || i - j);
  const adjusted = new Array<number>(m).fill(0);
  let running = 0;
  order.forEach((index, rank) => {
    running = Math.max(running, Math.min(1, (m - rank) * values[index]));
    adjusted[index] = running;
  });
  return adjusted;
}
