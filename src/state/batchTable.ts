/**
 * The batch table: one row per curve, the columns of the CSV export (RESULT_COLUMNS, units in the
 * headers), sortable on any column and filterable by text, kind and flag. Pure.
 */
import type { CurveResult } from '../analysis/index.ts';
import { RESULT_COLUMNS } from '../io/resultColumns.ts';
import { formatValue } from './format.ts';

/** Sort order of the table: a column index into RESULT_COLUMNS and a direction. */
export interface TableSort {
  column: number;
  descending: boolean;
}

/** Table filters: free text (file, curve, run, flags), kind, flag code ('all', 'any', 'none' or a code). */
export interface TableFilter {
  text: string;
  kind: 'all' | 'iz' | 'iv';
  flag: string;
}

/** The headers of the table, the same as the CSV export's. */
export const TABLE_HEADERS: readonly string[] = RESULT_COLUMNS.map((c) => c.header);

/** Columns holding text (left-aligned); the rest are numbers. */
export const TEXT_COLUMNS: ReadonlySet<number> = new Set(
  RESULT_COLUMNS.map((c, i) => [c.header, i] as const)
    .filter(([header]) => ['file', 'curve', 'run', 'kind', 'segment', 'model', 'status', 'flags', 'flag reasons'].includes(header))
    .map(([, i]) => i),
);

function compareCells(a: number | string | null | undefined, b: number | string | null | undefined): number {
  const missingA = a === null || a === undefined || (typeof a === 'number' && !Number.isFinite(a)) || a === '';
  const missingB = b === null || b === undefined || (typeof b === 'number' && !Number.isFinite(b)) || b === '';
  if (missingA || missingB) return missingA === missingB ? 0 : missingA ? 1 : -1;
  if (typeof a === 'number' && typeof b === 'number') return a - b;
  return String(a).localeCompare(String(b), undefined, { numeric: true });
}

/**
 * The rows to show: filtered, then sorted (stable; empty cells last in either direction).
 * @example tableRows(results, { column: 7, descending: true }, { text: '', kind: 'iz', flag: 'all' })[0].apparentBarrierEV
 */
export function tableRows(results: readonly CurveResult[], sort: TableSort | null, filter: TableFilter): CurveResult[] {
  const text = filter.text.trim().toLowerCase();
  const kept = results.filter((r) => {
    if (filter.kind !== 'all' && r.kind !== filter.kind) return false;
    if (filter.flag === 'any' && r.flags.length === 0) return false;
    if (filter.flag === 'none' && r.flags.length > 0) return false;
    if (!['all', 'any', 'none'].includes(filter.flag) && !r.flags.some((f) => f.code === filter.flag)) return false;
    if (text && !`${r.file} ${r.curve} ${r.run} ${r.flags.map((f) => f.code).join(' ')}`.toLowerCase().includes(text)) return false;
    return true;
  });
  if (!sort) return kept;
  const column = RESULT_COLUMNS[sort.column];
  if (!column) return kept;
  const keyed = kept.map((record, position) => ({ record, position, value: column.value(record) }));
  keyed.sort((x, y) => {
    const missingX = compareCells(x.value, null) === 0;
    const missingY = compareCells(y.value, null) === 0;
    if (missingX !== missingY) return missingX ? 1 : -1;
    const order = compareCells(x.value, y.value);
    return (sort.descending ? -order : order) || x.position - y.position;
  });
  return keyed.map((k) => k.record);
}

/**
 * One cell as displayed: numbers with 4 significant figures (the CSV keeps every digit), text as is.
 * @example tableCell(results[0], 7) // '4.523'
 */
export function tableCell(record: CurveResult, column: number): string {
  const value = RESULT_COLUMNS[column].value(record);
  if (value === null || value === undefined) return '';
  if (typeof value === 'number') return Number.isFinite(value) ? (Number.isInteger(value) ? String(value) : formatValue(value, 4)) : '';
  return value;
}

/**
 * Next sort after a click on a header: a new column sorts ascending, the same column flips.
 * @example nextSort({ column: 7, descending: false }, 7) // { column: 7, descending: true }
 */
export function nextSort(current: TableSort | null, column: number): TableSort {
  if (current && current.column === column) return { column, descending: !current.descending };
  return { column, descending: false };
}
