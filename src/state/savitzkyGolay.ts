/**
 * Smoothed value and first derivative of a sampled curve by local least-squares polynomials: at each
 * point a quadratic y ≈ b0 + b1·(x − x_i) + b2·(x − x_i)² is fitted to the `halfWidth` neighbours on
 * each side (the window slides inwards at the ends so it always holds 2·halfWidth + 1 points), and
 * b0, b1 are the smoothed value and slope at x_i. On evenly spaced x this is exactly the
 * Savitzky–Golay filter of degree 2; on uneven x it stays a true local fit.
 * Source: A. Savitzky & M. J. E. Golay, Anal. Chem. 36, 1627 (1964).
 */

/** Smoothed values and derivatives, one per input point (NaN where the window is degenerate). */
export interface LocalPolynomialResult {
  smoothed: Float64Array;
  derivative: Float64Array;
}

/**
 * Local quadratic smoothing and derivative (see the file comment). x must be sorted (either way)
 * and of the same length as y; x and y in any units, the derivative in y-units per x-unit.
 * @example savitzkyGolay([0, 1, 2, 3, 4], [0, 1, 4, 9, 16], 2).derivative[2] // 4
 */
export function savitzkyGolay(x: ArrayLike<number>, y: ArrayLike<number>, halfWidth: number): LocalPolynomialResult {
  const n = x.length;
  if (y.length !== n) throw new Error(`savitzkyGolay: y must have the length of x (${n}), got ${y.length}`);
  if (!(Number.isInteger(halfWidth) && halfWidth >= 1)) throw new Error(`savitzkyGolay: halfWidth must be an integer >= 1, got ${halfWidth}`);
  const smoothed = new Float64Array(n).fill(Number.NaN);
  const derivative = new Float64Array(n).fill(Number.NaN);
  const width = Math.min(n, 2 * halfWidth + 1);
  if (width < 3) return { smoothed, derivative };
  for (let i = 0; i < n; i++) {
    let lo = i - halfWidth;
    if (lo < 0) lo = 0;
    if (lo + width > n) lo = n - width;
    const x0 = x[i];
    // Scale dx by the window span so the 3×3 normal equations stay well conditioned.
    const span = Math.abs(x[lo + width - 1] - x[lo]) || 1;
    let s0 = 0, s1 = 0, s2 = 0, s3 = 0, s4 = 0, t0 = 0, t1 = 0, t2 = 0;
    for (let k = lo; k < lo + width; k++) {
      const d = (x[k] - x0) / span;
      const v = y[k];
      if (!Number.isFinite(d) || !Number.isFinite(v)) continue;
      const d2 = d * d;
      s0 += 1;
      s1 += d;
      s2 += d2;
      s3 += d2 * d;
      s4 += d2 * d2;
      t0 += v;
      t1 += v * d;
      t2 += v * d2;
    }
    // Solve [[s0 s1 s2][s1 s2 s3][s2 s3 s4]]·b = t by Cramer's rule.
    const det = s0 * (s2 * s4 - s3 * s3) - s1 * (s1 * s4 - s3 * s2) + s2 * (s1 * s3 - s2 * s2);
    if (!(Math.abs(det) > 1e-14)) continue;
    const b0 = (t0 * (s2 * s4 - s3 * s3) - s1 * (t1 * s4 - s3 * t2) + s2 * (t1 * s3 - s2 * t2)) / det;
    const b1 = (s0 * (t1 * s4 - s3 * t2) - t0 * (s1 * s4 - s3 * s2) + s2 * (s1 * t2 - t1 * s2)) / det;
    smoothed[i] = b0;
    derivative[i] = b1 / span;
  }
  return { smoothed, derivative };
}
