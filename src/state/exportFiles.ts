/**
 * What the dashboard writes: the result table as CSV (RESULT_COLUMNS, units in the headers,
 * formula-looking cells escaped by csvCell) preceded by '#' lines with the settings and manual
 * windows, and the same records as JSON. Both carry the settings, so every export says how it was
 * made. Pure text; the UI turns it into a download.
 */
import type { CurveResult } from '../analysis/index.ts';
import type { AnalysisSettings } from '../fit/index.ts';
import { toCsv } from '../io/exportResults.ts';
import { RESULT_COLUMNS } from '../io/resultColumns.ts';
import type { ManualWindow } from './types.ts';

/** What an export says about where it came from. */
export interface ExportContext {
  sessionName: string;
  settings: AnalysisSettings;
  manualWindows: Record<string, ManualWindow>;
  /** ISO time of the export (passed in, so output is reproducible). */
  exportedAt: string;
}

/** One line of text: line breaks become spaces. */
function oneLine(text: string): string {
  return text.replace(/[\r\n]+/g, ' ');
}

function settingText(value: unknown): string {
  return value === null ? 'none' : typeof value === 'string' ? value : String(value);
}

/**
 * The '#' lines of a CSV export: one per setting ('# setting tipRadiusNm: 12'), one per run override
 * ('# setting runOverrides.A-gold.tipRadiusNm: 12') and one per manual window. A CSV reader with
 * '#' comments skips them (papaparse `comments: '#'`); a spreadsheet shows them as text rows, and
 * since each starts with '#' none can run as a formula.
 * @example settingsLines(context)[0] // '# Burrow results, session Demo, exported 2024-01-01T00:00:00.000Z'
 */
export function settingsLines(context: ExportContext): string[] {
  const lines = [`# Burrow results, session ${oneLine(context.sessionName)}, exported ${context.exportedAt}`];
  const { runOverrides, ...session } = context.settings;
  for (const [field, value] of Object.entries(session)) lines.push(`# setting ${field}: ${settingText(value)}`);
  for (const [run, override] of Object.entries(runOverrides)) {
    for (const [field, value] of Object.entries(override)) lines.push(`# setting runOverrides.${oneLine(run)}.${field}: ${settingText(value)}`);
  }
  for (const [curve, window] of Object.entries(context.manualWindows)) lines.push(`# manual window ${oneLine(curve)}: ${window.fromNm} to ${window.toNm} nm`);
  return lines;
}

/**
 * The CSV export: settings lines, then the table (header row with units, one row per curve), CRLF.
 * @example resultsCsv(results, context).split('\r\n').find((l) => l.startsWith('file,')) // 'file,curve,run,…'
 */
export function resultsCsv(results: readonly CurveResult[], context: ExportContext): string {
  return settingsLines(context).join('\r\n') + '\r\n' + toCsv(results, RESULT_COLUMNS);
}

/**
 * The JSON export: format tag, session, settings, manual windows and the full records (NaN → null).
 * @example JSON.parse(resultsJson(results, context)).format // 'burrow-results'
 */
export function resultsJson(results: readonly CurveResult[], context: ExportContext): string {
  return JSON.stringify(
    { format: 'burrow-results', version: 1, session: context.sessionName, exportedAt: context.exportedAt, settings: context.settings, manualWindows: context.manualWindows, results },
    (_key, value) => (typeof value === 'number' && !Number.isFinite(value) ? null : value),
    1,
  );
}

/**
 * A file name made safe for a download: letters, digits, dot, dash and underscore only.
 * @example safeFileName('Demo session: 1/2') // 'Demo-session-1-2'
 */
export function safeFileName(name: string): string {
  return name.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '') || 'burrow';
}
