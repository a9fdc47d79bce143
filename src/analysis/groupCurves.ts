import type { CurveResult } from './analyzeCurve.ts';
import { describeValue } from './validate.ts';

/**
 * How curves are put into groups:
 * - `run`: by the result's run (its `run` metadata entry, else tip / sample, else its file);
 * - `file`: by the file it came from;
 * - `metadata`: by the text of one metadata entry (tip, sample, date, or any key found in the
 *   headers), looked up in a {@link CurveMetadataTable};
 * - `tag`: by a user's tag per curve id (curves without a tag form the group "(untagged)").
 */
export type CurveGrouping =
  | { readonly by: 'run' }
  | { readonly by: 'file' }
  | { readonly by: 'metadata'; readonly key: string }
  | { readonly by: 'tag'; readonly tags: Readonly<Record<string, string>> };

/** Metadata text per curve id: curve id → (key → text as written). */
export type CurveMetadataTable = Readonly<Record<string, Readonly<Record<string, string>>>>;

/** One group of curves: a stable key, a label to show, and its members' curve ids in result order. */
export interface CurveGroup {
  readonly key: string;
  readonly label: string;
  readonly curveIds: readonly string[];
}

/** Lower-case letters and digits only, so 'Tip', 'tip' and 'TIP:' find the same entry. */
function compactKey(key: string): string {
  return key.toLowerCase().normalize('NFC').replace(/[^\p{L}\p{N}]+/gu, '');
}

/**
 * Metadata text of each curve, for grouping by a metadata key: every entry under Burrow's key
 * (tip, sample, date, biasVoltage, …) and, when it differs, under the key as written in the file.
 * Takes the curves as imported (or CurveInput), so the table can be built where the curves are.
 * Source: Burrow's own convention (the metadata keys of readMetadata.ts).
 * @example metadataTableFromCurves(files.flatMap((f) => f.curves))['a.csv#0/single'].tip // 'A (etched W wire)'
 */
export function metadataTableFromCurves(
  curves: readonly { readonly id: string; readonly metadata?: Readonly<Record<string, { readonly raw: string; readonly label?: string }>> }[],
): CurveMetadataTable {
  if (!Array.isArray(curves)) throw new TypeError(`metadataTableFromCurves: curves must be an array, got ${describeValue(curves)}`);
  const table: Record<string, Record<string, string>> = {};
  for (const curve of curves) {
    const entries: Record<string, string> = {};
    const metadata: Readonly<Record<string, { readonly raw: string; readonly label?: string }>> = curve.metadata ?? {};
    for (const [key, entry] of Object.entries(metadata)) {
      const text = (entry.raw ?? '').trim();
      entries[key] = text;
      const label = entry.label?.trim();
      if (label && !(label in entries)) entries[label] = text;
    }
    table[curve.id] = entries;
  }
  return table;
}

/**
 * The text of a metadata entry of one curve: the exact key first, else any key that matches after
 * lower-casing and dropping everything but letters and digits. Undefined when absent or empty.
 * @example metadataText({ Tip: 'A' }, 'tip') // 'A'
 */
export function metadataText(entries: Readonly<Record<string, string>> | undefined, key: string): string | undefined {
  if (!entries) return undefined;
  const exact = entries[key]?.trim();
  if (exact) return exact;
  const wanted = compactKey(key);
  for (const [name, text] of Object.entries(entries)) {
    if (compactKey(name) === wanted && text.trim()) return text.trim();
  }
  return undefined;
}

/**
 * Every metadata key that at least one curve carries, sorted, for a "group by" menu or an error
 * message; keys that match alike after lower-casing ('Run', 'run') are listed once.
 * @example metadataKeys(table) // ['biasVoltage', 'run', 'sample', 'setpointCurrent', 'tip']
 */
export function metadataKeys(metadata: CurveMetadataTable): string[] {
  // One name per key that metadataText would match alike ('Run' and 'run'): Burrow's camelCase form when present.
  const byCompact = new Map<string, string>();
  const preferred = (name: string) => /^[a-z][A-Za-z0-9]*$/.test(name);
  for (const entries of Object.values(metadata)) {
    for (const [key, text] of Object.entries(entries)) {
      if (!text.trim()) continue;
      const compact = compactKey(key);
      const known = byCompact.get(compact);
      if (known === undefined || (!preferred(known) && preferred(key))) byCompact.set(compact, key);
    }
  }
  return [...byCompact.values()].sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
}

function checkGrouping(grouping: CurveGrouping): void {
  const name = 'groupCurves';
  if (grouping === null || typeof grouping !== 'object') throw new TypeError(`${name}: grouping must be an object, got ${describeValue(grouping)}`);
  const by = (grouping as { by?: unknown }).by;
  if (by !== 'run' && by !== 'file' && by !== 'metadata' && by !== 'tag') {
    throw new RangeError(`${name}: grouping.by must be run, file, metadata or tag, got ${describeValue(by)}`);
  }
  if (grouping.by === 'metadata' && (typeof grouping.key !== 'string' || grouping.key.trim() === '')) {
    throw new RangeError(`${name}: grouping.key must be a non-empty metadata key, got ${describeValue(grouping.key)}`);
  }
  if (grouping.by === 'tag' && (grouping.tags === null || typeof grouping.tags !== 'object')) {
    throw new TypeError(`${name}: grouping.tags must be an object of curve id → tag, got ${describeValue(grouping.tags)}`);
  }
}

/**
 * Put curve results into groups. Groups appear in the order their first curve appears in
 * `results`, and list their curves in result order; every curve falls in exactly one group.
 * Curves without the metadata entry form the group "(no KEY)" (key ''); untagged curves form
 * "(untagged)" (key ''). Flagged curves stay members: groupValues decides what is used.
 * Source: Burrow's own rules (runs as in analyzeCurve's runOf).
 * @example groupCurves(results).map((g) => g.key) // ['A-gold', 'A-graphite', 'B-gold', …]
 * @example groupCurves(results, { by: 'metadata', key: 'tip' }, table)[0].label // 'A (etched W wire)'
 */
export function groupCurves(results: readonly CurveResult[], grouping: CurveGrouping = { by: 'run' }, metadata: CurveMetadataTable = {}): CurveGroup[] {
  if (!Array.isArray(results)) throw new TypeError(`groupCurves: results must be an array of curve results, got ${describeValue(results)}`);
  checkGrouping(grouping);
  const members = new Map<string, { label: string; curveIds: string[] }>();
  for (const result of results) {
    let key: string;
    let label: string;
    if (grouping.by === 'run') {
      key = result.run;
      label = result.run;
    } else if (grouping.by === 'file') {
      key = result.file;
      label = result.file;
    } else if (grouping.by === 'metadata') {
      const text = metadataText(metadata[result.curve], grouping.key);
      key = text ?? '';
      label = text ?? `(no ${grouping.key})`;
    } else {
      const tag = grouping.tags[result.curve];
      const text = typeof tag === 'string' ? tag.trim() : '';
      key = text;
      label = text || '(untagged)';
    }
    const group = members.get(key);
    if (group) group.curveIds.push(result.curve);
    else members.set(key, { label, curveIds: [result.curve] });
  }
  return [...members.entries()].map(([key, group]) => ({ key, label: group.label, curveIds: group.curveIds }));
}

