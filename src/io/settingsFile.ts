/**
 * Settings files kept with the data: the geometry and analysis settings of a session saved as JSON
 * beside its exports (`settings.json`, or `<name>-settings.json` as the dashboard saves them). The
 * command line and the dashboard read them the same way: the JSON is parsed, every field checked by
 * validateSettings, and any problem reported as `file:line[:column]: message`.
 */
import { validateSettings, type AnalysisSettings } from '../fit/settings.ts';

/** Base names taken as settings files: settings.json, or ending in -settings.json, _settings.json or .settings.json. */
const SETTINGS_FILE_NAME = /(^|[-_.])settings\.json$/i;

/**
 * Is this file (a path or a base name) a settings file rather than a data export?
 * @example isSettingsFileName('sample-data/settings.json') // true
 */
export function isSettingsFileName(path: string): boolean {
  return SETTINGS_FILE_NAME.test(path.split(/[\\/]/).pop() ?? path);
}

export type SettingsFileRead = { ok: true; settings: AnalysisSettings } | { ok: false; message: string };

/**
 * Parse and check the text of a settings file named `name` (shown in the messages).
 * @example readSettingsText('{"temperatureK": 4.2}', 'settings.json') // { ok: true, settings: { …, temperatureK: 4.2 } }
 */
export function readSettingsText(text: string, name: string): SettingsFileRead {
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (error) {
    const message = (error as Error).message;
    const position = Number(/position (\d+)/.exec(message)?.[1] ?? Number.NaN);
    const where = Number.isFinite(position) ? lineColumn(text, position) : { line: 1, column: 1 };
    return { ok: false, message: `${name}:${where.line}:${where.column}: settings file is not valid JSON (${message})` };
  }
  const { settings, problems } = validateSettings(raw);
  if (problems.length === 0) return { ok: true, settings };
  const lines = problems.map((p) => {
    const where = lineColumn(text, fieldOffset(text, p.field));
    return `${name}:${where.line}:${where.column}: ${p.message}`;
  });
  return { ok: false, message: lines.join('\n') };
}

/**
 * Do these settings (read from several files kept with the data) all say the same? Only then may
 * they be applied; which one holds is otherwise the user's choice.
 * @example settingsAgree([a, { ...a }]) // true
 */
export function settingsAgree(settings: readonly AnalysisSettings[]): boolean {
  const first = JSON.stringify(settings[0]);
  return settings.every((s) => JSON.stringify(s) === first);
}

/**
 * Where a field's key stands in the text (0 when not found): `key`, `runOverrides.RUN` or
 * `runOverrides.RUN.key`, each key looked for after the one before it (run names may hold dots).
 */
function fieldOffset(text: string, field: string): number {
  const keys = [field];
  const prefix = 'runOverrides.';
  if (field.startsWith(prefix)) {
    const rest = field.slice(prefix.length);
    const dot = rest.lastIndexOf('.');
    keys.splice(0, 1, 'runOverrides', ...(dot > 0 ? [rest.slice(0, dot), rest.slice(dot + 1)] : [rest]));
  }
  let at = 0;
  let found = 0;
  for (const key of keys) {
    const next = text.indexOf(JSON.stringify(key), at);
    // Not found (a run name that holds a dot, say): the last key located is the nearest place.
    if (next < 0) return found;
    found = next;
    at = next + 1;
  }
  return found;
}

function lineColumn(text: string, offset: number): { line: number; column: number } {
  const before = text.slice(0, offset);
  const line = before.split('\n').length;
  return { line, column: offset - before.lastIndexOf('\n') };
}
