/** 1/Φ⁻¹(3/4) = 1.4826…: scales the median absolute deviation to σ for normal data (textbook; e.g. Hampel 1974 [from memory]). */
export const MAD_TO_SIGMA = 1.482602218505602;

/**
 * Median of the first `count` entries of `values`, by quickselect (C. A. R. Hoare, Commun. ACM 4, 321
 * (1961), "Algorithm 65: Find"). Reorders those entries in place; O(count) on average; no allocation.
 * @example selectMedian(new Float64Array([5, 1, 3]), 3) // 3
 */
export function selectMedian(values: Float64Array, count: number): number {
  if (count <= 0) return Number.NaN;
  const upper = selectKth(values, count, count >> 1);
  if (count % 2 === 1) return upper;
  // Even count: the lower middle is the largest of the entries left of the upper middle.
  let lower = -Infinity;
  for (let i = 0; i < count >> 1; i++) if (values[i] > lower) lower = values[i];
  return 0.5 * (lower + upper);
}

/** The k-th smallest (0-based) of values[0..count), partially sorting in place. */
export function selectKth(values: Float64Array, count: number, k: number): number {
  let left = 0;
  let right = count - 1;
  while (right > left) {
    const pivot = values[(left + right) >> 1];
    let i = left;
    let j = right;
    while (i <= j) {
      while (values[i] < pivot) i++;
      while (values[j] > pivot) j--;
      if (i <= j) {
        const t = values[i];
        values[i] = values[j];
        values[j] = t;
        i++;
        j--;
      }
    }
    if (k <= j) right = j;
    else if (k >= i) left = i;
    else break;
  }
  return values[k];
}
