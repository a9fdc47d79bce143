import {
  CONDUCTANCE_QUANTUM_S,
  apparentBarrierErrorEV,
  apparentBarrierFromSlopeEV,
  prefactorCorrectedBarrierEV,
} from '../physics/index.ts';
import { MAD_TO_SIGMA, selectMedianOfMagnitudes } from './selectMedian.ts';
import { lineFitFromSums, type LineFit } from './weightedLine.ts';

/**
 * Fit of an approach curve I(z): ln|I| is linear in z, I = I0·e^{slope·z} (slope < 0, z grows as the
 * tip retracts), weighted by a noise model of multiplicative plus additive parts,
 *   σ²(ln I) = σ_rel² + (σ_floor/Î)²,
 * after leaving out the preamp-clipped top and the points lost in the noise floor.
 * From the slope: apparent barrier φ_ap = (ħ²/8m)·slope², κ = −slope/2 (physics.md §2);
 * gap to point contact by extrapolating G = I/V to G0 = 2e²/h (physics.md §3).
 *
 * Exclusions, decided in this order and kept per point (see `ExclusionReason`):
 * 1. outside a manual window; 2. non-finite; 3. saturation: ≥ 2 points at the rail (within
 *    SATURATION_RELATIVE_TOLERANCE of the largest |I|, or at a known limit: ≥ 1) in a run from the
 *    closest end that ends at three consecutive points off the rail; 4. noise floor: where the fitted
 *    current is below `floorSignalRatio` × the floor σ (estimated from the tail when not given), and
 *    points whose current has the wrong sign.
 */
export interface ApproachCurveInput {
  /** Tip position, m; grows as the tip retracts. Any order; sorted inside. */
  zM: Float64Array;
  /** Current, A (sign follows the bias). */
  currentA: Float64Array;
  /** Bias during the approach, V (for the conductance and the contact extrapolation). */
  biasV: number;
  /** Known noise: relative σ of the current and additive σ in A; estimated when absent. */
  noise?: { relative?: number; floorA?: number };
  /** Known preamp limit, A (|I| at or above it is clipped). */
  saturationLimitA?: number;
  /** Manual fit window in z, m (inclusive). */
  windowM?: { fromM: number; toM: number };
  /** Setpoint current, A: the gap is reported at this current (else at the largest fitted current). */
  setpointCurrentA?: number;
  /**
   * Points per sliding window of the local φ_ap(z) profile; the profile is computed only when this
   * is given (0 < n), e.g. for the curve on screen. See also localBarrierProfile.
   */
  localWindowPoints?: number;
}

/** Why a point was left out (0 = used). */
export const ExclusionReason = { used: 0, window: 1, invalid: 2, saturation: 3, noiseFloor: 4 } as const;
export type ExclusionCode = (typeof ExclusionReason)[keyof typeof ExclusionReason];
// The codes as module constants for the per-point loops, which would otherwise read the (mutable)
// fields of ExclusionReason on every point.
const USED = ExclusionReason.used;
const OUTSIDE_WINDOW = ExclusionReason.window;
const INVALID = ExclusionReason.invalid;
const SATURATED = ExclusionReason.saturation;
const NOISE_FLOOR = ExclusionReason.noiseFloor;

export interface ApproachCurveFit {
  status: 'ok' | 'too-few-points' | 'no-decay';
  message: string;
  /** Original indices in ascending z (fit arrays below are in this order). */
  order: Int32Array;
  zM: Float64Array;
  lnCurrent: Float64Array;
  exclusion: Uint8Array;
  fittedLnCurrent: Float64Array;
  /** Weighted residuals (ln I − fit)/σ(ln I) of every point (excluded ones too). */
  weightedResiduals: Float64Array;
  weights: Float64Array;
  slopePerM: number;
  slopeErrorPerM: number;
  interceptLnA: number;
  /** Covariance of (intercept, slope) and the variance of the intercept. */
  interceptVariance: number;
  covarianceInterceptSlope: number;
  apparentBarrierEV: number;
  apparentBarrierErrorEV: number;
  /** κ = −slope/2, 1/m; the current falls as e^{−2κz}. */
  decayConstantPerM: number;
  decayConstantErrorPerM: number;
  /** Position where the extrapolated conductance reaches G0, m (in the curve's z). */
  contactPositionM: number;
  /** Distance from contact at the reference current, m, and its uncertainty (physics.md §3). */
  gapToContactM: number;
  gapToContactErrorM: number;
  referenceCurrentA: number;
  /** Barrier that a planar-WKB J ∝ e^{−2κs}/s would need to give the measured slope at that gap. */
  prefactorCorrectedBarrierEV: number;
  noiseFloorA: number;
  relativeNoise: number;
  saturationCount: number;
  noiseFloorCount: number;
  pointsUsed: number;
  points: number;
  /** R² of ln I, reduced χ² of the weighted residuals, RMS of ln I residuals, Durbin–Watson. */
  r2: number;
  reducedChi2: number;
  rmsResidual: number;
  durbinWatson: number;
  /** Local φ_ap(z) from a sliding window of used points (empty unless localWindowPoints was given). */
  localProfile: { zM: Float64Array; barrierEV: Float64Array; barrierErrorEV: Float64Array };
}

/**
 * Saturation: the points at the high-current end whose |I| is within this fraction of the largest
 * (a rail repeats one converter code or toggles between two; one 16-bit step is 3.1e-5 of full
 * scale). Shared with the flag table (FLAG_THRESHOLDS.saturationRelativeTolerance).
 */
export const SATURATION_RELATIVE_TOLERANCE = 5e-5;
/** Noise floor: points whose fitted current is below this many σ_floor are left out (FLAG_THRESHOLDS.noiseFloorMultiple). */
export const FLOOR_SIGNAL_RATIO = 3;
export const CLEAN_FLOOR_MULTIPLES = [30, 10];
const OPPOSITE_SIGN_MESSAGE = (biasV: number) =>
  `the current has the opposite sign to the bias (${biasV} V) on most points: Burrow's bias is the sample bias (V > 0 sends electrons tip → sample and gives I > 0); check the bias convention of the export or the preamp polarity`;

const TAIL_FRACTION_OF_MAX = 0.02;
const MIN_POINTS = 4;

// Work arrays shared by successive fits (never returned), grown as needed: a batch of fits then
// allocates only its outputs.
let workCapacity = 0;
let workSigned = new Float64Array(0);
let workDeviations = new Float64Array(0);
let workBracket = new Float64Array(0);
let workExp = new Float64Array(0);
function reserveWork(n: number): void {
  if (n <= workCapacity) return;
  workCapacity = Math.max(n, 2 * workCapacity);
  workSigned = new Float64Array(workCapacity);
  workDeviations = new Float64Array(workCapacity);
  workBracket = new Float64Array(workCapacity);
  workExp = new Float64Array(workCapacity);
}

/** The per-point outputs of one fit, as views of one ArrayBuffer (one allocation instead of seven). */
interface FitArrays {
  order: Int32Array;
  zM: Float64Array;
  lnCurrent: Float64Array;
  fitted: Float64Array;
  residuals: Float64Array;
  weights: Float64Array;
  exclusion: Uint8Array;
}

/** Five Float64 arrays, then the Int32 order, then the Uint8 exclusion codes (all zero): 45 bytes per point. */
function allocateFitArrays(n: number): FitArrays {
  const buffer = new ArrayBuffer(45 * n);
  return {
    zM: new Float64Array(buffer, 0, n),
    lnCurrent: new Float64Array(buffer, 8 * n, n),
    fitted: new Float64Array(buffer, 16 * n, n),
    residuals: new Float64Array(buffer, 24 * n, n),
    weights: new Float64Array(buffer, 32 * n, n),
    order: new Int32Array(buffer, 40 * n, n),
    exclusion: new Uint8Array(buffer, 44 * n, n),
  };
}

/**
 * What the stages need to know of the points in ascending z besides the arrays: z is finite on
 * [finiteFrom, finiteTo) (non-finite z sort to an end, and are excluded as invalid), so a line's
 * value a + b·z, which falls with z (b < 0), splits that range at any level (see firstIndexBelow);
 * `step` is the spacing of z when uniform (to 1e-9 relative), else NaN.
 */
interface PointLayout {
  maxCurrent: number;
  finiteFrom: number;
  finiteTo: number;
  step: number;
}

/**
 * out[i] = exp(intercept + slope·z_i) for i in [from, to), by one exp every 64 points and a
 * recurrence between them when z is uniform (the anchors are the multiples of 64, whatever `from`).
 */
function fillExponential(intercept: number, slope: number, zM: Float64Array, step: number, out: Float64Array, from: number, to: number): void {
  if (Number.isNaN(step)) {
    for (let i = from; i < to; i++) out[i] = Math.exp(intercept + slope * zM[i]);
    return;
  }
  const ratio = Math.exp(slope * step);
  let value = 0;
  for (let i = from & ~63; i < to; i++) {
    // Re-anchor every 64 points so rounding cannot build up.
    if ((i & 63) === 0) value = Math.exp(intercept + slope * zM[i]);
    out[i] = value;
    value *= ratio;
  }
}

/**
 * First index i in [from, to) with intercept + slope·z_i < level (≤ level when `orEqual`), or `to`:
 * by bisection, since that value never rises with i (z ascending, slope < 0, and rounding keeps the
 * order), so each point gets the same answer as if tested on its own.
 */
function firstIndexBelow(zM: Float64Array, intercept: number, slope: number, level: number, orEqual: boolean, from: number, to: number): number {
  let low = from;
  let high = to;
  while (low < high) {
    const middle = (low + high) >> 1;
    const value = intercept + slope * zM[middle];
    if (value < level || (orEqual && value === level)) high = middle;
    else low = middle + 1;
  }
  return low;
}

/**
 * Fit one approach curve (see ApproachCurveInput).
 * @example fitApproachCurve({ zM, currentA, biasV: 0.1 }).apparentBarrierEV // ≈ 4 for a 4 eV exponential
 */
export function fitApproachCurve(input: ApproachCurveInput): ApproachCurveFit {
  const n = input.zM.length;
  if (input.currentA.length !== n) {
    throw new Error(`fitApproachCurve: currentA must have the length of zM (${n}), got ${input.currentA.length}`);
  }
  const arrays = allocateFitArrays(n);
  const { zM, lnCurrent, exclusion } = arrays;
  reserveWork(n);
  const signedCurrent = copyAscending(input, ascendingDirection(input.zM, arrays.order), arrays);

  // 1–3: window, invalid values, saturation.
  const layout = classifyPoints(input, arrays, signedCurrent);
  const known = input.saturationLimitA !== undefined;
  const clipLevel = known ? Math.abs(input.saturationLimitA as number) : layout.maxCurrent;
  const saturationCount = excludeSaturation(signedCurrent, exclusion, clipLevel, known);
  const topCurrent = saturationCount > 0 ? largestUsedCurrent(signedCurrent, exclusion) : layout.maxCurrent;

  // Initial unweighted line through the top two decades (all positive currents when too few there;
  // I ≥ Number.MIN_VALUE is I > 0).
  let line = lineAboveCurrent(zM, lnCurrent, signedCurrent, exclusion, topCurrent / 100);
  if (line.count < MIN_POINTS) line = lineAboveCurrent(zM, lnCurrent, signedCurrent, exclusion, Number.MIN_VALUE);
  if (!(line.count >= MIN_POINTS && line.slope < 0)) {
    // Mostly negative signed currents: the data use the opposite sign convention.
    let positive = 0;
    let negative = 0;
    for (let i = 0; i < n; i++) {
      if (signedCurrent[i] > 0) positive++;
      else if (signedCurrent[i] < 0) negative++;
    }
    const failure = failed(input, arrays, line, saturationCount);
    if (negative > 4 * positive) failure.message = OPPOSITE_SIGN_MESSAGE(input.biasV);
    return failure;
  }

  let floorA = input.noise?.floorA ?? Number.NaN;
  if (!Number.isFinite(floorA)) floorA = tailFloorSigma(zM, signedCurrent, exclusion, line, Math.log(TAIL_FRACTION_OF_MAX * topCurrent), layout);
  const floorLn = floorA > 0 ? Math.log(FLOOR_SIGNAL_RATIO * floorA) : -Infinity;
  let relativeNoise = input.noise?.relative ?? Number.NaN;
  const estimateRelative = !Number.isFinite(relativeNoise);
  // Until the results are written, `exclusion` holds only the codes above: the noise floor of the
  // current line is the points from floorFrom on (its fitted current is below FLOOR_SIGNAL_RATIO
  // σ_floor there) and those whose current is not positive.
  let floorFrom = 0;
  for (let pass = 0; pass < 2; pass++) {
    floorFrom = firstIndexBelow(zM, line.intercept, line.slope, floorLn, false, layout.finiteFrom, layout.finiteTo);
    if (estimateRelative) relativeNoise = relativeNoiseFromScatter(zM, lnCurrent, signedCurrent, exclusion, line, floorA, layout.finiteFrom, floorFrom);
    // The weights are results only from the last pass; before, those of the points used suffice.
    const weightsTo = pass === 1 ? n : floorFrom;
    const refit = weightedRefit(zM, lnCurrent, signedCurrent, exclusion, line, floorFrom, floorA, relativeNoise, layout.step, arrays.weights, weightsTo);
    if (!(refit.count >= MIN_POINTS && refit.slope < 0)) {
      markNoiseFloor(signedCurrent, exclusion, floorFrom);
      return failed(input, arrays, refit, saturationCount);
    }
    line = refit;
  }
  return summarise(input, arrays, signedCurrent, line, floorFrom, floorA, relativeNoise, saturationCount);
}

/**
 * How to read zM in ascending order: 1 when it already ascends, −1 when it descends, else 0 after
 * writing the sorting order to `order` (non-finite z last, as they are excluded as invalid; ties by
 * index). Non-finite z thus never lie between finite ones.
 */
function ascendingDirection(zM: Float64Array, order: Int32Array): number {
  const n = zM.length;
  let increasing = true;
  let decreasing = true;
  for (let i = 1; i < n; i++) {
    if (!(zM[i] > zM[i - 1])) increasing = false;
    if (!(zM[i] < zM[i - 1])) decreasing = false;
  }
  if (increasing) return 1;
  if (decreasing) return -1;
  for (let i = 0; i < n; i++) order[i] = i;
  const key = (i: number) => (Number.isFinite(zM[i]) ? zM[i] : Infinity);
  order.sort((a, b) => key(a) - key(b) || a - b);
  return 0;
}

/**
 * z in ascending order into arrays.zM, with the order of the input (see ascendingDirection), and the
 * current times the sign of the bias in the same order: the input's own array when that changes
 * nothing (it is only read), else workSigned.
 */
function copyAscending(input: ApproachCurveInput, direction: number, arrays: FitArrays): Float64Array {
  const { order, zM } = arrays;
  const n = zM.length;
  const sign = input.biasV < 0 ? -1 : 1;
  if (direction > 0) {
    zM.set(input.zM);
    for (let i = 0; i < n; i++) order[i] = i;
    if (sign > 0) return input.currentA;
  } else {
    for (let i = 0; i < n; i++) {
      if (direction < 0) order[i] = n - 1 - i;
      zM[i] = input.zM[order[i]];
    }
  }
  const signedCurrent = workSigned;
  for (let i = 0; i < n; i++) signedCurrent[i] = sign * input.currentA[order[i]];
  return signedCurrent;
}

/**
 * Marks points outside the window and non-finite ones; ln I (NaN where I ≤ 0). Returns the largest
 * current of the rest (0 if none), where z is finite, and whether it is uniform (the test of 1e-9
 * relative per step from the ends).
 */
function classifyPoints(input: ApproachCurveInput, arrays: FitArrays, signedCurrent: Float64Array): PointLayout {
  const { zM, lnCurrent, exclusion } = arrays;
  const n = zM.length;
  // No window: no z is below −∞ or above +∞ (and NaN compares false either way, as with a window).
  const fromM = input.windowM ? input.windowM.fromM : -Infinity;
  const toM = input.windowM ? input.windowM.toM : Infinity;
  const firstZ = n > 0 ? zM[0] : 0;
  const step = n >= 2 ? (zM[n - 1] - firstZ) / (n - 1) : Number.NaN;
  const tolerance = 1e-9 * Math.abs(step);
  let uniform = n >= 2;
  let maxCurrent = 0;
  for (let i = 0; i < n; i++) {
    const z = zM[i];
    const current = signedCurrent[i];
    if (Math.abs(z - firstZ - i * step) > tolerance * i + 1e-30) uniform = false;
    if (z < fromM || z > toM) exclusion[i] = OUTSIDE_WINDOW;
    else if (!Number.isFinite(z) || !Number.isFinite(current)) exclusion[i] = INVALID;
    else if (current > maxCurrent) maxCurrent = current;
  }
  // A loop of its own: the call to log spills fewer registers.
  for (let i = 0; i < n; i++) lnCurrent[i] = signedCurrent[i] > 0 ? Math.log(signedCurrent[i]) : Number.NaN;
  let finiteFrom = 0;
  while (finiteFrom < n && !Number.isFinite(zM[finiteFrom])) finiteFrom++;
  let finiteTo = n;
  while (finiteTo > finiteFrom && !Number.isFinite(zM[finiteTo - 1])) finiteTo--;
  return { maxCurrent, finiteFrom, finiteTo, step: uniform ? step : Number.NaN };
}

/**
 * A clipped preamp holds the closest points (the start of the ascending-z order) at its rail: a
 * contiguous run from that end, at a known limit or within the tolerance of the largest |I|. The run
 * may be interleaved near its end, where noise takes the true current above and below the rail: it
 * ends at the first three consecutive points off the rail. Marks the run's points at the rail when
 * there are ≥ 2 (≥ 1 at a known limit) and returns how many were marked.
 */
function excludeSaturation(signedCurrent: Float64Array, exclusion: Uint8Array, clipLevel: number, known: boolean): number {
  const railCurrent = clipLevel * (1 - SATURATION_RELATIVE_TOLERANCE);
  let count = 0;
  let runEnd = -1;
  for (let i = 0, off = 0; i < exclusion.length && off < 3; i++) {
    if (exclusion[i] !== USED) continue;
    if (signedCurrent[i] >= railCurrent) {
      count++;
      runEnd = i;
      off = 0;
    } else off++;
  }
  if (!(count >= 2 || (known && count >= 1))) return 0;
  for (let i = 0; i <= runEnd; i++) if (exclusion[i] === USED && signedCurrent[i] >= railCurrent) exclusion[i] = SATURATED;
  return count;
}

/** Largest current of the points not excluded (0 if none is positive). */
function largestUsedCurrent(signedCurrent: Float64Array, exclusion: Uint8Array): number {
  let largest = 0;
  for (let i = 0; i < exclusion.length; i++) if (exclusion[i] === USED && signedCurrent[i] > largest) largest = signedCurrent[i];
  return largest;
}

/**
 * Straight line from sums over the points used, taken about a base line y = baseY + baseSlope·(x − x0)
 * through the first of them (x0): with dx = x − x0 and r = y − base(x), the sums Σw, Σw·dx, Σw·r,
 * Σw·dx², Σw·dx·r, Σw·r². The formulas of weightedLine (Draper & Smith) about the weighted means
 * follow by Σw(dx − d̄x)² = Σw·dx² − (Σw·dx)²/Σw etc. The base keeps dx and r small, so the
 * subtraction loses no more than weightedLine's two passes (with the previous line as the base, r is
 * a residual and Σw r² comes out more accurately); a single point, or a single z, gives dx = 0 and
 * a NaN slope, as weightedLine does.
 */
function lineFromSums(
  x0: number,
  baseY: number,
  baseSlope: number,
  count: number,
  sumW: number,
  sumWX: number,
  sumWR: number,
  sumWXX: number,
  sumWXR: number,
  sumWRR: number,
): LineFit {
  const meanDx = sumWX / sumW;
  const meanR = sumWR / sumW;
  const sxx = sumWXX - sumWX * meanDx;
  const sxy = sumWXR - sumWX * meanR;
  const syy = sumWRR - sumWR * meanR;
  const slopeChange = sxy / sxx;
  const slope = baseSlope + slopeChange;
  const meanX = x0 + meanDx;
  const intercept = baseY + baseSlope * meanDx + meanR - slope * meanX;
  // Σw r² = Syy − slope·Sxy about the weighted means (r measured from the base line).
  const rss = Math.max(0, syy - slopeChange * sxy);
  return lineFitFromSums(slope, intercept, meanX, sxx, rss, sumW, count);
}

/** Unweighted line of ln I over the points not excluded with I ≥ minimumCurrent, in one pass about the first of them. */
function lineAboveCurrent(zM: Float64Array, lnCurrent: Float64Array, signedCurrent: Float64Array, exclusion: Uint8Array, minimumCurrent: number): LineFit {
  let count = 0;
  let x0 = 0;
  let y0 = 0;
  let sumX = 0;
  let sumY = 0;
  let sumXX = 0;
  let sumXY = 0;
  let sumYY = 0;
  for (let i = 0; i < zM.length; i++) {
    if (exclusion[i] !== USED || !(signedCurrent[i] >= minimumCurrent)) continue;
    if (count === 0) {
      x0 = zM[i];
      y0 = lnCurrent[i];
    }
    const dx = zM[i] - x0;
    const dy = lnCurrent[i] - y0;
    sumX += dx;
    sumY += dy;
    sumXX += dx * dx;
    sumXY += dx * dy;
    sumYY += dy * dy;
    count++;
  }
  return lineFromSums(x0, y0, 0, count, count, sumX, sumY, sumXX, sumXY, sumYY);
}

/**
 * Noise floor σ when not given: MAD_TO_SIGMA × median |I − Î| of the points not excluded whose fitted
 * ln I is below tailLn (0 if fewer than 5); those are the points from the first below tailLn on.
 */
function tailFloorSigma(zM: Float64Array, signedCurrent: Float64Array, exclusion: Uint8Array, line: LineFit, tailLn: number, layout: PointLayout): number {
  const deviations = workDeviations;
  const from = firstIndexBelow(zM, line.intercept, line.slope, tailLn, false, layout.finiteFrom, layout.finiteTo);
  const to = layout.finiteTo;
  const fitted = workExp;
  fillExponential(line.intercept, line.slope, zM, layout.step, fitted, from, to);
  let tail = 0;
  let sum = 0;
  for (let i = from; i < to; i++) {
    if (exclusion[i] !== USED) continue;
    const deviation = Math.abs(signedCurrent[i] - fitted[i]);
    deviations[tail++] = deviation;
    sum += deviation;
  }
  return tail >= 5 ? MAD_TO_SIGMA * selectMedianOfMagnitudes(deviations, tail, sum, workBracket) : 0;
}

/**
 * Relative noise from the ln I scatter where the floor is negligible: MAD_TO_SIGMA × median |ln I − line|
 * of the points used (before floorFrom, current positive, not excluded otherwise) whose line value is
 * more than CLEAN_FLOOR_MULTIPLES[0] σ_floor (30 σ_floor, or 10 σ_floor when fewer than 5 are that
 * high), at least 1e-6; 0.01 when too few points are clean. Those points come first, so each level
 * extends the range of the one before.
 */
function relativeNoiseFromScatter(
  zM: Float64Array,
  lnCurrent: Float64Array,
  signedCurrent: Float64Array,
  exclusion: Uint8Array,
  line: LineFit,
  floorA: number,
  from: number,
  floorFrom: number,
): number {
  const deviations = workDeviations;
  const intercept = line.intercept;
  const slope = line.slope;
  let count = 0;
  let sum = 0;
  let collectedTo = from;
  for (const multiple of CLEAN_FLOOR_MULTIPLES) {
    const cleanLn = floorA > 0 ? Math.log(multiple * floorA) : -Infinity;
    const cleanTo = firstIndexBelow(zM, intercept, slope, cleanLn, true, from, floorFrom);
    if (cleanTo < collectedTo) {
      count = 0;
      sum = 0;
      collectedTo = from;
    }
    for (let i = collectedTo; i < cleanTo; i++) {
      if (exclusion[i] !== USED || !(signedCurrent[i] > 0)) continue;
      const deviation = Math.abs(lnCurrent[i] - (intercept + slope * zM[i]));
      deviations[count++] = deviation;
      sum += deviation;
    }
    collectedTo = cleanTo;
    if (count >= 5) break;
  }
  return count >= 5 ? Math.max(1e-6, MAD_TO_SIGMA * selectMedianOfMagnitudes(deviations, count, sum, workBracket)) : 0.01;
}

/** Marks the noise floor of the line that ends the fit: the points not excluded from floorFrom on, and those whose current is not positive. */
function markNoiseFloor(signedCurrent: Float64Array, exclusion: Uint8Array, floorFrom: number): void {
  for (let i = 0; i < exclusion.length; i++) if (exclusion[i] === USED && (i >= floorFrom || !(signedCurrent[i] > 0))) exclusion[i] = NOISE_FLOOR;
}

/**
 * Writes the weights 1/σ²(ln I) = 1/(σ_rel² + (σ_floor/Î)²) of the points before weightsTo, Î from
 * `line`, and fits the weighted line through the points used (not excluded, before floorFrom, current
 * positive; floorFrom ≤ weightsTo). Additive noise biases ln I low by (σ_floor/Î)²/2 (second-order
 * delta method), which grows towards the floor and would steepen the slope: it is removed from the
 * values fitted. The sums are taken about `line` through the first point used.
 */
function weightedRefit(
  zM: Float64Array,
  lnCurrent: Float64Array,
  signedCurrent: Float64Array,
  exclusion: Uint8Array,
  line: LineFit,
  floorFrom: number,
  floorA: number,
  relativeNoise: number,
  step: number,
  weights: Float64Array,
  weightsTo: number,
): LineFit {
  const floorSquared = floorA * floorA;
  const relativeSquared = relativeNoise * relativeNoise;
  const intercept = line.intercept;
  const slope = line.slope;
  // inverseSquared = 1/Î² = e^{−2(a + bz)}
  const inverseSquared = workExp;
  if (floorSquared > 0) fillExponential(-2 * intercept, -2 * slope, zM, step, inverseSquared, 0, weightsTo);
  let x0 = 0;
  let baseY = 0;
  let count = 0;
  let sumW = 0;
  let sumWX = 0;
  let sumWR = 0;
  let sumWXX = 0;
  let sumWXR = 0;
  let sumWRR = 0;
  for (let i = 0; i < weightsTo; i++) {
    const floorRatioSquared = floorSquared > 0 ? floorSquared * inverseSquared[i] : 0;
    const w = 1 / (relativeSquared + floorRatioSquared);
    weights[i] = w;
    if (exclusion[i] !== USED || i >= floorFrom || !(signedCurrent[i] > 0)) continue;
    if (count === 0) {
      x0 = zM[i];
      baseY = intercept + slope * x0;
    }
    const dx = zM[i] - x0;
    const r = lnCurrent[i] + 0.5 * floorRatioSquared - (baseY + slope * dx);
    sumW += w;
    sumWX += w * dx;
    sumWR += w * r;
    sumWXX += w * dx * dx;
    sumWXR += w * dx * r;
    sumWRR += w * r * r;
    count++;
  }
  return lineFromSums(x0, baseY, slope, count, sumW, sumWX, sumWR, sumWXX, sumWXR, sumWRR);
}

/**
 * Fitted ln I, weighted residuals and the noise-floor codes of every point; R², RMS and Durbin–Watson
 * of the used points; barrier, contact, gap and the prefactor-corrected barrier from the final line.
 */
function summarise(
  input: ApproachCurveInput,
  arrays: FitArrays,
  signedCurrent: Float64Array,
  line: LineFit,
  floorFrom: number,
  floorA: number,
  relativeNoise: number,
  saturationCount: number,
): ApproachCurveFit {
  const { zM, lnCurrent, exclusion, fitted, weights, residuals } = arrays;
  const n = zM.length;
  const used = line.count;
  const intercept = line.intercept;
  const slope = line.slope;
  // Total sum of squares about the mean of ln I, from sums about the line's mean (keeps them small).
  const lineMeanY = intercept + slope * line.meanX;
  let sumDy = 0;
  let sumDy2 = 0;
  let residualSS = 0;
  let dwNumerator = 0;
  let dwDenominator = 0;
  let previous = Number.NaN;
  let sumZ = 0;
  let largestCurrent = 0;
  let noiseFloorCount = 0;
  for (let i = 0; i < n; i++) {
    const f = intercept + slope * zM[i];
    fitted[i] = f;
    const r = lnCurrent[i] - f;
    const weighted = Number.isFinite(lnCurrent[i]) ? r * Math.sqrt(weights[i]) : Number.NaN;
    residuals[i] = weighted;
    if (exclusion[i] !== USED) continue;
    if (i >= floorFrom || !(signedCurrent[i] > 0)) {
      exclusion[i] = NOISE_FLOOR;
      noiseFloorCount++;
      continue;
    }
    const dy = lnCurrent[i] - lineMeanY;
    sumDy += dy;
    sumDy2 += dy * dy;
    residualSS += r * r;
    dwDenominator += weighted * weighted;
    if (Number.isFinite(previous)) dwNumerator += (weighted - previous) ** 2;
    previous = weighted;
    sumZ += zM[i];
    if (signedCurrent[i] > largestCurrent) largestCurrent = signedCurrent[i];
  }
  const totalSS = sumDy2 - (sumDy * sumDy) / used;
  const apparentBarrierEV = apparentBarrierFromSlopeEV(slope);
  const apparentBarrierErr = apparentBarrierErrorEV(slope, line.slopeError);
  // Contact: ln(G0·|V|) = intercept + slope·z_c.
  const biasMagnitude = Math.abs(input.biasV);
  const contactPositionM = (Math.log(CONDUCTANCE_QUANTUM_S * biasMagnitude) - intercept) / slope;
  const setpointA = input.setpointCurrentA !== undefined ? Math.abs(input.setpointCurrentA) : 0;
  const referenceCurrentA = setpointA > 0 ? setpointA : Math.max(setpointA, largestCurrent);
  const referenceZ = (Math.log(referenceCurrentA) - intercept) / slope;
  const gapToContactM = referenceZ - contactPositionM;
  // physics.md §3: σ_z = (z − z_c)·σ_φ/(2φ)
  const gapToContactErrorM = Math.abs(gapToContactM) * (apparentBarrierErr / (2 * apparentBarrierEV));
  // The planar-WKB correction at the middle of the fitted range.
  const middleZ = sumZ / used;
  const prefactorCorrected = prefactorCorrectedBarrierEV(slope, Math.max(middleZ - contactPositionM, 1e-12));
  return {
    status: 'ok',
    message: `fitted ${used} of ${n} points`,
    order: arrays.order,
    zM,
    lnCurrent,
    exclusion,
    fittedLnCurrent: fitted,
    weightedResiduals: residuals,
    weights,
    slopePerM: slope,
    slopeErrorPerM: line.slopeError,
    interceptLnA: intercept,
    interceptVariance: line.interceptError ** 2,
    covarianceInterceptSlope: line.covarianceInterceptSlope,
    apparentBarrierEV,
    apparentBarrierErrorEV: apparentBarrierErr,
    decayConstantPerM: -slope / 2,
    decayConstantErrorPerM: line.slopeError / 2,
    contactPositionM,
    gapToContactM,
    gapToContactErrorM,
    referenceCurrentA,
    prefactorCorrectedBarrierEV: prefactorCorrected,
    noiseFloorA: floorA,
    relativeNoise,
    saturationCount,
    noiseFloorCount,
    pointsUsed: used,
    points: n,
    r2: 1 - residualSS / totalSS,
    reducedChi2: line.weightedResidualSumOfSquares / Math.max(1, used - 2),
    rmsResidual: Math.sqrt(residualSS / used),
    durbinWatson: dwNumerator / dwDenominator,
    localProfile:
      input.localWindowPoints !== undefined && input.localWindowPoints > 0
        ? localBarrierProfile(zM, lnCurrent, weights, exclusion, input.localWindowPoints)
        : { zM: new Float64Array(0), barrierEV: new Float64Array(0), barrierErrorEV: new Float64Array(0) },
  };
}

/**
 * Local apparent barrier φ_ap(z) from weighted lines over a sliding window of `windowPoints` used
 * points, by running sums (O(n)). Window centres are the weighted mean z of each window.
 * Source: physics.md §2 (φ_ap from the local slope); near contact the local value departs from the
 * far one (Chen & Hamers 1991, cited there).
 */
export function localBarrierProfile(
  zM: Float64Array,
  lnCurrent: Float64Array,
  weights: Float64Array,
  exclusion: Uint8Array,
  windowPoints: number,
): ApproachCurveFit['localProfile'] {
  let usedCount = 0;
  for (let i = 0; i < zM.length; i++) if (exclusion[i] === 0) usedCount++;
  const usedIndex = new Int32Array(usedCount);
  for (let i = 0, k = 0; i < zM.length; i++) if (exclusion[i] === 0) usedIndex[k++] = i;
  const w = Math.max(3, Math.min(windowPoints, usedCount));
  const count = usedCount >= 3 ? usedCount - w + 1 : 0;
  const out = { zM: new Float64Array(count), barrierEV: new Float64Array(count), barrierErrorEV: new Float64Array(count) };
  if (count === 0) return out;
  const origin = zM[usedIndex[0]];
  const sums = new Float64Array(6); // Σw, Σwx, Σwy, Σwx², Σwxy, Σwy² with x in nm from the first point
  for (let k = 0; k < w; k++) accumulate(sums, zM, lnCurrent, weights, usedIndex[k], origin, 1);
  for (let c = 0; c < count; c++) {
    if (c > 0) {
      accumulate(sums, zM, lnCurrent, weights, usedIndex[c - 1], origin, -1);
      accumulate(sums, zM, lnCurrent, weights, usedIndex[c + w - 1], origin, 1);
    }
    const sw = sums[0], sx = sums[1], sy = sums[2], sxx = sums[3], sxy = sums[4], syy = sums[5];
    const det = sw * sxx - sx * sx;
    const slopePerNm = (sw * sxy - sx * sy) / det;
    const intercept = (sy - slopePerNm * sx) / sw;
    const rss = Math.max(0, syy - intercept * sy - slopePerNm * sxy);
    const slopeErrorPerNm = Math.sqrt((rss / Math.max(1, w - 2)) * (sw / det));
    out.zM[c] = origin + sx / sw / 1e9;
    out.barrierEV[c] = apparentBarrierFromSlopeEV(slopePerNm * 1e9);
    out.barrierErrorEV[c] = apparentBarrierErrorEV(slopePerNm * 1e9, slopeErrorPerNm * 1e9);
  }
  return out;
}

function accumulate(sums: Float64Array, zM: Float64Array, lnCurrent: Float64Array, weights: Float64Array, i: number, origin: number, sign: number): void {
  const x = (zM[i] - origin) * 1e9;
  const y = lnCurrent[i];
  const w = sign * weights[i];
  sums[0] += w;
  sums[1] += w * x;
  sums[2] += w * y;
  sums[3] += w * x * x;
  sums[4] += w * x * y;
  sums[5] += w * y * y;
}

/** The result of a fit that stopped early: the per-point arrays read so far, NaN fitted values and residuals, zero weights. */
function failed(input: ApproachCurveInput, arrays: FitArrays, line: LineFit, saturationCount: number): ApproachCurveFit {
  const n = arrays.zM.length;
  const tooFew = !(line.count >= MIN_POINTS);
  const nan = Number.NaN;
  return {
    status: tooFew ? 'too-few-points' : 'no-decay',
    message: tooFew
      ? `only ${line.count} usable points (need ${MIN_POINTS}) after leaving out points outside the window, invalid, saturated and noise-floor points`
      : `current does not fall with z (slope ${line.slope.toExponential(3)} per m); check the z direction or the calibration`,
    order: arrays.order,
    zM: arrays.zM,
    lnCurrent: arrays.lnCurrent,
    exclusion: arrays.exclusion,
    fittedLnCurrent: arrays.fitted.fill(nan),
    weightedResiduals: arrays.residuals.fill(nan),
    weights: arrays.weights.fill(0),
    slopePerM: line.slope,
    slopeErrorPerM: nan,
    interceptLnA: line.intercept,
    interceptVariance: nan,
    covarianceInterceptSlope: nan,
    apparentBarrierEV: nan,
    apparentBarrierErrorEV: nan,
    decayConstantPerM: nan,
    decayConstantErrorPerM: nan,
    contactPositionM: nan,
    gapToContactM: nan,
    gapToContactErrorM: nan,
    referenceCurrentA: input.setpointCurrentA ?? nan,
    prefactorCorrectedBarrierEV: nan,
    noiseFloorA: nan,
    relativeNoise: nan,
    saturationCount,
    noiseFloorCount: 0,
    pointsUsed: line.count,
    points: n,
    r2: nan,
    reducedChi2: nan,
    rmsResidual: nan,
    durbinWatson: nan,
    localProfile: { zM: new Float64Array(0), barrierEV: new Float64Array(0), barrierErrorEV: new Float64Array(0) },
  };
}
