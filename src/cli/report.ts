/**
 * burrow report: the run-comparison report as one self-contained HTML file. Input is either a
 * results JSON (`{ settings, results }` as `burrow fit --out x.json` writes, or the bare array it
 * prints), a dashboard session file (format 'burrow-session'), or data files and folders, which are
 * fitted first by `burrow fit` itself (same code path, in this process).
 */
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { resolve } from 'node:path';
import {
  acquisitionTimes,
  finishBatch,
  GROUP_QUANTITIES,
  GROUP_QUANTITY_NAMES,
  groupCurves,
  metadataKeys,
  metadataTableFromCurves,
  type CurveGrouping,
  type CurveMetadataTable,
  type CurveResult,
  type GridColourMapName,
  type GroupQuantityName,
} from '../analysis/index.ts';
import { importText } from '../io/index.ts';
// The Node file reader is not part of io/index.ts (which stays free of node: imports for the browser).
import { importPaths } from '../io/readFileNode.ts';
import { writeReport } from '../io/reportHtml.ts';
import { parseArgs, UsageError, type FlagSpecs } from './args.ts';
import type { Command, CommandIO } from './command.ts';
import { fitCommand, resolveSettings } from './fit.ts';

const flags: FlagSpecs = {
  settings: { kind: 'string', help: 'analysis settings JSON, when data files are fitted for the report' },
  'group-by': { kind: 'string', help: 'run, file, or metadata:KEY (a header entry such as tip, sample, date) (default run)' },
  tags: { kind: 'string', help: 'JSON file of user tags, { "curve id": "tag" } or { "tag": ["curve id", …] }; groups by tag' },
  quantity: { kind: 'string', help: 'the result compared', choices: GROUP_QUANTITY_NAMES, default: 'apparentBarrierEV' },
  'include-flagged': { kind: 'boolean', help: 'use flagged curves in the statistics too (default: shown hollow, left out)' },
  'colour-map': { kind: 'string', help: 'perceptually uniform colour map of grid maps', choices: ['viridis', 'cividis'], default: 'viridis' },
  title: { kind: 'string', help: 'heading of the report' },
  out: { kind: 'string', help: 'write the report to FILE.html instead of printing it' },
  workers: { kind: 'number', help: 'worker threads when fitting data files (as burrow fit)', min: 1, max: 64, integer: true },
};

interface LoadedResults {
  settings: unknown;
  results: CurveResult[];
  metadata: CurveMetadataTable;
  source: string;
  badInput: boolean;
}

function isObject(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

/** Check that each entry looks like a CurveResult (the fields the report reads); a UsageError names the first that does not. */
function checkResults(path: string, where: string, entries: unknown[]): CurveResult[] {
  entries.forEach((entry, i) => {
    const ok =
      isObject(entry) &&
      typeof entry.curve === 'string' &&
      typeof entry.file === 'string' &&
      typeof entry.run === 'string' &&
      (entry.kind === 'iz' || entry.kind === 'iv') &&
      Array.isArray(entry.flags);
    if (!ok) throw new UsageError(`burrow report: ${path}: ${where}[${i}] is not a curve result (needs curve, file, run, kind and flags)`);
  });
  return entries as CurveResult[];
}

/** Metadata of the data files named in results, where they can still be read (a results JSON carries none). */
async function metadataOfNamedFiles(results: readonly CurveResult[], io: CommandIO): Promise<CurveMetadataTable> {
  const files = [...new Set(results.map((result) => result.file))].filter((file) => existsSync(resolve(io.cwd, file)));
  if (files.length === 0) return {};
  const imported = await importPaths(files, { cwd: io.cwd });
  return metadataTableFromCurves(imported.flatMap((file) => file.curves));
}

async function loadJson(path: string, settingsFlag: string | undefined, io: CommandIO): Promise<LoadedResults> {
  if (settingsFlag !== undefined) {
    throw new UsageError(`burrow report: --settings applies to data files; ${path} carries its own settings, got --settings ${settingsFlag}`);
  }
  let text: string;
  try {
    text = readFileSync(resolve(io.cwd, path), 'utf8');
  } catch (error) {
    throw new UsageError(`burrow report: cannot read ${path} (${(error as NodeJS.ErrnoException).code ?? (error as Error).message})`);
  }
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (error) {
    throw new UsageError(`burrow report: ${path} is not valid JSON (${(error as Error).message})`);
  }
  if (Array.isArray(raw)) {
    const results = checkResults(path, 'results', raw);
    return { settings: null, results, metadata: await metadataOfNamedFiles(results, io), source: path, badInput: false };
  }
  if (isObject(raw) && raw.format === 'burrow-session') {
    if (!Array.isArray(raw.results) || raw.results.length === 0) {
      throw new UsageError(`burrow report: ${path}: the session holds no fitted results; fit it in the dashboard first, or give the data files`);
    }
    const stored = raw.results.map((entry, i) => {
      if (!isObject(entry) || !isObject(entry.result)) throw new UsageError(`burrow report: ${path}: results[${i}] must be { curveId, fitKey, result }`);
      return entry.result;
    });
    // Stored results are as fitted one by one: the batch flags (hysteresis, batch outliers) are added here.
    const results = finishBatch(checkResults(path, 'results[].result', stored));
    const curves = [];
    for (const file of Array.isArray(raw.files) ? raw.files : []) {
      if (isObject(file) && typeof file.text === 'string' && typeof file.fileName === 'string') {
        const key = typeof file.key === 'string' && file.key ? file.key : file.fileName;
        curves.push(...importText(file.text, key, { keepRawText: false }).curves);
      }
    }
    return { settings: raw.settings ?? null, results, metadata: metadataTableFromCurves(curves), source: path, badInput: false };
  }
  if (isObject(raw) && Array.isArray(raw.results)) {
    const results = checkResults(path, 'results', raw.results);
    return { settings: raw.settings ?? null, results, metadata: await metadataOfNamedFiles(results, io), source: path, badInput: false };
  }
  throw new UsageError(`burrow report: ${path} is neither a results file ({ settings, results } from burrow fit --out) nor a burrow session`);
}

async function loadByFitting(paths: readonly string[], settingsFlag: string | undefined, workers: number | undefined, io: CommandIO): Promise<LoadedResults> {
  const args = [...paths, ...(settingsFlag !== undefined ? ['--settings', settingsFlag] : []), ...(workers !== undefined ? ['--workers', String(workers)] : [])];
  let printed = '';
  const fitIO: CommandIO = { ...io, stdout: (text) => void (printed += text) };
  let code: number;
  try {
    code = await fitCommand.run(args, fitIO);
  } catch (error) {
    if (error instanceof UsageError) throw new UsageError(error.message.replace(/^burrow fit:/, 'burrow report:'));
    throw error;
  }
  const results = JSON.parse(printed) as CurveResult[];
  const { settings } = await resolveSettings(settingsFlag, paths, io);
  const files = await importPaths(paths, { cwd: io.cwd });
  const source = `${paths.join(', ')} (fitted for this report)`;
  return { settings, results, metadata: metadataTableFromCurves(files.flatMap((file) => file.curves)), source, badInput: code !== 0 };
}

function readTags(path: string, io: CommandIO): Record<string, string> {
  let raw: unknown;
  try {
    raw = JSON.parse(readFileSync(resolve(io.cwd, path), 'utf8'));
  } catch (error) {
    const reason = (error as NodeJS.ErrnoException).code ?? (error as Error).message;
    throw new UsageError(`burrow report: cannot read --tags ${path} as JSON (${reason})`);
  }
  if (!isObject(raw)) throw new UsageError(`burrow report: --tags ${path} must hold a JSON object, got ${Array.isArray(raw) ? 'an array' : typeof raw}`);
  const tags: Record<string, string> = {};
  for (const [key, value] of Object.entries(raw)) {
    if (typeof value === 'string') tags[key] = value;
    else if (Array.isArray(value) && value.every((id) => typeof id === 'string')) for (const id of value) tags[id] = key;
    else throw new UsageError(`burrow report: --tags ${path}: '${key}' must map to a tag (text) or to a list of curve ids, got ${JSON.stringify(value)}`);
  }
  return tags;
}

function parseGrouping(groupBy: string | undefined, tagsPath: string | undefined, io: CommandIO): CurveGrouping {
  if (tagsPath !== undefined) {
    if (groupBy !== undefined) throw new UsageError(`burrow report: --tags groups by tag; give it without --group-by, got --group-by ${groupBy}`);
    return { by: 'tag', tags: readTags(tagsPath, io) };
  }
  if (groupBy === undefined || groupBy === 'run') return { by: 'run' };
  if (groupBy === 'file') return { by: 'file' };
  const match = /^metadata:(.+)$/.exec(groupBy);
  if (match && match[1].trim()) return { by: 'metadata', key: match[1].trim() };
  throw new UsageError(`burrow report: --group-by must be run, file or metadata:KEY, got '${groupBy}'`);
}

/**
 * The `burrow report` command: load or fit results, group them (run, file, metadata:KEY or tags),
 * compare the chosen quantity and write the HTML report (writeReport) to --out or stdout. Bad
 * arguments and unreadable input are one-line UsageErrors (exit 2); input files with import
 * errors still give a report, with exit 2, as `burrow fit` does.
 * Source: Burrow's command-line conventions (src/cli/args.ts).
 * @example await runCli(['report', 'results.json', '--group-by', 'metadata:tip', '--out', 'report.html'], io) // 0
 */
export const reportCommand: Command = {
  name: 'report',
  summary: 'Compare runs (or tips, samples, tags): one self-contained HTML report with plots, tests, drift, maps and flags',
  usage:
    'burrow report <results.json|session.json|files or folders…> [--settings settings.json] [--group-by run|file|metadata:KEY] [--tags tags.json] [--quantity apparentBarrierEV|gapToContactNm|phi1EV|phi2EV|asymmetryEV|meanBarrierEV] [--include-flagged] [--colour-map viridis|cividis] [--title TEXT] [--out report.html]',
  flags,
  async run(argv, io) {
    const { flags: f, positionals } = parseArgs('report', argv, flags);
    if (positionals.length === 0) throw new UsageError('burrow report: give a results or session .json, or data files and folders');
    const out = f.out as string | undefined;
    if (out !== undefined && !/\.html?$/i.test(out)) throw new UsageError(`burrow report: --out must end in .html or .htm, got '${out}'`);
    const grouping = parseGrouping(f['group-by'] as string | undefined, f.tags as string | undefined, io);
    const quantity = f.quantity as GroupQuantityName;
    const settingsFlag = f.settings as string | undefined;
    const jsonPaths = positionals.filter((path) => /\.json$/i.test(path));
    if (jsonPaths.length > 0 && positionals.length > 1) {
      throw new UsageError(`burrow report: give one results or session .json, or data files and folders, not both; got ${positionals.length} paths`);
    }
    const loaded = jsonPaths.length ? await loadJson(jsonPaths[0], settingsFlag, io) : await loadByFitting(positionals, settingsFlag, f.workers as number | undefined, io);
    if (loaded.results.length === 0) throw new UsageError('burrow report: no curves to report on');

    if (grouping.by === 'metadata') {
      const keys = metadataKeys(loaded.metadata);
      const groups = groupCurves(loaded.results, grouping, loaded.metadata);
      if (groups.every((group) => group.key === '')) {
        const found = keys.length ? `keys found: ${keys.join(', ')}` : 'no metadata could be read (a results JSON carries none; keep the data files where burrow fit read them)';
        throw new UsageError(`burrow report: --group-by metadata:${grouping.key}: no curve has a '${grouping.key}' entry; ${found}`);
      }
    }
    if (grouping.by === 'tag' && !loaded.results.some((result) => Object.hasOwn(grouping.tags, result.curve))) {
      throw new UsageError(`burrow report: --tags ${String(f.tags)}: none of its ${Object.keys(grouping.tags).length} curve ids matches a curve`);
    }
    const info = GROUP_QUANTITIES[quantity];
    if (!loaded.results.some((result) => result.kind === info.kind)) {
      io.stderr(`burrow report: no ${info.kind === 'iz' ? 'approach curve (I(z))' : 'spectrum (I(V))'} among the curves, so no ${info.label} to compare\n`);
    }
    const html = writeReport({
      settings: loaded.settings,
      results: loaded.results,
      grouping,
      metadata: loaded.metadata,
      quantity,
      includeFlagged: f['include-flagged'] === true,
      timeSByCurve: acquisitionTimes(loaded.metadata),
      colourMap: f['colour-map'] as GridColourMapName,
      title: f.title as string | undefined,
      generatedAt: new Date().toISOString(),
      source: loaded.source,
    });
    if (out === undefined) io.stdout(html);
    else {
      writeFileSync(resolve(io.cwd, out), html);
      io.stderr(`burrow report: wrote ${out}\n`);
    }
    return loaded.badInput ? 2 : 0;
  },
};
