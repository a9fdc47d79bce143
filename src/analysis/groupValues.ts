import type { CurveResult } from './analyzeCurve.ts';
import type { CurveGroup } from './groupCurves.ts';
import { groupQuantity, quantityOf, type GroupQuantityName } from './groupQuantities.ts';
import { describeValue } from './validate.ts';

/** One curve of a group as a comparison sees it. */
export interface GroupPoint {
  readonly curveId: string;
  readonly file: string;
  /** Curve number within its file. */
  readonly index: number;
  /** Position of the curve in the results list (the acquisition order when nothing better is known). */
  readonly resultOrder: number;
  /** The quantity's value, in its unit. */
  readonly value: number;
  /** Its standard error from the fit (same unit), or null when the fit gave none. */
  readonly standardError: number | null;
  /** True when the curve carries at least one quality flag. */
  readonly flagged: boolean;
  /** Codes of its flags, in order. */
  readonly flagCodes: readonly string[];
  /** True when the statistics use it (not flagged, or flagged curves included). */
  readonly used: boolean;
  /** Lateral position of the curve, nm, or null. */
  readonly position: { readonly xNm: number; readonly yNm: number } | null;
}

/** A group's values of one quantity, split into used and left-out curves. */
export interface GroupValues {
  readonly key: string;
  readonly label: string;
  readonly quantity: GroupQuantityName;
  /** Every curve of the quantity's kind with a value, used or not, in result order. */
  readonly points: readonly GroupPoint[];
  /** Values of the used points, in order (unit of the quantity). */
  readonly values: readonly number[];
  /** Standard errors of the used points (null where missing), in the same order. */
  readonly standardErrors: readonly (number | null)[];
  readonly usedCurveIds: readonly string[];
  /** Number of curves the statistics use. */
  readonly nUsed: number;
  /** Curves of the right kind left out: flagged ones (when excluded) and ones with no value (failed fits). */
  readonly excluded: { readonly flagged: number; readonly noValue: number };
  /** excluded.flagged + excluded.noValue. */
  readonly nExcluded: number;
  /** Members of the group whose kind does not carry the quantity (not counted as excluded). */
  readonly otherKind: number;
  readonly includeFlagged: boolean;
}

/** Options of {@link groupValues}. */
export interface GroupValueOptions {
  /** Use flagged curves in the statistics too (default false: they are shown, hollow, but left out). */
  readonly includeFlagged?: boolean;
}

/**
 * Index results by curve id (the `curve` field). Throws when an id appears twice.
 * @example resultsByCurveId(results).get('a.csv#0/single')?.run // 'A-gold'
 */
export function resultsByCurveId(results: readonly CurveResult[]): Map<string, { result: CurveResult; order: number }> {
  const byId = new Map<string, { result: CurveResult; order: number }>();
  results.forEach((result, order) => {
    if (byId.has(result.curve)) throw new RangeError(`resultsByCurveId: results must have unique curve ids, got '${result.curve}' twice`);
    byId.set(result.curve, { result, order });
  });
  return byId;
}

/**
 * The values of one quantity in one group, ready for statistics. A member counts only when its
 * kind carries the quantity (I(z) for apparentBarrierEV and gapToContactNm, I(V) for the rest);
 * of those, a failed fit or missing value is excluded as 'noValue', a flagged curve as 'flagged'
 * unless includeFlagged. Curve ids not found in results are ignored. Units as the quantity.
 * Source: Burrow's own rule (flagged curves are left out by default, as the dashboard shows).
 * @example groupValues(results, group, 'apparentBarrierEV').nUsed // 10
 */
export function groupValues(
  results: readonly CurveResult[] | Map<string, { result: CurveResult; order: number }>,
  group: CurveGroup,
  quantity: GroupQuantityName,
  options: GroupValueOptions = {},
): GroupValues {
  const name = 'groupValues';
  if (group === null || typeof group !== 'object' || !Array.isArray(group.curveIds)) {
    throw new TypeError(`${name}: group must be { key, label, curveIds }, got ${describeValue(group)}`);
  }
  const quantityInfo = groupQuantity(quantity);
  const includeFlagged = options.includeFlagged ?? false;
  if (typeof includeFlagged !== 'boolean') throw new TypeError(`${name}: includeFlagged must be true or false, got ${describeValue(includeFlagged)}`);
  const byId = results instanceof Map ? results : resultsByCurveId(results);
  const points: GroupPoint[] = [];
  let noValue = 0;
  let flaggedExcluded = 0;
  let otherKind = 0;
  for (const curveId of group.curveIds) {
    const entry = byId.get(curveId);
    if (!entry) continue;
    const { result, order } = entry;
    if (result.kind !== quantityInfo.kind) {
      otherKind++;
      continue;
    }
    const { value, standardError } = quantityOf(result, quantity);
    if (value === null) {
      noValue++;
      continue;
    }
    const flagged = result.flags.length > 0;
    const used = includeFlagged || !flagged;
    if (!used) flaggedExcluded++;
    points.push({
      curveId,
      file: result.file,
      index: result.index,
      resultOrder: order,
      value,
      standardError,
      flagged,
      flagCodes: result.flags.map((flag) => flag.code),
      used,
      position: result.position ? { xNm: result.position.xNm, yNm: result.position.yNm } : null,
    });
  }
  const usedPoints = points.filter((point) => point.used);
  return {
    key: group.key,
    label: group.label,
    quantity,
    points,
    values: usedPoints.map((point) => point.value),
    standardErrors: usedPoints.map((point) => point.standardError),
    usedCurveIds: usedPoints.map((point) => point.curveId),
    nUsed: usedPoints.length,
    excluded: { flagged: flaggedExcluded, noValue },
    nExcluded: flaggedExcluded + noValue,
    otherKind,
    includeFlagged,
  };
}
