/**
 * Data shapes shared by the dashboard's state classes, the browser worker and IndexedDB. Plain
 * data only (typed arrays allowed), so every value can be structured-cloned to a worker or stored.
 */
import type { CurveResult } from '../analysis/index.ts';
import type { AnalysisSettings } from '../fit/index.ts';
import type { Dialect, ImportProblem, MappingAnswer, MappingMemoryJSON, MappingProposal, MetadataEntry } from '../io/index.ts';

/** A manual I(z) fit window in calibrated z, nm (inclusive). */
export interface ManualWindow {
  fromNm: number;
  toNm: number;
}

/** One imported file as the session keeps it (the curves live beside it, the raw text in IndexedDB). */
export interface SessionFile {
  /** Unique within the session: the file name, with ' (2)', ' (3)' … added for a different file of the same name. */
  key: string;
  /** Name shown and used in curve ids (equal to key). */
  fileName: string;
  /** Length of the text in characters. */
  sizeChars: number;
  /** Mapping answer given for this file, if any. */
  mapping?: MappingAnswer;
  problems: ImportProblem[];
  proposal?: MappingProposal;
  metadata: Record<string, MetadataEntry>;
  dialect: Dialect;
  curveIds: string[];
  rowCount: number;
  mappingSource: 'detected' | 'answer' | 'memory';
}

/** A per-curve result as fitted (before batch flags), with the inputs it was fitted with. */
export interface StoredResult {
  curveId: string;
  /** fitKey() of the curve when it was fitted: settings in force for its run, and its manual window. */
  fitKey: string;
  result: CurveResult;
}

/** What the user was looking at, restored on reload. */
export interface ViewState {
  selectedCurveId: string | null;
  tab: DashboardTab;
  filters: CurveFilters;
}

/** The dashboard's main tabs. */
export type DashboardTab = 'curve' | 'table' | 'settings' | 'files' | 'compare';

/** Curve browser filters: kind, flag code ('any' = flagged at all, 'none' = clean), run. */
export interface CurveFilters {
  kind: 'all' | 'iz' | 'iv';
  flag: string;
  run: string;
  text: string;
}

export const DEFAULT_FILTERS: Readonly<CurveFilters> = Object.freeze({ kind: 'all', flag: 'all', run: 'all', text: '' });

/**
 * Tags as stored or read from a bundle: string values only, trimmed, empty ones dropped.
 * @example cleanTags({ 'a.csv#0/single': ' terrace ', b: 3 }) // { 'a.csv#0/single': 'terrace' }
 */
export function cleanTags(tags: unknown): Record<string, string> {
  const clean: Record<string, string> = {};
  if (tags === null || typeof tags !== 'object' || Array.isArray(tags)) return clean;
  for (const [id, tag] of Object.entries(tags as Record<string, unknown>)) {
    if (typeof tag === 'string' && tag.trim()) clean[id] = tag.trim();
  }
  return clean;
}

/** Version of the stored session record; bump with a migration when the shape changes. */
export const SESSION_SCHEMA_VERSION = 1;

/**
 * One session as stored in IndexedDB (store 'sessions', key 'id'). The raw text of each file is
 * stored separately (RawTextStore, key `${id}/${file.key}`).
 */
export interface SessionRecord {
  schema: typeof SESSION_SCHEMA_VERSION;
  id: string;
  name: string;
  /** ISO 8601 times. */
  createdAt: string;
  updatedAt: string;
  settings: AnalysisSettings;
  mappings: MappingMemoryJSON;
  files: { key: string; fileName: string; mapping?: MappingAnswer }[];
  manualWindows: Record<string, ManualWindow>;
  results: StoredResult[];
  view: ViewState;
  /** User tags by curve id, for grouping by tag (absent in records saved before tags: read as none). */
  tags?: Record<string, string>;
}

/** The list entry of a stored session. */
export interface SessionSummary {
  id: string;
  name: string;
  createdAt: string;
  updatedAt: string;
  fileCount: number;
  curveCount: number;
}
