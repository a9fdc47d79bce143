/**
 * Ordinary least-squares polynomial y = Σ_{k=0}^{degree} c_k x^k, by the normal equations on x
 * scaled to [−1, 1] (well conditioned for the low degrees used here), with the coefficient
 * covariance s²(XᵀX)⁻¹. Source: Draper & Smith, Applied Regression Analysis (1998), ch. 5 [from memory].
 * @example polynomialFit(new Float64Array([0, 1, 2, 3]), new Float64Array([1, 2, 5, 10]), 2).coefficients // [1, 0, 1]
 */
export interface PolynomialFit {
  /** c_0 … c_degree in the original x units. */
  coefficients: Float64Array;
  /** Row-major covariance of the coefficients (original units). */
  covariance: Float64Array;
  residualStandardDeviation: number;
}

export function polynomialFit(x: Float64Array, y: Float64Array, degree: number, weights: Float64Array | null = null): PolynomialFit {
  const n = x.length;
  const m = degree + 1;
  if (!(n > m)) throw new Error(`polynomialFit: needs more than ${m} points for degree ${degree}, got ${n}`);
  let scale = 0;
  for (let i = 0; i < n; i++) scale = Math.max(scale, Math.abs(x[i]));
  if (!(scale > 0)) scale = 1;
  // Powers t_i^k column by column, then each entry of XᵀWX and XᵀWy as one dot product over the
  // points (the sums of the textbook form, in the same order, so the same rounding).
  const powers = new Float64Array(m * n);
  for (let i = 0; i < n; i++) {
    const t = x[i] / scale;
    powers[i] = 1;
    for (let k = 1; k < m; k++) powers[k * n + i] = powers[(k - 1) * n + i] * t;
  }
  const normal = new Float64Array(m * m);
  const rhs = new Float64Array(m);
  for (let a = 0; a < m; a++) {
    const rowA = a * n;
    let sumY = 0;
    for (let i = 0; i < n; i++) sumY += (weights === null ? 1 : weights[i]) * powers[rowA + i] * y[i];
    rhs[a] = sumY;
    for (let b = a; b < m; b++) {
      const rowB = b * n;
      let sum = 0;
      for (let i = 0; i < n; i++) sum += (weights === null ? 1 : weights[i]) * powers[rowA + i] * powers[rowB + i];
      normal[a * m + b] = sum;
      normal[b * m + a] = sum;
    }
  }
  const inverse = invertSymmetric(normal, m);
  const scaled = new Float64Array(m);
  for (let a = 0; a < m; a++) for (let b = 0; b < m; b++) scaled[a] += inverse[a * m + b] * rhs[b];
  let rss = 0;
  for (let i = 0; i < n; i++) {
    const t = x[i] / scale;
    let value = 0;
    for (let k = m - 1; k >= 0; k--) value = value * t + scaled[k];
    const w = weights === null ? 1 : weights[i];
    rss += w * (y[i] - value) ** 2;
  }
  const s2 = rss / (n - m);
  const coefficients = new Float64Array(m);
  const covariance = new Float64Array(m * m);
  for (let a = 0; a < m; a++) {
    coefficients[a] = scaled[a] / scale ** a;
    for (let b = 0; b < m; b++) covariance[a * m + b] = (s2 * inverse[a * m + b]) / (scale ** a * scale ** b);
  }
  return { coefficients, covariance, residualStandardDeviation: Math.sqrt(s2) };
}

/** Value of the polynomial at x (Horner). */
export function polynomialValue(coefficients: Float64Array, x: number): number {
  let value = 0;
  for (let k = coefficients.length - 1; k >= 0; k--) value = value * x + coefficients[k];
  return value;
}

/** Inverse of a small symmetric positive-definite matrix by Gauss–Jordan with partial pivoting. */
export function invertSymmetric(matrix: Float64Array, m: number): Float64Array {
  const a = Float64Array.from(matrix);
  const inverse = new Float64Array(m * m);
  for (let i = 0; i < m; i++) inverse[i * m + i] = 1;
  for (let col = 0; col < m; col++) {
    let pivot = col;
    for (let r = col + 1; r < m; r++) if (Math.abs(a[r * m + col]) > Math.abs(a[pivot * m + col])) pivot = r;
    if (pivot !== col) {
      for (let k = 0; k < m; k++) {
        [a[col * m + k], a[pivot * m + k]] = [a[pivot * m + k], a[col * m + k]];
        [inverse[col * m + k], inverse[pivot * m + k]] = [inverse[pivot * m + k], inverse[col * m + k]];
      }
    }
    const diagonal = a[col * m + col];
    for (let k = 0; k < m; k++) {
      a[col * m + k] /= diagonal;
      inverse[col * m + k] /= diagonal;
    }
    for (let r = 0; r < m; r++) {
      if (r === col) continue;
      const factor = a[r * m + col];
      if (factor === 0) continue;
      for (let k = 0; k < m; k++) {
        a[r * m + k] -= factor * a[col * m + k];
        inverse[r * m + k] -= factor * inverse[col * m + k];
      }
    }
  }
  return inverse;
}
