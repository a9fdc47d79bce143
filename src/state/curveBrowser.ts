/**
 * The curve browser's rows: every curve grouped by run, then by file, with its kind, key result and
 * flag codes, after the kind / flag / run / text filters. Flat rows of fixed height so the list can
 * be virtualised; pure, so filtering and grouping are tested without a DOM.
 */
import { runOf, type CurveResult } from '../analysis/index.ts';
import type { Curve, ImportColumn } from '../io/index.ts';
import { formatWithError } from './format.ts';
import type { CurveFilters } from './types.ts';

/** One row of the browser. */
export type BrowserRow =
  | { type: 'run'; id: string; run: string; curves: number; flagged: number }
  | { type: 'file'; id: string; fileName: string; curves: number }
  | {
      type: 'curve';
      id: string;
      curveId: string;
      label: string;
      kind: 'iz' | 'iv';
      /** Key result with its error and unit, or a status word. */
      keyResult: string;
      flags: string[];
      status: 'ok' | 'failed' | 'pending';
      manual: boolean;
    };

/** What a curve row needs to know about the file the curve came from. */
export interface FileColumns {
  columns: ImportColumn[];
  curveCount: number;
  /** How many different current columns the file's curves come from. */
  currentColumns: number;
}

/**
 * A short label for a curve within its file: its curve id column, else the header of its current
 * column when the file holds several, else its number; plus the segment and grid position.
 * @example curveLabel(curve, { columns, curveCount: 3, currentColumns: 3 }) // 'I site 2'
 */
export function curveLabel(curve: Curve, file: FileColumns | undefined): string {
  const parts: string[] = [];
  const labelEntry = curve.metadata.curveLabel?.raw ?? curve.metadata.blockLabel?.raw;
  if (labelEntry) parts.push(`curve ${labelEntry}`);
  else if (file && file.currentColumns > 1 && curve.position === undefined) {
    const column = file.columns.find((c) => c.index === curve.sourceColumns[1]);
    parts.push(column ? column.name : `#${curve.index + 1}`);
  } else parts.push(`#${curve.index + 1}`);
  if (curve.segment !== 'single') parts.push(curve.segment);
  if (curve.position) parts.push(`(${formatGrid(curve.position.xM)}, ${formatGrid(curve.position.yM)}) nm`);
  return parts.join(' · ');
}

function formatGrid(valueM: number): string {
  return String(Math.round(valueM * 1e9 * 100) / 100);
}

/**
 * The key number of a result: φ_ap for I(z), the mean barrier φ̄ for I(V), with its error.
 * @example keyResult(result) // 'φ 4.52 ± 0.03 eV'
 */
export function keyResult(result: CurveResult | undefined): string {
  if (!result) return 'not fitted';
  if (result.status !== 'ok') return 'fit failed';
  if (result.kind === 'iz') return `φap ${formatWithError(result.apparentBarrierEV, result.apparentBarrierErrEV)} eV`;
  return `φ̄ ${formatWithError(result.meanBarrierEV, result.meanBarrierErrEV)} eV`;
}

/** Does a curve pass the filters? */
export function passesFilters(curve: Curve, run: string, result: CurveResult | undefined, label: string, filters: CurveFilters): boolean {
  if (filters.kind !== 'all' && curve.kind !== filters.kind) return false;
  if (filters.run !== 'all' && run !== filters.run) return false;
  const flags = result?.flags ?? [];
  if (filters.flag === 'any' && flags.length === 0) return false;
  if (filters.flag === 'none' && flags.length > 0) return false;
  if (filters.flag !== 'all' && filters.flag !== 'any' && filters.flag !== 'none' && !flags.some((f) => f.code === filters.flag)) return false;
  const text = filters.text.trim().toLowerCase();
  if (text && !`${curve.fileName} ${label} ${run}`.toLowerCase().includes(text)) return false;
  return true;
}

/** Inputs of browserRows. */
export interface BrowserInput {
  curves: readonly Curve[];
  results: ReadonlyMap<string, CurveResult>;
  files: ReadonlyMap<string, FileColumns>;
  manualIds: ReadonlySet<string>;
  filters: CurveFilters;
}

/**
 * Rows grouped by run (in order of first appearance), then file, then curve (file order); groups
 * with no curve left after filtering are dropped.
 * @example browserRows({ curves, results, files, manualIds: new Set(), filters: DEFAULT_FILTERS })[0].type // 'run'
 */
export function browserRows(input: BrowserInput): BrowserRow[] {
  const byRun = new Map<string, Map<string, BrowserRow[]>>();
  const flaggedByRun = new Map<string, number>();
  for (const curve of input.curves) {
    const run = runOf(curve);
    const result = input.results.get(curve.id);
    const label = curveLabel(curve, input.files.get(curve.fileName));
    if (!passesFilters(curve, run, result, label, input.filters)) continue;
    let files = byRun.get(run);
    if (!files) byRun.set(run, (files = new Map()));
    let rows = files.get(curve.fileName);
    if (!rows) files.set(curve.fileName, (rows = []));
    const flags = result?.flags.map((f) => f.code) ?? [];
    if (flags.length) flaggedByRun.set(run, (flaggedByRun.get(run) ?? 0) + 1);
    rows.push({
      type: 'curve',
      id: `c:${curve.id}`,
      curveId: curve.id,
      label,
      kind: curve.kind,
      keyResult: keyResult(result),
      flags: [...new Set(flags)],
      status: result ? result.status : 'pending',
      manual: input.manualIds.has(curve.id),
    });
  }
  const rows: BrowserRow[] = [];
  for (const [run, files] of byRun) {
    let count = 0;
    for (const list of files.values()) count += list.length;
    rows.push({ type: 'run', id: `r:${run}`, run, curves: count, flagged: flaggedByRun.get(run) ?? 0 });
    for (const [fileName, list] of files) {
      rows.push({ type: 'file', id: `f:${run}\u0000${fileName}`, fileName, curves: list.length });
      rows.push(...list);
    }
  }
  return rows;
}

/**
 * The curve id `step` curve rows away from `currentId` (clamped at the ends); the first curve when
 * the current one is not visible.
 * @example neighbourCurve(rows, 'a.csv#0/single', 1) // 'a.csv#1/single'
 */
export function neighbourCurve(rows: readonly BrowserRow[], currentId: string | null, step: number): string | null {
  const ids: string[] = [];
  for (const row of rows) if (row.type === 'curve') ids.push(row.curveId);
  if (ids.length === 0) return null;
  const at = currentId === null ? -1 : ids.indexOf(currentId);
  if (at < 0) return step < 0 ? ids[ids.length - 1] : ids[0];
  return ids[Math.max(0, Math.min(ids.length - 1, at + step))];
}

/** Every run among the curves, in order of first appearance. */
export function runsOf(curves: readonly Curve[]): string[] {
  const seen = new Set<string>();
  for (const curve of curves) seen.add(runOf(curve));
  return [...seen];
}
