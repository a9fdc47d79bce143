/**
 * Inline SVG plots of a run comparison, as strings (no DOM): the strip-and-box plot of every group,
 * the drift plot of one group and the map of a grid. d3 supplies only scales, ticks and number
 * formats; every text from data is escaped. The SVGs carry no xmlns (inline in HTML it is implied)
 * and no external references. Each point and cell has a <title> (hover text) and a data-curve-id
 * attribute, so a page can open the curve behind it.
 */
import { scaleLinear, type ScaleLinear } from 'd3';
import type { DriftAnalysis, GridMap, RunComparison } from '../analysis/index.ts';
import { escapeHtml, formatSignificant } from './reportFormat.ts';

/**
 * Colours of the plots (#rrggbb), also used by the report's stylesheet: dark teal for used curves,
 * grey for flagged ones, rust for means and trends, violet for change points. Burrow's own choice,
 * picked for contrast in print and to stay apart for red–green colour-blind readers.
 * Source: Burrow's own palette (common practice, no source).
 * @example REPORT_PLOT_COLOURS.used // '#0b6e75'
 */
export const REPORT_PLOT_COLOURS = Object.freeze({
  ink: '#1f2933',
  grid: '#e4e7eb',
  used: '#0b6e75',
  flagged: '#5b6470',
  box: '#dfe6ea',
  mean: '#a63d12',
  trend: '#a63d12',
  change: '#7a3ea8',
  empty: '#eef0f2',
});

const FONT = 'font-family="system-ui, sans-serif"';

function fixed(value: number): string {
  return Number.isFinite(value) ? String(Math.round(value * 10) / 10) : '0';
}

function tickText(scale: ScaleLinear<number, number>, count: number): (value: number) => string {
  const format = scale.tickFormat(count);
  return (value) => format(value).replace(/^-|^\u2212/, '\u2212');
}

function truncate(text: string, length: number): string {
  return text.length > length ? `${text.slice(0, length - 1)}…` : text;
}

/** A padded value domain over the given numbers (±8 % of the span; ±0.5 % of |v| when flat). */
function paddedDomain(values: readonly number[]): [number, number] {
  let low = Math.min(...values);
  let high = Math.max(...values);
  const span = high - low;
  const pad = span > 0 ? 0.08 * span : Math.max(0.005 * Math.abs(low), 1e-6);
  low -= pad;
  high += pad;
  return [low, high];
}

/** A point marker: filled circle when used, hollow when flagged, triangle at the edge when off scale. */
function marker(options: { x: number; y: number; used: boolean; flagged: boolean; offScale: 'above' | 'below' | null; title: string; curveId: string }): string {
  const { x, y, used, flagged, offScale, title, curveId } = options;
  const colour = used && !flagged ? REPORT_PLOT_COLOURS.used : REPORT_PLOT_COLOURS.flagged;
  const fill = flagged ? 'none' : colour;
  const attributes = `data-curve-id="${escapeHtml(curveId)}" class="${flagged ? 'point flagged' : 'point'}"`;
  const tooltip = `<title>${escapeHtml(title)}</title>`;
  if (offScale) {
    const tip = offScale === 'above' ? y - 4 : y + 4;
    const base = offScale === 'above' ? y + 3 : y - 3;
    return `<path ${attributes} d="M${fixed(x)},${fixed(tip)}L${fixed(x - 4)},${fixed(base)}L${fixed(x + 4)},${fixed(base)}Z" fill="${fill}" stroke="${colour}" stroke-width="1.3">${tooltip}</path>`;
  }
  return `<circle ${attributes} cx="${fixed(x)}" cy="${fixed(y)}" r="3.6" fill="${fill}" fill-opacity="${flagged ? 0 : 0.8}" stroke="${colour}" stroke-width="1.3">${tooltip}</circle>`;
}

function pointTitle(point: { file: string; curveId: string; value: number; standardError: number | null; flagCodes: readonly string[]; used: boolean }, unit: string): string {
  const error = point.standardError !== null ? ` ± ${formatSignificant(point.standardError, 2)}` : '';
  const flags = point.flagCodes.length ? ` · flags: ${point.flagCodes.join(', ')}${point.used ? ' (used)' : ' (left out)'}` : '';
  return `${point.curveId}: ${formatSignificant(point.value, 5)}${error} ${unit}${flags}`;
}

function yAxis(scale: ScaleLinear<number, number>, left: number, right: number, title: string, top: number, bottom: number): string {
  const ticks = scale.ticks(6);
  const text = tickText(scale, 6);
  const parts: string[] = [];
  for (const tick of ticks) {
    const y = fixed(scale(tick));
    parts.push(`<line x1="${left}" x2="${fixed(right)}" y1="${y}" y2="${y}" stroke="${REPORT_PLOT_COLOURS.grid}"/>`);
    parts.push(`<text x="${left - 6}" y="${y}" dy="0.32em" text-anchor="end" font-size="11" fill="${REPORT_PLOT_COLOURS.ink}">${escapeHtml(text(tick))}</text>`);
  }
  parts.push(`<line x1="${left}" x2="${left}" y1="${top}" y2="${bottom}" stroke="${REPORT_PLOT_COLOURS.ink}"/>`);
  const middle = fixed((top + bottom) / 2);
  parts.push(`<text transform="translate(${left - 52},${middle}) rotate(-90)" text-anchor="middle" font-size="12" fill="${REPORT_PLOT_COLOURS.ink}">${escapeHtml(title)}</text>`);
  return parts.join('');
}

/**
 * Strip-and-box plot of every group of a comparison: each curve a point (filled when used, hollow
 * when flagged; triangles at the edge for values off the scale, which spans the used values), the
 * box from Q1 to Q3 with the median, whiskers to the furthest used value within 1.5 IQR (Tukey),
 * and beside it the mean with its confidence interval. Horizontal jitter is a fixed golden-ratio
 * sequence, so the plot is the same on every run. Returns an <svg> string in CSS pixels.
 * Source: J. W. Tukey, Exploratory Data Analysis (1977), box plot whiskers [from memory].
 * @example stripBoxPlotSvg(compareRuns({ results })).startsWith('<svg') // true
 */
export function stripBoxPlotSvg(comparison: RunComparison): string {
  const groups = comparison.groups;
  const unit = comparison.quantity.unit;
  const margin = { top: 16, right: 20, bottom: 60, left: 76 };
  const band = 136;
  const plotHeight = 280;
  const width = margin.left + margin.right + Math.max(1, groups.length) * band;
  const height = margin.top + plotHeight + margin.bottom;
  const label = `${comparison.quantity.label} (${unit})`;
  const domainValues: number[] = [];
  for (const report of groups) {
    domainValues.push(...report.values.values);
    const interval = report.summary?.meanConfidenceInterval;
    if (interval) domainValues.push(interval.low, interval.high);
  }
  if (domainValues.length === 0) for (const report of groups) for (const point of report.values.points) domainValues.push(point.value);
  const open = `<svg class="plot strip-box" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}" role="img" aria-label="${escapeHtml(`${label} by group`)}" ${FONT}>`;
  if (domainValues.length === 0) {
    return `${open}<text x="${width / 2}" y="${height / 2}" text-anchor="middle" font-size="13" fill="${REPORT_PLOT_COLOURS.ink}">No curve has a value of ${escapeHtml(comparison.quantity.label)}.</text></svg>`;
  }
  const y = scaleLinear().domain(paddedDomain(domainValues)).nice().range([margin.top + plotHeight, margin.top]);
  const [low, high] = y.domain();
  const parts: string[] = [open];
  parts.push(yAxis(y, margin.left, width - margin.right, label, margin.top, margin.top + plotHeight));
  parts.push(`<line x1="${margin.left}" x2="${width - margin.right}" y1="${margin.top + plotHeight}" y2="${margin.top + plotHeight}" stroke="${REPORT_PLOT_COLOURS.ink}"/>`);
  groups.forEach((report, i) => {
    const centre = margin.left + i * band + band / 2;
    const summary = report.summary;
    if (summary && summary.n >= 2) {
      const used = [...report.values.values].sort((a, b) => a - b);
      const iqr = summary.interquartileRange;
      const lowWhisker = used.find((value) => value >= summary.firstQuartile - 1.5 * iqr) ?? summary.minimum;
      const highWhisker = [...used].reverse().find((value) => value <= summary.thirdQuartile + 1.5 * iqr) ?? summary.maximum;
      const boxLeft = centre - 22;
      parts.push(`<g class="box">`);
      parts.push(`<line x1="${fixed(centre)}" x2="${fixed(centre)}" y1="${fixed(y(lowWhisker))}" y2="${fixed(y(highWhisker))}" stroke="${REPORT_PLOT_COLOURS.ink}"/>`);
      for (const whisker of [lowWhisker, highWhisker]) {
        parts.push(`<line x1="${fixed(centre - 9)}" x2="${fixed(centre + 9)}" y1="${fixed(y(whisker))}" y2="${fixed(y(whisker))}" stroke="${REPORT_PLOT_COLOURS.ink}"/>`);
      }
      const boxTop = y(summary.thirdQuartile);
      const boxHeight = Math.max(1, y(summary.firstQuartile) - boxTop);
      parts.push(
        `<rect x="${fixed(boxLeft)}" y="${fixed(boxTop)}" width="44" height="${fixed(boxHeight)}" fill="${REPORT_PLOT_COLOURS.box}" stroke="${REPORT_PLOT_COLOURS.ink}"><title>${escapeHtml(
          `median ${formatSignificant(summary.median, 5)} ${unit}, IQR ${formatSignificant(summary.firstQuartile, 5)} to ${formatSignificant(summary.thirdQuartile, 5)} ${unit}`,
        )}</title></rect>`,
      );
      parts.push(`<line x1="${fixed(boxLeft)}" x2="${fixed(boxLeft + 44)}" y1="${fixed(y(summary.median))}" y2="${fixed(y(summary.median))}" stroke="${REPORT_PLOT_COLOURS.ink}" stroke-width="2"/>`);
      parts.push(`</g>`);
    }
    report.values.points.forEach((point, k) => {
      const jitter = (((k * 0.6180339887498949) % 1) - 0.5) * 36;
      const offScale = point.value > high ? 'above' : point.value < low ? 'below' : null;
      const py = offScale === 'above' ? margin.top + 4 : offScale === 'below' ? margin.top + plotHeight - 4 : y(point.value);
      parts.push(marker({ x: centre + jitter, y: py, used: point.used, flagged: point.flagged, offScale, title: pointTitle(point, unit), curveId: point.curveId }));
    });
    if (summary) {
      const mx = centre + 38;
      const interval = summary.meanConfidenceInterval;
      const level = Math.round(summary.confidenceLevel * 100);
      const title = interval
        ? `mean ${formatSignificant(summary.mean, 5)} ${unit}, ${level} % CI ${formatSignificant(interval.low, 5)} to ${formatSignificant(interval.high, 5)} ${unit}`
        : `mean ${formatSignificant(summary.mean, 5)} ${unit} (one curve: no CI)`;
      parts.push(`<g class="mean"><title>${escapeHtml(title)}</title>`);
      if (interval) {
        parts.push(`<line x1="${fixed(mx)}" x2="${fixed(mx)}" y1="${fixed(y(interval.low))}" y2="${fixed(y(interval.high))}" stroke="${REPORT_PLOT_COLOURS.mean}" stroke-width="2"/>`);
        for (const end of [interval.low, interval.high]) {
          parts.push(`<line x1="${fixed(mx - 5)}" x2="${fixed(mx + 5)}" y1="${fixed(y(end))}" y2="${fixed(y(end))}" stroke="${REPORT_PLOT_COLOURS.mean}" stroke-width="2"/>`);
        }
      }
      const my = y(summary.mean);
      parts.push(`<path d="M${fixed(mx)},${fixed(my - 5)}L${fixed(mx + 5)},${fixed(my)}L${fixed(mx)},${fixed(my + 5)}L${fixed(mx - 5)},${fixed(my)}Z" fill="${REPORT_PLOT_COLOURS.mean}"/></g>`);
    }
    const labelY = margin.top + plotHeight + 18;
    parts.push(
      `<text x="${fixed(centre)}" y="${labelY}" text-anchor="middle" font-size="12" fill="${REPORT_PLOT_COLOURS.ink}"><title>${escapeHtml(report.group.label)}</title>${escapeHtml(truncate(report.group.label, 20))}</text>`,
    );
    const excluded = report.values.nExcluded ? ` · ${report.values.nExcluded} left out` : '';
    parts.push(`<text x="${fixed(centre)}" y="${labelY + 15}" text-anchor="middle" font-size="11" fill="${REPORT_PLOT_COLOURS.flagged}">n = ${report.values.nUsed}${escapeHtml(excluded)}</text>`);
  });
  parts.push('</svg>');
  return parts.join('');
}

/**
 * Drift plot of one group: the quantity against acquisition order (or minutes since the first
 * curve), each curve a point (hollow when flagged), the Theil–Sen line, and a dashed mark with the
 * step size at each change point. Returns an <svg> string in CSS pixels.
 * Source: driftAnalysis (Theil 1950; Sen 1968; Hawkins 1977).
 * @example driftPlotSvg(report.drift, { unit: 'eV', valueLabel: 'apparent barrier height' }).includes('class="trend"') // true with a trend
 */
export function driftPlotSvg(drift: DriftAnalysis, axis: { readonly unit: string; readonly valueLabel: string }): string {
  const unit = axis.unit;
  const margin = { top: 22, right: 20, bottom: 42, left: 76 };
  const width = 640;
  const height = 230;
  const plotWidth = width - margin.left - margin.right;
  const plotHeight = height - margin.top - margin.bottom;
  const finite = drift.points.filter((point) => Number.isFinite(point.x));
  const used = finite.filter((point) => point.used);
  const open = `<svg class="plot drift" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}" role="img" aria-label="${escapeHtml(`drift of ${drift.label}`)}" ${FONT}>`;
  if (finite.length === 0) return `${open}<text x="${width / 2}" y="${height / 2}" text-anchor="middle" font-size="13">No values.</text></svg>`;
  const xValues = finite.map((point) => point.x);
  const xPad = drift.abscissa === 'order' ? 0.5 : Math.max(0.02 * (Math.max(...xValues) - Math.min(...xValues)), 0.5);
  const x = scaleLinear().domain([Math.min(...xValues) - xPad, Math.max(...xValues) + xPad]).range([margin.left, margin.left + plotWidth]);
  const y = scaleLinear()
    .domain(paddedDomain((used.length ? used : finite).map((point) => point.value)))
    .nice()
    .range([margin.top + plotHeight, margin.top]);
  const [low, high] = y.domain();
  const parts: string[] = [open];
  parts.push(yAxis(y, margin.left, margin.left + plotWidth, `${axis.valueLabel} (${unit})`, margin.top, margin.top + plotHeight));
  const bottom = margin.top + plotHeight;
  parts.push(`<line x1="${margin.left}" x2="${margin.left + plotWidth}" y1="${bottom}" y2="${bottom}" stroke="${REPORT_PLOT_COLOURS.ink}"/>`);
  const xTicks = drift.abscissa === 'order' ? x.ticks(Math.min(10, finite.length)).filter(Number.isInteger) : x.ticks(8);
  const xText = drift.abscissa === 'order' ? (tick: number) => String(tick) : tickText(x, 8);
  for (const tick of xTicks) {
    parts.push(`<line x1="${fixed(x(tick))}" x2="${fixed(x(tick))}" y1="${bottom}" y2="${bottom + 4}" stroke="${REPORT_PLOT_COLOURS.ink}"/>`);
    parts.push(`<text x="${fixed(x(tick))}" y="${bottom + 16}" text-anchor="middle" font-size="11" fill="${REPORT_PLOT_COLOURS.ink}">${escapeHtml(xText(tick))}</text>`);
  }
  const xTitle = drift.abscissa === 'order' ? 'acquisition order (curve number)' : 'time since the first curve (min)';
  parts.push(`<text x="${fixed(margin.left + plotWidth / 2)}" y="${height - 6}" text-anchor="middle" font-size="12" fill="${REPORT_PLOT_COLOURS.ink}">${xTitle}</text>`);
  for (const change of drift.changePoints) {
    const cx = fixed(x(change.x));
    const sign = change.stepSize >= 0 ? '+' : '\u2212';
    parts.push(
      `<g class="change-point"><title>${escapeHtml(`likely tip change between ${change.curveIdBefore} and ${change.curveIdAfter}: step ${formatSignificant(change.stepSize, 3)} ${unit}, adjusted p = ${formatSignificant(change.adjustedPValue, 2)}`)}</title><line x1="${cx}" x2="${cx}" y1="${margin.top}" y2="${bottom}" stroke="${REPORT_PLOT_COLOURS.change}" stroke-width="1.5" stroke-dasharray="5 3"/><text x="${cx}" y="${margin.top - 6}" text-anchor="middle" font-size="11" fill="${REPORT_PLOT_COLOURS.change}">step ${sign}${escapeHtml(formatSignificant(Math.abs(change.stepSize), 2))} ${escapeHtml(unit)}</text></g>`,
    );
  }
  if (drift.trend) {
    const [x0, x1] = x.domain();
    const clampY = (value: number) => Math.min(bottom, Math.max(margin.top, y(value)));
    parts.push(
      `<line class="trend" x1="${fixed(x(x0))}" x2="${fixed(x(x1))}" y1="${fixed(clampY(drift.trend.intercept + drift.trend.slope * x0))}" y2="${fixed(clampY(drift.trend.intercept + drift.trend.slope * x1))}" stroke="${REPORT_PLOT_COLOURS.trend}" stroke-width="1.8"><title>${escapeHtml(`Theil–Sen slope ${formatSignificant(drift.trend.slope, 3)} ${drift.slopeUnit}`)}</title></line>`,
    );
  }
  for (const point of finite) {
    const offScale = point.value > high ? 'above' : point.value < low ? 'below' : null;
    const py = offScale === 'above' ? margin.top + 4 : offScale === 'below' ? bottom - 4 : y(point.value);
    parts.push(marker({ x: x(point.x), y: py, used: point.used, flagged: point.flagged, offScale, title: pointTitle(point, unit), curveId: point.curveId }));
  }
  parts.push('</svg>');
  return parts.join('');
}

/** Black or white, whichever reads better on a #rrggbb fill (WCAG relative luminance). */
function contrastingInk(hex: string): string {
  const channel = (offset: number) => {
    const value = parseInt(hex.slice(offset, offset + 2), 16) / 255;
    return value <= 0.03928 ? value / 12.92 : ((value + 0.055) / 1.055) ** 2.4;
  };
  const luminance = 0.2126 * channel(1) + 0.7152 * channel(3) + 0.0722 * channel(5);
  return luminance > 0.4 ? '#000000' : '#ffffff';
}

/**
 * Map of one quantity over a grid: one square per site on the inferred lattice (y upwards), filled
 * from the perceptually uniform scale, flagged sites crossed, sites whose curves were all left out
 * grey, and a colour bar with ticks in the physical unit. idPrefix makes the gradient id unique in
 * a page (letters, digits and '-' kept). Returns an <svg> string in CSS pixels.
 * Source: gridMap and gridColourScale (viridis / cividis).
 * @example gridMapSvg(map, 'map-0').match(/<rect class="cell"/g)?.length // map.cells.length
 */
export function gridMapSvg(map: GridMap, idPrefix = 'map'): string {
  const id = `${idPrefix.replace(/[^A-Za-z0-9-]/g, '') || 'map'}-gradient`;
  const cell = Math.max(10, Math.min(56, Math.floor(360 / Math.max(map.columns, map.rows))));
  const margin = { top: 16, right: 120, bottom: 46, left: 64 };
  const mapWidth = map.columns * cell;
  const mapHeight = map.rows * cell;
  const legendHeight = Math.max(140, mapHeight);
  const width = margin.left + mapWidth + margin.right;
  const height = margin.top + Math.max(mapHeight, legendHeight) + margin.bottom;
  const bottom = margin.top + mapHeight;
  const parts: string[] = [
    `<svg class="plot grid-map" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}" role="img" aria-label="${escapeHtml(`map of ${map.label}`)}" ${FONT}>`,
  ];
  parts.push(`<rect x="${margin.left}" y="${margin.top}" width="${mapWidth}" height="${mapHeight}" fill="${REPORT_PLOT_COLOURS.empty}"/>`);
  for (const site of map.cells) {
    const left = margin.left + site.column * cell;
    const top = margin.top + (map.rows - 1 - site.row) * cell;
    const fill = site.colour ?? '#b8bec6';
    const value = site.value === null ? 'no value used (all curves left out)' : `${formatSignificant(site.value, 5)} ${map.unit}`;
    const title = `x = ${formatSignificant(site.xNm, 4)} nm, y = ${formatSignificant(site.yNm, 4)} nm: ${value}${site.flagged ? ' · flagged' : ''} · ${site.curveIds.join(', ')}`;
    parts.push(
      `<rect class="cell${site.flagged ? ' flagged' : ''}" data-curve-id="${escapeHtml(site.curveIds[0] ?? '')}" x="${left}" y="${top}" width="${cell}" height="${cell}" fill="${fill}" stroke="#ffffff" stroke-width="0.5"><title>${escapeHtml(title)}</title></rect>`,
    );
    if (site.flagged) {
      const ink = contrastingInk(fill);
      const inset = Math.max(2, cell * 0.22);
      parts.push(
        `<path d="M${fixed(left + inset)},${fixed(top + inset)}L${fixed(left + cell - inset)},${fixed(top + cell - inset)}M${fixed(left + cell - inset)},${fixed(top + inset)}L${fixed(left + inset)},${fixed(top + cell - inset)}" stroke="${ink}" stroke-width="1.6" pointer-events="none"/>`,
      );
    }
  }
  parts.push(`<rect x="${margin.left}" y="${margin.top}" width="${mapWidth}" height="${mapHeight}" fill="none" stroke="${REPORT_PLOT_COLOURS.ink}"/>`);
  // Axis labels at a few columns and rows (at most 7 each), in nm.
  const every = (count: number) => Math.max(1, Math.ceil(count / 7));
  for (let column = 0; column < map.columns; column += every(map.columns)) {
    const cx = margin.left + (column + 0.5) * cell;
    parts.push(
      `<text x="${fixed(cx)}" y="${bottom + 14}" text-anchor="middle" font-size="11" fill="${REPORT_PLOT_COLOURS.ink}">${escapeHtml(formatSignificant(map.originXNm + column * map.spacingXNm, 4))}</text>`,
    );
  }
  for (let row = 0; row < map.rows; row += every(map.rows)) {
    const cy = margin.top + (map.rows - 1 - row + 0.5) * cell;
    parts.push(
      `<text x="${margin.left - 6}" y="${fixed(cy)}" dy="0.32em" text-anchor="end" font-size="11" fill="${REPORT_PLOT_COLOURS.ink}">${escapeHtml(formatSignificant(map.originYNm + row * map.spacingYNm, 4))}</text>`,
    );
  }
  parts.push(`<text x="${fixed(margin.left + mapWidth / 2)}" y="${bottom + 32}" text-anchor="middle" font-size="12" fill="${REPORT_PLOT_COLOURS.ink}">x (nm)</text>`);
  parts.push(`<text transform="translate(${margin.left - 44},${fixed(margin.top + mapHeight / 2)}) rotate(-90)" text-anchor="middle" font-size="12" fill="${REPORT_PLOT_COLOURS.ink}">y (nm)</text>`);
  if (map.scale) {
    const scale = map.scale;
    const barLeft = margin.left + mapWidth + 28;
    const barTop = margin.top + 14;
    const barHeight = legendHeight - 14;
    parts.push(`<defs><linearGradient id="${id}" x1="0" y1="1" x2="0" y2="0">`);
    for (const stop of scale.stops) parts.push(`<stop offset="${stop.offset}" stop-color="${stop.colour}"/>`);
    parts.push(`</linearGradient></defs>`);
    parts.push(`<rect class="colour-bar" x="${barLeft}" y="${barTop}" width="14" height="${barHeight}" fill="url(#${id})" stroke="${REPORT_PLOT_COLOURS.ink}" stroke-width="0.5"/>`);
    const legendScale = scaleLinear().domain([scale.minimum, scale.maximum]).range([barTop + barHeight, barTop]);
    const text = tickText(legendScale, 5);
    for (const tick of scale.ticks) {
      const ty = fixed(legendScale(tick));
      parts.push(`<line x1="${barLeft + 14}" x2="${barLeft + 19}" y1="${ty}" y2="${ty}" stroke="${REPORT_PLOT_COLOURS.ink}"/>`);
      parts.push(`<text class="legend-tick" x="${barLeft + 22}" y="${ty}" dy="0.32em" font-size="11" fill="${REPORT_PLOT_COLOURS.ink}">${escapeHtml(text(tick))} ${escapeHtml(map.unit)}</text>`);
    }
  }
  parts.push('</svg>');
  return parts.join('');
}

