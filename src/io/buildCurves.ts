import type { ChunkedArray } from './chunkedArray.ts';
import type { ColumnValues, LineMap } from './columnValues.ts';
import { segmentFromWord } from './inferColumnRole.ts';
import { UNIT_CANDIDATES } from './planColumns.ts';
import type { ProblemLog } from './problemLog.ts';
import type { ColumnRole, Curve, CurveKind, ImportColumn, MappingAmbiguity, MetadataEntry, Segment } from './types.ts';

/** Column values and row bookkeeping gathered while streaming a file. */
export interface ParsedColumns {
  columns: readonly ImportColumn[];
  /** SI values of stored numeric columns (NaN for missing or bad cells), null for others. */
  numeric: readonly (ColumnValues | null)[];
  /** Trimmed cells for stored text columns, null for others. */
  text: readonly (string[] | null)[];
  /** 1-based file line of each stored row. */
  lineOfRow: LineMap;
  rowCount: number;
  /** Blocks separated by blank or comment lines: first stored row of each, with the comment text. */
  blocks: readonly { startRow: number; label: string }[];
  /** Rows whose cell was empty, per column. */
  emptyRows: readonly (ChunkedArray | null)[];
  /** Last row with a value, per column (-1 for none). */
  lastFilledRow: Int32Array;
}

/** Roles whose columns are stored while streaming (the others are listed but not kept). */
export const STORED_ROLES: ReadonlySet<ColumnRole> = new Set<ColumnRole>(['distance', 'piezo', 'bias', 'current', 'segment', 'curveId', 'positionX', 'positionY', 'unknown']);

// Rough limits of SI values in STM data, used only to doubt a column written without a unit
// (common practice, no source): gaps below a micrometre, piezo ranges below 10 µm, positions
// below a millimetre, currents below a milliampere, biases below a hundred volts.
const PLAUSIBLE_SI_LIMIT: Partial<Record<ColumnRole, number>> = {
  distance: 1e-6,
  piezo: 1e-5,
  positionX: 1e-3,
  positionY: 1e-3,
  current: 1e-3,
  bias: 100,
};

// A column whose values spread less than this fraction of their magnitude is held constant
// (a fixed bias during an I(z) sweep). Heuristic of this importer, no source.
const CONSTANT_SPREAD = 0.01;

interface Range {
  start: number;
  end: number;
}

interface SegmentRows {
  code: number;
  label: string;
  ranges: Range[];
}

interface Group {
  label: string;
  firstRow: number;
  segments: Map<number, SegmentRows>;
}

const NO_SEGMENT = -1;
const APPROACH = 0;
const RETRACT = 1;
const BAD_SEGMENT = 2;

function lineOf(data: ParsedColumns, row: number): number {
  return data.lineOfRow.lineOf(row);
}

function describe(column: ImportColumn): string {
  return column.header ? `column ${column.index} '${column.header}'` : `column ${column.index}`;
}

function rangeOf(values: ColumnValues, rows: number): { min: number; max: number; maxAbs: number } {
  let min = Infinity;
  let max = -Infinity;
  for (let r = 0; r < rows; r++) {
    const v = values.get(r);
    if (v !== v) continue;
    if (v < min) min = v;
    if (v > max) max = v;
  }
  return { min, max, maxAbs: Math.max(Math.abs(min), Math.abs(max)) };
}

function varies(values: ColumnValues, rows: number): boolean {
  const { min, max, maxAbs } = rangeOf(values, rows);
  if (!Number.isFinite(min)) return false;
  return max - min > CONSTANT_SPREAD * maxAbs;
}

/** Indices i where the sweep turns (x[i] is an extreme), ignoring repeated values. */
function turningPoints(x: Float64Array): number[] {
  const turns: number[] = [];
  let direction = 0;
  let lastChange = 0;
  for (let i = 1; i < x.length; i++) {
    const step = x[i] - x[i - 1];
    if (step === 0) continue;
    const sign = step > 0 ? 1 : -1;
    if (direction !== 0 && sign !== direction) turns.push(lastChange);
    direction = sign;
    lastChange = i;
  }
  return turns;
}

interface Points {
  x: Float64Array;
  current: Float64Array;
  /** Stored row of point k. */
  rowAt: (k: number) => number;
}

/**
 * The valid points (x and current both present) of some rows. A curve covering one unbroken run
 * of at least half the column, with no gaps, is a view of the column (no copy): large files then
 * cost no second copy. Everything else is copied, so small curves never pin a large buffer.
 */
function gather(data: ParsedColumns, ranges: readonly Range[], axis: ImportColumn, current: ImportColumn): Points {
  const xs = data.numeric[axis.index - 1]!;
  const cs = data.numeric[current.index - 1]!;
  let count = 0;
  for (const { start, end } of ranges) {
    for (let r = start; r < end; r++) {
      const a = xs.get(r);
      const b = cs.get(r);
      if (a === a && b === b) count++;
    }
  }
  if (ranges.length === 1) {
    const { start, end } = ranges[0];
    const x = xs.view(start, end);
    const y = cs.view(start, end);
    if (x && y && count === end - start && 2 * count >= data.rowCount) return { x, current: y, rowAt: (k) => start + k };
  }
  const x = new Float64Array(count);
  const y = new Float64Array(count);
  let k = 0;
  for (const { start, end } of ranges) {
    for (let r = start; r < end; r++) {
      const a = xs.get(r);
      const b = cs.get(r);
      if (a === a && b === b) {
        x[k] = a;
        y[k] = b;
        k++;
      }
    }
  }
  const rowAt = (wanted: number): number => {
    let seen = 0;
    for (const { start, end } of ranges) {
      for (let r = start; r < end; r++) {
        const a = xs.get(r);
        const b = cs.get(r);
        if (a === a && b === b && seen++ === wanted) return r;
      }
    }
    return ranges.length > 0 ? ranges[ranges.length - 1].end - 1 : 0;
  };
  return { x, current: y, rowAt };
}

function slice(points: Points, from: number, to: number): Points {
  return { x: points.x.subarray(from, to), current: points.current.subarray(from, to), rowAt: (k) => points.rowAt(from + k) };
}

/**
 * Turn the streamed columns into curves: choose the sweep kind (iz or iv), pair each current
 * column with its x column (one shared x, or repeated x/current pairs), group rows into curves
 * (curve-id column, else x/y position, else blank-line blocks), split approach from retract
 * (direction column, header word, or where the sweep reverses) and check each curve (at least two
 * points, some non-zero current, a varying and, for I(z), monotonic x).
 * Whatever cannot be decided is returned as ambiguities and no curves are made.
 */
export function buildCurves(
  data: ParsedColumns,
  metadata: Readonly<Record<string, MetadataEntry>>,
  fileName: string,
  problems: ProblemLog,
): { curves: Curve[]; ambiguities: MappingAmbiguity[] } {
  const { columns, rowCount } = data;
  const ambiguities: MappingAmbiguity[] = [];
  const numericWith = (roles: ColumnRole[]) => columns.filter((c) => roles.includes(c.role) && data.numeric[c.index - 1]);

  // Empty cells inside the data of a used column (trailing padding of shorter columns is fine).
  for (const column of numericWith(['distance', 'piezo', 'bias', 'current'])) {
    const empties = data.emptyRows[column.index - 1];
    const last = data.lastFilledRow[column.index - 1];
    if (!empties) continue;
    for (let k = 0; k < empties.length; k++) {
      const row = empties.get(k);
      if (row >= last) break;
      problems.add({
        code: 'emptyCell',
        severity: 'warning',
        line: lineOf(data, row),
        column: column.index,
        message: `empty cell in ${describe(column)}; that point is left out`,
      });
    }
  }

  // Columns written without a unit: SI was assumed; doubt it when the values are implausible.
  for (const column of numericWith(['distance', 'piezo', 'bias', 'current', 'positionX', 'positionY'])) {
    if (!column.unitAssumed) continue;
    const limit = PLAUSIBLE_SI_LIMIT[column.role];
    const { maxAbs } = rangeOf(data.numeric[column.index - 1]!, rowCount);
    if (limit !== undefined && Number.isFinite(maxAbs) && maxAbs > limit) {
      const dimension = column.role === 'current' ? 'current' : column.role === 'bias' ? 'voltage' : 'length';
      const candidates = UNIT_CANDIDATES[dimension] ?? [];
      ambiguities.push({
        kind: 'unit',
        columns: [column.index],
        candidates,
        message: `${describe(column)} (${column.role}) has no unit and values up to ${maxAbs} are implausible in SI; choose one of ${candidates.join(', ')}`,
      });
    }
  }

  const currents = numericWith(['current']);
  const izAxes = numericWith(['distance', 'piezo']);
  const ivAxes = numericWith(['bias']);
  if (currents.length === 0) {
    const free = columns.filter((c) => c.valueType === 'number' && !['distance', 'piezo', 'bias'].includes(c.role));
    ambiguities.push({
      kind: 'role',
      columns: free.map((c) => c.index),
      candidates: ['current'],
      message: free.length > 0 ? `no current column found; mark one of columns ${free.map((c) => c.index).join(', ')} as current` : 'no current column found',
    });
  }
  if (izAxes.length === 0 && ivAxes.length === 0) {
    const free = columns.filter((c) => c.valueType === 'number' && c.role !== 'current');
    ambiguities.push({
      kind: 'role',
      columns: free.map((c) => c.index),
      candidates: ['distance', 'piezo', 'bias'],
      message: 'no distance or bias column found; mark the swept column as distance, piezo or bias',
    });
  }
  let kind: CurveKind = izAxes.length > 0 ? 'iz' : 'iv';
  if (izAxes.length > 0 && ivAxes.length > 0) {
    const biasVaries = varies(data.numeric[ivAxes[0].index - 1]!, rowCount);
    const distanceVaries = varies(data.numeric[izAxes[0].index - 1]!, rowCount);
    if (!biasVaries) kind = 'iz';
    else if (!distanceVaries) kind = 'iv';
    else {
      ambiguities.push({
        kind: 'role',
        columns: [izAxes[0].index, ivAxes[0].index],
        candidates: ['distance', 'bias', 'ignore'],
        message: `both ${describe(izAxes[0])} and ${describe(ivAxes[0])} vary; mark the one that is not swept as ignore`,
      });
    }
  }
  const axes = kind === 'iz' ? izAxes : ivAxes;
  const fixedColumn = kind === 'iz' ? ivAxes[0] : izAxes[0];

  // Each current belongs to the nearest x column on its left (repeated x/current pairs),
  // or to the only x column.
  const axisOf = new Map<number, ImportColumn>();
  const axisUsed = new Set<number>();
  let lastAxis: ImportColumn | undefined;
  for (const column of columns) {
    if (axes.includes(column)) lastAxis = column;
    else if (currents.includes(column)) {
      const axis = lastAxis ?? axes[0];
      if (axis) {
        axisOf.set(column.index, axis);
        axisUsed.add(axis.index);
      }
    }
  }
  const unusedAxes = axes.filter((a) => !axisUsed.has(a.index));
  if (axes.length > 1 && unusedAxes.length > 0 && currents.length > 0) {
    const all = axes.map((a) => a.index);
    ambiguities.push({
      kind: 'role',
      columns: all,
      candidates: [axes[0].role, 'ignore'],
      message: `columns ${axes.map((a) => `${a.index} '${a.header}'`).join(' and ')} could each be the ${kind === 'iz' ? 'distance' : 'bias'} axis; keep one and mark the other as ignore`,
    });
  }
  if (ambiguities.length > 0) return { curves: [], ambiguities };

  // Group rows into curves, and split each group by direction when a column gives it.
  const curveIdColumn = columns.find((c) => c.role === 'curveId' && (data.numeric[c.index - 1] || data.text[c.index - 1]));
  const segmentColumn = columns.find((c) => c.role === 'segment' && (data.numeric[c.index - 1] || data.text[c.index - 1]));
  const xColumn = numericWith(['positionX'])[0];
  const yColumn = numericWith(['positionY'])[0];
  const cellText = (column: ImportColumn, row: number): string => {
    const t = data.text[column.index - 1];
    if (t) return t[row];
    const v = data.numeric[column.index - 1]!.get(row);
    return v === v ? String(v) : '';
  };

  const segmentCodes = new Map<string, number>();
  let unknownCodes = 0;
  const segmentOf = (row: number): number => {
    if (!segmentColumn) return NO_SEGMENT;
    const raw = cellText(segmentColumn, row);
    const known = segmentCodes.get(raw);
    if (known !== undefined) return known;
    const word = segmentFromWord(raw);
    let code: number;
    if (word === 'approach') code = APPROACH;
    else if (word === 'retract') code = RETRACT;
    else if (raw === '') code = BAD_SEGMENT;
    else {
      code = unknownCodes === 0 ? APPROACH : unknownCodes === 1 ? RETRACT : BAD_SEGMENT;
      unknownCodes++;
      if (code !== BAD_SEGMENT) {
        problems.add({
          code: 'directionCode',
          severity: 'warning',
          line: lineOf(data, row),
          column: segmentColumn.index,
          mergeKey: 'directionCode',
          message: `direction value '${raw}' is not a word like approach or retract; read as ${code === APPROACH ? 'approach' : 'retract'} (first value seen = approach)`,
        });
      }
    }
    segmentCodes.set(raw, code);
    return code;
  };

  let blockIndex = 0;
  let previousPosition = '';
  let positionGroup = -1;
  const groupKeys = new Map<string, number>();
  const groups: Group[] = [];
  const groupOf = (row: number): { key: string; label: string } => {
    if (curveIdColumn) {
      const label = cellText(curveIdColumn, row);
      return { key: `id:${label}`, label };
    }
    if (xColumn || yColumn) {
      const position = `${xColumn ? data.numeric[xColumn.index - 1]!.get(row) : ''}|${yColumn ? data.numeric[yColumn.index - 1]!.get(row) : ''}`;
      if (position !== previousPosition) {
        positionGroup++;
        previousPosition = position;
      }
      return { key: `pos:${positionGroup}`, label: position };
    }
    if (data.blocks.length > 1) {
      while (blockIndex + 1 < data.blocks.length && data.blocks[blockIndex + 1].startRow <= row) blockIndex++;
      return { key: `block:${blockIndex}`, label: data.blocks[blockIndex].label };
    }
    return { key: 'all', label: '' };
  };

  let runGroup: Group | undefined;
  let runSegment = NO_SEGMENT - 1;
  let runKey = '';
  let runRange: Range | undefined;
  for (let row = 0; row < rowCount; row++) {
    const { key, label } = groupOf(row);
    const segment = segmentOf(row);
    if (segment === BAD_SEGMENT) {
      problems.add({
        code: 'directionValue',
        severity: 'error',
        line: lineOf(data, row),
        column: segmentColumn!.index,
        message: `direction '${cellText(segmentColumn!, row)}' is neither approach nor retract (only two directions per curve); the row is left out`,
      });
      runRange = undefined;
      continue;
    }
    if (runRange && key === runKey && segment === runSegment) {
      runRange.end = row + 1;
      continue;
    }
    let groupIndex = groupKeys.get(key);
    if (groupIndex === undefined) {
      groupIndex = groups.length;
      groupKeys.set(key, groupIndex);
      groups.push({ label, firstRow: row, segments: new Map() });
    }
    runGroup = groups[groupIndex];
    let rows = runGroup.segments.get(segment);
    if (!rows) {
      rows = { code: segment, label: segmentColumn ? cellText(segmentColumn, row) : '', ranges: [] };
      runGroup.segments.set(segment, rows);
    }
    runRange = { start: row, end: row + 1 };
    rows.ranges.push(runRange);
    runKey = key;
    runSegment = segment;
  }

  const curves: Curve[] = [];
  let nextIndex = 0;
  const fixedValueAt = (column: ImportColumn | undefined, row: number): number | undefined => {
    if (!column) return undefined;
    const v = data.numeric[column.index - 1]!.get(row);
    return v === v ? v : undefined;
  };

  for (const group of groups) {
    for (const currentColumn of currents) {
      const axis = axisOf.get(currentColumn.index);
      if (!axis) continue;
      const hint = currentColumn.segmentHint ?? axis.segmentHint;
      let index = nextIndex++;
      const describeCurve = `curve ${index} (${describe(currentColumn)}${group.label ? `, ${group.label}` : ''})`;
      const pieces: { segment: Segment; points: Points; sweep?: string }[] = [];
      for (const rows of group.segments.values()) {
        const points = gather(data, rows.ranges, axis, currentColumn);
        const turns = turningPoints(points.x);
        if (rows.code !== NO_SEGMENT || hint) {
          const segment: Segment = rows.code === APPROACH ? 'approach' : rows.code === RETRACT ? 'retract' : hint!;
          if (kind === 'iz' && turns.length > 0) {
            problems.add({
              code: 'nonMonotonic',
              severity: 'error',
              line: lineOf(data, points.rowAt(turns[0] + 1)),
              column: axis.index,
              message: `${describe(axis)} is not monotonic within the ${segment} of ${describeCurve}: it turns back here; sort the rows or give each sweep its own direction value`,
            });
          }
          pieces.push({ segment, points });
          continue;
        }
        if (kind === 'iz') {
          // One reversal splits the sweep in two: an approach and a retract
          // (common practice, no source: programs record both legs in one table).
          if (turns.length === 1) {
            const before = slice(points, 0, turns[0] + 1);
            const after = slice(points, turns[0] + 1, points.x.length);
            // A gap column says which half is which: the gap shrinks while the tip approaches.
            // A piezo position has no agreed sign, so there the acquisition order decides.
            const firstIsApproach = axis.role !== 'distance' || before.x[before.x.length - 1] < before.x[0];
            pieces.push({ segment: firstIsApproach ? 'approach' : 'retract', points: before });
            pieces.push({ segment: firstIsApproach ? 'retract' : 'approach', points: after });
          } else {
            if (turns.length > 1) {
              problems.add({
                code: 'nonMonotonic',
                severity: 'error',
                line: lineOf(data, points.rowAt(turns[1] + 1)),
                column: axis.index,
                message: `${describe(axis)} reverses ${turns.length} times in ${describeCurve} (one reversal would split approach from retract); sort the rows, add a direction column or a curve id column`,
              });
            }
            pieces.push({ segment: 'single', points });
          }
        } else {
          // I(V): every reversal starts a new sweep (forward and backward sweeps are separate curves).
          let from = 0;
          for (const turn of [...turns, points.x.length - 1]) {
            const part = slice(points, from, turn + 1);
            const rising = part.x.length > 1 && part.x[part.x.length - 1] > part.x[0];
            pieces.push({ segment: 'single', points: part, sweep: rising ? 'increasing' : 'decreasing' });
            from = turn + 1;
          }
        }
      }

      let first = true;
      for (const piece of pieces) {
        if (kind === 'iv' && !first) index = nextIndex++;
        first = false;
        const { points, segment } = piece;
        const n = points.x.length;
        const startRow = n > 0 ? points.rowAt(0) : group.firstRow;
        const where = { line: lineOf(data, startRow), column: currentColumn.index };
        const label = `curve ${index} ${segment} (${describe(currentColumn)}${group.label ? `, ${group.label}` : ''})`;
        if (n < 2) {
          problems.add({ code: 'onePoint', severity: 'error', ...where, mergeKey: `onePoint|${index}|${segment}`, message: `${label} has ${n} point${n === 1 ? '' : 's'}; at least 2 are needed, so it is left out` });
          continue;
        }
        let anyCurrent = false;
        let xMin = Infinity;
        let xMax = -Infinity;
        for (let i = 0; i < n; i++) {
          if (points.current[i] !== 0) anyCurrent = true;
          if (points.x[i] < xMin) xMin = points.x[i];
          if (points.x[i] > xMax) xMax = points.x[i];
        }
        if (!anyCurrent) {
          problems.add({ code: 'zeroCurrent', severity: 'error', ...where, mergeKey: `zeroCurrent|${index}|${segment}`, message: `${label}: the current is 0 at all ${n} points; check the column, its unit or the amplifier gain; the curve is left out` });
          continue;
        }
        if (xMin === xMax) {
          problems.add({ code: 'flatAxis', severity: 'error', line: where.line, column: axis.index, mergeKey: `flatAxis|${index}|${segment}`, message: `${label}: ${describe(axis)} has the same value at all ${n} points; the curve is left out` });
          continue;
        }
        const curveMetadata: Record<string, MetadataEntry> = { ...metadata };
        if (group.label && curveIdColumn) curveMetadata.curveLabel = { raw: group.label, label: curveIdColumn.header, line: where.line };
        if (group.label && !curveIdColumn && !xColumn && !yColumn) curveMetadata.blockLabel = { raw: group.label, label: '', line: where.line };
        if (piece.sweep) curveMetadata.sweepDirection = { raw: piece.sweep, label: '', line: 0 };
        const curve: Curve = {
          id: `${fileName}#${index}/${segment}`,
          fileName,
          index,
          segment,
          kind,
          x: points.x,
          xRole: axis.role === 'piezo' ? 'piezo' : kind === 'iz' ? 'distance' : 'bias',
          current: points.current,
          metadata: curveMetadata,
          sourceColumns: [axis.index, currentColumn.index],
          firstLine: where.line,
        };
        if (kind === 'iz') {
          const bias = fixedValueAt(fixedColumn, startRow) ?? metadata.biasVoltage?.value;
          if (bias !== undefined) curve.fixedBiasV = bias;
        } else {
          const gap = fixedValueAt(fixedColumn, startRow);
          if (gap !== undefined) curve.fixedGapM = gap;
        }
        if (fixedColumn) curve.sourceColumns.push(fixedColumn.index);
        const xM = fixedValueAt(xColumn, group.firstRow) ?? (xColumn ? undefined : metadata.positionX?.value);
        const yM = fixedValueAt(yColumn, group.firstRow) ?? (yColumn ? undefined : metadata.positionY?.value);
        if (xM !== undefined || yM !== undefined) curve.position = { xM: xM ?? 0, yM: yM ?? 0 };
        for (const extra of [segmentColumn, curveIdColumn, xColumn, yColumn]) if (extra) curve.sourceColumns.push(extra.index);
        curves.push(curve);
      }
    }
  }
  return { curves, ambiguities };
}
