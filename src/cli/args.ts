/**
 * Flag parsing shared by every burrow command. A command declares its flags as data; the parser
 * returns typed values or throws a UsageError whose one-line message names the flag, the accepted
 * range and the value received. main.ts turns a UsageError into exit code 2.
 */

export class UsageError extends Error {
  readonly exitCode = 2;
  constructor(message: string) {
    super(message);
    this.name = 'UsageError';
  }
}

export type FlagSpec =
  | { kind: 'number'; help: string; min?: number; max?: number; minExclusive?: boolean; integer?: boolean; default?: number }
  | { kind: 'string'; help: string; choices?: readonly string[]; default?: string }
  | { kind: 'boolean'; help: string };

export type FlagSpecs = Record<string, FlagSpec>;

export interface ParsedArgs {
  flags: Record<string, number | string | boolean | undefined>;
  positionals: string[];
}

function describeRange(spec: Extract<FlagSpec, { kind: 'number' }>): string {
  const lo = spec.min === undefined ? '' : `${spec.minExclusive ? '>' : '>='} ${spec.min}`;
  const hi = spec.max === undefined ? '' : `<= ${spec.max}`;
  const kind = spec.integer ? 'an integer' : 'a number';
  if (lo && hi) return `${kind} ${lo} and ${hi}`;
  if (lo || hi) return `${kind} ${lo || hi}`;
  return kind;
}

function parseNumber(command: string, name: string, spec: Extract<FlagSpec, { kind: 'number' }>, raw: string): number {
  const value = raw.trim() === '' ? Number.NaN : Number(raw);
  const bad =
    !Number.isFinite(value) ||
    (spec.integer && !Number.isInteger(value)) ||
    (spec.min !== undefined && (spec.minExclusive ? value <= spec.min : value < spec.min)) ||
    (spec.max !== undefined && value > spec.max);
  if (bad) throw new UsageError(`burrow ${command}: --${name} must be ${describeRange(spec)}, got '${raw}'`);
  return value;
}

/** Parse argv against the specs. `--flag value` and `--flag=value` are both accepted. */
export function parseArgs(command: string, argv: readonly string[], specs: FlagSpecs): ParsedArgs {
  const flags: ParsedArgs['flags'] = {};
  const positionals: string[] = [];
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i];
    if (!arg.startsWith('--') || arg === '--') {
      positionals.push(arg);
      continue;
    }
    const eq = arg.indexOf('=');
    const name = eq > 0 ? arg.slice(2, eq) : arg.slice(2);
    const spec = specs[name];
    if (!spec) {
      const known = Object.keys(specs).map((k) => `--${k}`).join(', ');
      throw new UsageError(`burrow ${command}: unknown flag --${name}; accepted: ${known}`);
    }
    if (spec.kind === 'boolean') {
      if (eq > 0) {
        const text = arg.slice(eq + 1);
        if (text !== 'true' && text !== 'false') throw new UsageError(`burrow ${command}: --${name} takes no value or true/false, got '${text}'`);
        flags[name] = text === 'true';
      } else flags[name] = true;
      continue;
    }
    let raw: string | undefined;
    if (eq > 0) raw = arg.slice(eq + 1);
    else {
      raw = argv[i + 1];
      i++;
    }
    if (raw === undefined) throw new UsageError(`burrow ${command}: --${name} needs a value`);
    if (spec.kind === 'number') flags[name] = parseNumber(command, name, spec, raw);
    else {
      if (spec.choices && !spec.choices.includes(raw)) {
        throw new UsageError(`burrow ${command}: --${name} must be one of ${spec.choices.join('|')}, got '${raw}'`);
      }
      flags[name] = raw;
    }
  }
  for (const [name, spec] of Object.entries(specs)) {
    if (flags[name] === undefined && spec.kind !== 'boolean' && spec.default !== undefined) flags[name] = spec.default;
  }
  return { flags, positionals };
}

/** Help text for a command's flags, one line each, aligned. */
export function formatFlagHelp(specs: FlagSpecs): string {
  const rows = Object.entries(specs).map(([name, spec]) => {
    const value = spec.kind === 'boolean' ? '' : spec.kind === 'number' ? ' N' : spec.choices ? ` ${spec.choices.join('|')}` : ' TEXT';
    const def = spec.kind !== 'boolean' && spec.default !== undefined ? ` (default ${spec.default})` : '';
    return [`  --${name}${value}`, `${spec.help}${def}`];
  });
  const width = Math.max(...rows.map((r) => r[0].length)) + 2;
  return rows.map(([a, b]) => a.padEnd(width) + b).join('\n');
}
