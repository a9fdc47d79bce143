/**
 * The self-contained HTML report of a run comparison: one string with inline CSS (screen and
 * print), inline SVG plots and tables, no script, no external request (a Content-Security-Policy
 * forbids any), every text from data escaped. Pure: the CLI writes it to a file, the dashboard
 * offers it as a download. The numbers come from compareRuns, the same as the comparison view.
 */
import {
  compareRuns,
  FLAG_CODES,
  MANN_WHITNEY_EXACT_MAXIMUM_TOTAL,
  type CurveResult,
  type GroupComparison,
  type GroupReport,
  type RunComparison,
  type CompareRunsInput,
} from '../analysis/index.ts';
import { decimalsForUncertainty, escapeHtml, formatFixed, formatPValue, formatSignificant } from './reportFormat.ts';
import { driftPlotSvg, gridMapSvg, REPORT_PLOT_COLOURS, stripBoxPlotSvg } from './reportSvg.ts';

/** What a report is made from: a comparison's input plus what the page shows about it. */
export interface ReportInput extends CompareRunsInput {
  /** The analysis settings the results were fitted with (shown as a table). */
  readonly settings: unknown;
  /** Heading of the report; default 'Burrow report: <quantity> by <grouping>'. */
  readonly title?: string;
  /** When it was made, as text (e.g. an ISO 8601 time); omitted when absent, so tests stay clock-free. */
  readonly generatedAt?: string;
  /** Where the results came from, e.g. 'results.json' or 'sample-data (fitted for this report)'. */
  readonly source?: string;
}

const CSS = `
:root { --ink: ${REPORT_PLOT_COLOURS.ink}; --muted: #52606d; --rule: #cbd2d9; --band: #f5f7fa; --accent: ${REPORT_PLOT_COLOURS.used}; }
* { box-sizing: border-box; }
body { font-family: system-ui, -apple-system, "Segoe UI", Roboto, "Helvetica Neue", Arial, sans-serif; color: var(--ink); margin: 0 auto; max-width: 1180px; padding: 24px 28px 48px; line-height: 1.45; font-size: 15px; }
h1 { font-size: 1.6em; margin: 0 0 4px; }
h2 { font-size: 1.25em; margin: 32px 0 8px; padding-bottom: 4px; border-bottom: 2px solid var(--accent); }
h3 { font-size: 1.05em; margin: 20px 0 6px; }
p.meta, .note, figcaption { color: var(--muted); font-size: 0.9em; }
nav.contents { font-size: 0.9em; margin: 12px 0 0; }
nav.contents a { margin-right: 14px; color: var(--accent); }
.answer { background: var(--band); border-left: 4px solid var(--accent); padding: 10px 16px; margin: 12px 0; }
.answer li { margin: 6px 0; }
table { border-collapse: collapse; margin: 8px 0 12px; font-size: 0.88em; font-variant-numeric: tabular-nums; }
th, td { border-bottom: 1px solid var(--rule); padding: 4px 8px; text-align: left; vertical-align: top; }
th { background: var(--band); font-weight: 600; }
td.number, th.number { text-align: right; white-space: nowrap; }
table.pairwise td:nth-child(-n+2) { white-space: nowrap; }
.scroll { overflow-x: auto; }
figure { margin: 8px 0 16px; }
svg.plot { max-width: 100%; height: auto; display: block; }
.caution { border: 1px solid #d9a441; background: #fff8e6; padding: 10px 16px; }
code { font-size: 0.92em; }
@media print {
  @page { margin: 14mm; }
  body { max-width: none; padding: 0; font-size: 10pt; color: #000; }
  nav.contents { display: none; }
  h2 { break-after: avoid-page; }
  figure, table, .answer, .caution { break-inside: avoid-page; }
  .scroll { overflow: visible; }
  table { font-size: 8pt; }
  * { -webkit-print-color-adjust: exact; print-color-adjust: exact; }
}
`;

const SOURCES: readonly string[] = [
  'Student (W. S. Gosset), “The probable error of a mean”, Biometrika 6, 1–25 (1908): the t interval of a mean.',
  'B. L. Welch, “The generalization of ‘Student’s’ problem when several different population variances are involved”, Biometrika 34, 28–35 (1947); F. E. Satterthwaite, Biometrics Bull. 2, 110–114 (1946): the unequal-variance test and its degrees of freedom.',
  'H. B. Mann & D. R. Whitney, “On a test of whether one of two random variables is stochastically larger than the other”, Ann. Math. Stat. 18, 50–60 (1947); tie correction as in E. L. Lehmann, Nonparametrics (1975) [from memory].',
  'J. Cohen, Statistical Power Analysis for the Behavioral Sciences, 2nd ed. (1988); L. V. Hedges, J. Educ. Stat. 6, 107–128 (1981): standardised mean difference and its small-sample correction.',
  'S. Holm, “A simple sequentially rejective multiple test procedure”, Scand. J. Stat. 6, 65–70 (1979).',
  'R. T. Birge, “The calculation of errors by the method of least squares”, Phys. Rev. 40, 207–227 (1932); P. R. Bevington & D. K. Robinson, Data Reduction and Error Analysis, 3rd ed. (2003) §4.1 [from memory]: weighted mean and the Birge ratio.',
  'H. Theil (1950) and P. K. Sen, “Estimates of the regression coefficient based on Kendall’s tau”, J. Am. Stat. Assoc. 63, 1379–1389 (1968): the robust trend and its interval.',
  'D. M. Hawkins, J. Am. Stat. Assoc. 72, 180–186 (1977): the single-step change test; A. J. Scott & M. Knott, Biometrics 30, 507–512 (1974) [from memory]: binary segmentation.',
  'R. J. Hyndman & Y. Fan, “Sample quantiles in statistical packages”, Am. Stat. 50, 361–365 (1996): quartiles of type 7.',
  'J. W. Tukey, Exploratory Data Analysis (1977) [from memory]: box plots with 1.5 IQR whiskers.',
  'Colour maps: viridis (S. van der Walt & N. Smith, 2015 [from memory]) and cividis (J. R. Nuñez, C. R. Anderton & R. S. Renslow, PLoS ONE 13, e0199239, 2018), as in d3-scale-chromatic.',
  'Computation: simple-statistics (means, medians, variances, quantiles, rank sums); t and χ² tails from the regularised incomplete beta and gamma functions (Numerical Recipes, 3rd ed., §6.2 and §6.4). Every statistic is tested against scipy 1.17 and statsmodels 0.15 values.',
];

function groupingWords(input: ReportInput): string {
  if (input.groups) return 'custom groups';
  const grouping = input.grouping ?? { by: 'run' };
  if (grouping.by === 'run') return 'run';
  if (grouping.by === 'file') return 'file';
  if (grouping.by === 'metadata') return `metadata entry “${grouping.key}”`;
  return 'user tags';
}

function capitalised(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

function interval(low: number, high: number, decimals: number, unit: string): string {
  return `${formatFixed(low, decimals)} to ${formatFixed(high, decimals)} ${unit}`;
}

function numberCell(text: string): string {
  return `<td class="number">${escapeHtml(text)}</td>`;
}

function textCell(text: string): string {
  return `<td>${escapeHtml(text)}</td>`;
}

function headerRow(headers: readonly (string | [string, 'number'])[]): string {
  return `<tr>${headers.map((header) => (Array.isArray(header) ? `<th class="number">${escapeHtml(header[0])}</th>` : `<th>${escapeHtml(header)}</th>`)).join('')}</tr>`;
}

/** Decimals for the values of one group: two significant figures of its standard error of the mean (or SD, or fit error). */
function groupDecimals(report: GroupReport): number {
  const summary = report.summary;
  const scale = summary?.standardErrorOfMean ?? report.weighted?.standardError ?? null;
  return scale !== null && scale > 0 ? decimalsForUncertainty(scale) : 3;
}

/** One sentence answering "do A and B differ, and by how much". */
function pairSentence(pair: GroupComparison, level: number): string {
  const unit = pair.unit;
  const name = `${pair.labelA} − ${pair.labelB}`;
  const welch = pair.welch;
  if (!welch) {
    return `<li><strong>${escapeHtml(name)}</strong>: ${escapeHtml(pair.note ?? 'not enough curves to compare')}.</li>`;
  }
  const halfWidth = (welch.confidenceInterval.high - welch.confidenceInterval.low) / 2;
  const decimals = decimalsForUncertainty(halfWidth);
  const parts = [
    `<strong>${escapeHtml(name)}</strong> = <strong>${escapeHtml(formatFixed(welch.differenceOfMeans, decimals))} ${escapeHtml(unit)}</strong>`,
    ` (${level} % CI ${escapeHtml(interval(welch.confidenceInterval.low, welch.confidenceInterval.high, decimals, unit))})`,
    `; Welch p = ${escapeHtml(formatPValue(welch.pValue))}`,
    pair.welchPValueHolm !== null ? ` (Holm-adjusted ${escapeHtml(formatPValue(pair.welchPValueHolm))})` : '',
    pair.mannWhitney ? `, Mann–Whitney p = ${escapeHtml(formatPValue(pair.mannWhitney.pValue))} (${pair.mannWhitney.method})` : '',
    pair.effectSize?.cohensD !== null && pair.effectSize?.cohensD !== undefined ? `, Cohen’s d = ${escapeHtml(formatSignificant(pair.effectSize.cohensD, 2))}` : '',
    `; n = ${pair.nUsedA} and ${pair.nUsedB} curves`,
  ];
  const low = welch.confidenceInterval.low;
  const high = welch.confidenceInterval.high;
  const verdict =
    low > 0
      ? ` ${escapeHtml(pair.labelA)} is higher.`
      : high < 0
        ? ` ${escapeHtml(pair.labelA)} is lower.`
        : ' The interval includes 0: no clear difference with these curves.';
  return `<li>${parts.join('')}.${verdict}</li>`;
}

function summaryTable(comparison: RunComparison): string {
  const unit = comparison.quantity.unit;
  const level = Math.round(comparison.confidenceLevel * 100);
  const rows = comparison.groups.map((report) => {
    const s = report.summary;
    const decimals = groupDecimals(report);
    const { flagged, noValue } = report.values.excluded;
    const excluded = [flagged ? `${flagged} flagged` : '', noValue ? `${noValue} failed fit${noValue === 1 ? '' : 's'}` : ''].filter(Boolean).join(', ') || 'none';
    if (!s) {
      return `<tr>${textCell(report.group.label)}${numberCell('0')}${textCell(excluded)}${'<td class="number">—</td>'.repeat(6)}</tr>`;
    }
    const ci = s.meanConfidenceInterval ? interval(s.meanConfidenceInterval.low, s.meanConfidenceInterval.high, decimals, unit) : '—';
    return `<tr>${textCell(report.group.label)}${numberCell(String(s.n))}${textCell(excluded)}${numberCell(`${formatFixed(s.mean, decimals)} ${unit}`)}${numberCell(ci)}${numberCell(
      s.standardDeviation === null ? '—' : `${formatSignificant(s.standardDeviation, 2)} ${unit}`,
    )}${numberCell(`${formatFixed(s.median, decimals)} ${unit}`)}${numberCell(`${formatSignificant(s.interquartileRange, 2)} ${unit}`)}${numberCell(interval(s.firstQuartile, s.thirdQuartile, decimals, unit))}</tr>`;
  });
  return `<div class="scroll"><table class="group-summary"><thead>${headerRow([
    'group',
    ['n used', 'number'],
    'left out',
    ['mean', 'number'],
    [`${level} % CI of the mean`, 'number'],
    ['SD', 'number'],
    ['median', 'number'],
    ['IQR', 'number'],
    ['Q1 to Q3', 'number'],
  ])}</thead><tbody>${rows.join('')}</tbody></table></div>`;
}

function weightedTable(comparison: RunComparison): string {
  const unit = comparison.quantity.unit;
  const rows = comparison.groups.map((report) => {
    const w = report.weighted;
    if (!w) return `<tr>${textCell(report.group.label)}${numberCell('0')}${'<td class="number">—</td>'.repeat(5)}${textCell('no fit errors')}</tr>`;
    const decimals = decimalsForUncertainty(w.standardError);
    const missing = report.missingErrors ? ` (${report.missingErrors} without error)` : '';
    return `<tr>${textCell(report.group.label)}${numberCell(`${w.n}${missing}`)}${numberCell(`${formatFixed(w.weightedMean, decimals)} ± ${formatFixed(w.standardError, decimals)} ${unit}`)}${numberCell(
      `± ${formatFixed(w.scaledStandardError, decimals)} ${unit}`,
    )}${numberCell(w.reducedChiSquare === null ? '—' : formatSignificant(w.reducedChiSquare, 3))}${numberCell(w.birgeRatio === null ? '—' : formatSignificant(w.birgeRatio, 3))}${numberCell(
      formatPValue(w.chiSquarePValue),
    )}${textCell(w.verdict)}</tr>`;
  });
  return `<div class="scroll"><table class="weighted-summary"><thead>${headerRow([
    'group',
    ['curves', 'number'],
    ['weighted mean ± 1/√Σw', 'number'],
    ['error × max(1, Birge)', 'number'],
    ['χ²/(n − 1)', 'number'],
    ['Birge ratio', 'number'],
    ['χ² p', 'number'],
    'spread vs fit errors',
  ])}</thead><tbody>${rows.join('')}</tbody></table></div>`;
}

function pairTable(comparison: RunComparison): string {
  const unit = comparison.quantity.unit;
  const level = Math.round(comparison.confidenceLevel * 100);
  const rows = comparison.pairs.map((pair) => {
    const w = pair.welch;
    const u = pair.mannWhitney;
    const e = pair.effectSize;
    const decimals = w ? decimalsForUncertainty((w.confidenceInterval.high - w.confidenceInterval.low) / 2) : 3;
    return `<tr>${textCell(pair.labelA)}${textCell(pair.labelB)}${numberCell(`${pair.nUsedA} (${pair.nExcludedA})`)}${numberCell(`${pair.nUsedB} (${pair.nExcludedB})`)}${numberCell(
      w ? `${formatFixed(w.differenceOfMeans, decimals)} ${unit}` : '—',
    )}${numberCell(w ? interval(w.confidenceInterval.low, w.confidenceInterval.high, decimals, unit) : '—')}${numberCell(w ? formatSignificant(w.tStatistic, 3) : '—')}${numberCell(
      w ? formatSignificant(w.degreesOfFreedom, 3) : '—',
    )}${numberCell(w ? formatPValue(w.pValue) : '—')}${numberCell(formatPValue(pair.welchPValueHolm))}${numberCell(u ? formatSignificant(u.uStatisticA, 4) : '—')}${numberCell(u ? formatPValue(u.pValue) : '—')}${textCell(
      u ? (u.method === 'exact' ? 'exact' : u.hasTies ? 'normal, ties' : 'normal') : (pair.note ?? '—'),
    )}${numberCell(e ? formatSignificant(e.cohensD, 3) : '—')}${numberCell(e ? formatSignificant(e.hedgesG, 3) : '—')}</tr>`;
  });
  return `<div class="scroll"><table class="pairwise"><thead>${headerRow([
    'A',
    'B',
    ['n A (left out)', 'number'],
    ['n B (left out)', 'number'],
    ['A − B', 'number'],
    [`${level} % CI (Welch)`, 'number'],
    ['Welch t', 'number'],
    ['df', 'number'],
    ['p', 'number'],
    ['p (Holm)', 'number'],
    ['U (A)', 'number'],
    ['p (Mann–Whitney)', 'number'],
    'M–W method',
    ['Cohen’s d', 'number'],
    ['Hedges’ g', 'number'],
  ])}</thead><tbody>${rows.join('')}</tbody></table></div>`;
}

function driftSection(comparison: RunComparison): string {
  const unit = comparison.quantity.unit;
  const level = Math.round(comparison.confidenceLevel * 100);
  const parts: string[] = [];
  const tooFew: string[] = [];
  comparison.groups.forEach((report) => {
    const drift = report.drift;
    if (report.values.nUsed < 3) {
      tooFew.push(report.group.label);
      return;
    }
    const trend = drift.trend;
    const trendText = trend
      ? `Theil–Sen slope ${formatSignificant(trend.slope, 2)} ${drift.slopeUnit}${
          trend.slopeConfidenceInterval
            ? ` (${level} % CI ${formatSignificant(trend.slopeConfidenceInterval.low, 2)} to ${formatSignificant(trend.slopeConfidenceInterval.high, 2)})${
                trend.slopeConfidenceInterval.low > 0 || trend.slopeConfidenceInterval.high < 0 ? ': a drift' : ': no clear drift'
              }`
            : ''
        }`
      : 'too few used curves for a trend';
    const changeText = drift.changePoints.length
      ? `Likely tip change${drift.changePoints.length > 1 ? 's' : ''}: ${drift.changePoints
          .map((change) => `between ${change.curveIdBefore} and ${change.curveIdAfter} (step ${formatSignificant(change.stepSize, 2)} ${unit}, adjusted p = ${formatPValue(change.adjustedPValue)})`)
          .join('; ')}.`
      : 'No step found (change-point test, false-alarm rate 1e-3 per search).';
    const order = drift.abscissa === 'time' ? 'against the acquisition time from the metadata' : 'in acquisition order (file order, then curve number)';
    const raster = report.grid ? ' These curves form a map: their order follows the raster, so a spatial pattern shows here as drift.' : '';
    parts.push(
      `<figure class="drift-figure"><h3>${escapeHtml(report.group.label)}</h3>${driftPlotSvg(drift, { unit, valueLabel: comparison.quantity.label })}<figcaption>${escapeHtml(
        `${capitalised(comparison.quantity.label)} ${order}, hollow points flagged. ${trendText}. ${changeText}${raster}`,
      )}</figcaption></figure>`,
    );
  });
  if (tooFew.length) parts.push(`<p class="note">${escapeHtml(`Fewer than 3 used curves, no drift plot: ${tooFew.join(', ')}.`)}</p>`);
  return parts.join('');
}

function mapSection(comparison: RunComparison): string {
  const parts: string[] = [];
  comparison.groups.forEach((report, i) => {
    const map = report.grid;
    if (!map) return;
    const flagged = map.cells.filter((cell) => cell.flagged).length;
    const regular = map.regular ? '' : ' The positions do not lie on a regular lattice; squares are placed at the nearest lattice point.';
    parts.push(
      `<figure class="map-figure"><h3>${escapeHtml(report.group.label)}</h3>${gridMapSvg(map, `map-${i}`)}<figcaption>${escapeHtml(
        `${capitalised(comparison.quantity.label)} at ${map.cells.length} sites (${map.columns} × ${map.rows}, pitch ${formatSignificant(map.spacingXNm, 3)} nm × ${formatSignificant(map.spacingYNm, 3)} nm); colour scale ${map.scale?.colourMap ?? 'none'} (perceptually uniform) in ${map.unit}. Crossed squares: flagged sites (${flagged}); grey: every curve there left out.${regular}`,
      )}</figcaption></figure>`,
    );
  });
  return parts.join('');
}

function flagSection(results: readonly CurveResult[]): string {
  const counts = new Map<string, number>();
  const flagged = results.filter((result) => result.flags.length > 0);
  for (const result of flagged) for (const code of new Set(result.flags.map((flag) => flag.code))) counts.set(code, (counts.get(code) ?? 0) + 1);
  if (flagged.length === 0) return `<p>No curve carries a quality flag (${results.length} curves).</p>`;
  const known = FLAG_CODES.filter((code) => counts.has(code));
  const others = [...counts.keys()].filter((code) => !(FLAG_CODES as readonly string[]).includes(code));
  const countRows = [...known, ...others].map((code) => `<tr>${textCell(code)}${numberCell(String(counts.get(code)))}</tr>`).join('');
  const curveRows = flagged
    .map(
      (result) =>
        `<tr>${textCell(result.file)}${textCell(result.curve)}${textCell(result.run)}<td>${result.flags
          .map((flag) => `<strong>${escapeHtml(flag.code)}</strong>: ${escapeHtml(flag.reason)}`)
          .join('<br>')}</td></tr>`,
    )
    .join('');
  return `<p>${flagged.length} of ${results.length} curves carry at least one flag.</p><table class="flag-counts"><thead>${headerRow(['flag', ['curves', 'number']])}</thead><tbody>${countRows}</tbody></table><div class="scroll"><table class="flagged-curves"><thead>${headerRow(['file', 'curve', 'run', 'flags and reasons'])}</thead><tbody>${curveRows}</tbody></table></div>`;
}

function settingsSection(settings: unknown): string {
  if (settings === null || typeof settings !== 'object') return '<p class="note">No settings were recorded with these results.</p>';
  const rows = Object.entries(settings as Record<string, unknown>).map(([key, value]) => {
    const text = value === null ? 'null (not set)' : typeof value === 'object' ? JSON.stringify(value) : String(value);
    return `<tr><td><code>${escapeHtml(key)}</code></td><td><code>${escapeHtml(text)}</code></td></tr>`;
  });
  return `<table class="settings"><thead>${headerRow(['setting', 'value'])}</thead><tbody>${rows.join('')}</tbody></table>`;
}

function methodSection(comparison: RunComparison): string {
  const level = Math.round(comparison.confidenceLevel * 100);
  const flagged = comparison.includeFlagged
    ? 'Flagged curves are <strong>included</strong> in the statistics (and drawn hollow).'
    : 'Flagged curves are drawn hollow and <strong>left out</strong> of the statistics; curves whose fit failed are left out too. The counts are in every table.';
  const items = [
    `Each curve contributes one fitted value of ${escapeHtml(comparison.quantity.label)} (${escapeHtml(comparison.quantity.unit)}). ${flagged}`,
    `Mean with a ${level} % Student-t interval x̄ ± t·s/√n; median and quartiles by linear interpolation (type 7); box whiskers reach the furthest value within 1.5 IQR.`,
    'Weighted mean x̄_w = Σw·x/Σw with w = 1/σ² from each fit; its error 1/√Σw holds only if the fit errors explain the scatter. The Birge ratio √(χ²/(n − 1)) compares the curve-to-curve scatter with the fit errors: near 1 they agree; well above 1 (χ² p < 0.05) the curves really differ (site-to-site variation or an unstable tip), and the error scaled by the Birge ratio is the honest one.',
    `Pairs: difference of means A − B with its ${level} % Welch interval and Welch’s t-test (no equal-variance assumption, Welch–Satterthwaite df); Mann–Whitney U, exact when there are no ties and n_A + n_B ≤ ${MANN_WHITNEY_EXACT_MAXIMUM_TOTAL}, else the normal approximation with tie and continuity corrections (the table says which); Cohen’s d with the pooled SD and Hedges’ g = d·(1 − 3/(4N − 9)). p-values are two-sided; with many pairs, read the Holm-adjusted column.`,
    'Curves from one run share a tip and a session, so they are not fully independent repeats: a tiny p says the runs differ, not why (tip, sample or drift). Look at the drift plots before trusting a difference.',
    'Drift: Theil–Sen line (median of pairwise slopes) with Sen’s interval; change points by a step test allowing a linear trend (Bonferroni false-alarm rate 1e-3), repeated on each side of a step (binary segmentation).',
    'Maps: sites on the lattice inferred from the positions (median step between neighbouring distinct coordinates, steps over a missing row left out); a site shows the median of its used curves on a perceptually uniform colour scale.',
  ];
  return `<ul>${items.map((item) => `<li>${item}</li>`).join('')}</ul><h3>Sources</h3><ol class="sources">${SOURCES.map((source) => `<li>${escapeHtml(source)}</li>`).join('')}</ol>`;
}

const CAUTIONS = `<div class="caution"><p><strong>Safety.</strong> Burrow only analyses data; it does not control an instrument. Scanning-tunnelling microscopes use high voltages (piezo drives, some bias supplies), ultra-high-vacuum systems (bake-outs, viewports under load, heavy flanges) and often cryogens (liquid nitrogen and helium: cold burns, oxygen displacement in closed rooms, pressure build-up). Follow your laboratory’s local safety rules, training and the instrument maker’s instructions.</p><p><strong>Interpretation.</strong> An apparent barrier from I(z) is not a work function: it is lowered by the image potential and by tip–sample forces, and depends on the tip. Compare runs taken with the same tip and settings where you can, and treat the numbers here as a summary of your fits, not as calibrated constants.</p></div>`;

/**
 * Write the comparison report as one self-contained HTML page (inline CSS with a print
 * stylesheet, inline SVG, no script, no external request): a plain-words answer for every pair of
 * groups (difference with its CI and p-values), the strip-and-box plot, summary and weighted
 * tables (with the Birge ratio), the pairwise table, drift plots with change points, grid maps,
 * the flags summary, the settings, the method with its sources, and the safety cautions. Every
 * text that comes from data (file names, curve ids, metadata, labels, flag reasons) is escaped.
 * Numbers in the quantity's unit; values rounded to two significant figures of their uncertainty.
 * Source: compareRuns and the sources listed in the report.
 * @example writeReport({ settings, results }).startsWith('<!doctype html>') // true
 */
export function writeReport(input: ReportInput): string {
  if (input === null || typeof input !== 'object' || !Array.isArray(input.results)) {
    throw new TypeError(`writeReport: input.results must be an array of curve results, got ${input === null || typeof input !== 'object' ? String(input) : typeof input.results}`);
  }
  const comparison = compareRuns({
    results: input.results,
    quantity: input.quantity,
    grouping: input.grouping,
    groups: input.groups,
    metadata: input.metadata,
    includeFlagged: input.includeFlagged,
    confidenceLevel: input.confidenceLevel,
    timeSByCurve: input.timeSByCurve,
    colourMap: input.colourMap,
  });
  const level = Math.round(comparison.confidenceLevel * 100);
  const by = groupingWords(input);
  const title = input.title ?? `Burrow report: ${comparison.quantity.label} by ${by}`;
  const meta = [
    input.generatedAt ? `Made ${input.generatedAt}` : '',
    input.source ? `from ${input.source}` : '',
    `${input.results.length} curves, ${comparison.groups.length} groups by ${by}`,
    comparison.includeFlagged ? 'flagged curves included' : 'flagged curves left out',
  ].filter(Boolean);
  const pairsShown = comparison.pairs.slice(0, 21);
  const answer = comparison.pairs.length
    ? `<ul>${pairsShown.map((pair) => pairSentence(pair, level)).join('')}</ul>${
        comparison.pairs.length > pairsShown.length ? `<p class="note">${comparison.pairs.length - pairsShown.length} more pairs in the pairwise table.</p>` : ''
      }`
    : '<p>Fewer than two groups have values of this quantity, so there is nothing to compare.</p>';
  const without = comparison.groupsWithoutQuantity.length
    ? `<p class="note">Groups without ${escapeHtml(comparison.quantity.label)} (other curve kind): ${escapeHtml(comparison.groupsWithoutQuantity.join(', '))}.</p>`
    : '';
  const maps = mapSection(comparison);
  const sections = [
    ['answer', 'Answer'],
    ['comparison', 'Comparison'],
    ['weighted', 'Weighted summary'],
    ['pairs', 'Pairwise comparisons'],
    ['drift', 'Drift and stability'],
    ...(maps ? [['maps', 'Maps']] : []),
    ['flags', 'Quality flags'],
    ['settings', 'Settings'],
    ['method', 'Method and sources'],
    ['cautions', 'Cautions'],
  ];
  return [
    '<!doctype html>',
    '<html lang="en"><head><meta charset="utf-8">',
    `<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'; img-src data:">`,
    '<meta name="viewport" content="width=device-width, initial-scale=1">',
    `<title>${escapeHtml(title)}</title><style>${CSS}</style></head><body>`,
    `<header><h1>${escapeHtml(title)}</h1><p class="meta">${escapeHtml(meta.join(' · '))}</p>`,
    `<nav class="contents">${sections.map(([id, name]) => `<a href="#${id}">${name}</a>`).join('')}</nav></header>`,
    `<section id="answer"><h2>Answer</h2><div class="answer">${answer}</div>${without}</section>`,
    `<section id="comparison"><h2>Comparison</h2><figure>${stripBoxPlotSvg(comparison)}<figcaption>${escapeHtml(
      `Every curve is a point: filled = used, hollow = flagged (${comparison.includeFlagged ? 'included' : 'left out'}); triangles mark values off the scale. Box: median and interquartile range, whiskers 1.5 IQR; diamond and bar: mean and ${level} % CI. Hover a point for its curve.`,
    )}</figcaption></figure>${summaryTable(comparison)}</section>`,
    `<section id="weighted"><h2>Weighted summary</h2><p class="note">Inverse-variance weighted mean of each group from the fit errors, and whether the curve-to-curve spread is larger than those errors.</p>${weightedTable(comparison)}</section>`,
    `<section id="pairs"><h2>Pairwise comparisons</h2>${comparison.pairs.length ? pairTable(comparison) : '<p class="note">No pair to compare.</p>'}</section>`,
    `<section id="drift"><h2>Drift and stability</h2>${driftSection(comparison)}</section>`,
    maps ? `<section id="maps"><h2>Maps</h2>${maps}</section>` : '',
    `<section id="flags"><h2>Quality flags</h2>${flagSection(input.results)}</section>`,
    `<section id="settings"><h2>Settings</h2>${settingsSection(input.settings)}</section>`,
    `<section id="method"><h2>Method and sources</h2>${methodSection(comparison)}</section>`,
    `<section id="cautions"><h2>Cautions</h2>${CAUTIONS}</section>`,
    '<footer class="note"><p>Made with Burrow. All numbers were computed on this machine from the curves listed; no data left it.</p></footer>',
    '</body></html>',
    '',
  ].join('\n');
}
