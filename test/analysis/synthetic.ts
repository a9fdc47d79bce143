/**
 * Seeded synthetic curves and a small straight-line fit for the analysis tests. The curves are plain
 * exponentials, I = I_max · exp(−decay · (z − z_min)) · (1 + σ·N(0, 1)), no physics needed.
 */
import { gaussian, mulberry32 } from '../../src/physics/index.ts';

/** A synthetic I(z) approach curve, z ascending (closest point first). */
export interface SyntheticApproach {
  zNm: number[];
  currentA: number[];
  /** Noise-free current, A. */
  trueCurrentA: number[];
  biasV: number;
  /** Relative (multiplicative) noise σ. */
  noiseRelative: number;
  /** d lnI/dz of the noise-free curve, 1/nm. */
  slopePerNm: number;
}

/** Options for {@link cleanApproach}; unspecified ones are drawn from the seeded generator. */
export interface ApproachOptions {
  points?: number;
  decades?: number;
  noiseRelative?: number;
  maximumCurrentA?: number;
  slopePerNm?: number;
  biasV?: number;
  zStartNm?: number;
}

/** Uniform number in [low, high) from a generator. */
export function uniform(random: () => number, low: number, high: number): number {
  return low + (high - low) * random();
}

/** Uniform integer in [low, high] from a generator. */
export function uniformInteger(random: () => number, low: number, high: number): number {
  return low + Math.floor(random() * (high - low + 1));
}

/**
 * A clean approach curve: 64–256 points over 2–3 decades with 2–5 % multiplicative noise, slope
 * −15 … −25 nm⁻¹ (φ_ap ≈ 2.1–6 eV), closest current 0.3–3 nA at 0.1 V (≤ 4e-4 G0).
 */
export function cleanApproach(seed: number, options: ApproachOptions = {}): SyntheticApproach {
  const random = mulberry32(seed);
  const points = options.points ?? uniformInteger(random, 64, 256);
  const decades = options.decades ?? uniform(random, 2, 3);
  const noiseRelative = options.noiseRelative ?? uniform(random, 0.02, 0.05);
  const maximumCurrentA = options.maximumCurrentA ?? uniform(random, 0.3e-9, 3e-9);
  const slopePerNm = options.slopePerNm ?? -uniform(random, 15, 25);
  const biasV = options.biasV ?? 0.1;
  const zStartNm = options.zStartNm ?? 0.4;
  const spanNm = (decades * Math.LN10) / Math.abs(slopePerNm);
  const zNm: number[] = [];
  const currentA: number[] = [];
  const trueCurrentA: number[] = [];
  for (let i = 0; i < points; i++) {
    const z = zStartNm + (spanNm * i) / (points - 1);
    const exact = maximumCurrentA * Math.exp(slopePerNm * (z - zStartNm));
    zNm.push(z);
    trueCurrentA.push(exact);
    currentA.push(exact * (1 + noiseRelative * gaussian(random)));
  }
  return { zNm, currentA, trueCurrentA, biasV, noiseRelative, slopePerNm };
}

/** White Gaussian noise of a given length and σ. */
export function whiteNoise(seed: number, length: number, sigma = 1): number[] {
  const random = mulberry32(seed);
  const values: number[] = [];
  for (let i = 0; i < length; i++) values.push(sigma * gaussian(random));
  return values;
}

/** Result of {@link fitLine}: y = intercept + slope·x with standard errors from the residual scatter. */
export interface LineFit {
  slope: number;
  intercept: number;
  slopeError: number;
  interceptError: number;
  slopeInterceptCovariance: number;
  /** Correlation of slope and intercept. */
  correlation: number;
  fitted: number[];
}

/**
 * Ordinary least squares line through the points with used[i] (default all), covariance scaled by
 * the residual variance s² = Σe²/(n − 2) (textbook formulas; an independent check on the analysis code).
 */
export function fitLine(x: readonly number[], y: readonly number[], used?: readonly boolean[]): LineFit {
  let count = 0;
  let meanX = 0;
  let meanY = 0;
  for (let i = 0; i < x.length; i++) {
    if (used && !used[i]) continue;
    count++;
    meanX += x[i];
    meanY += y[i];
  }
  meanX /= count;
  meanY /= count;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < x.length; i++) {
    if (used && !used[i]) continue;
    sxx += (x[i] - meanX) ** 2;
    sxy += (x[i] - meanX) * (y[i] - meanY);
  }
  const slope = sxy / sxx;
  const intercept = meanY - slope * meanX;
  const fitted = x.map((value) => intercept + slope * value);
  let sse = 0;
  for (let i = 0; i < x.length; i++) {
    if (used && !used[i]) continue;
    sse += (y[i] - fitted[i]) ** 2;
  }
  const residualVariance = sse / (count - 2);
  const slopeVariance = residualVariance / sxx;
  const interceptVariance = residualVariance * (1 / count + (meanX * meanX) / sxx);
  const slopeInterceptCovariance = -meanX * slopeVariance;
  return {
    slope,
    intercept,
    slopeError: Math.sqrt(slopeVariance),
    interceptError: Math.sqrt(interceptVariance),
    slopeInterceptCovariance,
    correlation: slopeInterceptCovariance / Math.sqrt(slopeVariance * interceptVariance),
    fitted,
  };
}
