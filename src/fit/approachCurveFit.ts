import {
  CONDUCTANCE_QUANTUM_S,
  apparentBarrierErrorEV,
  apparentBarrierFromSlopeEV,
  prefactorCorrectedBarrierEV,
} from '../physics/index.ts';
import { MAD_TO_SIGMA, selectMedian } from './selectMedian.ts';
import { weightedLine, type LineFit } from './weightedLine.ts';

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
let workScratch = new Float64Array(0);
let workDebiased = new Float64Array(0);
let workExp = new Float64Array(0);
let workMask = new Uint8Array(0);
function reserveWork(n: number): void {
  if (n <= workCapacity) return;
  workCapacity = Math.max(n, 2 * workCapacity);
  workSigned = new Float64Array(workCapacity);
  workScratch = new Float64Array(workCapacity);
  workDebiased = new Float64Array(workCapacity);
  workExp = new Float64Array(workCapacity);
  workMask = new Uint8Array(workCapacity);
}

/** Spacing of z when it is uniform (to 1e-9 relative), else NaN: then e^{a+bz} follows by recurrence. */
function uniformStep(zM: Float64Array): number {
  const n = zM.length;
  if (n < 2) return Number.NaN;
  const step = (zM[n - 1] - zM[0]) / (n - 1);
  const tolerance = 1e-9 * Math.abs(step);
  for (let i = 1; i < n; i++) if (Math.abs(zM[i] - zM[0] - i * step) > tolerance * i + 1e-30) return Number.NaN;
  return step;
}

/** out[i] = exp(intercept + slope·z_i), by one exp and a recurrence when z is uniform. */
function fillExponential(intercept: number, slope: number, zM: Float64Array, step: number, out: Float64Array): void {
  const n = zM.length;
  if (Number.isNaN(step)) {
    for (let i = 0; i < n; i++) out[i] = Math.exp(intercept + slope * zM[i]);
    return;
  }
  const ratio = Math.exp(slope * step);
  let value = Math.exp(intercept + slope * zM[0]);
  for (let i = 0; i < n; i++) {
    // Re-anchor every 64 points so rounding cannot build up.
    if ((i & 63) === 0) value = Math.exp(intercept + slope * zM[i]);
    out[i] = value;
    value *= ratio;
  }
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
  const order = ascendingOrder(input.zM);
  // The five per-point outputs share one allocation (views of one buffer).
  const outputs = new Float64Array(5 * n);
  const zM = outputs.subarray(0, n);
  reserveWork(n);
  const signedCurrent = workSigned;
  const sign = input.biasV < 0 ? -1 : 1;
  for (let i = 0; i < n; i++) {
    zM[i] = input.zM[order[i]];
    signedCurrent[i] = sign * input.currentA[order[i]];
  }
  const exclusion = new Uint8Array(n);
  const lnCurrent = outputs.subarray(n, 2 * n);
  const fitted = outputs.subarray(2 * n, 3 * n);
  const weights = outputs.subarray(3 * n, 4 * n);
  const residuals = outputs.subarray(4 * n, 5 * n);
  const scratch = workScratch;
  const debiased = workDebiased;
  const expLine = workExp;
  const mask = workMask;
  const step = uniformStep(zM);

  // 1–3: window, invalid values, saturation.
  let maxCurrent = 0;
  for (let i = 0; i < n; i++) {
    const z = zM[i];
    const current = signedCurrent[i];
    if (input.windowM && (z < input.windowM.fromM || z > input.windowM.toM)) exclusion[i] = ExclusionReason.window;
    else if (!Number.isFinite(z) || !Number.isFinite(current)) exclusion[i] = ExclusionReason.invalid;
    else if (current > maxCurrent) maxCurrent = current;
    lnCurrent[i] = current > 0 ? Math.log(current) : Number.NaN;
  }
  // A clipped preamp holds the closest points (the start of the ascending-z order) at its rail:
  // a contiguous run from that end, at a known limit or within the tolerance of the largest |I|.
  const known = input.saturationLimitA !== undefined;
  const clipLevel = known ? Math.abs(input.saturationLimitA as number) : maxCurrent;
  // The run may be interleaved near its end, where noise takes the true current above and below
  // the rail: it ends at the first three consecutive points off the rail.
  let saturationCount = 0;
  let runEnd = -1;
  for (let i = 0, off = 0; i < n && off < 3; i++) {
    if (exclusion[i] !== 0) continue;
    if (signedCurrent[i] >= clipLevel * (1 - SATURATION_RELATIVE_TOLERANCE)) {
      saturationCount++;
      runEnd = i;
      off = 0;
    } else off++;
  }
  if (saturationCount >= 2 || (known && saturationCount >= 1)) {
    for (let i = 0; i <= runEnd; i++) {
      if (exclusion[i] === 0 && signedCurrent[i] >= clipLevel * (1 - SATURATION_RELATIVE_TOLERANCE)) exclusion[i] = ExclusionReason.saturation;
    }
  } else saturationCount = 0;
  let topCurrent = 0;
  for (let i = 0; i < n; i++) if (exclusion[i] === 0 && signedCurrent[i] > topCurrent) topCurrent = signedCurrent[i];

  // Initial unweighted line through the top two decades.
  let initialCount = 0;
  for (let i = 0; i < n; i++) {
    mask[i] = exclusion[i] === 0 && signedCurrent[i] >= topCurrent / 100 ? 1 : 0;
    initialCount += mask[i];
  }
  if (initialCount < MIN_POINTS) for (let i = 0; i < n; i++) mask[i] = exclusion[i] === 0 && signedCurrent[i] > 0 ? 1 : 0;
  let line = weightedLine(zM, lnCurrent, null, mask);
  if (!(line.count >= MIN_POINTS && line.slope < 0)) {
    // Mostly negative signed currents: the data use the opposite sign convention.
    let positive = 0;
    let negative = 0;
    for (let i = 0; i < n; i++) {
      if (signedCurrent[i] > 0) positive++;
      else if (signedCurrent[i] < 0) negative++;
    }
    const failure = failed(input, order, zM, lnCurrent, exclusion, line, saturationCount);
    if (negative > 4 * positive) failure.message = OPPOSITE_SIGN_MESSAGE(input.biasV);
    return failure;
  }

  // Noise floor σ: robust scatter of I − Î in the tail, unless given.
  let floorA = input.noise?.floorA ?? Number.NaN;
  if (!Number.isFinite(floorA)) {
    let tail = 0;
    const tailLn = Math.log(TAIL_FRACTION_OF_MAX * topCurrent);
    fillExponential(line.intercept, line.slope, zM, step, expLine);
    for (let i = 0; i < n; i++) {
      if (exclusion[i] !== 0) continue;
      const predictedLn = line.intercept + line.slope * zM[i];
      if (predictedLn < tailLn) scratch[tail++] = Math.abs(signedCurrent[i] - expLine[i]);
    }
    floorA = tail >= 5 ? MAD_TO_SIGMA * selectMedian(scratch, tail) : 0;
  }

  let relativeNoise = input.noise?.relative ?? Number.NaN;
  let noiseFloorCount = 0;
  for (let pass = 0; pass < 2; pass++) {
    const floorLn = floorA > 0 ? Math.log(FLOOR_SIGNAL_RATIO * floorA) : -Infinity;
    noiseFloorCount = 0;
    for (let i = 0; i < n; i++) {
      if (exclusion[i] !== 0 && exclusion[i] !== ExclusionReason.noiseFloor) continue;
      const predictedLn = line.intercept + line.slope * zM[i];
      const lost = predictedLn < floorLn || !(signedCurrent[i] > 0);
      exclusion[i] = lost ? ExclusionReason.noiseFloor : ExclusionReason.used;
      if (lost) noiseFloorCount++;
    }
    // Relative noise from the ln I scatter where the floor is negligible (30 σ_floor above it, or
    // 10 σ_floor when too few points are that high), against the current line, unless given.
    if (!Number.isFinite(input.noise?.relative ?? Number.NaN)) {
      let count = 0;
      for (const multiple of CLEAN_FLOOR_MULTIPLES) {
        count = 0;
        const cleanLn = floorA > 0 ? Math.log(multiple * floorA) : -Infinity;
        for (let i = 0; i < n; i++) {
          if (exclusion[i] !== 0) continue;
          const predictedLn = line.intercept + line.slope * zM[i];
          if (predictedLn > cleanLn) scratch[count++] = Math.abs(lnCurrent[i] - predictedLn);
        }
        if (count >= 5) break;
      }
      relativeNoise = count >= 5 ? Math.max(1e-6, MAD_TO_SIGMA * selectMedian(scratch, count)) : 0.01;
    }
    const floorSquared = floorA * floorA;
    const relativeSquared = relativeNoise * relativeNoise;
    // expLine = 1/Î² = e^{−2(a + bz)}
    if (floorSquared > 0) fillExponential(-2 * line.intercept, -2 * line.slope, zM, step, expLine);
    for (let i = 0; i < n; i++) {
      const floorRatioSquared = floorSquared > 0 ? floorSquared * expLine[i] : 0;
      weights[i] = 1 / (relativeSquared + floorRatioSquared);
      // Additive noise biases ln I low by (σ_floor/Î)²/2 (second-order delta method), which grows
      // towards the floor and would steepen the slope: remove it from the values fitted.
      debiased[i] = lnCurrent[i] + 0.5 * floorRatioSquared;
      mask[i] = exclusion[i] === 0 ? 1 : 0;
    }
    const refit = weightedLine(zM, debiased, weights, mask);
    if (!(refit.count >= MIN_POINTS && refit.slope < 0)) return failed(input, order, zM, lnCurrent, exclusion, refit, saturationCount);
    line = refit;
  }
  return summarise(input, { order, zM, lnCurrent, signedCurrent, exclusion, fitted, weights, residuals, mask, line, floorA, relativeNoise, saturationCount, noiseFloorCount });
}

function ascendingOrder(zM: Float64Array): Int32Array {
  const n = zM.length;
  const order = new Int32Array(n);
  let increasing = true;
  let decreasing = true;
  for (let i = 1; i < n; i++) {
    if (!(zM[i] > zM[i - 1])) increasing = false;
    if (!(zM[i] < zM[i - 1])) decreasing = false;
  }
  for (let i = 0; i < n; i++) order[i] = decreasing ? n - 1 - i : i;
  if (!increasing && !decreasing) {
    // Non-finite z sort last (they are excluded as invalid), the rest ascending, ties by index.
    const key = (i: number) => (Number.isFinite(zM[i]) ? zM[i] : Infinity);
    order.sort((a, b) => key(a) - key(b) || a - b);
  }
  return order;
}

interface FitState {
  order: Int32Array;
  zM: Float64Array;
  lnCurrent: Float64Array;
  signedCurrent: Float64Array;
  exclusion: Uint8Array;
  fitted: Float64Array;
  weights: Float64Array;
  residuals: Float64Array;
  mask: Uint8Array;
  line: LineFit;
  floorA: number;
  relativeNoise: number;
  saturationCount: number;
  noiseFloorCount: number;
}

function summarise(input: ApproachCurveInput, s: FitState): ApproachCurveFit {
  const { zM, lnCurrent, exclusion, fitted, weights, line, residuals } = s;
  const n = zM.length;
  let sumY = 0;
  let used = 0;
  for (let i = 0; i < n; i++) {
    fitted[i] = line.intercept + line.slope * zM[i];
    residuals[i] = Number.isFinite(lnCurrent[i]) ? (lnCurrent[i] - fitted[i]) * Math.sqrt(weights[i]) : Number.NaN;
    if (exclusion[i] === 0) {
      sumY += lnCurrent[i];
      used++;
    }
  }
  const meanY = sumY / used;
  let totalSS = 0;
  let residualSS = 0;
  let dwNumerator = 0;
  let dwDenominator = 0;
  let previous = Number.NaN;
  for (let i = 0; i < n; i++) {
    if (exclusion[i] !== 0) continue;
    const r = lnCurrent[i] - fitted[i];
    totalSS += (lnCurrent[i] - meanY) ** 2;
    residualSS += r * r;
    const weighted = residuals[i];
    dwDenominator += weighted * weighted;
    if (Number.isFinite(previous)) dwNumerator += (weighted - previous) ** 2;
    previous = weighted;
  }
  const slope = line.slope;
  const apparentBarrierEV = apparentBarrierFromSlopeEV(slope);
  const apparentBarrierErr = apparentBarrierErrorEV(slope, line.slopeError);
  // Contact: ln(G0·|V|) = intercept + slope·z_c.
  const biasMagnitude = Math.abs(input.biasV);
  const contactPositionM = (Math.log(CONDUCTANCE_QUANTUM_S * biasMagnitude) - line.intercept) / slope;
  let referenceCurrentA = input.setpointCurrentA !== undefined ? Math.abs(input.setpointCurrentA) : 0;
  if (!(referenceCurrentA > 0)) for (let i = 0; i < n; i++) if (exclusion[i] === 0) referenceCurrentA = Math.max(referenceCurrentA, s.signedCurrent[i]);
  const referenceZ = (Math.log(referenceCurrentA) - line.intercept) / slope;
  const gapToContactM = referenceZ - contactPositionM;
  // physics.md §3: σ_z = (z − z_c)·σ_φ/(2φ)
  const gapToContactErrorM = Math.abs(gapToContactM) * (apparentBarrierErr / (2 * apparentBarrierEV));
  // The planar-WKB correction at the middle of the fitted range.
  let middleZ = 0;
  for (let i = 0; i < n; i++) if (exclusion[i] === 0) middleZ += zM[i] / used;
  const prefactorCorrected = prefactorCorrectedBarrierEV(slope, Math.max(middleZ - contactPositionM, 1e-12));
  return {
    status: 'ok',
    message: `fitted ${used} of ${n} points`,
    order: s.order,
    zM,
    lnCurrent,
    exclusion,
    fittedLnCurrent: fitted,
    weightedResiduals: residuals,
    weights,
    slopePerM: slope,
    slopeErrorPerM: line.slopeError,
    interceptLnA: line.intercept,
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
    noiseFloorA: s.floorA,
    relativeNoise: s.relativeNoise,
    saturationCount: s.saturationCount,
    noiseFloorCount: s.noiseFloorCount,
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

function failed(
  input: ApproachCurveInput,
  order: Int32Array,
  zM: Float64Array,
  lnCurrent: Float64Array,
  exclusion: Uint8Array,
  line: LineFit,
  saturationCount: number,
): ApproachCurveFit {
  const n = zM.length;
  const tooFew = !(line.count >= MIN_POINTS);
  const nan = Number.NaN;
  return {
    status: tooFew ? 'too-few-points' : 'no-decay',
    message: tooFew
      ? `only ${line.count} usable points (need ${MIN_POINTS}) after leaving out points outside the window, invalid, saturated and noise-floor points`
      : `current does not fall with z (slope ${line.slope.toExponential(3)} per m); check the z direction or the calibration`,
    order,
    zM,
    lnCurrent,
    exclusion,
    fittedLnCurrent: new Float64Array(n).fill(nan),
    weightedResiduals: new Float64Array(n).fill(nan),
    weights: new Float64Array(n),
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
