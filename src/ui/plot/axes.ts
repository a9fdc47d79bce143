/**
 * Attachments for the parts of a plot that d3 owns: axes, grid lines and the fit-window brush.
 * Each returns its cleanup; Svelte re-runs it when the scale (or another argument) changes.
 */
import { axisBottom, axisLeft, brushX, format, select, type D3BrushEvent } from 'd3';
import type { Attachment } from 'svelte/attachments';
import type { NumberScale } from './scales.ts';

function isLog(scale: NumberScale): boolean {
  return 'base' in scale;
}

/** Tick labels of a log axis: 1e-12 → 1p, … only at decades, with an SI prefix. */
const siFormat = format('~s');

function tickFormat(scale: NumberScale, unitless: boolean): (value: number) => string {
  if (isLog(scale)) {
    return (value) => {
      const exponent = Math.log10(value);
      return Math.abs(exponent - Math.round(exponent)) < 1e-9 ? (unitless ? `1e${Math.round(exponent)}` : siFormat(value)) : '';
    };
  }
  const ticks = scale.ticks(6);
  const step = ticks.length > 1 ? Math.abs(ticks[1] - ticks[0]) : 1;
  const decimals = Math.max(0, -Math.floor(Math.log10(step) + 1e-9));
  return (value) => value.toFixed(Math.min(decimals, 6));
}

/**
 * Bottom axis at the foot of the plot.
 * @example <g transform="translate(0,{h})" {@attach xAxis(sx)}></g>
 */
export function xAxis(scale: NumberScale, ticks = 6): Attachment<SVGGElement> {
  return (node) => {
    const axis = axisBottom(scale).ticks(ticks).tickSizeOuter(0).tickFormat((v) => tickFormat(scale, true)(Number(v)));
    select(node).call(axis);
    return () => select(node).selectAll('*').remove();
  };
}

/**
 * Left axis. On a log scale the labels carry SI prefixes (1n, 10p, …) so the unit goes in the title.
 * @example <g {@attach yAxis(sy)}></g>
 */
export function yAxis(scale: NumberScale, ticks = 5): Attachment<SVGGElement> {
  return (node) => {
    const axis = axisLeft(scale).ticks(ticks).tickSizeOuter(0).tickFormat((v) => tickFormat(scale, false)(Number(v)));
    select(node).call(axis);
    return () => select(node).selectAll('*').remove();
  };
}

/**
 * Faint horizontal grid lines at the y ticks, across `width`.
 * @example <g class="grid" {@attach yGrid(sy, w)}></g>
 */
export function yGrid(scale: NumberScale, width: number, ticks = 5): Attachment<SVGGElement> {
  return (node) => {
    const axis = axisLeft(scale).ticks(ticks).tickSize(-width).tickFormat(() => '');
    select(node).call(axis).call((g) => g.select('.domain').remove());
    return () => select(node).selectAll('*').remove();
  };
}

/** What the brush reports: a window in data units, or null when cleared. */
export type BrushHandler = (window: { from: number; to: number } | null) => void;

/**
 * A horizontal brush over the plot area that reports the chosen x range (in data units) when the
 * user lets go; `current` is drawn as the initial selection. A click without dragging clears it.
 * @example <g {@attach windowBrush(sx, w, h, current, onwindow)}></g>
 */
export function windowBrush(
  scale: NumberScale,
  width: number,
  height: number,
  current: { from: number; to: number } | null,
  onwindow: BrushHandler,
): Attachment<SVGGElement> {
  return (node) => {
    const brush = brushX<unknown>()
      .extent([
        [0, 0],
        [width, height],
      ])
      .on('end', (event: D3BrushEvent<unknown>) => {
        if (!event.sourceEvent) return; // moved by code, not by the user
        const selection = event.selection as [number, number] | null;
        if (!selection || Math.abs(selection[1] - selection[0]) < 3) onwindow(null);
        else {
          const a = scale.invert(selection[0]);
          const b = scale.invert(selection[1]);
          onwindow({ from: Math.min(a, b), to: Math.max(a, b) });
        }
      });
    const group = select(node).call(brush);
    if (current) {
      const a = Math.max(0, Math.min(width, scale(current.from)));
      const b = Math.max(0, Math.min(width, scale(current.to)));
      if (b - a > 1) group.call(brush.move, [a, b]);
    }
    return () => {
      brush.on('end', null);
      group.on('.brush', null);
      group.selectAll('*').remove();
    };
  };
}
