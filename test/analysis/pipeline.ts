/**
 * What a fitting pipeline would do with an I(z) curve, built from the analysis functions and a plain
 * straight-line fit of ln I (test/analysis/synthetic.ts), so the flag composition can be tested end to end.
 * Order matters: the step test runs first (with a quadratic trend, so curvature is not a step), then
 * the curvature test with the step in its model (so a step is not curvature).
 */
import {
  detectCurvature,
  detectNoiseFloor,
  detectSaturation,
  detectStepChange,
  flagsForFit,
  qualityMetrics,
  type FitSummaryForFlags,
  type QualityFlag,
} from '../../src/analysis/index.ts';
import { apparentBarrierFromSlopeEV } from '../../src/physics/index.ts';
import { fitLine, type LineFit, type SyntheticApproach } from './synthetic.ts';

/** The summary built for a curve, its flags and the line fit behind them. */
export interface ApproachAssessment {
  summary: FitSummaryForFlags;
  flags: QualityFlag[];
  line: LineFit;
  usedIndices: number[];
}

/**
 * Exclude saturated and floor points, fit ln I = a + b z to the rest, and run every per-curve
 * detector: the step test on ln I with a quadratic trend, then curvature on (z, ln I) with any step.
 */
export function assessApproach(curve: SyntheticApproach, options: { noiseFloorA?: number } = {}): ApproachAssessment {
  const saturation = detectSaturation(curve.currentA);
  const noiseFloor = detectNoiseFloor(curve.currentA, options.noiseFloorA === undefined ? {} : { noiseFloorA: options.noiseFloorA });
  const excluded = new Set<number>([...(saturation?.pointIndices ?? []), ...(noiseFloor?.pointIndices ?? [])]);
  const used = curve.currentA.map((current, i) => !excluded.has(i) && current > 0);
  const usedIndices: number[] = [];
  used.forEach((isUsed, i) => {
    if (isUsed) usedIndices.push(i);
  });
  const logCurrent = curve.currentA.map((current) => Math.log(Math.abs(current) || Number.MIN_VALUE));
  const line = fitLine(curve.zNm, logCurrent, used);
  const metrics = qualityMetrics({ observed: logCurrent, fitted: line.fitted, nParams: 2, used });
  const usedZ = usedIndices.map((i) => curve.zNm[i]);
  const usedLogCurrent = usedIndices.map((i) => logCurrent[i]);
  const step = detectStepChange(usedLogCurrent, undefined, { trendDegree: 2, x: usedZ });
  const curvature = detectCurvature(usedZ, usedLogCurrent, undefined, step ? { stepAtIndex: step.index } : {});
  const summary: FitSummaryForFlags = {
    kind: 'iz',
    converged: true,
    statusMessage: 'converged: relative reduction of chi-square below functionTolerance',
    metrics,
    noiseKnown: false,
    parameters: [
      { name: 'logCurrentAtZero', value: line.intercept, stderr: line.interceptError, correlations: { slopePerNm: line.correlation } },
      { name: 'slopePerNm', value: line.slope, stderr: line.slopeError, correlations: { logCurrentAtZero: line.correlation } },
    ],
    barrierEV: apparentBarrierFromSlopeEV(line.slope * 1e9),
    saturation,
    noiseFloor,
    excludedIndices: [...excluded].sort((a, b) => a - b),
    curvature,
    step,
    stepSeriesIndices: usedIndices,
    conductance: { currentA: curve.currentA, biasV: curve.biasV },
  };
  return { summary, flags: flagsForFit(summary), line, usedIndices };
}
