/**
 * A whole session in one JSON file, to move it between machines or keep it beside a paper:
 * { format: 'burrow-session', version: 1, name, createdAt, exportedAt, settings, mappings,
 *   manualWindows, files: [{ key, fileName, mapping?, text }], results, view, tags? }.
 * Reading checks every part and names what is wrong; settings go through validateSettings and the
 * mapping answers through MappingMemory.fromJSON, as when they are typed in. Pure.
 */
import { validateSettings, type AnalysisSettings } from '../fit/index.ts';
import { MappingMemory, type MappingAnswer, type MappingMemoryJSON } from '../io/index.ts';
import { cleanTags, DEFAULT_FILTERS, type ManualWindow, type StoredResult, type ViewState } from './types.ts';

/** A session bundle as written to and read from a file. */
export interface SessionBundle {
  format: 'burrow-session';
  version: 1;
  name: string;
  createdAt: string;
  exportedAt: string;
  settings: AnalysisSettings;
  mappings: MappingMemoryJSON;
  manualWindows: Record<string, ManualWindow>;
  files: { key: string; fileName: string; mapping?: MappingAnswer; text: string }[];
  results: StoredResult[];
  view: ViewState;
  /** User tags by curve id (absent in bundles written before tags). */
  tags?: Record<string, string>;
}

/**
 * The bundle as JSON text (non-finite numbers become null).
 * @example JSON.parse(writeBundle(bundle)).format // 'burrow-session'
 */
export function writeBundle(bundle: SessionBundle): string {
  return JSON.stringify(bundle, (_key, value) => (typeof value === 'number' && !Number.isFinite(value) ? null : value));
}

function fail(message: string): never {
  throw new Error(`session bundle: ${message}`);
}

function isObject(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

/**
 * Read a bundle from JSON text; throws an Error naming the first problem found.
 * @example readBundle(writeBundle(bundle)).files.length // bundle.files.length
 */
export function readBundle(text: string): SessionBundle {
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (error) {
    fail(`not valid JSON (${(error as Error).message})`);
  }
  if (!isObject(raw)) fail('expected a JSON object');
  if (raw.format !== 'burrow-session') fail(`format must be 'burrow-session', got ${JSON.stringify(raw.format)}`);
  if (raw.version !== 1) fail(`version must be 1, got ${JSON.stringify(raw.version)}`);
  const name = typeof raw.name === 'string' && raw.name.trim() ? raw.name : 'Imported session';
  const { settings, problems } = validateSettings(raw.settings ?? {});
  if (problems.length) fail(`settings: ${problems[0].message}`);
  let mappings: MappingMemoryJSON;
  try {
    mappings = MappingMemory.fromJSON(raw.mappings ?? { version: 1, answers: {} }).toJSON();
  } catch (error) {
    fail(`mappings: ${(error as Error).message}`);
  }
  if (!Array.isArray(raw.files)) fail('files must be an array');
  const keys = new Set<string>();
  const files = raw.files.map((file, i) => {
    if (!isObject(file)) fail(`files[${i}] must be an object`);
    if (typeof file.fileName !== 'string' || file.fileName === '') fail(`files[${i}].fileName must be a non-empty string`);
    if (typeof file.text !== 'string') fail(`files[${i}].text must be a string`);
    const key = typeof file.key === 'string' && file.key ? file.key : file.fileName;
    if (keys.has(key)) fail(`files[${i}]: key '${key}' appears twice`);
    keys.add(key);
    const mapping = isObject(file.mapping) ? readMapping(file.mapping, i) : undefined;
    return { key, fileName: key, text: file.text, ...(mapping ? { mapping } : {}) };
  });
  const manualWindows: Record<string, ManualWindow> = {};
  if (isObject(raw.manualWindows)) {
    for (const [curve, window] of Object.entries(raw.manualWindows)) {
      if (!isObject(window) || typeof window.fromNm !== 'number' || typeof window.toNm !== 'number' || !(window.fromNm < window.toNm)) {
        fail(`manualWindows['${curve}'] must be { fromNm, toNm } with fromNm < toNm`);
      }
      manualWindows[curve] = { fromNm: window.fromNm, toNm: window.toNm };
    }
  }
  const results: StoredResult[] = [];
  if (Array.isArray(raw.results)) {
    raw.results.forEach((entry, i) => {
      if (!isObject(entry) || typeof entry.curveId !== 'string' || typeof entry.fitKey !== 'string' || !isObject(entry.result)) {
        fail(`results[${i}] must be { curveId, fitKey, result }`);
      }
      const result = entry.result;
      // A record that does not look like a CurveResult is dropped: its curve is simply fitted again.
      const usable =
        Array.isArray(result.flags) &&
        result.flags.every((f) => isObject(f) && typeof f.code === 'string' && typeof f.reason === 'string') &&
        isObject(result.quality) &&
        (result.kind === 'iz' || result.kind === 'iv') &&
        typeof result.curve === 'string' &&
        result.curve === entry.curveId;
      if (usable) results.push(entry as unknown as StoredResult);
    });
  }
  const view = isObject(raw.view) ? (raw.view as unknown as ViewState) : { selectedCurveId: null, tab: 'curve' as const, filters: { ...DEFAULT_FILTERS } };
  return {
    format: 'burrow-session',
    version: 1,
    name,
    createdAt: typeof raw.createdAt === 'string' ? raw.createdAt : '',
    exportedAt: typeof raw.exportedAt === 'string' ? raw.exportedAt : '',
    settings,
    mappings,
    manualWindows,
    files,
    results,
    view: { selectedCurveId: typeof view.selectedCurveId === 'string' ? view.selectedCurveId : null, tab: view.tab ?? 'curve', filters: { ...DEFAULT_FILTERS, ...(view.filters ?? {}) } },
    ...(isObject(raw.tags) ? { tags: cleanTags(raw.tags) } : {}),
  };
}

function readMapping(mapping: Record<string, unknown>, i: number): MappingAnswer {
  try {
    const memory = MappingMemory.fromJSON({ version: 1, answers: { file: mapping } });
    return memory.get('file') ?? {};
  } catch (error) {
    fail(`files[${i}].mapping: ${(error as Error).message}`);
  }
}
