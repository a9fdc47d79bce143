import { color, interpolateCividis, interpolateViridis, scaleLinear } from 'd3';
import { describeValue } from './validate.ts';

/** Perceptually uniform colour maps offered for maps of results. */
export type GridColourMapName = 'viridis' | 'cividis';

/** A colour scale as plain data (structured-cloneable): domain, ticks and gradient stops. */
export interface GridColourScale {
  readonly colourMap: GridColourMapName;
  /** Value at the low (dark) end and the high (light) end, in `unit`. */
  readonly minimum: number;
  readonly maximum: number;
  /** Physical unit of the values, e.g. 'eV'. */
  readonly unit: string;
  /** Round tick values inside the domain for a legend, ascending (d3 scaleLinear().ticks(5)). */
  readonly ticks: readonly number[];
  /** Eleven evenly spaced gradient stops, offset 0 … 1, colour as #rrggbb. */
  readonly stops: readonly { readonly offset: number; readonly colour: string }[];
}

const INTERPOLATORS: Record<GridColourMapName, (t: number) => string> = {
  viridis: interpolateViridis,
  cividis: interpolateCividis,
};

function hex(text: string): string {
  return color(text)?.formatHex() ?? '#000000';
}

/**
 * A perceptually uniform colour scale from minimum to maximum, for a map in physical units.
 * Viridis (default) or cividis (also even for red–green colour-vision deficiency), both from
 * d3-scale-chromatic. Equal value steps look like equal colour steps, unlike a rainbow.
 * When minimum = maximum the domain is widened by ±0.5 % of |value| (or ±0.5 for 0).
 * Source: viridis, S. van der Walt & N. Smith, matplotlib colour maps (2015) [from memory];
 * cividis, J. R. Nuñez, C. R. Anderton & R. S. Renslow, PLoS ONE 13, e0199239 (2018); d3's
 * interpolateViridis and interpolateCividis.
 * @example gridColourScale(5.6, 6.1, 'eV').ticks // [5.6, 5.7, 5.8, 5.9, 6, 6.1]
 */
export function gridColourScale(minimum: number, maximum: number, unit: string, colourMap: GridColourMapName = 'viridis'): GridColourScale {
  const name = 'gridColourScale';
  if (typeof minimum !== 'number' || !Number.isFinite(minimum)) throw new RangeError(`${name}: minimum must be a finite number, got ${describeValue(minimum)}`);
  if (typeof maximum !== 'number' || !Number.isFinite(maximum) || maximum < minimum) {
    throw new RangeError(`${name}: maximum must be a finite number ≥ minimum (${minimum}), got ${describeValue(maximum)}`);
  }
  if (!Object.hasOwn(INTERPOLATORS, colourMap)) throw new RangeError(`${name}: colourMap must be viridis or cividis, got ${describeValue(colourMap)}`);
  let low = minimum;
  let high = maximum;
  if (high - low <= 1e-12 * Math.max(1, Math.abs(low))) {
    const widen = low === 0 ? 0.5 : 0.005 * Math.abs(low);
    low -= widen;
    high += widen;
  }
  const interpolate = INTERPOLATORS[colourMap];
  const stops = Array.from({ length: 11 }, (_, i) => ({ offset: i / 10, colour: hex(interpolate(i / 10)) }));
  return { colourMap, minimum: low, maximum: high, unit, ticks: scaleLinear().domain([low, high]).ticks(5), stops };
}

/**
 * The colour (#rrggbb) of a value on a scale; values outside the domain take the end colours.
 * @example gridColour(gridColourScale(0, 1, 'eV'), 0) // '#440154' (viridis, dark end)
 */
export function gridColour(scale: GridColourScale, value: number): string {
  if (typeof value !== 'number' || !Number.isFinite(value)) throw new RangeError(`gridColour: value must be a finite number, got ${describeValue(value)}`);
  const fraction = Math.min(1, Math.max(0, (value - scale.minimum) / (scale.maximum - scale.minimum)));
  return hex(INTERPOLATORS[scale.colourMap](fraction));
}
