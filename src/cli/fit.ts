import { readFileSync, writeFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { analyzeCurve, type CurveResult } from '../analysis/analyzeCurve.ts';
import { finishBatch } from '../analysis/analyzeBatch.ts';
import { analyzeJoint } from '../analysis/analyzeJoint.ts';
import { pairSites } from '../analysis/pairSites.ts';
import { RESULT_COLUMNS } from '../io/resultColumns.ts';
import { validateSettings, type AnalysisSettings } from '../fit/index.ts';
import { toCsv } from '../io/exportResults.ts';
import { importPaths, listSettingsFiles } from '../io/readFileNode.ts';
import { readSettingsText, settingsAgree } from '../io/settingsFile.ts';
import { defaultPoolSize, runAnalysisPool } from '../workers/nodePool.ts';
import type { AnalysisTask } from '../workers/analysisTask.ts';
import { parseArgs, UsageError, type FlagSpecs } from './args.ts';
import type { Command, CommandIO } from './command.ts';
import { formatProblem } from './formatProblem.ts';

const flags: FlagSpecs = {
  settings: { kind: 'string', help: 'JSON file with the analysis settings (schema in the README); default: the settings file kept with the data, if any' },
  out: { kind: 'string', help: 'write results to FILE.json or FILE.csv instead of printing JSON' },
  model: { kind: 'string', help: 'auto: I(z) line for approach curves, WKB for spectra; or force one', choices: ['auto', 'iz', 'wkb', 'simmons', 'bdr'] },
  workers: { kind: 'number', help: 'worker threads (default: one per core; 1 fits in this process)', min: 1, max: 64, integer: true },
};

/** Below this many curves, fitting in-process beats starting worker threads. */
const IN_PROCESS_BELOW = 24;

export const fitCommand: Command = {
  name: 'fit',
  summary: 'Fit and flag every curve in the given files or folders; JSON on stdout, or --out FILE.json|FILE.csv',
  usage: 'burrow fit <files or folders…> [--settings settings.json] [--out results.json|results.csv] [--model auto|iz|wkb|simmons|bdr] [--workers N]',
  flags,
  async run(argv, io) {
    const { flags: f, positionals } = parseArgs('fit', argv, flags);
    if (positionals.length === 0) throw new UsageError('burrow fit: give at least one file or folder');
    const { settings, source } = await resolveSettings(f.settings as string | undefined, positionals, io);
    if (source !== null && f.settings === undefined) io.stderr(`burrow fit: settings from ${source} (kept with the data; --settings FILE chooses another)\n`);
    if (typeof f.model === 'string') settings.model = f.model as AnalysisSettings['model'];
    const out = f.out as string | undefined;
    if (out !== undefined && !/\.(json|csv)$/i.test(out)) throw new UsageError(`burrow fit: --out must end in .json or .csv, got '${out}'`);

    const files = await importPaths(positionals, { cwd: io.cwd });
    let badInput = false;
    for (const file of files) {
      for (const problem of file.problems) {
        if (problem.severity === 'error') badInput = true;
        io.stderr(formatProblem(problem) + '\n');
      }
    }
    const curves = files.flatMap((file) => file.curves);
    const chosen = curves.filter((curve) => settings.model === 'auto' || (settings.model === 'iz') === (curve.kind === 'iz'));
    if (chosen.length < curves.length) io.stderr(`burrow fit: --model ${settings.model} skips ${curves.length - chosen.length} curves of the other kind\n`);
    const tasks: AnalysisTask[] = chosen.map((curve) => ({ curve, settings }));
    const size = (f.workers as number | undefined) ?? defaultPoolSize();
    const progress = progressBar(io, tasks.length);
    let results: CurveResult[];
    if (size === 1 || tasks.length < IN_PROCESS_BELOW) {
      results = tasks.map((task, i) => {
        const result = analyzeCurve(task.curve, task.settings);
        progress(i + 1);
        return result;
      });
    } else {
      const raw = await runAnalysisPool(tasks, size, { onProgress: (done) => progress(done) });
      results = raw.map((result, i) => (result instanceof Error ? failedResult(tasks[i], result) : result));
    }
    results = finishBatch(results);
    // Approach curves and spectra of one site: fit them together too (the spectrum's record gets `joint`).
    const pairs = pairSites(chosen);
    for (const pair of pairs) {
      const spectrumIndex = pair.spectrum;
      results[spectrumIndex] = { ...results[spectrumIndex], joint: analyzeJoint(chosen[pair.approach], chosen[spectrumIndex], pair.by, settings) };
    }
    if (pairs.length) io.stderr(`burrow fit: ${pairs.length} site${pairs.length === 1 ? '' : 's'} with an approach curve and a spectrum fitted jointly\n`);
    if (io.stderrIsTTY && tasks.length) io.stderr('\n');
    const flagged = results.filter((r) => r.flags.length).length;
    io.stderr(`burrow fit: ${results.length} curves from ${files.length} files; ${results.filter((r) => r.status === 'ok').length} fitted, ${flagged} flagged\n`);
    if (out === undefined) io.stdout(JSON.stringify(results, null, 1) + '\n');
    else {
      const text = /\.csv$/i.test(out) ? toCsv(results, RESULT_COLUMNS) : JSON.stringify({ settings, results }, null, 1) + '\n';
      writeFileSync(resolve(io.cwd, out), text);
      io.stderr(`burrow fit: wrote ${out}\n`);
    }
    return badInput ? 2 : 0;
  },
};

/** A worker that died on a task: fit that curve here instead (analyzeCurve never throws). */
function failedResult(task: AnalysisTask, error: Error): CurveResult {
  const result = analyzeCurve(task.curve, task.settings);
  return result.status === 'ok' ? result : { ...result, message: `${result.message} (worker: ${error.message})` };
}

/** Read and validate a settings file; any problem is a UsageError naming the file, line, column, field, range and value. */
export function readSettings(path: string | undefined, io: CommandIO, what = '--settings '): AnalysisSettings {
  if (path === undefined) return validateSettings({}).settings;
  let text: string;
  try {
    text = readFileSync(resolve(io.cwd, path), 'utf8');
  } catch (error) {
    throw new UsageError(`burrow fit: cannot read ${what}${path} (${(error as NodeJS.ErrnoException).code ?? (error as Error).message})`);
  }
  const read = readSettingsText(text, path);
  if (!read.ok) throw new UsageError(read.message);
  return read.settings;
}

/**
 * The settings of a run of `fit`: the --settings file when given, else the settings file kept with
 * the data (a settings file among the paths or in their folders, see isSettingsFileName; several
 * are fine when they agree), else the defaults. `source` names the file read, null for defaults.
 */
export async function resolveSettings(flag: string | undefined, paths: readonly string[], io: CommandIO): Promise<{ settings: AnalysisSettings; source: string | null }> {
  if (flag !== undefined) return { settings: readSettings(flag, io), source: flag };
  const found = await listSettingsFiles(paths, io.cwd);
  if (found.length === 0) return { settings: readSettings(undefined, io), source: null };
  const read = found.map((path) => readSettings(path, io, 'settings file '));
  if (!settingsAgree(read)) {
    throw new UsageError(`burrow fit: the settings files kept with the data disagree (${found.join(', ')}); choose one with --settings FILE`);
  }
  return { settings: read[0], source: found[0] };
}

/** A progress bar on stderr when it is a terminal; silent otherwise. */
function progressBar(io: CommandIO, total: number): (done: number) => void {
  if (!io.stderrIsTTY || total === 0) return () => {};
  let last = -1;
  return (done) => {
    const percent = Math.floor((100 * done) / total);
    if (percent === last) return;
    last = percent;
    const width = 30;
    const filled = Math.round((width * done) / total);
    io.stderr(`\rfitting [${'#'.repeat(filled)}${'.'.repeat(width - filled)}] ${done}/${total} curves`);
  };
}
