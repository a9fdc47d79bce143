import { FLAG_THRESHOLDS } from './flagThresholds.ts';
import { describeValue } from './validate.ts';

/** Two parameters whose estimates move together almost exactly. */
export interface CorrelatedPair {
  readonly first: string;
  readonly second: string;
  /** Correlation coefficient r (−1 … 1). */
  readonly correlation: number;
}

/** What {@link checkDegenerate} found. */
export interface DegeneracyFinding {
  /** Pairs with |r| > FLAG_THRESHOLDS.degenerateCorrelation, largest |r| first. */
  readonly correlatedPairs: CorrelatedPair[];
  /** Parameters with a NaN/infinite standard error or correlation row (not determined by the data). */
  readonly unidentifiable: string[];
}

/**
 * Check a fit's parameter correlations for degeneracy: some pair has |r_ij| >
 * FLAG_THRESHOLDS.degenerateCorrelation (0.999), or a parameter is unidentifiable (its standard error,
 * when given, or any entry of its correlation row is NaN or infinite). correlation is the
 * correlation matrix of the varying parameters, either nested rows or flat row-major (length n²,
 * as src/fit returns it), in the order of names. standardErrors (optional) in the parameters' units.
 * Source: correlation_ij = cov_ij/(σ_i σ_j) (style of src/fit); the 0.999 limit [cp].
 * @example checkDegenerate([[1, 0.9995], [0.9995, 1]], ['barrierHeightEV', 'gapNm'])?.correlatedPairs[0].correlation // 0.9995
 */
export function checkDegenerate(
  correlation: ArrayLike<number> | readonly ArrayLike<number>[],
  names: readonly string[],
  standardErrors?: ArrayLike<number>,
): DegeneracyFinding | null {
  const name = 'checkDegenerate';
  if (!Array.isArray(names) || names.some((entry) => typeof entry !== 'string')) {
    throw new TypeError(`${name}: names must be an array of strings, got ${describeValue(names)}`);
  }
  const n = names.length;
  if (correlation === null || typeof correlation !== 'object' || typeof correlation.length !== 'number') {
    throw new TypeError(`${name}: correlation must be an n×n matrix (nested or flat), got ${describeValue(correlation)}`);
  }
  const nested = correlation.length > 0 && typeof (correlation as ArrayLike<unknown>)[0] === 'object';
  const entry = (row: number, column: number): number =>
    nested ? (correlation as readonly ArrayLike<number>[])[row][column] : (correlation as ArrayLike<number>)[row * n + column];
  if (nested) {
    const rows = correlation as readonly ArrayLike<number>[];
    if (rows.length !== n || rows.some((row) => row === null || typeof row !== 'object' || row.length !== n)) {
      throw new RangeError(`${name}: correlation must be ${n}×${n} to match names, got ${rows.length} rows`);
    }
  } else if (correlation.length !== n * n) {
    throw new RangeError(`${name}: correlation must have ${n * n} entries (flat ${n}×${n}) to match names, got ${correlation.length}`);
  }
  if (standardErrors !== undefined && (standardErrors === null || typeof standardErrors !== 'object' || standardErrors.length !== n)) {
    throw new RangeError(`${name}: standardErrors must have ${n} entries to match names, got ${describeValue(standardErrors)}`);
  }

  const unidentifiable: string[] = [];
  for (let i = 0; i < n; i++) {
    let bad = standardErrors !== undefined && !Number.isFinite(standardErrors[i]);
    for (let j = 0; j < n && !bad; j++) if (!Number.isFinite(entry(i, j))) bad = true;
    if (bad) unidentifiable.push(names[i]);
  }
  const limit = FLAG_THRESHOLDS.degenerateCorrelation.value;
  const correlatedPairs: CorrelatedPair[] = [];
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) {
      const value = entry(i, j);
      if (Number.isFinite(value) && Math.abs(value) > limit) correlatedPairs.push({ first: names[i], second: names[j], correlation: value });
    }
  }
  correlatedPairs.sort((a, b) => Math.abs(b.correlation) - Math.abs(a.correlation));
  return correlatedPairs.length > 0 || unidentifiable.length > 0 ? { correlatedPairs, unidentifiable } : null;
}
