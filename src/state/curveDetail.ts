/**
 * The per-point arrays behind the curve views, from the same core calls analyzeCurve makes (so a
 * plot shows exactly the fit in the table): for I(z) the sorted fit with its exclusions, the 95 %
 * band of the fitted line and the local φ_ap(z); for I(V) the chosen model's current, the smoothed
 * numerical conductance, the normalised conductance and the Fowler–Nordheim coordinates.
 * Pure and slow enough (an I(V) refit takes tens of ms) that the dashboard runs it in a worker.
 */
import { approachFitInput, runOf, spectrumFitInput, type CurveInput } from '../analysis/index.ts';
import { ExclusionReason, fitApproachCurve, fitSpectrum, settingsForRun, type AnalysisSettings, type BarrierEstimate } from '../fit/index.ts';
import { savitzkyGolay } from './savitzkyGolay.ts';

/** Two-sided 95 % quantile of the normal distribution (Abramowitz & Stegun 26.2.23 tables). */
const Z_95 = 1.959963984540054;

/** Why a point was left out of an I(z) fit, by ExclusionReason code. */
export const EXCLUSION_LABELS: Readonly<Record<number, string>> = {
  [ExclusionReason.window]: 'outside the manual window',
  [ExclusionReason.invalid]: 'not a finite number',
  [ExclusionReason.saturation]: 'preamp saturation',
  [ExclusionReason.noiseFloor]: 'below the noise floor',
};

/** Everything the I(z) views draw. Point arrays are in the curve's own order (flag indices index them). */
export interface ApproachDetail {
  kind: 'iz';
  curveId: string;
  status: string;
  message: string;
  biasV: number;
  /** Calibrated z of each point, nm. */
  zNm: Float64Array;
  /** |I| of each point, A (the fit works on sign(V)·I). */
  currentA: Float64Array;
  /** ExclusionReason code of each point (0 = used). */
  exclusion: Uint8Array;
  /** Weighted residual (ln I − fit)/σ of each point; NaN where ln I is undefined. */
  residual: Float64Array;
  /** The fitted line, sampled at the sorted z of the points: current and its 95 % band, A. */
  lineZNm: Float64Array;
  lineCurrentA: Float64Array;
  bandLowA: Float64Array;
  bandHighA: Float64Array;
  /** Local apparent barrier from a sliding window of used points. */
  profileZNm: Float64Array;
  profileEV: Float64Array;
  profileErrorEV: Float64Array;
  noiseFloorA: number;
  /** The manual window in force, nm, or null. */
  windowNm: { fromNm: number; toNm: number } | null;
}

/** Everything the I(V) views draw. Point arrays are in the curve's own order. */
export interface SpectrumDetail {
  kind: 'iv';
  curveId: string;
  status: string;
  message: string;
  model: BarrierEstimate['model'];
  biasV: Float64Array;
  currentA: Float64Array;
  /** 1 where the point was left out as saturated (not fitted). */
  dropped: Uint8Array;
  /** Model current at each point, A (NaN at dropped points). */
  fittedCurrentA: Float64Array;
  /** (I − model)/σ at each point (NaN at dropped points). */
  residual: Float64Array;
  /** dI/dV by local quadratic smoothing, S: measured and model. */
  conductanceS: Float64Array;
  fitConductanceS: Float64Array;
  /** (dI/dV)/(I/V), NaN near V = 0 and where |I| is within 3σ of the noise floor. */
  normalized: Float64Array;
  fitNormalized: Float64Array;
  /** Fowler–Nordheim coordinates: 1/V (1/V) and ln(|I|/V²) (ln of A/V²), measured and model. */
  inverseBiasPerV: Float64Array;
  fowlerNordheimY: Float64Array;
  fitFowlerNordheimY: Float64Array;
  fowlerNordheim: { reached: boolean; onsetBiasV: number; message: string };
  noiseFloorA: number;
  smoothingPoints: number;
}

export type CurveDetail = ApproachDetail | SpectrumDetail;

/**
 * The I(z) view arrays of one curve with the session settings (run overrides applied here).
 * Band: var(ln Î(z)) = var(a) + 2z·cov(a, b) + z²·var(b) of the weighted line ln I = a + b·z,
 * drawn at ±1.96σ (normal approximation).
 * @example approachDetail(curve, DEFAULT_SETTINGS).lineCurrentA.length // points of the curve
 */
export function approachDetail(curve: CurveInput, sessionSettings: AnalysisSettings): ApproachDetail {
  const settings = settingsForRun(sessionSettings, runOf(curve));
  // The very input analyzeCurve fits (bias, calibration, noise, window), plus the local profile.
  const input = approachFitInput(curve, settings);
  const { zM, biasV } = input;
  const fit = fitApproachCurve({ ...input, localWindowPoints: Math.min(32, Math.max(8, Math.round(zM.length / 8))) });
  const n = zM.length;
  const zNm = new Float64Array(n);
  const currentA = new Float64Array(n);
  const exclusion = new Uint8Array(n);
  const residual = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    const i = fit.order[k];
    zNm[i] = fit.zM[k] * 1e9;
    currentA[i] = Math.abs(curve.current[i]);
    exclusion[i] = fit.exclusion[k];
    residual[i] = fit.weightedResiduals[k];
  }
  const lineZNm = Float64Array.from(fit.zM, (z) => z * 1e9);
  const lineCurrentA = new Float64Array(n);
  const bandLowA = new Float64Array(n);
  const bandHighA = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    const z = fit.zM[k];
    const ln = fit.fittedLnCurrent[k];
    const variance = fit.interceptVariance + 2 * z * fit.covarianceInterceptSlope + z * z * fit.slopeErrorPerM * fit.slopeErrorPerM;
    const half = Z_95 * Math.sqrt(Math.max(0, variance));
    lineCurrentA[k] = Math.exp(ln);
    bandLowA[k] = Math.exp(ln - half);
    bandHighA[k] = Math.exp(ln + half);
  }
  return {
    kind: 'iz',
    curveId: curve.id,
    status: fit.status,
    message: fit.message,
    biasV,
    zNm,
    currentA,
    exclusion,
    residual,
    lineZNm,
    lineCurrentA,
    bandLowA,
    bandHighA,
    profileZNm: Float64Array.from(fit.localProfile.zM, (z) => z * 1e9),
    profileEV: fit.localProfile.barrierEV,
    profileErrorEV: fit.localProfile.barrierErrorEV,
    noiseFloorA: fit.noiseFloorA,
    windowNm: curve.windowM ? { fromNm: curve.windowM.fromM * 1e9, toNm: curve.windowM.toM * 1e9 } : null,
  };
}

/**
 * The I(V) view arrays of one curve: saturated points left out as analyzeCurve does, the model the
 * settings choose (auto → WKB unless only Simmons converged), conductance by local quadratic
 * smoothing over `smoothingPoints` (odd, default n/20 clamped to 7…31).
 * @example spectrumDetail(curve, DEFAULT_SETTINGS).model // 'wkb'
 */
export function spectrumDetail(curve: CurveInput, sessionSettings: AnalysisSettings, smoothingPoints?: number): SpectrumDetail {
  const settings = settingsForRun(sessionSettings, runOf(curve));
  const n = curve.x.length;
  // The very input analyzeCurve fits: saturated points left out, the geometry and materials in force.
  const { input, saturation, keptIndex: kept } = spectrumFitInput(curve, settings);
  const dropped = new Uint8Array(n);
  for (const i of saturation?.pointIndices ?? []) dropped[i] = 1;
  const fit = fitSpectrum(input);
  const chosen = settings.model === 'simmons' ? fit.simmons : settings.model === 'bdr' ? fit.bdr : fit.best;
  const fittedCurrentA = new Float64Array(n).fill(Number.NaN);
  const residual = new Float64Array(n).fill(Number.NaN);
  kept.forEach((i, k) => {
    fittedCurrentA[i] = chosen.fittedCurrentA[k];
    residual[i] = (curve.current[i] - chosen.fittedCurrentA[k]) * fit.weights[k];
  });
  const views = conductanceViews(curve.x, curve.current, fittedCurrentA, fit.noise.floorA, smoothingPoints);
  return {
    kind: 'iv',
    curveId: curve.id,
    status: chosen.converged ? 'ok' : 'failed',
    message: chosen.message,
    model: chosen.model,
    biasV: Float64Array.from(curve.x),
    currentA: Float64Array.from(curve.current),
    dropped,
    fittedCurrentA,
    residual,
    ...views,
    fowlerNordheim: fit.fowlerNordheim,
    noiseFloorA: fit.noise.floorA,
  };
}

/**
 * Conductance views of a spectrum, measured and model: dI/dV by local quadratic smoothing (in
 * bias order), the normalised conductance (dI/dV)/(I/V) where I/V is meaningful, and the
 * Fowler–Nordheim coordinates 1/V, ln(|I|/V²) for |V| ≥ 10 % of the largest |V|. Arrays come back
 * in the input's order.
 * Masks (common practice, no source): |V| below 5 % of the largest |V|, or |I| within 3σ of the
 * noise floor, give NaN in the normalised conductance.
 * @example conductanceViews(bias, current, model, 1e-12).conductanceS.length // bias.length
 */
export function conductanceViews(
  biasV: ArrayLike<number>,
  currentA: ArrayLike<number>,
  modelCurrentA: ArrayLike<number>,
  noiseFloorA: number,
  smoothingPoints?: number,
): Pick<SpectrumDetail, 'conductanceS' | 'fitConductanceS' | 'normalized' | 'fitNormalized' | 'inverseBiasPerV' | 'fowlerNordheimY' | 'fitFowlerNordheimY' | 'smoothingPoints'> {
  const n = biasV.length;
  const order = Array.from({ length: n }, (_, i) => i).sort((a, b) => biasV[a] - biasV[b] || a - b);
  const points = smoothingPoints ?? Math.min(31, Math.max(7, 2 * Math.round(n / 40) + 1));
  const halfWidth = Math.max(1, Math.floor(points / 2));
  const sortedBias = order.map((i) => biasV[i]);
  const measured = savitzkyGolay(sortedBias, order.map((i) => currentA[i]), halfWidth);
  const model = savitzkyGolay(sortedBias, order.map((i) => modelCurrentA[i]), 1);
  let maxBias = 0;
  for (let i = 0; i < n; i++) maxBias = Math.max(maxBias, Math.abs(biasV[i]));
  const conductanceS = new Float64Array(n);
  const fitConductanceS = new Float64Array(n);
  const normalized = new Float64Array(n).fill(Number.NaN);
  const fitNormalized = new Float64Array(n).fill(Number.NaN);
  const inverseBiasPerV = new Float64Array(n);
  const fowlerNordheimY = new Float64Array(n);
  const fitFowlerNordheimY = new Float64Array(n);
  order.forEach((i, k) => {
    const v = biasV[i];
    conductanceS[i] = measured.derivative[k];
    fitConductanceS[i] = model.derivative[k];
    const usable = Math.abs(v) >= 0.05 * maxBias && v !== 0;
    if (usable && Math.abs(measured.smoothed[k]) > 3 * noiseFloorA) normalized[i] = measured.derivative[k] / (measured.smoothed[k] / v);
    if (usable && Number.isFinite(modelCurrentA[i]) && modelCurrentA[i] !== 0) fitNormalized[i] = model.derivative[k] / (modelCurrentA[i] / v);
    // Fowler–Nordheim coordinates only where |V| ≥ 10 % of the sweep: near zero 1/V runs away.
    const high = Math.abs(v) >= 0.1 * maxBias && v !== 0;
    inverseBiasPerV[i] = high ? 1 / v : Number.NaN;
    fowlerNordheimY[i] = high && currentA[i] !== 0 ? Math.log(Math.abs(currentA[i]) / (v * v)) : Number.NaN;
    fitFowlerNordheimY[i] = high && Math.abs(modelCurrentA[i]) > 0 ? Math.log(Math.abs(modelCurrentA[i]) / (v * v)) : Number.NaN;
  });
  return { conductanceS, fitConductanceS, normalized, fitNormalized, inverseBiasPerV, fowlerNordheimY, fitFowlerNordheimY, smoothingPoints: 2 * halfWidth + 1 };
}

/** A stretch of sorted z left out of the fit for one reason, for shading. */
export interface ExclusionRegion {
  fromNm: number;
  toNm: number;
  code: number;
  reason: string;
  points: number;
}

/**
 * Contiguous runs of excluded points (in ascending z) merged into shaded regions, each reaching
 * halfway to its neighbouring points.
 * @example exclusionRegions(Float64Array.of(0, 1, 2, 3), Uint8Array.of(3, 3, 0, 0))[0] // { fromNm: 0, toNm: 1.5, code: 3, … }
 */
export function exclusionRegions(zNm: ArrayLike<number>, exclusion: ArrayLike<number>): ExclusionRegion[] {
  const order = Array.from({ length: zNm.length }, (_, i) => i).filter((i) => Number.isFinite(zNm[i])).sort((a, b) => zNm[a] - zNm[b]);
  const regions: ExclusionRegion[] = [];
  let start = -1;
  for (let k = 0; k <= order.length; k++) {
    const code = k < order.length ? exclusion[order[k]] : -1;
    const previous = start >= 0 ? exclusion[order[start]] : -1;
    if (start >= 0 && code !== previous) {
      const first = zNm[order[start]];
      const last = zNm[order[k - 1]];
      const before = start > 0 ? (zNm[order[start - 1]] + first) / 2 : first;
      const after = k < order.length ? (last + zNm[order[k]]) / 2 : last;
      regions.push({ fromNm: before, toNm: after, code: previous, reason: EXCLUSION_LABELS[previous] ?? 'left out', points: k - start });
      start = -1;
    }
    if (start < 0 && code > 0) start = k;
  }
  return regions;
}
