/**
 * Weighted least-squares straight line y = intercept + slope·x, closed form.
 * With weights w_i = 1/σ_i² (relative; the scale is taken from the scatter):
 *   slope = Σw(x − x̄)(y − ȳ) / Σw(x − x̄)²,  intercept = ȳ − slope·x̄   (x̄, ȳ weighted means)
 *   s² = Σw r² / (n − 2),  var(slope) = s²/Σw(x − x̄)²,  var(intercept at x̄) = s²/Σw.
 * Source: N. R. Draper and H. Smith, Applied Regression Analysis, 3rd ed. (1998), ch. 1 and §9.2 [from memory].
 * `mask` (optional) selects points (non-zero = used); `from`/`to` restrict to an index range.
 */
export interface LineFit {
  slope: number;
  intercept: number;
  slopeError: number;
  interceptError: number;
  /** Covariance of (intercept, slope). */
  covarianceInterceptSlope: number;
  /** Weighted mean of x (where the intercept and slope are uncorrelated). */
  meanX: number;
  /** Σ w r² (weighted residual sum of squares). */
  weightedResidualSumOfSquares: number;
  /** Number of points used. */
  count: number;
}

/**
 * Fit a weighted line over points [from, to) where mask is non-zero (all points when mask is null).
 * Returns count < 2 or non-finite numbers when the data cannot define a line.
 * @example weightedLine(new Float64Array([0, 1, 2]), new Float64Array([1, 3, 5]), null, null).slope // 2
 */
export function weightedLine(
  x: Float64Array,
  y: Float64Array,
  weights: Float64Array | null,
  mask: Uint8Array | null,
  from = 0,
  to = x.length,
): LineFit {
  // Two passes: weighted means, then sums about them (as accurate as the textbook three passes).
  let sumW = 0;
  let sumWX = 0;
  let sumWY = 0;
  let count = 0;
  for (let i = from; i < to; i++) {
    if (mask !== null && mask[i] === 0) continue;
    const w = weights === null ? 1 : weights[i];
    sumW += w;
    sumWX += w * x[i];
    sumWY += w * y[i];
    count++;
  }
  const meanX = sumWX / sumW;
  const meanY = sumWY / sumW;
  let sxx = 0;
  let sxy = 0;
  let syy = 0;
  for (let i = from; i < to; i++) {
    if (mask !== null && mask[i] === 0) continue;
    const w = weights === null ? 1 : weights[i];
    const dx = x[i] - meanX;
    const dy = y[i] - meanY;
    sxx += w * dx * dx;
    sxy += w * dx * dy;
    syy += w * dy * dy;
  }
  const slope = sxy / sxx;
  const intercept = meanY - slope * meanX;
  // Σw r² = Syy − slope·Sxy about the weighted means.
  const rss = Math.max(0, syy - slope * sxy);
  return lineFitFromSums(slope, intercept, meanX, sxx, rss, sumW, count);
}

/**
 * The LineFit of a weighted line known by its slope, intercept and sums: x̄ the weighted mean of
 * x, S_xx = Σw(x − x̄)², Σw r² and Σw over `count` points. Errors as in weightedLine:
 * s² = Σw r²/(n − 2), var(slope) = s²/S_xx, var(intercept) = s²/Σw + x̄²·var(slope).
 * @example lineFitFromSums(2, 1, 1, 2, 0, 3, 3).slopeError // 0
 */
export function lineFitFromSums(slope: number, intercept: number, meanX: number, sxx: number, rss: number, sumW: number, count: number): LineFit {
  const s2 = count > 2 ? rss / (count - 2) : Number.NaN;
  const slopeVariance = s2 / sxx;
  const interceptVariance = s2 / sumW + meanX * meanX * slopeVariance;
  return {
    slope,
    intercept,
    slopeError: Math.sqrt(slopeVariance),
    interceptError: Math.sqrt(interceptVariance),
    covarianceInterceptSlope: -meanX * slopeVariance,
    meanX,
    weightedResidualSumOfSquares: rss,
    count,
  };
}
