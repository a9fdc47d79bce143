/**
 * Pure plot helpers: the frame of a plot, scales from finished arrays, and SVG path strings for
 * lines, bands, point clouds and shaded regions. Components render the strings; nothing here fits,
 * flags or filters data.
 */
import { area, extent, line, scaleLinear, scaleLog, type ScaleLinear, type ScaleLogarithmic } from 'd3';

/** Inner drawing area of a plot inside its margins, px. */
export interface Frame {
  width: number;
  height: number;
  margin: { top: number; right: number; bottom: number; left: number };
  innerWidth: number;
  innerHeight: number;
}

/**
 * The frame of a plot of the given outer size.
 * @example plotFrame(600, 240).innerWidth // 600 − 56 − 12
 */
export function plotFrame(width: number, height: number, margin: Partial<Frame['margin']> = {}): Frame {
  const m = { top: 8, right: 12, bottom: 30, left: 56, ...margin };
  return { width, height, margin: m, innerWidth: Math.max(10, width - m.left - m.right), innerHeight: Math.max(10, height - m.top - m.bottom) };
}

/** A numeric scale of either kind. */
export type NumberScale = ScaleLinear<number, number> | ScaleLogarithmic<number, number>;

/**
 * Finite extent of several arrays (positive values only when `positive`), padded by `pad` of the
 * span on each side (or by a factor on a log scale); [0, 1] (or [1, 10]) when nothing is finite.
 * @example paddedExtent([[1, 2, 3]], 0.05) // [0.9, 3.1]
 */
export function paddedExtent(arrays: readonly ArrayLike<number>[], pad = 0.04, positive = false): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (const array of arrays) {
    for (let i = 0; i < array.length; i++) {
      const v = array[i];
      if (!Number.isFinite(v) || (positive && !(v > 0))) continue;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
  }
  if (!(lo <= hi)) return positive ? [1, 10] : [0, 1];
  if (positive) {
    const factor = Math.pow(hi / lo, pad) || 1.1;
    return lo === hi ? [lo / 2, hi * 2] : [lo / factor, hi * factor];
  }
  const span = hi - lo || Math.abs(hi) || 1;
  return [lo - pad * span, hi + pad * span];
}

/**
 * A linear scale over a domain onto [0, size] (inverted for y when `vertical`).
 * @example linearScale([0, 1], 100).invert(50) // 0.5
 */
export function linearScale(domain: [number, number], size: number, vertical = false): ScaleLinear<number, number> {
  return scaleLinear().domain(domain).range(vertical ? [size, 0] : [0, size]);
}

/**
 * A log10 scale onto [size, 0] (y axis).
 * @example logScale([1e-12, 1e-9], 100)(1e-12) // 100
 */
export function logScale(domain: [number, number], size: number): ScaleLogarithmic<number, number> {
  return scaleLog().domain(domain).range([size, 0]).clamp(true);
}

/**
 * Path of a polyline through (x[i], y[i]) in the given order, broken where a value is not finite
 * (or not positive on a log scale).
 * @example linePath([0, 1], [0, 1], sx, sy) // 'M0,100L100,0'
 */
export function linePath(x: ArrayLike<number>, y: ArrayLike<number>, sx: NumberScale, sy: NumberScale, logY = false): string {
  const indices = Array.from({ length: Math.min(x.length, y.length) }, (_, i) => i);
  return (
    line<number>()
      .defined((i) => Number.isFinite(x[i]) && Number.isFinite(y[i]) && (!logY || y[i] > 0))
      .x((i) => sx(x[i]))
      .y((i) => sy(y[i]))(indices) ?? ''
  );
}

/**
 * Path of a band between low[i] and high[i] along x.
 * @example bandPath([0, 1], [0, 0], [1, 1], sx, sy).startsWith('M') // true
 */
export function bandPath(x: ArrayLike<number>, low: ArrayLike<number>, high: ArrayLike<number>, sx: NumberScale, sy: NumberScale, logY = false): string {
  const indices = Array.from({ length: x.length }, (_, i) => i);
  return (
    area<number>()
      .defined((i) => Number.isFinite(x[i]) && Number.isFinite(low[i]) && Number.isFinite(high[i]) && (!logY || (low[i] > 0 && high[i] > 0)))
      .x((i) => sx(x[i]))
      .y0((i) => sy(low[i]))
      .y1((i) => sy(high[i]))(indices) ?? ''
  );
}

/**
 * One path holding a small circle of radius r at every selected point (one DOM node for a whole
 * curve). `pick` chooses the points (default: all).
 * @example pointsPath([0], [0], sx, sy, 2) // 'M-2,100a2,2 0 1,0 4,0a2,2 0 1,0 -4,0'
 */
export function pointsPath(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  sx: NumberScale,
  sy: NumberScale,
  r: number,
  pick?: (i: number) => boolean,
  logY = false,
): string {
  let d = '';
  const n = Math.min(x.length, y.length);
  for (let i = 0; i < n; i++) {
    if (pick && !pick(i)) continue;
    const xv = x[i];
    const yv = y[i];
    if (!Number.isFinite(xv) || !Number.isFinite(yv) || (logY && !(yv > 0))) continue;
    const px = round(sx(xv));
    const py = round(sy(yv));
    d += `M${round(px - r)},${py}a${r},${r} 0 1,0 ${2 * r},0a${r},${r} 0 1,0 ${-2 * r},0`;
  }
  return d;
}

/**
 * Vertical error bars (value ± error) at each point, one path.
 * @example errorBarsPath([0], [1], [0.5], sx, sy).includes('M') // true
 */
export function errorBarsPath(x: ArrayLike<number>, y: ArrayLike<number>, error: ArrayLike<number>, sx: NumberScale, sy: NumberScale): string {
  let d = '';
  for (let i = 0; i < x.length; i++) {
    if (!Number.isFinite(x[i]) || !Number.isFinite(y[i]) || !Number.isFinite(error[i])) continue;
    const px = round(sx(x[i]));
    d += `M${px},${round(sy(y[i] - error[i]))}V${round(sy(y[i] + error[i]))}`;
  }
  return d;
}

function round(value: number): number {
  return Math.round(value * 10) / 10;
}

/**
 * Finite min and max of one array, or null.
 * @example finiteExtent([3, NaN, 1]) // [1, 3]
 */
export function finiteExtent(values: ArrayLike<number>): [number, number] | null {
  const [lo, hi] = extent(Array.from(values).filter(Number.isFinite));
  return lo === undefined || hi === undefined ? null : [lo, hi];
}
