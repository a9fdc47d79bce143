import { wilcoxonRankSum } from 'simple-statistics';
import { normalTwoSidedPValue } from './tailProbabilities.ts';
import { describeValue, requireFiniteArray } from './validate.ts';

/**
 * Largest n_A + n_B for which the exact null distribution of U is counted (samples without ties).
 * The counts are integers up to C(50, 25) ≈ 1.3e14 < 2^53, so they are exact in doubles.
 * Source: IEEE 754 doubles hold integers exactly below 2^53 (common practice, no source).
 * @example MANN_WHITNEY_EXACT_MAXIMUM_TOTAL // 50
 */
export const MANN_WHITNEY_EXACT_MAXIMUM_TOTAL = 50;

/** How the Mann–Whitney p-value was found. */
export type MannWhitneyMethod = 'exact' | 'normal';

/** Mann–Whitney U test of two groups, from {@link mannWhitneyU}. */
export interface MannWhitneyResult {
  readonly nA: number;
  readonly nB: number;
  /** U of sample A: R_A − n_A(n_A + 1)/2, the number of (a, b) pairs with a > b (ties count ½). */
  readonly uStatisticA: number;
  /** U of sample B: n_A·n_B − uStatisticA. */
  readonly uStatisticB: number;
  /** 'exact' (counted null distribution) or 'normal' (approximation with tie and continuity corrections). */
  readonly method: MannWhitneyMethod;
  /** True when some values occur in both or the same sample more than once. */
  readonly hasTies: boolean;
  /** Standardised U for the normal method (continuity-corrected, |z|); null for exact. */
  readonly zStatistic: number | null;
  /** Two-sided p-value. */
  readonly pValue: number;
  /** Words saying which method gave the p-value, for tables. */
  readonly methodNote: string;
}

/** Options of {@link mannWhitneyU}. */
export interface MannWhitneyOptions {
  /**
   * 'auto' (default): exact when there are no ties and n_A + n_B ≤ MANN_WHITNEY_EXACT_MAXIMUM_TOTAL,
   * else the normal approximation. (scipy's 'auto' goes exact only when one sample has ≤ 8 values.)
   */
  readonly method?: 'auto' | 'exact' | 'normal';
  /** Continuity correction of the normal approximation (default true). */
  readonly continuityCorrection?: boolean;
}

/**
 * Number of arrangements giving each U = 0 … m·n, the coefficients of the Gaussian binomial
 * [m+n choose m]_q, built as Π_{i=1..m} (1 − q^{n+i})/(1 − q^i): each step multiplies by
 * (1 − q^{n+i}) and divides by (1 − q^i) (a running sum), so every intermediate is an integer.
 */
function exactUCounts(m: number, n: number): number[] {
  const degree = m * n;
  const counts = new Array<number>(degree + 1).fill(0);
  counts[0] = 1;
  for (let i = 1; i <= m; i++) {
    const shift = n + i;
    for (let k = degree; k >= shift; k--) counts[k] -= counts[k - shift];
    for (let k = i; k <= degree; k++) counts[k] += counts[k - i];
  }
  return counts;
}

/**
 * Mann–Whitney U (Wilcoxon rank-sum) test: do values of A tend to be larger or smaller than B's?
 * The rank sum R_A (mid-ranks for ties) is simple-statistics `wilcoxonRankSum`; U_A = R_A − n_A(n_A+1)/2.
 * Exact: P(U ≤ u) counted from the Gaussian-binomial coefficients; p = min(1, 2·min(P(U ≤ U_A), P(U ≥ U_A))).
 * Normal: μ = n_A n_B/2, σ² = n_A n_B/12 · ((N + 1) − Σ(t³ − t)/(N(N − 1))) over tie groups of size t,
 * z = (max(U_A, U_B) − μ − ½)/σ (½ only with the continuity correction), p = 2(1 − Φ(z)), capped at 1.
 * Each sample needs ≥ 1 value; any unit. Exact needs no ties.
 * Source: H. B. Mann & D. R. Whitney, Ann. Math. Stat. 18, 50–60 (1947); tie correction as in
 * E. L. Lehmann, Nonparametrics (1975) [from memory]; checked against scipy.stats.mannwhitneyu
 * (method='exact' and 'asymptotic').
 * @example mannWhitneyU([1, 2, 3], [4, 5, 6]) // { uStatisticA: 0, method: 'exact', pValue: 0.1, … }
 */
export function mannWhitneyU(sampleA: ArrayLike<number>, sampleB: ArrayLike<number>, options: MannWhitneyOptions = {}): MannWhitneyResult {
  const name = 'mannWhitneyU';
  const a = requireFiniteArray(name, 'sampleA', sampleA, 1);
  const b = requireFiniteArray(name, 'sampleB', sampleB, 1);
  const requested = options.method ?? 'auto';
  if (requested !== 'auto' && requested !== 'exact' && requested !== 'normal') {
    throw new RangeError(`${name}: method must be auto, exact or normal, got ${describeValue(requested)}`);
  }
  const continuity = options.continuityCorrection ?? true;
  const nA = a.length;
  const nB = b.length;
  const total = nA + nB;
  const uStatisticA = wilcoxonRankSum(a, b) - (nA * (nA + 1)) / 2;
  const uStatisticB = nA * nB - uStatisticA;

  const pooled = [...a, ...b].sort((x, y) => x - y);
  let tieTerm = 0;
  for (let i = 0; i < pooled.length; ) {
    let j = i + 1;
    while (j < pooled.length && pooled[j] === pooled[i]) j++;
    const size = j - i;
    if (size > 1) tieTerm += size * size * size - size;
    i = j;
  }
  const hasTies = tieTerm > 0;
  if (requested === 'exact' && hasTies) throw new RangeError(`${name}: method exact needs samples without ties, got tied values`);
  if (requested === 'exact' && total > MANN_WHITNEY_EXACT_MAXIMUM_TOTAL) {
    throw new RangeError(`${name}: method exact needs nA + nB ≤ ${MANN_WHITNEY_EXACT_MAXIMUM_TOTAL}, got ${total}`);
  }
  const method: MannWhitneyMethod =
    requested === 'exact' || (requested === 'auto' && !hasTies && total <= MANN_WHITNEY_EXACT_MAXIMUM_TOTAL) ? 'exact' : 'normal';

  if (method === 'exact') {
    const counts = exactUCounts(nA, nB);
    let all = 0;
    for (const count of counts) all += count;
    // uStatisticA is an integer without ties.
    let atMost = 0;
    let atLeast = 0;
    for (let u = 0; u < counts.length; u++) {
      if (u <= uStatisticA) atMost += counts[u];
      if (u >= uStatisticA) atLeast += counts[u];
    }
    const pValue = Math.min(1, (2 * Math.min(atMost, atLeast)) / all);
    return { nA, nB, uStatisticA, uStatisticB, method, hasTies, zStatistic: null, pValue, methodNote: 'exact distribution (no ties)' };
  }
  const centre = (nA * nB) / 2;
  const variance = ((nA * nB) / 12) * (total + 1 - tieTerm / (total * (total - 1)));
  const larger = Math.max(uStatisticA, uStatisticB);
  let z: number;
  if (variance > 0) z = (larger - centre - (continuity ? 0.5 : 0)) / Math.sqrt(variance);
  else z = 0;
  const pValue = Math.min(1, z <= 0 ? 1 : normalTwoSidedPValue(z));
  const note = `normal approximation${hasTies ? ' with tie correction' : ''}${continuity ? ' and continuity correction' : ''}`;
  return { nA, nB, uStatisticA, uStatisticB, method, hasTies, zStatistic: z, pValue, methodNote: note };
}
