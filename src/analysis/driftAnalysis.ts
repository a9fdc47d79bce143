import { detectStepChange } from './detectStepChange.ts';
import { theilSenTrend, type TheilSenTrend } from './driftTrend.ts';
import { metadataText, type CurveMetadataTable } from './groupCurves.ts';
import { groupQuantity, type GroupQuantityName } from './groupQuantities.ts';
import type { GroupPoint, GroupValues } from './groupValues.ts';
import { describeValue } from './validate.ts';

/** One curve on the drift plot. */
export interface DriftPoint extends GroupPoint {
  /** 1-based place in acquisition order among all the group's points (used or not). */
  readonly acquisitionNumber: number;
  /** Minutes since the group's first curve, when times are known; else null. */
  readonly elapsedMin: number | null;
  /** The abscissa used: elapsedMin when the drift is against time, else acquisitionNumber. */
  readonly x: number;
}

/** A likely tip change: a step in the used series between two neighbouring curves. */
export interface DriftChangePoint {
  /** Index (into the used points, in order) of the first curve after the step. */
  readonly indexAfter: number;
  readonly curveIdBefore: string;
  readonly curveIdAfter: string;
  /** Abscissa half way between the two curves (for a mark on the plot). */
  readonly x: number;
  /** Size of the step, after minus before with the linear trend removed (unit of the quantity). */
  readonly stepSize: number;
  /** Bonferroni-corrected p of the step (detectStepChange). */
  readonly adjustedPValue: number;
}

/** Result vs acquisition order (or time) for one group, from {@link driftAnalysis}. */
export interface DriftAnalysis {
  readonly key: string;
  readonly label: string;
  readonly quantity: GroupQuantityName;
  /** 'time' when every used curve has an acquisition time and they are not all equal; else 'order'. */
  readonly abscissa: 'order' | 'time';
  /** All points of the group, in acquisition order. */
  readonly points: readonly DriftPoint[];
  /** Theil–Sen line through the used points; null with fewer than 3 used points. */
  readonly trend: TheilSenTrend | null;
  /** Unit of the slope, e.g. 'eV per curve' or 'eV/min'. */
  readonly slopeUnit: string;
  /** Steps found by binary segmentation with detectStepChange; empty when none. */
  readonly changePoints: readonly DriftChangePoint[];
}

/** Options of {@link driftAnalysis}. */
export interface DriftOptions {
  /** Acquisition time of each curve in seconds (any common origin), by curve id; see acquisitionTimes. */
  readonly timeSByCurve?: Readonly<Record<string, number>>;
  /** Level of the slope's CI (default 0.95). */
  readonly confidenceLevel?: number;
  /** At most this many change points (default 4). */
  readonly maximumChangePoints?: number;
}

/** Shortest segment detectStepChange accepts with a linear trend (2 points a side, 2 trend terms). */
const MINIMUM_SEGMENT_FOR_STEP = 5;

/**
 * Acquisition time of each curve from a metadata entry (default 'date') written in ISO 8601
 * ('2024-06-11T14:03:20', a space also accepted, optional Z or ±hh:mm; no zone is read as UTC,
 * which leaves differences between curves right). Other forms are skipped rather than guessed.
 * Returns seconds since 1970 by curve id.
 * Source: ISO 8601 / ECMAScript Date Time String Format (common practice, no source).
 * @example acquisitionTimes({ 'a#0': { date: '2024-06-11 14:03:20' } })['a#0'] // 1718114600
 */
export function acquisitionTimes(metadata: CurveMetadataTable, key = 'date'): Record<string, number> {
  if (metadata === null || typeof metadata !== 'object') throw new TypeError(`acquisitionTimes: metadata must be an object, got ${describeValue(metadata)}`);
  const times: Record<string, number> = {};
  const iso = /^(\d{4})-(\d{2})-(\d{2})(?:[T ](\d{2}):(\d{2})(?::(\d{2}(?:\.\d+)?))?)?\s*(Z|[+-]\d{2}:?\d{2})?$/;
  for (const [curveId, entries] of Object.entries(metadata)) {
    const text = metadataText(entries, key);
    const match = text ? iso.exec(text) : null;
    if (!match) continue;
    const [, year, month, day, hour = '0', minute = '0', second = '0', zone] = match;
    let milliseconds = Date.UTC(Number(year), Number(month) - 1, Number(day), Number(hour), Number(minute), 0) + Number(second) * 1000;
    if (zone && zone !== 'Z') {
      const sign = zone.startsWith('-') ? -1 : 1;
      const digits = zone.slice(1).replace(':', '');
      milliseconds -= sign * (Number(digits.slice(0, 2)) * 60 + Number(digits.slice(2))) * 60_000;
    }
    if (Number.isFinite(milliseconds)) times[curveId] = milliseconds / 1000;
  }
  return times;
}

function findSteps(
  values: readonly number[],
  xs: readonly number[],
  from: number,
  to: number,
  found: { index: number; stepSize: number; adjustedPValue: number }[],
  limit: number,
): void {
  if (found.length >= limit || to - from < MINIMUM_SEGMENT_FOR_STEP) return;
  const segmentX = xs.slice(from, to);
  if (new Set(segmentX).size < 2) return;
  const step = detectStepChange(values.slice(from, to), undefined, { trendDegree: 1, x: segmentX });
  if (!step) return;
  const split = from + step.index;
  found.push({ index: split, stepSize: step.stepSize, adjustedPValue: step.adjustedPValue });
  findSteps(values, xs, from, split, found, limit);
  findSteps(values, xs, split, to, found, limit);
}

/**
 * Drift and stability of one group: its points in acquisition order (time when known, else the
 * order of the results, i.e. file order then curve number), a Theil–Sen trend line with the CI
 * of its slope, and change points where the tip likely changed. Change points come from binary
 * segmentation: detectStepChange (linear trend allowed, Bonferroni p < 1e-3) on the used series,
 * then again on each side of a step found, down to segments of 5 curves.
 * Units: the quantity's; slope per curve or per minute.
 * Source: theilSenTrend (Theil 1950; Sen 1968); detectStepChange (Hawkins 1977); binary
 * segmentation, A. J. Scott & M. Knott, Biometrics 30, 507–512 (1974) [from memory].
 * @example driftAnalysis(groupValues(results, group, 'apparentBarrierEV')).trend?.slope // eV per curve
 */
export function driftAnalysis(group: GroupValues, options: DriftOptions = {}): DriftAnalysis {
  const name = 'driftAnalysis';
  if (group === null || typeof group !== 'object' || !Array.isArray(group.points)) {
    throw new TypeError(`${name}: group must be a GroupValues record (from groupValues), got ${describeValue(group)}`);
  }
  const limit = options.maximumChangePoints ?? 4;
  if (!Number.isInteger(limit) || limit < 0) throw new RangeError(`${name}: maximumChangePoints must be an integer ≥ 0, got ${describeValue(limit)}`);
  const quantity = groupQuantity(group.quantity);
  const times = options.timeSByCurve ?? {};
  const timeOf = (point: GroupPoint): number | null => {
    const t = times[point.curveId];
    return typeof t === 'number' && Number.isFinite(t) ? t : null;
  };
  const used = group.points.filter((point) => point.used);
  const usedTimes = used.map(timeOf);
  const byTime = used.length >= 2 && usedTimes.every((t) => t !== null) && new Set(usedTimes).size >= 2;
  const ordered = [...group.points].sort((p, q) => {
    if (byTime) {
      const tp = timeOf(p) ?? Infinity;
      const tq = timeOf(q) ?? Infinity;
      if (tp !== tq) return tp - tq;
    }
    return p.resultOrder - q.resultOrder;
  });
  let firstTime = Infinity;
  for (const point of ordered) firstTime = Math.min(firstTime, timeOf(point) ?? Infinity);
  const points: DriftPoint[] = ordered.map((point, i) => {
    const t = timeOf(point);
    const elapsedMin = byTime && t !== null ? (t - firstTime) / 60 : null;
    return { ...point, acquisitionNumber: i + 1, elapsedMin, x: byTime ? (elapsedMin ?? Number.NaN) : i + 1 };
  });
  const usedPoints = points.filter((point) => point.used && Number.isFinite(point.x));
  const xs = usedPoints.map((point) => point.x);
  const values = usedPoints.map((point) => point.value);
  const confidenceLevel = options.confidenceLevel ?? 0.95;
  const trend = usedPoints.length >= 3 && new Set(xs).size >= 2 ? theilSenTrend(xs, values, confidenceLevel) : null;
  const found: { index: number; stepSize: number; adjustedPValue: number }[] = [];
  findSteps(values, xs, 0, values.length, found, limit);
  found.sort((p, q) => p.index - q.index);
  const changePoints: DriftChangePoint[] = found.map((step) => ({
    indexAfter: step.index,
    curveIdBefore: usedPoints[step.index - 1].curveId,
    curveIdAfter: usedPoints[step.index].curveId,
    x: (xs[step.index - 1] + xs[step.index]) / 2,
    stepSize: step.stepSize,
    adjustedPValue: step.adjustedPValue,
  }));
  return {
    key: group.key,
    label: group.label,
    quantity: group.quantity,
    abscissa: byTime ? 'time' : 'order',
    points,
    trend,
    slopeUnit: byTime ? `${quantity.unit}/min` : `${quantity.unit} per curve`,
    changePoints,
  };
}
