/**
 * The comparison tab's text: how the user's "group by" choice becomes a grouping, and the rows of
 * the per-group and pairwise tables and the one-line answers, written from compareRuns' numbers.
 * No statistic is computed here: every number comes from the analysis layer, only rounded.
 * Pure; the Compare view class and its tests use it.
 */
import type { CurveGrouping, GroupComparison, GroupQuantityName, GroupReport, RunComparison } from '../analysis/index.ts';
import { formatValue } from './format.ts';

/** What the "group by" menu can say. */
export type CompareGroupBy = { by: 'run' } | { by: 'file' } | { by: 'metadata'; key: string } | { by: 'tag' };

/** The comparison's choices as the user made them. */
export interface CompareChoices {
  quantity: GroupQuantityName;
  groupBy: CompareGroupBy;
  includeFlagged: boolean;
}

/** Apparent barrier by run, flagged curves left out. */
export const DEFAULT_COMPARE_CHOICES: Readonly<CompareChoices> = Object.freeze<CompareChoices>({ quantity: 'apparentBarrierEV', groupBy: { by: 'run' }, includeFlagged: false });

/**
 * The grouping compareRuns takes for a menu choice; grouping by tag uses the session's tags.
 * @example groupingFor({ by: 'tag' }, { 'a.csv#0/single': 'terrace' }) // { by: 'tag', tags: { … } }
 */
export function groupingFor(groupBy: CompareGroupBy, tags: Readonly<Record<string, string>>): CurveGrouping {
  if (groupBy.by === 'tag') return { by: 'tag', tags };
  if (groupBy.by === 'metadata') return { by: 'metadata', key: groupBy.key };
  return groupBy;
}

/**
 * The menu value of a choice ('run', 'file', 'tag', 'metadata:tip') and back.
 * @example groupByValue({ by: 'metadata', key: 'tip' }) // 'metadata:tip'
 */
export function groupByValue(groupBy: CompareGroupBy): string {
  return groupBy.by === 'metadata' ? `metadata:${groupBy.key}` : groupBy.by;
}

/**
 * A menu value read back into a choice; anything unknown is grouping by run.
 * @example parseGroupBy('metadata:tip') // { by: 'metadata', key: 'tip' }
 */
export function parseGroupBy(value: string): CompareGroupBy {
  if (value === 'file' || value === 'tag' || value === 'run') return { by: value };
  if (value.startsWith('metadata:') && value.length > 'metadata:'.length) return { by: 'metadata', key: value.slice('metadata:'.length) };
  return { by: 'run' };
}

/**
 * Decimal places that show an uncertainty to two significant figures (the report's rule), 0 to 8.
 * @example decimalsFor(0.0295) // 3
 */
export function decimalsFor(uncertainty: number | null | undefined): number {
  if (uncertainty === null || uncertainty === undefined || !(uncertainty > 0) || !Number.isFinite(uncertainty)) return 3;
  return Math.min(8, Math.max(0, 1 - Math.floor(Math.log10(uncertainty))));
}

/**
 * A number with fixed decimals and a true minus sign; '—' when missing.
 * @example fixed(-0.29114, 3) // '−0.291'
 */
export function fixed(value: number | null | undefined, decimals: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  const text = value.toFixed(decimals);
  const clean = Number(text) === 0 ? text.replace(/^-/, '') : text;
  return clean.startsWith('-') ? `\u2212${clean.slice(1)}` : clean;
}

/**
 * A p-value with two significant figures ('2.8e-14'), '< 1e-300' at the floor of doubles.
 * @example formatP(2.776e-14) // '2.8e-14'
 */
export function formatP(pValue: number | null | undefined): string {
  if (pValue === null || pValue === undefined || !Number.isFinite(pValue)) return '—';
  if (pValue < 1e-300) return '< 1e-300';
  return formatValue(pValue, 2);
}

/** One row of the per-group table, as text. */
export interface GroupRow {
  key: string;
  label: string;
  nUsed: number;
  /** 'none', '3 flagged', '1 flagged, 2 failed fits'. */
  excluded: string;
  meanCI: string;
  median: string;
  iqr: string;
  weighted: string;
  birge: string;
  verdict: string;
  /** The spread is larger than the fit errors (χ² test). */
  spreadExceedsErrors: boolean;
}

/**
 * The per-group table: n used and left out, mean ± CI half-width (and the interval), median, IQR,
 * weighted mean ± its error, Birge ratio and the weighted mean's verdict. Values to two
 * significant figures of their uncertainty, as in the report.
 * @example groupRows(comparison)[0].meanCI // '5.64 ± 0.03 eV (5.61–5.67)'
 */
export function groupRows(comparison: RunComparison): GroupRow[] {
  const unit = comparison.quantity.unit;
  return comparison.groups.map((report: GroupReport) => {
    const s = report.summary;
    const w = report.weighted;
    const { flagged, noValue } = report.values.excluded;
    const excluded = [flagged ? `${flagged} flagged` : '', noValue ? `${noValue} failed fit${noValue === 1 ? '' : 's'}` : ''].filter(Boolean).join(', ') || 'none';
    const decimals = decimalsFor(s?.standardErrorOfMean ?? w?.standardError ?? null);
    let meanCI = '—';
    if (s) {
      const ci = s.meanConfidenceInterval;
      meanCI = ci ? `${fixed(s.mean, decimals)} ± ${fixed((ci.high - ci.low) / 2, decimals)} ${unit} (${fixed(ci.low, decimals)}–${fixed(ci.high, decimals)})` : `${fixed(s.mean, decimals)} ${unit} (n = 1)`;
    }
    const wDecimals = decimalsFor(w?.standardError ?? null);
    return {
      key: report.group.key,
      label: report.group.label,
      nUsed: report.values.nUsed,
      excluded,
      meanCI,
      median: s ? `${fixed(s.median, decimals)} ${unit}` : '—',
      iqr: s ? `${formatValue(s.interquartileRange, 2)} ${unit}` : '—',
      weighted: w ? `${fixed(w.weightedMean, wDecimals)} ± ${fixed(w.standardError, wDecimals)} ${unit}${report.missingErrors ? ` (${report.missingErrors} without error)` : ''}` : '—',
      birge: w?.birgeRatio === null || w?.birgeRatio === undefined ? '—' : formatValue(w.birgeRatio, 3),
      verdict: w ? w.verdict : 'no fit errors',
      spreadExceedsErrors: w?.spreadExceedsErrors ?? false,
    };
  });
}

/** One row of the pairwise table, as text. */
export interface PairRow {
  key: string;
  labelA: string;
  labelB: string;
  /** 'n used (left out)' of each group. */
  nA: string;
  nB: string;
  difference: string;
  interval: string;
  welchP: string;
  holmP: string;
  mannWhitneyP: string;
  mannWhitneyMethod: string;
  cohensD: string;
  /** Welch p as a number, for ordering and tests; null without a test. */
  welchPValue: number | null;
  sentence: string;
}

/**
 * The one-line answer for a pair, as the report words it: which group is higher, by how much, the
 * CI of the difference and Welch's p.
 * @example pairSentence(pair, 95) // 'A-gold is higher than A-graphite by 0.29 eV (95 % CI 0.26–0.32), Welch p = 2.8e-14'
 */
export function pairSentence(pair: GroupComparison, level: number): string {
  const welch = pair.welch;
  if (!welch) return `${pair.labelA} and ${pair.labelB}: ${pair.note ?? 'not enough curves to compare'}.`;
  const { low, high } = welch.confidenceInterval;
  const decimals = decimalsFor((high - low) / 2);
  const p = `Welch p = ${formatP(welch.pValue)}`;
  const difference = welch.differenceOfMeans;
  if (low > 0 || high < 0) {
    const word = low > 0 ? 'higher' : 'lower';
    const sign = low > 0 ? 1 : -1;
    const [from, to] = sign > 0 ? [low, high] : [-high, -low];
    return `${pair.labelA} is ${word} than ${pair.labelB} by ${fixed(sign * difference, decimals)} ${pair.unit} (${level} % CI ${fixed(from, decimals)}–${fixed(to, decimals)}), ${p}`;
  }
  return `${pair.labelA} and ${pair.labelB} show no clear difference: ${fixed(difference, decimals)} ${pair.unit} (${level} % CI ${fixed(low, decimals)} to ${fixed(high, decimals)} includes 0), ${p}`;
}

/**
 * The pairwise table: difference A − B with its CI, Welch p (and Holm-adjusted), Mann–Whitney p
 * and its method, Cohen's d, and the counts, with the one-line answer of each pair.
 * @example pairRows(comparison)[0].welchP // '2.8e-14'
 */
export function pairRows(comparison: RunComparison): PairRow[] {
  const level = Math.round(comparison.confidenceLevel * 100);
  return comparison.pairs.map((pair) => {
    const w = pair.welch;
    const u = pair.mannWhitney;
    const decimals = w ? decimalsFor((w.confidenceInterval.high - w.confidenceInterval.low) / 2) : 3;
    return {
      key: `${pair.keyA}\u0000${pair.keyB}`,
      labelA: pair.labelA,
      labelB: pair.labelB,
      nA: `${pair.nUsedA} (${pair.nExcludedA})`,
      nB: `${pair.nUsedB} (${pair.nExcludedB})`,
      difference: w ? `${fixed(w.differenceOfMeans, decimals)} ${pair.unit}` : '—',
      interval: w ? `${fixed(w.confidenceInterval.low, decimals)} to ${fixed(w.confidenceInterval.high, decimals)}` : '—',
      welchP: w ? formatP(w.pValue) : '—',
      holmP: formatP(pair.welchPValueHolm),
      mannWhitneyP: u ? formatP(u.pValue) : '—',
      mannWhitneyMethod: u ? (u.method === 'exact' ? 'exact' : u.hasTies ? 'normal, ties' : 'normal') : (pair.note ?? '—'),
      cohensD: pair.effectSize ? formatValue(pair.effectSize.cohensD, 3) : '—',
      welchPValue: w ? w.pValue : null,
      sentence: pairSentence(pair, level),
    };
  });
}

/**
 * Words for the drift panel: the Theil–Sen slope with its CI, and the change points.
 * @example driftSummary(report, 95) // 'Theil–Sen slope 0.0012 eV per curve (95 % CI …): no clear drift. No step found.'
 */
export function driftSummary(report: GroupReport, level: number, unit: string): string {
  const drift = report.drift;
  const trend = drift.trend;
  const trendText = trend
    ? `Theil–Sen slope ${formatValue(trend.slope, 2)} ${drift.slopeUnit}${
        trend.slopeConfidenceInterval
          ? ` (${level} % CI ${formatValue(trend.slopeConfidenceInterval.low, 2)} to ${formatValue(trend.slopeConfidenceInterval.high, 2)})${
              trend.slopeConfidenceInterval.low > 0 || trend.slopeConfidenceInterval.high < 0 ? ': a drift' : ': no clear drift'
            }`
          : ''
      }`
    : 'Too few used curves for a trend';
  const changes = drift.changePoints.length
    ? `Likely tip change${drift.changePoints.length > 1 ? 's' : ''}: ${drift.changePoints
        .map((change) => `after ${change.curveIdBefore} (step ${formatValue(change.stepSize, 2)} ${unit}, adjusted p = ${formatP(change.adjustedPValue)})`)
        .join('; ')}.`
    : 'No step found.';
  return `${trendText}. ${changes}`;
}
