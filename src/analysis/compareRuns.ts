import type { CurveResult } from './analyzeCurve.ts';
import { compareGroupPairs, type CompareGroupsOptions, type GroupComparison } from './compareGroups.ts';
import { driftAnalysis, type DriftAnalysis } from './driftAnalysis.ts';
import type { GridColourMapName } from './gridColourScale.ts';
import { gridMap, type GridMap } from './gridMap.ts';
import { groupCurves, type CurveGroup, type CurveGrouping, type CurveMetadataTable } from './groupCurves.ts';
import { groupQuantity, type GroupQuantity, type GroupQuantityName } from './groupQuantities.ts';
import { groupValues, resultsByCurveId, type GroupValues } from './groupValues.ts';
import { summarizeRun, type RunSummary } from './runStatistics.ts';
import { weightedMean, type WeightedMeanResult } from './weightedMean.ts';
import { describeValue } from './validate.ts';

/** Everything a comparison shows about one group. */
export interface GroupReport {
  readonly group: CurveGroup;
  readonly values: GroupValues;
  /** Descriptive statistics of the used values; null when none is used. */
  readonly summary: RunSummary | null;
  /** Weighted mean over the used curves that have a fit error; null when none has. */
  readonly weighted: WeightedMeanResult | null;
  /** Used curves without a fit error, left out of the weighted mean. */
  readonly missingErrors: number;
  readonly drift: DriftAnalysis;
  /** Map data when the group's curves carry positions; else null. */
  readonly grid: GridMap | null;
}

/** A whole comparison of runs for one quantity, from {@link compareRuns}. */
export interface RunComparison {
  readonly quantity: GroupQuantity;
  readonly includeFlagged: boolean;
  readonly confidenceLevel: number;
  /** Groups holding at least one curve of the quantity's kind, in grouping order. */
  readonly groups: readonly GroupReport[];
  /** Labels of groups with no curve of the quantity's kind (left out of the comparison). */
  readonly groupsWithoutQuantity: readonly string[];
  /** Every pair of groups with at least one used value each. */
  readonly pairs: readonly GroupComparison[];
}

/** Input of {@link compareRuns}. */
export interface CompareRunsInput {
  readonly results: readonly CurveResult[];
  /** Default 'apparentBarrierEV'. */
  readonly quantity?: GroupQuantityName;
  /** How to group (default by run); ignored when `groups` is given. */
  readonly grouping?: CurveGrouping;
  /** Groups made elsewhere (e.g. edited in the dashboard). */
  readonly groups?: readonly CurveGroup[];
  /** Metadata text per curve, for grouping by a metadata key. */
  readonly metadata?: CurveMetadataTable;
  readonly includeFlagged?: boolean;
  /** Level of every confidence interval (default 0.95). */
  readonly confidenceLevel?: number;
  /** Acquisition time in seconds per curve id, for the drift plots (see acquisitionTimes). */
  readonly timeSByCurve?: Readonly<Record<string, number>>;
  readonly colourMap?: GridColourMapName;
  readonly mannWhitney?: CompareGroupsOptions['mannWhitney'];
}

/**
 * Compare runs (or any groups) for one quantity: per group the used and left-out curves, summary
 * statistics with the Student CI, the inverse-variance weighted mean with its Birge ratio, drift
 * against acquisition order with change points, and a map when positions exist; across groups
 * every pairwise comparison (Welch, Mann–Whitney, Cohen's d, Holm-adjusted p). Pure data, the
 * same for the dashboard's comparison view and the HTML report. Units of the quantity throughout.
 * Source: the functions it calls (summarizeRun, weightedMean, compareGroupPairs, driftAnalysis, gridMap).
 * @example compareRuns({ results, quantity: 'apparentBarrierEV' }).pairs[0].welch?.confidenceInterval
 */
export function compareRuns(input: CompareRunsInput): RunComparison {
  const name = 'compareRuns';
  if (input === null || typeof input !== 'object' || !Array.isArray(input.results)) {
    throw new TypeError(`${name}: input.results must be an array of curve results, got ${describeValue(input?.results)}`);
  }
  const quantity = groupQuantity(input.quantity ?? 'apparentBarrierEV');
  const includeFlagged = input.includeFlagged ?? false;
  const confidenceLevel = input.confidenceLevel ?? 0.95;
  if (typeof confidenceLevel !== 'number' || !(confidenceLevel > 0 && confidenceLevel < 1)) {
    throw new RangeError(`${name}: confidenceLevel must be within (0, 1), got ${describeValue(confidenceLevel)}`);
  }
  const groups = input.groups ?? groupCurves(input.results, input.grouping ?? { by: 'run' }, input.metadata ?? {});
  const byId = resultsByCurveId(input.results);
  const reports: GroupReport[] = [];
  const groupsWithoutQuantity: string[] = [];
  for (const group of groups) {
    const values = groupValues(byId, group, quantity.name, { includeFlagged });
    if (values.points.length === 0 && values.excluded.noValue === 0) {
      groupsWithoutQuantity.push(group.label);
      continue;
    }
    const withErrors: number[] = [];
    const errors: number[] = [];
    values.values.forEach((value, i) => {
      const error = values.standardErrors[i];
      if (error !== null) {
        withErrors.push(value);
        errors.push(error);
      }
    });
    reports.push({
      group,
      values,
      summary: values.nUsed > 0 ? summarizeRun(values.values, confidenceLevel) : null,
      weighted: withErrors.length > 0 ? weightedMean(withErrors, errors) : null,
      missingErrors: values.nUsed - withErrors.length,
      drift: driftAnalysis(values, { timeSByCurve: input.timeSByCurve, confidenceLevel }),
      grid: gridMap(values, { colourMap: input.colourMap }),
    });
  }
  const comparable = reports.filter((report) => report.values.nUsed > 0).map((report) => report.values);
  return {
    quantity,
    includeFlagged,
    confidenceLevel,
    groups: reports,
    groupsWithoutQuantity,
    pairs: compareGroupPairs(comparable, { confidenceLevel, mannWhitney: input.mannWhitney }),
  };
}
