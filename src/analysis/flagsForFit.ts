import { CONDUCTANCE_QUANTUM_S } from '../physics/index.ts';
import { checkDegenerate } from './checkDegenerate.ts';
import { checkPlausibility } from './checkPlausibility.ts';
import { checkPoorFit, type PoorFitFailure } from './checkPoorFit.ts';
import type { HysteresisFinding } from './compareApproachRetract.ts';
import type { CurvatureResult } from './detectCurvature.ts';
import type { NoiseFloorFinding } from './detectNoiseFloor.ts';
import { detectPointContact, type PointContactInput } from './detectPointContact.ts';
import type { SaturationFinding } from './detectSaturation.ts';
import type { StepChangeFinding } from './detectStepChange.ts';
import { FLAG_THRESHOLDS, type FlagCode, type QualityFlag } from './flagThresholds.ts';
import { formatNumber, formatPercent, formatProbability, formatWithPrefix, pointsPhrase } from './formatFigures.ts';
import type { QualityMetrics } from './qualityMetrics.ts';
import { describeValue } from './validate.ts';

/** A fitted parameter as src/fit reports it (only the fields the flags need). */
export interface ParameterForFlags {
  readonly name: string;
  readonly value: number;
  /** Standard error in the parameter's unit; NaN when not determined. */
  readonly stderr: number;
  /** False for a fixed parameter, which is skipped by the degeneracy check; default true. */
  readonly vary?: boolean;
  /** Correlation coefficient with each other varying parameter, by name (missing pairs count as 0). */
  readonly correlations?: Readonly<Record<string, number>>;
}

/** This curve's standing in a batch, computed by the caller with {@link detectBatchOutliers}. */
export interface BatchOutlierForCurve {
  /** What was compared, in words: 'apparent barrier', 'gap'. */
  readonly quantity: string;
  /** Unit of value and batchMedian, e.g. 'eV'. */
  readonly unit: string;
  readonly value: number;
  readonly modifiedZScore: number;
  readonly batchMedian: number;
}

/**
 * Everything {@link flagsForFit} needs to know about one fitted curve. Only kind, converged and
 * statusMessage are required; a rule whose input is absent raises nothing.
 */
export interface FitSummaryForFlags {
  /** 'iz': current–distance approach curve; 'iv': current–bias spectrum. */
  readonly kind: 'iz' | 'iv';
  readonly converged: boolean;
  /** The fit's status message (src/fit's `message`). */
  readonly statusMessage: string;
  /** Goodness of fit over the used points ({@link qualityMetrics}). */
  readonly metrics?: QualityMetrics;
  /** True when the fit weights are 1/σ_i from a known noise level, so χ²/ν should be ≈ 1. Default false. */
  readonly noiseKnown?: boolean;
  /** The fitted parameters (value, stderr, correlations). */
  readonly parameters?: readonly ParameterForFlags[];
  /** Why the fit's own uncertainties are unreliable (raises degenerate with this clause), if they are. */
  readonly uncertaintyNotReliable?: string;
  /** Barrier height(s) in eV for the plausibility check (I(z): the apparent barrier; I(V): φ1, φ2). */
  readonly barrierEV?: number | readonly number[];
  /** Labels of barrierEV entries for the reasons; default 'Apparent barrier' (iz) or 'Barrier 1', … (iv). */
  readonly barrierLabels?: readonly string[];
  /** Fitted barrier width (gap) in nm for the plausibility check. */
  readonly widthNm?: number;
  /** Result of {@link detectSaturation} on the raw currents. */
  readonly saturation?: SaturationFinding | null;
  /** The points lost in the noise floor: from the fit's exclusions for I(z) (analyzeCurve), or {@link detectNoiseFloor} on raw currents. */
  readonly noiseFloor?: NoiseFloorFinding | null;
  /** Curve indices the fit left out; when given, reasons say whether flagged points were excluded. */
  readonly excludedIndices?: readonly number[];
  /**
   * Result of {@link detectCurvature} (I(z): x = z in nm, y = ln I over the used points; pass
   * { stepAtIndex: step.index } when a step was found, so the step is not read as curvature).
   */
  readonly curvature?: CurvatureResult | null;
  /** Result of {@link detectStepChange} (I(z): on ln I of the used points with { trendDegree: 2, x: zNm }). */
  readonly step?: StepChangeFinding | null;
  /** Curve index of each entry of the series given to detectStepChange; default the same index. */
  readonly stepSeriesIndices?: readonly number[];
  /** Raw currents and bias for the point-contact check ({@link detectPointContact}). */
  readonly conductance?: PointContactInput;
  /** Result of {@link compareApproachRetract} for this curve's approach/retract pair. */
  readonly hysteresis?: HysteresisFinding | null;
  /** This curve's batch comparisons that came out as outliers. */
  readonly batchOutliers?: readonly BatchOutlierForCurve[];
}

/** One row of the flag table: which code, and how to read it off a summary. */
interface FlagRule {
  readonly code: FlagCode;
  readonly check: (summary: FitSummaryForFlags) => Omit<QualityFlag, 'code'> | null;
}

function exclusionClause(indices: readonly number[], excluded: readonly number[] | undefined): string {
  if (excluded === undefined) return '';
  const excludedSet = new Set(excluded);
  let count = 0;
  for (const i of indices) if (excludedSet.has(i)) count++;
  if (count === indices.length) return indices.length === 1 ? '; it was left out of the fit' : '; they were left out of the fit';
  if (count === 0) return indices.length === 1 ? '; it was kept in the fit' : '; they were kept in the fit';
  return `; ${count} of them were left out of the fit`;
}

function endPhrase(kind: 'iz' | 'iv', count: number): string {
  const adjective = kind === 'iz' ? 'closest' : 'highest-bias';
  return count === 1 ? `the ${adjective} point` : `the ${count} ${adjective} points`;
}

function mapIndices(indices: readonly number[], map: readonly number[] | undefined): number[] {
  return map === undefined ? [...indices] : indices.map((i) => map[i]);
}

/** Join clauses with "; ", keeping the first capital letter only on the first clause. */
function joinClauses(parts: readonly string[]): string {
  return parts.map((part, i) => (i === 0 ? part.charAt(0).toUpperCase() + part.slice(1) : part.charAt(0).toLowerCase() + part.slice(1))).join('; ');
}

function describeFailure(failure: PoorFitFailure): string {
  if (failure.test === 'r-squared') return `R² = ${formatNumber(failure.value, 4)} (below ${failure.limit})`;
  if (failure.test === 'reduced-chi-square') {
    return `reduced χ² = ${formatNumber(failure.value)} with known noise (above ${failure.limit}, p = ${formatProbability(failure.pValue)})`;
  }
  return `Durbin–Watson d = ${formatNumber(failure.value)} (below ${failure.limit}, p = ${formatProbability(failure.pValue)}), so neighbouring residuals are correlated`;
}

function degeneracyInput(parameters: readonly ParameterForFlags[]): { names: string[]; correlation: number[][]; standardErrors: number[] } {
  const varying = parameters.filter((parameter) => parameter.vary !== false);
  const names = varying.map((parameter) => parameter.name);
  const correlation = varying.map((row) =>
    varying.map((column) => (row.name === column.name ? (Number.isFinite(row.stderr) ? 1 : NaN) : (row.correlations?.[column.name] ?? 0))),
  );
  return { names, correlation, standardErrors: varying.map((parameter) => parameter.stderr) };
}

/**
 * The flag table: one rule per flag code, in FLAG_CODES order. Each reads its figures off the
 * summary and writes one sentence; the thresholds live in FLAG_THRESHOLDS.
 */
const FLAG_RULES: readonly FlagRule[] = [
  {
    code: 'saturation',
    check: ({ kind, saturation, excludedIndices }) => {
      if (!saturation) return null;
      const count = saturation.pointIndices.length;
      const reason =
        `Current is clipped at ${formatWithPrefix(saturation.levelA, 'A')} on ${endPhrase(kind, count)} (preamp saturation)` +
        `${exclusionClause(saturation.pointIndices, excludedIndices)}.`;
      return { reason, pointIndices: saturation.pointIndices };
    },
  },
  {
    code: 'noise-floor',
    check: ({ noiseFloor, excludedIndices }) => {
      if (!noiseFloor) return null;
      const count = noiseFloor.pointIndices.length;
      const subject = count === 1 ? 'One point lies' : `${count} points lie`;
      const reason =
        `${subject} below ${formatWithPrefix(noiseFloor.thresholdA, 'A')}, ${FLAG_THRESHOLDS.noiseFloorMultiple.value}× the ` +
        `${noiseFloor.estimated ? 'estimated ' : ''}${formatWithPrefix(noiseFloor.noiseFloorA, 'A')} noise floor, where ln|I| no longer follows the exponential` +
        `${exclusionClause(noiseFloor.pointIndices, excludedIndices)}.`;
      return { reason, pointIndices: noiseFloor.pointIndices };
    },
  },
  {
    code: 'tip-change',
    check: ({ kind, step, stepSeriesIndices }) => {
      if (!step) return null;
      const pointIndices = mapIndices(step.pointIndices, stepSeriesIndices);
      const atPoint = stepSeriesIndices === undefined ? step.index : stepSeriesIndices[step.index];
      const size =
        kind === 'iz'
          ? `ln I shifts by ${formatNumber(step.stepSize)} (current ×${formatNumber(Math.exp(step.stepSize))}, ${formatNumber(step.stepSize / step.sigma)} σ)`
          : `The residuals shift by ${formatNumber(step.stepSize / step.sigma)} σ`;
      const reason =
        `${size} from point ${atPoint} on (${step.statisticKind} = ${formatNumber(step.statistic)}, false-alarm probability ≤ ` +
        `${formatProbability(step.adjustedPValue)} over ${step.positionsSearched} positions), a sudden tip change.`;
      return { reason, pointIndices };
    },
  },
  {
    code: 'point-contact',
    check: ({ conductance }) => {
      if (!conductance) return null;
      const finding = detectPointContact(conductance);
      if (!finding) return null;
      const parts: string[] = [];
      if (finding.nearContact) {
        parts.push(
          `Conductance reaches ${formatNumber(finding.maximumConductanceG0)} G0 ` +
            `(${formatWithPrefix(finding.maximumConductanceG0 * CONDUCTANCE_QUANTUM_S, 'S')}) at point ${finding.maximumIndex}, ` +
            `at or above the ${FLAG_THRESHOLDS.nearContactConductanceG0.value} G0 near-contact limit`,
        );
      }
      if (finding.jump) {
        const { jump } = finding;
        parts.push(
          `${parts.length === 0 ? 'Conductance' : 'it'} jumps ×${formatNumber(jump.factor)} between points ${jump.fromIndex} and ${jump.toIndex} ` +
            `(${formatNumber(jump.fromConductanceG0)} to ${formatNumber(jump.toConductanceG0)} G0, ${formatNumber(jump.robustSigmas)} robust σ), a jump to contact`,
        );
      }
      return { reason: `${parts.join('; ')}.`, pointIndices: finding.pointIndices };
    },
  },
  {
    code: 'non-exponential',
    check: ({ kind, curvature }) => {
      if (!curvature || !curvature.nonExponential) return null;
      const figures =
        `c = ${formatNumber(curvature.curvature)} ± ${formatNumber(curvature.curvatureStandardError, 2)}${kind === 'iz' ? ' nm⁻²' : ''}, ` +
        `p = ${formatProbability(curvature.pValue)}`;
      const reason =
        kind === 'iz'
          ? `ln I is curved (${figures}): its slope changes by ${formatPercent(curvature.relativeSlopeChange)} across the window, so one apparent barrier does not describe the curve.`
          : `The curve bends away from its model scale (${figures}): its slope changes by ${formatPercent(curvature.relativeSlopeChange)} across the window.`;
      return { reason };
    },
  },
  {
    code: 'hysteresis',
    check: ({ hysteresis }) => {
      if (!hysteresis) return null;
      const parts: string[] = [];
      if (hysteresis.disagreesIn !== 'current') {
        parts.push(
          `slopes differ by ${formatNumber(hysteresis.slopeDifferencePerNm)} nm⁻¹ (${formatNumber(hysteresis.slopeSigmas)} combined standard errors)`,
        );
      }
      if (hysteresis.disagreesIn !== 'slope') {
        parts.push(
          `at z = ${formatNumber(hysteresis.commonZNm)} nm the retract current is ×${formatNumber(hysteresis.currentRatio)} the approach current ` +
            `(${formatNumber(hysteresis.currentSigmas)} combined standard errors)`,
        );
      }
      const limit = FLAG_THRESHOLDS.hysteresisSigmas.value;
      return { reason: `Approach and retract disagree beyond ${limit}σ: ${parts.join('; ')}, so the junction changed between them.` };
    },
  },
  {
    code: 'poor-fit',
    check: ({ metrics, noiseKnown }) => {
      if (!metrics) return null;
      const finding = checkPoorFit(metrics, { noiseKnown: noiseKnown ?? false });
      if (!finding) return null;
      return { reason: `The model does not describe the data: ${finding.failures.map(describeFailure).join('; ')}.` };
    },
  },
  {
    code: 'no-convergence',
    check: ({ converged, statusMessage }) => {
      if (converged) return null;
      const message = statusMessage.trim().replace(/\.+$/, '');
      return { reason: `The fit did not converge (${message.length > 0 ? message : 'no status message'}); its numbers are not results.` };
    },
  },
  {
    code: 'degenerate',
    check: ({ parameters, uncertaintyNotReliable }) => {
      if (uncertaintyNotReliable) return { reason: `The error bars cannot be trusted: ${uncertaintyNotReliable}.` };
      if (!parameters || parameters.length === 0) return null;
      const { names, correlation, standardErrors } = degeneracyInput(parameters);
      if (names.length === 0) return null;
      const finding = checkDegenerate(correlation, names, standardErrors);
      if (!finding) return null;
      const parts: string[] = [];
      for (const pair of finding.correlatedPairs) {
        parts.push(`${pair.first} and ${pair.second} are correlated at r = ${formatNumber(pair.correlation, 5)}`);
      }
      if (finding.unidentifiable.length > 0) {
        const list = finding.unidentifiable.join(', ');
        parts.push(`${list} ${finding.unidentifiable.length === 1 ? 'has' : 'have'} no finite standard error`);
      }
      return {
        reason: `Parameters are not separately determined (|r| limit ${FLAG_THRESHOLDS.degenerateCorrelation.value}): ${parts.join('; ')}.`,
      };
    },
  },
  {
    code: 'implausible',
    check: ({ kind, barrierEV, barrierLabels, widthNm }) => {
      if (barrierEV === undefined && widthNm === undefined) return null;
      const finding = checkPlausibility({ barrierEV, widthNm });
      if (!finding) return null;
      const barrierCount = typeof barrierEV === 'number' ? 1 : (barrierEV?.length ?? 0);
      const parts = finding.implausible.map((entry) => {
        const label =
          entry.quantity === 'width'
            ? 'Width'
            : (barrierLabels?.[entry.index] ?? (kind === 'iz' && barrierCount === 1 ? 'Apparent barrier' : `Barrier ${entry.index + 1}`));
        return `${label} ${formatNumber(entry.value)} ${entry.unit} is outside the plausible ${entry.minimum}–${entry.maximum} ${entry.unit}`;
      });
      return { reason: `${joinClauses(parts)}.` };
    },
  },
  {
    code: 'batch-outlier',
    check: ({ batchOutliers }) => {
      if (!batchOutliers || batchOutliers.length === 0) return null;
      const parts = batchOutliers.map(
        (entry) =>
          `${entry.quantity} ${formatNumber(entry.value)} ${entry.unit} stands out of its batch (modified z = ${formatNumber(entry.modifiedZScore)}, ` +
          `batch median ${formatNumber(entry.batchMedian)} ${entry.unit}, limit ${FLAG_THRESHOLDS.batchOutlierModifiedZ.value})`,
      );
      return { reason: `${joinClauses(parts)}.` };
    },
  },
];

/**
 * All quality flags of one fitted curve, each with a one-sentence reason carrying the measured
 * figure, in FLAG_CODES order. Table-driven: one rule per code reads the summary (see
 * {@link FitSummaryForFlags}); thresholds come from FLAG_THRESHOLDS. Rules run independently, so a
 * curve can carry several flags (a tip change can also make the fit poor).
 * Source: the detectors' own sources; see each detector.
 * @example
 * flagsForFit({ kind: 'iz', converged: false, statusMessage: 'not converged: maxIterations reached' })
 * // [{ code: 'no-convergence', reason: 'The fit did not converge (not converged: maxIterations reached); its numbers are not results.' }]
 */
export function flagsForFit(summary: FitSummaryForFlags): QualityFlag[] {
  const name = 'flagsForFit';
  if (summary === null || typeof summary !== 'object') throw new TypeError(`${name}: summary must be an object, got ${describeValue(summary)}`);
  if (summary.kind !== 'iz' && summary.kind !== 'iv') throw new RangeError(`${name}: summary.kind must be 'iz' or 'iv', got ${describeValue(summary.kind)}`);
  if (typeof summary.converged !== 'boolean') throw new TypeError(`${name}: summary.converged must be a boolean, got ${describeValue(summary.converged)}`);
  if (typeof summary.statusMessage !== 'string') {
    throw new TypeError(`${name}: summary.statusMessage must be a string, got ${describeValue(summary.statusMessage)}`);
  }
  if (summary.stepSeriesIndices !== undefined && summary.step) {
    const highest = Math.max(summary.step.index, ...summary.step.pointIndices);
    if (summary.stepSeriesIndices.length <= highest) {
      throw new RangeError(`${name}: summary.stepSeriesIndices must cover the step series (length ${summary.step.points}), got length ${summary.stepSeriesIndices.length}`);
    }
  }
  const flags: QualityFlag[] = [];
  for (const rule of FLAG_RULES) {
    const found = rule.check(summary);
    if (found) flags.push({ code: rule.code, ...found });
  }
  return flags;
}
