import {
  DEFAULT_SETTINGS,
  ExclusionReason,
  fitApproachCurve,
  fitSpectrum,
  settingsForRun,
  type AnalysisSettings,
  type ApproachCurveFit,
  type ApproachCurveInput,
  type SpectrumInput,
  type AreaConstraint,
  type BarrierEstimate,
  type SpectrumFit,
} from '../fit/index.ts';
import { nm2ToM2, nmToM } from '../physics/index.ts';
import { detectCurvature } from './detectCurvature.ts';
import { detectSaturation, type SaturationFinding } from './detectSaturation.ts';
import { detectStepChange } from './detectStepChange.ts';
import { FLAG_THRESHOLDS, type QualityFlag } from './flagThresholds.ts';
import { flagsForFit, type FitSummaryForFlags, type ParameterForFlags } from './flagsForFit.ts';
import type { NoiseFloorFinding } from './detectNoiseFloor.ts';
import { qualityMetrics, type QualityMetrics } from './qualityMetrics.ts';

/**
 * One curve as the analysis needs it (the import layer's Curve has these fields): x is the sweep
 * axis in SI (m for 'iz', V for 'iv'), current in A.
 */
export interface CurveInput {
  id: string;
  fileName: string;
  index: number;
  segment: 'approach' | 'retract' | 'single';
  kind: 'iz' | 'iv';
  x: Float64Array;
  current: Float64Array;
  fixedBiasV?: number;
  fixedGapM?: number;
  position?: { xM: number; yM: number };
  metadata?: Record<string, { raw: string; value?: number; unit?: string }>;
  /** Manual fit window of an I(z) curve, m, in calibrated z (x × piezoCalibration), inclusive; points outside are left out of the fit. */
  windowM?: { fromM: number; toM: number };
}

/**
 * The result record of one curve: what `burrow fit` prints and the dashboard's table shows.
 * Values carry their unit in the name with an `…Err` beside each; quantities that do not apply to
 * the curve's kind are null. Internal NaN becomes null in JSON.
 */
export interface CurveResult {
  file: string;
  curve: string;
  index: number;
  segment: CurveInput['segment'];
  kind: 'iz' | 'iv';
  model: 'iz-exponential' | 'wkb' | 'simmons' | 'bdr';
  status: 'ok' | 'failed';
  message: string;
  run: string;
  apparentBarrierEV: number | null;
  apparentBarrierErrEV: number | null;
  /** Planar-WKB prefactor-corrected barrier (I(z) only): the φ that J ∝ e^{−2κs}/s needs for the measured slope. */
  prefactorCorrectedBarrierEV: number | null;
  decayPerNm: number | null;
  decayErrPerNm: number | null;
  gapToContactNm: number | null;
  gapToContactErrNm: number | null;
  phi1EV: number | null;
  phi1ErrEV: number | null;
  phi2EV: number | null;
  phi2ErrEV: number | null;
  meanBarrierEV: number | null;
  meanBarrierErrEV: number | null;
  asymmetryEV: number | null;
  asymmetryErrEV: number | null;
  widthNm: number | null;
  widthErrNm: number | null;
  areaNm2: number | null;
  areaErrNm2: number | null;
  quality: { r2: number; reducedChi2: number; durbinWatson: number; rmsResidual: number; pointsUsed: number; points: number };
  flags: QualityFlag[];
  position: { xNm: number; yNm: number } | null;
  /** I(z) line (for hysteresis and joint fits): ln I = interceptLn + slopePerNm·z[nm]. */
  line: { slopePerNm: number; slopeErrPerNm: number; interceptLn: number; interceptErrLn: number; covariancePerNm: number } | null;
  /** I(V): the models compared by AIC, the Fowler–Nordheim check, the parameter correlations. */
  spectrum: {
    comparison: SpectrumFit['comparison'];
    fowlerNordheim: SpectrumFit['fowlerNordheim'];
    correlationNames: string[];
    correlation: number[];
  } | null;
  /** For a spectrum paired with an approach curve of the same site: the joint fit (analyzeJoint). */
  joint?: import('./analyzeJoint.ts').JointSiteResult;
  /** Numbers used for the bias of I(z) curves and the temperature, for the record. */
  conditions: { biasV: number | null; temperatureK: number };
}

const finiteOrNull = (value: number): number | null => (Number.isFinite(value) ? value : null);

/**
 * A curve's metadata entry by key, ignoring case ('Run' and 'run' are one key): the importer keeps
 * unknown keys as written and gives known quantities fixed keys (biasVoltage, setpointCurrent, …).
 */
export function metadataEntry(curve: Pick<CurveInput, 'metadata'>, key: string): { raw: string; value?: number; unit?: string } | undefined {
  const metadata = curve.metadata;
  if (!metadata) return undefined;
  if (metadata[key]) return metadata[key];
  const lower = key.toLowerCase();
  for (const [name, entry] of Object.entries(metadata)) if (name.toLowerCase() === lower) return entry;
  return undefined;
}

/** The run a curve belongs to: its `run` metadata entry, else the tip and sample entries, else its file. */
export function runOf(curve: CurveInput): string {
  const entry = (key: string) => metadataEntry(curve, key)?.raw?.trim();
  return entry('run') || [entry('tip'), entry('sample')].filter(Boolean).join(' / ') || curve.fileName;
}

function areaConstraint(settings: AnalysisSettings): AreaConstraint {
  if (settings.areaNm2 !== null) return { mode: 'fixed', areaM2: nm2ToM2(settings.areaNm2) };
  if (settings.tipRadiusNm !== null) return { mode: 'tip-radius', tipRadiusM: nmToM(settings.tipRadiusNm) };
  return { mode: 'free' };
}

function biasOf(curve: CurveInput, settings: AnalysisSettings): number {
  if (curve.fixedBiasV !== undefined && Number.isFinite(curve.fixedBiasV) && curve.fixedBiasV !== 0) return curve.fixedBiasV;
  const meta = (metadataEntry(curve, 'biasVoltage') ?? metadataEntry(curve, 'bias'))?.value;
  return meta !== undefined && Number.isFinite(meta) && meta !== 0 ? meta : settings.defaultBiasV;
}

/**
 * Fit one curve with the model its kind and the settings call for, and flag it. Batch-level flags
 * (batch-outlier) and pair-level ones (hysteresis) are added by analyzeBatch.
 * @example analyzeCurve(curve, DEFAULT_SETTINGS).apparentBarrierEV
 */
export function analyzeCurve(curve: CurveInput, sessionSettings: AnalysisSettings = DEFAULT_SETTINGS): CurveResult {
  const settings = settingsForRun(sessionSettings, runOf(curve));
  try {
    return curve.kind === 'iz' ? analyzeApproach(curve, settings) : analyzeSpectrum(curve, settings);
  } catch (error) {
    // A curve the fit cannot handle is an outcome for that curve, never the end of the batch.
    const record = baseRecord(curve, settings);
    record.message = `analysis failed: ${(error as Error).message}`;
    record.flags = flagsForFit({ kind: curve.kind, converged: false, statusMessage: record.message });
    return record;
  }
}

function baseRecord(curve: CurveInput, settings: AnalysisSettings): CurveResult {
  return {
    file: curve.fileName,
    curve: curve.id,
    index: curve.index,
    segment: curve.segment,
    kind: curve.kind,
    model: curve.kind === 'iz' ? 'iz-exponential' : 'wkb',
    status: 'failed',
    message: '',
    run: runOf(curve),
    apparentBarrierEV: null,
    apparentBarrierErrEV: null,
    prefactorCorrectedBarrierEV: null,
    decayPerNm: null,
    decayErrPerNm: null,
    gapToContactNm: null,
    gapToContactErrNm: null,
    phi1EV: null,
    phi1ErrEV: null,
    phi2EV: null,
    phi2ErrEV: null,
    meanBarrierEV: null,
    meanBarrierErrEV: null,
    asymmetryEV: null,
    asymmetryErrEV: null,
    widthNm: null,
    widthErrNm: null,
    areaNm2: null,
    areaErrNm2: null,
    quality: { r2: Number.NaN, reducedChi2: Number.NaN, durbinWatson: Number.NaN, rmsResidual: Number.NaN, pointsUsed: 0, points: curve.x.length },
    flags: [],
    position: curve.position ? { xNm: curve.position.xM * 1e9, yNm: curve.position.yM * 1e9 } : null,
    line: null,
    spectrum: null,
    conditions: { biasV: null, temperatureK: settings.temperatureK },
  };
}

/**
 * The approach-curve fit input that a curve and the settings in force call for (bias, calibrated
 * z, known noise and preamp limit, setpoint, manual window): shared by analyzeCurve and the joint fit.
 */
export function approachFitInput(curve: CurveInput, settings: AnalysisSettings): ApproachCurveInput {
  const setpoint = metadataEntry(curve, 'setpointCurrent')?.value;
  return {
    zM: settings.piezoCalibration === 1 ? curve.x : Float64Array.from(curve.x, (z) => z * settings.piezoCalibration),
    currentA: curve.current,
    biasV: biasOf(curve, settings),
    noise: { relative: settings.noiseRelative ?? undefined, floorA: settings.noiseFloorA ?? undefined },
    saturationLimitA: settings.saturationLimitA ?? undefined,
    setpointCurrentA: setpoint !== undefined && setpoint !== 0 ? setpoint : undefined,
    ...(curve.windowM ? { windowM: curve.windowM } : {}),
  };
}

/**
 * The spectrum fit input for a curve and the settings in force, with clipped points (preamp
 * saturation) left out; `keptIndex` maps the kept points back to the curve.
 */
export function spectrumFitInput(curve: CurveInput, settings: AnalysisSettings): { input: SpectrumInput; saturation: SaturationFinding | null; keptIndex: number[] } {
  // Non-finite points never reach the detectors or the fit (the importer reports them; an API
  // caller may still pass them); clipped points are left out of the fit.
  const finite: number[] = [];
  for (let i = 0; i < curve.x.length; i++) if (Number.isFinite(curve.x[i]) && Number.isFinite(curve.current[i])) finite.push(i);
  const found = detectSaturation(Float64Array.from(finite, (i) => curve.current[i]), { knownLimitA: settings.saturationLimitA ?? undefined });
  const saturation = found ? { ...found, pointIndices: found.pointIndices.map((k) => finite[k]) } : null;
  const dropped = new Set(saturation?.pointIndices ?? []);
  const keptIndex = finite.filter((i) => !dropped.has(i));
  const all = keptIndex.length === curve.x.length;
  const biasV = all ? curve.x : Float64Array.from(keptIndex, (i) => curve.x[i]);
  const currentA = all ? curve.current : Float64Array.from(keptIndex, (i) => curve.current[i]);
  return {
    input: {
      biasV,
      currentA,
      temperatureK: settings.temperatureK,
      fermiEnergyEV: settings.fermiEnergyEV,
      area: areaConstraint(settings),
      tipWorkFunctionEV: settings.tipWorkFunctionEV ?? undefined,
      imagePotential: settings.imagePotential,
      noise: { relative: settings.noiseRelative ?? undefined, floorA: settings.noiseFloorA ?? undefined },
    },
    saturation,
    keptIndex,
  };
}

function analyzeApproach(curve: CurveInput, settings: AnalysisSettings): CurveResult {
  const record = baseRecord(curve, settings);
  const input = approachFitInput(curve, settings);
  const { zM, biasV } = input;
  record.conditions.biasV = biasV;
  const fit = fitApproachCurve(input);
  record.message = fit.message;
  const excluded: number[] = [];
  const saturated: number[] = [];
  const floor: number[] = [];
  for (let k = 0; k < fit.exclusion.length; k++) {
    const original = fit.order[k];
    if (fit.exclusion[k] !== 0) excluded.push(original);
    if (fit.exclusion[k] === ExclusionReason.saturation) saturated.push(original);
    if (fit.exclusion[k] === ExclusionReason.noiseFloor) floor.push(original);
  }
  const saturation: SaturationFinding | null =
    saturated.length > 0
      ? { pointIndices: saturated.sort((a, b) => a - b), levelA: Math.max(...saturated.map((i) => Math.abs(curve.current[i]))), end: 'start', atKnownLimit: settings.saturationLimitA !== null }
      : null;
  const floorFraction = floor.length / Math.max(1, fit.points);
  const noiseFloor: NoiseFloorFinding | null =
    floor.length > 0 && floorFraction >= FLAG_THRESHOLDS.noiseFloorMinimumFraction.value
      ? { pointIndices: floor.sort((a, b) => a - b), noiseFloorA: fit.noiseFloorA, thresholdA: FLAG_THRESHOLDS.noiseFloorMultiple.value * fit.noiseFloorA, estimated: settings.noiseFloorA === null }
      : null;
  // Point contact is judged where the signal stands well above the floor: below ~10 σ_floor, |I/V|
  // scatters by tens of percent between neighbours and would look like jumps. Those points are
  // replaced by the fitted current, which keeps every index in place.
  const contactCurrent = Float64Array.from(curve.current);
  if (fit.status === 'ok' && fit.noiseFloorA > 0) {
    const quietLn = Math.log(FLAG_THRESHOLDS.contactQuietFloorMultiple.value * fit.noiseFloorA);
    const sign = biasV < 0 ? -1 : 1;
    for (let k = 0; k < fit.zM.length; k++) {
      if (fit.fittedLnCurrent[k] < quietLn && fit.exclusion[k] !== ExclusionReason.saturation) contactCurrent[fit.order[k]] = sign * Math.exp(fit.fittedLnCurrent[k]);
    }
  }
  const summary: FitSummaryForFlags = {
    kind: 'iz',
    converged: fit.status === 'ok',
    statusMessage: fit.message,
    saturation,
    noiseFloor,
    excludedIndices: excluded,
    conductance: { currentA: contactCurrent, biasV },
  };
  if (fit.status !== 'ok') {
    record.flags = flagsForFit(summary);
    return record;
  }
  record.status = 'ok';
  fillApproach(record, fit);
  const usedZNm: number[] = [];
  const usedLn: number[] = [];
  const usedWeights: number[] = [];
  const usedOriginal: number[] = [];
  // The step test wants even noise in ln I: the points where the relative noise dominates the floor.
  const quietZNm: number[] = [];
  const quietLn: number[] = [];
  const quietOriginal: number[] = [];
  const quietLevel = fit.noiseFloorA > 0 ? Math.log(FLAG_THRESHOLDS.stepQuietFloorMultiple.value * fit.noiseFloorA) : -Infinity;
  for (let k = 0; k < fit.zM.length; k++) {
    if (fit.exclusion[k] !== 0) continue;
    usedZNm.push(fit.zM[k] * 1e9);
    usedLn.push(fit.lnCurrent[k]);
    usedWeights.push(Math.sqrt(fit.weights[k]));
    usedOriginal.push(fit.order[k]);
    if (fit.fittedLnCurrent[k] >= quietLevel) {
      quietZNm.push(fit.zM[k] * 1e9);
      quietLn.push(fit.lnCurrent[k]);
      quietOriginal.push(fit.order[k]);
    }
  }
  const usedFitted: number[] = [];
  for (let k = 0; k < fit.zM.length; k++) if (fit.exclusion[k] === 0) usedFitted.push(fit.fittedLnCurrent[k]);
  const metrics = qualityMetrics({ observed: usedLn, fitted: usedFitted, weights: usedWeights, nParams: 2 });
  record.quality = qualityRecord(metrics, fit.points);
  // The step test runs on ln I where the noise is even (well above the floor), with a quadratic
  // trend so that curvature is not taken for a step; the curvature test then allows for a step
  // where one was found.
  const stepFound = quietZNm.length >= 8 ? detectStepChange(quietLn, undefined, { trendDegree: 2, x: quietZNm }) : null;
  const step = stepFound && Math.abs(stepFound.stepSize) >= FLAG_THRESHOLDS.stepMinimumLogCurrent.value ? stepFound : null;
  const stepIndexInUsed = step ? usedOriginal.indexOf(quietOriginal[step.index]) : -1;
  const curvature =
    usedZNm.length >= 6 ? detectCurvature(usedZNm, usedLn, usedWeights, stepIndexInUsed >= 0 ? { stepAtIndex: stepIndexInUsed } : {}) : null;
  record.flags = flagsForFit({
    ...summary,
    metrics,
    noiseKnown: settings.noiseRelative !== null,
    barrierEV: fit.apparentBarrierEV,
    widthNm: fit.gapToContactM * 1e9,
    curvature,
    step,
    stepSeriesIndices: quietOriginal,
  });
  return record;
}

function qualityRecord(metrics: QualityMetrics, points: number): CurveResult['quality'] {
  const { r2, reducedChi2, durbinWatson, rmsResidual, pointsUsed } = metrics;
  return { r2, reducedChi2, durbinWatson, rmsResidual, pointsUsed, points };
}

function fillApproach(record: CurveResult, fit: ApproachCurveFit): void {
  record.apparentBarrierEV = finiteOrNull(fit.apparentBarrierEV);
  record.apparentBarrierErrEV = finiteOrNull(fit.apparentBarrierErrorEV);
  record.prefactorCorrectedBarrierEV = finiteOrNull(fit.prefactorCorrectedBarrierEV);
  record.decayPerNm = finiteOrNull(fit.decayConstantPerM * 1e-9);
  record.decayErrPerNm = finiteOrNull(fit.decayConstantErrorPerM * 1e-9);
  record.gapToContactNm = finiteOrNull(fit.gapToContactM * 1e9);
  record.gapToContactErrNm = finiteOrNull(fit.gapToContactErrorM * 1e9);
  record.line = {
    slopePerNm: fit.slopePerM * 1e-9,
    slopeErrPerNm: fit.slopeErrorPerM * 1e-9,
    interceptLn: fit.interceptLnA,
    interceptErrLn: Math.sqrt(fit.interceptVariance),
    covariancePerNm: fit.covarianceInterceptSlope * 1e-9,
  };
}

function analyzeSpectrum(curve: CurveInput, settings: AnalysisSettings): CurveResult {
  const record = baseRecord(curve, settings);
  const { input, saturation, keptIndex } = spectrumFitInput(curve, settings);
  const current = input.currentA;
  let fit: SpectrumFit;
  try {
    // Asked for Simmons or BDR only: the fit chain stops there (the joint fit always runs it whole).
    fit = fitSpectrum({ ...input, lastModel: settings.model === 'simmons' || settings.model === 'bdr' ? settings.model : 'wkb' });
  } catch (error) {
    record.message = (error as Error).message;
    record.flags = flagsForFit({ kind: 'iv', converged: false, statusMessage: record.message, saturation });
    return record;
  }
  const chosen: BarrierEstimate = settings.model === 'simmons' ? fit.simmons : settings.model === 'bdr' ? fit.bdr : fit.best;
  record.model = chosen.model;
  record.status = chosen.converged ? 'ok' : 'failed';
  record.message = chosen.message;
  record.phi1EV = finiteOrNull(chosen.tipWorkFunctionEV);
  record.phi1ErrEV = finiteOrNull(chosen.tipWorkFunctionErrorEV);
  record.phi2EV = finiteOrNull(chosen.sampleWorkFunctionEV);
  record.phi2ErrEV = finiteOrNull(chosen.sampleWorkFunctionErrorEV);
  record.meanBarrierEV = finiteOrNull(chosen.meanBarrierEV);
  record.meanBarrierErrEV = finiteOrNull(chosen.meanBarrierErrorEV);
  record.asymmetryEV = finiteOrNull(chosen.asymmetryEV);
  record.asymmetryErrEV = finiteOrNull(chosen.asymmetryErrorEV);
  record.widthNm = finiteOrNull(chosen.widthM * 1e9);
  record.widthErrNm = finiteOrNull(chosen.widthErrorM * 1e9);
  record.areaNm2 = finiteOrNull(chosen.areaM2 * 1e18);
  record.areaErrNm2 = finiteOrNull(chosen.areaErrorM2 * 1e18);
  record.spectrum = { comparison: fit.comparison, fowlerNordheim: fit.fowlerNordheim, correlationNames: chosen.correlationNames, correlation: chosen.correlation };
  const metrics = qualityMetrics({ observed: current, fitted: chosen.fittedCurrentA, weights: fit.weights, nParams: chosen.nFree });
  record.quality = qualityRecord(metrics, curve.x.length);
  const residuals = Array.from(current, (value, i) => (value - chosen.fittedCurrentA[i]) * fit.weights[i]);
  const names = chosen.correlationNames;
  const parameters: ParameterForFlags[] = names.map((name, a) => ({
    name,
    value: 1,
    stderr: Number.isFinite(chosen.correlation[a * names.length + a]) ? 1 : Number.NaN,
    correlations: Object.fromEntries(names.map((other, b) => [other, chosen.correlation[a * names.length + b]])),
  }));
  record.flags = flagsForFit({
    kind: 'iv',
    converged: chosen.converged,
    statusMessage: chosen.message,
    metrics,
    noiseKnown: settings.noiseRelative !== null && settings.noiseFloorA !== null,
    parameters: chosen.model === 'bdr' ? undefined : parameters,
    uncertaintyNotReliable: chosen.model !== 'bdr' && chosen.converged && !chosen.uncertaintiesOk && chosen.uncertaintyNote ? chosen.uncertaintyNote : undefined,
    barrierEV: [chosen.tipWorkFunctionEV, chosen.sampleWorkFunctionEV],
    barrierLabels: ['Tip barrier φ1', 'Sample barrier φ2'],
    widthNm: chosen.widthM * 1e9,
    saturation,
    excludedIndices: saturation?.pointIndices,
    step: residuals.length >= 8 ? detectStepChange(residuals) : null,
    stepSeriesIndices: keptIndex,
    // Non-finite points as zero current: skipped by the contact check, indices kept.
    conductance: { currentA: Float64Array.from(curve.current, (c) => (Number.isFinite(c) ? c : 0)), biasV: Float64Array.from(curve.x, (v) => (Number.isFinite(v) ? v : 0)) },
  });
  return record;
}
