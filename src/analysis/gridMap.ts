import { median } from 'simple-statistics';
import { gridColour, gridColourScale, type GridColourMapName, type GridColourScale } from './gridColourScale.ts';
import { groupQuantity, type GroupQuantityName } from './groupQuantities.ts';
import type { GroupValues } from './groupValues.ts';
import { describeValue } from './validate.ts';

/** One site of a map. */
export interface GridCell {
  /** 0-based column (x) and row (y) on the inferred lattice. */
  readonly column: number;
  readonly row: number;
  /** Site position as recorded (first curve at the site), nm. */
  readonly xNm: number;
  readonly yNm: number;
  /** Median of the used curves' values at the site (unit of the quantity); null when all were left out. */
  readonly value: number | null;
  /** Every curve at the site (several for approach + retract), and those used. */
  readonly curveIds: readonly string[];
  readonly usedCurveIds: readonly string[];
  /** True when any curve at the site carries a flag. */
  readonly flagged: boolean;
  /** Fill colour (#rrggbb) of the value, or null when value is null. */
  readonly colour: string | null;
}

/** The data of a map of one quantity over a grid, from {@link gridMap}. */
export interface GridMap {
  readonly key: string;
  readonly label: string;
  readonly quantity: GroupQuantityName;
  readonly unit: string;
  /** Lattice pitch along x and y, nm (median step between neighbouring distinct coordinates). */
  readonly spacingXNm: number;
  readonly spacingYNm: number;
  /** Smallest x and y, nm: the centre of column 0 / row 0. */
  readonly originXNm: number;
  readonly originYNm: number;
  readonly columns: number;
  readonly rows: number;
  /** True when every site lies within 20 % of a pitch of a lattice point. */
  readonly regular: boolean;
  /** One per occupied site, by row then column. */
  readonly cells: readonly GridCell[];
  /** Colour scale over the cells' values; null when no site has a value. */
  readonly scale: GridColourScale | null;
}

/** Options of {@link gridMap}. */
export interface GridMapOptions {
  readonly colourMap?: GridColourMapName;
  /** Fixed colour domain (e.g. to compare two maps); default the range of the sites' values. */
  readonly domain?: { readonly minimum: number; readonly maximum: number };
}

/** Coordinates closer than this (nm) are one coordinate: well below any STM grid pitch. */
const SAME_COORDINATE_NM = 1e-6;

function distinctSorted(values: readonly number[]): number[] {
  const sorted = [...values].sort((a, b) => a - b);
  const distinct: number[] = [];
  for (const value of sorted) if (distinct.length === 0 || value - distinct[distinct.length - 1] > SAME_COORDINATE_NM) distinct.push(value);
  return distinct;
}

function pitch(distinct: readonly number[]): number | null {
  if (distinct.length < 2) return null;
  const steps: number[] = [];
  for (let i = 1; i < distinct.length; i++) steps.push(distinct[i] - distinct[i - 1]);
  // Steps across a missing row are multiples of the pitch: keep those within 1.5× the smallest.
  const smallest = Math.min(...steps);
  return median(steps.filter((step) => step <= 1.5 * smallest));
}

/**
 * Map data of one group's curves that carry x/y positions: the lattice pitch inferred along each
 * axis (median of the steps between distinct coordinates that are within 1.5× the smallest step, so
 * a missing row does not widen it; an axis with one coordinate takes the other's pitch, or 1 nm), each site's column and row, its value (median
 * of the used curves there), whether it is flagged, and its colour on a perceptually uniform scale.
 * Returns null when fewer than 2 sites have positions. Positions in nm, values in the quantity's unit.
 * Source: Burrow's own rules; colour scale as gridColourScale (viridis / cividis).
 * @example gridMap(groupValues(results, gridGroup, 'apparentBarrierEV'))?.cells.length // 36
 */
export function gridMap(group: GroupValues, options: GridMapOptions = {}): GridMap | null {
  const name = 'gridMap';
  if (group === null || typeof group !== 'object' || !Array.isArray(group.points)) {
    throw new TypeError(`${name}: group must be a GroupValues record (from groupValues), got ${describeValue(group)}`);
  }
  const placed = group.points.filter((point) => point.position !== null);
  const distinctX = distinctSorted(placed.map((point) => point.position!.xNm));
  const distinctY = distinctSorted(placed.map((point) => point.position!.yNm));
  const siteKeys = new Set(placed.map((point) => `${Math.round(point.position!.xNm / SAME_COORDINATE_NM)}:${Math.round(point.position!.yNm / SAME_COORDINATE_NM)}`));
  if (siteKeys.size < 2) return null;
  const pitchX = pitch(distinctX);
  const pitchY = pitch(distinctY);
  const spacingXNm = pitchX ?? pitchY ?? 1;
  const spacingYNm = pitchY ?? pitchX ?? 1;
  const originXNm = distinctX[0];
  const originYNm = distinctY[0];
  let regular = true;
  const sites = new Map<string, { column: number; row: number; xNm: number; yNm: number; points: typeof placed }>();
  for (const point of placed) {
    const { xNm, yNm } = point.position!;
    const columnExact = (xNm - originXNm) / spacingXNm;
    const rowExact = (yNm - originYNm) / spacingYNm;
    const column = Math.round(columnExact);
    const row = Math.round(rowExact);
    if (Math.abs(columnExact - column) > 0.2 || Math.abs(rowExact - row) > 0.2) regular = false;
    const key = `${column}:${row}`;
    const site = sites.get(key);
    if (site) site.points.push(point);
    else sites.set(key, { column, row, xNm, yNm, points: [point] });
  }
  const ordered = [...sites.values()].sort((a, b) => a.row - b.row || a.column - b.column);
  const values = ordered.map((site) => {
    const used = site.points.filter((point) => point.used).map((point) => point.value);
    return used.length ? median(used) : null;
  });
  const present = values.filter((value): value is number => value !== null);
  const quantity = groupQuantity(group.quantity);
  let scale: GridColourScale | null = null;
  if (options.domain) scale = gridColourScale(options.domain.minimum, options.domain.maximum, quantity.unit, options.colourMap);
  else if (present.length) scale = gridColourScale(Math.min(...present), Math.max(...present), quantity.unit, options.colourMap);
  const cells: GridCell[] = ordered.map((site, i) => ({
    column: site.column,
    row: site.row,
    xNm: site.xNm,
    yNm: site.yNm,
    value: values[i],
    curveIds: site.points.map((point) => point.curveId),
    usedCurveIds: site.points.filter((point) => point.used).map((point) => point.curveId),
    flagged: site.points.some((point) => point.flagged),
    colour: values[i] !== null && scale ? gridColour(scale, values[i] as number) : null,
  }));
  let columns = 0;
  let rows = 0;
  for (const cell of cells) {
    columns = Math.max(columns, cell.column + 1);
    rows = Math.max(rows, cell.row + 1);
  }
  return {
    key: group.key,
    label: group.label,
    quantity: group.quantity,
    unit: quantity.unit,
    spacingXNm,
    spacingYNm,
    originXNm,
    originYNm,
    columns,
    rows,
    regular,
    cells,
    scale,
  };
}
