/**
 * burrow inspect: show what the importer detects in text exports (dialect, metadata, columns with
 * roles and units, curves, problems), so a user can check a file before fitting it, and answer a
 * mapping question from the command line.
 */
import { readFile, writeFile } from 'node:fs/promises';
import { resolve } from 'node:path';
import { parseArgs, UsageError } from './args.ts';
import type { Command, CommandIO } from './command.ts';
import { COLUMN_ROLES, MappingMemory, delimiterName, parseUnit, type ColumnRole, type Curve, type ImportedFile, type MappingAnswer } from '../io/index.ts';
// The Node file reader is not part of io/index.ts, which must stay free of node: imports for the browser.
import { importPaths } from '../io/readFileNode.ts';

const FLAGS = {
  json: { kind: 'boolean', help: 'print the detection as JSON instead of text' },
  role: { kind: 'string', help: `column roles as N=ROLE[,N=ROLE...], columns from 1; roles: ${COLUMN_ROLES.join(', ')}` },
  unit: { kind: 'string', help: 'column units as N=UNIT[,N=UNIT...], e.g. 1=nm,2=pA' },
  'piezo-nm-per-v': { kind: 'number', min: 0, minExclusive: true, help: 'piezo z calibration in nm/V, for a piezo column written in volts' },
  mapping: { kind: 'string', help: 'JSON file of remembered mapping answers (read; written with --remember)' },
  remember: { kind: 'boolean', help: 'store the --role/--unit/--piezo-nm-per-v answer in the --mapping file for each file of that shape' },
} as const;

const ROLE_LIST_FORMAT = 'N=ROLE[,N=ROLE...]';

function parsePairs(flag: string, text: string, format: string): [number, string][] {
  const pairs: [number, string][] = [];
  for (const part of text.split(',')) {
    const match = /^\s*(\d+)\s*=\s*(\S.*?)\s*$/.exec(part);
    const column = match ? Number(match[1]) : 0;
    if (!match || column < 1) throw new UsageError(`burrow inspect: --${flag} must be ${format} with columns from 1, got '${text}'`);
    pairs.push([column, match[2]]);
  }
  return pairs;
}

/** The mapping answer given by --role, --unit and --piezo-nm-per-v, or undefined when none was. */
function answerFromFlags(flags: Record<string, unknown>): MappingAnswer | undefined {
  const answer: MappingAnswer = {};
  if (typeof flags.role === 'string') {
    const roles: Record<number, ColumnRole> = {};
    for (const [column, role] of parsePairs('role', flags.role, ROLE_LIST_FORMAT)) {
      if (!COLUMN_ROLES.includes(role as ColumnRole)) {
        throw new UsageError(`burrow inspect: --role for column ${column} must be one of ${COLUMN_ROLES.join('|')}, got '${role}'`);
      }
      roles[column] = role as ColumnRole;
    }
    answer.columnRoles = roles;
  }
  if (typeof flags.unit === 'string') {
    const units: Record<number, string> = {};
    for (const [column, unit] of parsePairs('unit', flags.unit, 'N=UNIT[,N=UNIT...]')) {
      if (parseUnit(unit).length === 0) throw new UsageError(`burrow inspect: --unit for column ${column} must be a unit such as nm, Å, pA, mV, got '${unit}'`);
      units[column] = unit;
    }
    answer.units = units;
  }
  if (typeof flags['piezo-nm-per-v'] === 'number') answer.piezoCalibrationMPerV = flags['piezo-nm-per-v'] * 1e-9;
  return Object.keys(answer).length > 0 ? answer : undefined;
}

async function loadMemory(path: string, mayBeMissing: boolean): Promise<MappingMemory> {
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch (error) {
    if (mayBeMissing && (error as NodeJS.ErrnoException).code === 'ENOENT') return new MappingMemory();
    throw new UsageError(`burrow inspect: --mapping file cannot be read: ${path} (${(error as NodeJS.ErrnoException).code ?? (error as Error).message})`);
  }
  try {
    return MappingMemory.fromJSON(JSON.parse(text));
  } catch (error) {
    throw new UsageError(`burrow inspect: --mapping file ${path} is not a mapping file: ${(error as Error).message}`);
  }
}

const PREFIXES: [number, string][] = [
  [1e3, 'k'],
  [1, ''],
  [1e-3, 'm'],
  [1e-6, 'µ'],
  [1e-9, 'n'],
  [1e-12, 'p'],
  [1e-15, 'f'],
];

/** A value in SI with an SI prefix and 4 significant digits, e.g. 4.5e-10 m → '450 pm'. */
function formatSI(value: number, unit: string): string {
  if (!Number.isFinite(value)) return `${value} ${unit}`;
  if (value === 0 || unit === '' || unit === 'K' || unit === 'm/V') return `${Number(value.toPrecision(4))} ${unit}`.trim();
  const magnitude = Math.abs(value);
  for (const [factor, prefix] of PREFIXES) {
    if (magnitude >= factor * 0.9995) return `${Number((value / factor).toPrecision(4))} ${prefix}${unit}`;
  }
  return `${value.toPrecision(4)} ${unit}`;
}

function range(values: Float64Array): { min: number; max: number } {
  let min = Infinity;
  let max = -Infinity;
  for (const v of values) {
    if (v < min) min = v;
    if (v > max) max = v;
  }
  return { min, max };
}

function curveSummary(curve: Curve) {
  const x = range(curve.x);
  const current = range(curve.current);
  return {
    id: curve.id,
    index: curve.index,
    segment: curve.segment,
    kind: curve.kind,
    xRole: curve.xRole,
    points: curve.x.length,
    firstLine: curve.firstLine,
    xFirst: curve.x[0],
    xLast: curve.x[curve.x.length - 1],
    xMin: x.min,
    xMax: x.max,
    currentMinA: current.min,
    currentMaxA: current.max,
    ...(curve.fixedBiasV !== undefined ? { fixedBiasV: curve.fixedBiasV } : {}),
    ...(curve.fixedGapM !== undefined ? { fixedGapM: curve.fixedGapM } : {}),
    ...(curve.position ? { position: curve.position } : {}),
    sourceColumns: curve.sourceColumns,
  };
}

function fileAsJSON(file: ImportedFile) {
  const { rawText: _raw, curves, ...rest } = file;
  return { ...rest, curves: curves.map(curveSummary) };
}

function pad(text: string, width: number): string {
  return text.length >= width ? `${text} ` : text.padEnd(width);
}

function describeFile(file: ImportedFile): string {
  const d = file.dialect;
  const out: string[] = [file.fileName];
  const indent = '            ';
  const yesNo = (b: boolean) => (b ? 'yes' : 'no');
  out.push(`  dialect   delimiter ${delimiterName(d.delimiter)}, decimal mark '${d.decimalMark}', line ending ${d.lineEnding}, BOM ${yesNo(d.hasBOM)}, quoted ${yesNo(d.quoted)}${file.encoding ? `, encoding ${file.encoding}` : ''}`);
  const lines = [
    d.headerLine !== null ? `header line ${d.headerLine}` : 'no header',
    ...(d.unitsLine !== null ? [`units line ${d.unitsLine}`] : []),
    d.dataStartLine !== null ? `data from line ${d.dataStartLine}` : 'no data',
    `${file.rowCount} rows`,
    `mapping ${file.mappingSource}`,
  ];
  out.push(`${indent}${lines.join(', ')}`);
  const entries = Object.entries(file.metadata);
  out.push(`  metadata  ${entries.length === 0 ? 'none' : `${entries.length} entr${entries.length === 1 ? 'y' : 'ies'}`}`);
  const keyWidth = Math.max(0, ...entries.map(([k]) => k.length)) + 2;
  for (const [key, entry] of entries) {
    const si = entry.value !== undefined && entry.unit ? `  = ${formatSI(entry.value, entry.unit)}` : '';
    const label = entry.label && entry.label !== key ? `, '${entry.label}'` : '';
    out.push(`${indent}${pad(key, keyWidth)}${entry.raw}${si}  (line ${entry.line}${label})`);
  }
  out.push(`  columns   ${file.columns.length}`);
  const headerWidth = Math.max(8, ...file.columns.map((c) => (c.header || c.name).length)) + 2;
  for (const c of file.columns) {
    const unit = c.siUnit ? `${c.unit || '(none)'}${c.unitAssumed ? ' (SI assumed)' : ''} ×${c.scaleToSI} → ${c.siUnit}` : c.valueType === 'text' ? 'text' : '';
    out.push(`${indent}${pad(String(c.index), 3)}${pad(c.header || c.name, headerWidth)}${pad(c.role, 12)}${unit}${c.segmentHint ? `  [${c.segmentHint}]` : ''}`);
  }
  out.push(`  curves    ${file.curves.length}`);
  for (const curve of file.curves) {
    const xUnit = curve.kind === 'iz' ? 'm' : 'V';
    const extra = [
      curve.fixedBiasV !== undefined ? `bias ${formatSI(curve.fixedBiasV, 'V')}` : '',
      curve.fixedGapM !== undefined ? `gap ${formatSI(curve.fixedGapM, 'm')}` : '',
      curve.position ? `at x ${formatSI(curve.position.xM, 'm')}, y ${formatSI(curve.position.yM, 'm')}` : '',
    ].filter((s) => s !== '');
    const current = range(curve.current);
    out.push(
      `${indent}${curve.id}  ${curve.kind}  ${curve.x.length} points from line ${curve.firstLine}  ${curve.xRole} ${formatSI(curve.x[0], xUnit)} … ${formatSI(curve.x[curve.x.length - 1], xUnit)}  current ${formatSI(current.min, 'A')} … ${formatSI(current.max, 'A')}${extra.length ? `  ${extra.join(', ')}` : ''}`,
    );
  }
  const errors = file.problems.filter((p) => p.severity === 'error').length;
  const warnings = file.problems.length - errors;
  out.push(`  problems  ${file.problems.length === 0 ? 'none' : `${errors} error${errors === 1 ? '' : 's'}, ${warnings} warning${warnings === 1 ? '' : 's'} (on stderr)`}`);
  if (file.proposal) {
    out.push('  mapping   needed:');
    for (const a of file.proposal.ambiguities) out.push(`${indent}- ${a.message}`);
    out.push(`${indent}answer with: ${hintFlags(file)}`);
  }
  return out.join('\n');
}

function hintFlags(file: ImportedFile): string {
  const suggested = file.proposal?.suggested ?? {};
  const roles = Object.entries(suggested.columnRoles ?? {}).map(([k, v]) => `${k}=${v}`);
  const units = Object.entries(suggested.units ?? {}).map(([k, v]) => `${k}=${v}`);
  const calibration = file.proposal?.ambiguities.some((a) => a.kind === 'calibration') ? ' --piezo-nm-per-v N' : '';
  return `--role ${roles.join(',') || '1=distance,2=current'}${units.length ? ` --unit ${units.join(',')}` : ''}${calibration}  (add --mapping FILE.json --remember to reuse it)`;
}

async function run(argv: readonly string[], io: CommandIO): Promise<number> {
  const { flags, positionals } = parseArgs('inspect', argv, FLAGS);
  if (positionals.length === 0) throw new UsageError('burrow inspect: give at least one file or folder, e.g. burrow inspect run7.csv');
  const answer = answerFromFlags(flags);
  const mappingPath = typeof flags.mapping === 'string' ? resolve(io.cwd, flags.mapping) : undefined;
  if (flags.remember && !mappingPath) throw new UsageError('burrow inspect: --remember needs --mapping FILE.json to write to');
  if (flags.remember && !answer) throw new UsageError('burrow inspect: --remember needs an answer to store (--role, --unit or --piezo-nm-per-v)');
  const memory = mappingPath ? await loadMemory(mappingPath, Boolean(flags.remember)) : undefined;

  const files = await importPaths(positionals, { cwd: io.cwd, ...(answer ? { mapping: answer } : {}), ...(memory ? { memory } : {}) });
  if (files.length === 0) {
    io.stderr(`burrow inspect: no data files found in ${positionals.join(', ')} (looked for ${['.csv', '.tsv', '.txt', '.dat'].join(', ')}, ...)\n`);
    return 2;
  }
  if (flags.json) io.stdout(JSON.stringify({ files: files.map(fileAsJSON) }, null, 2) + '\n');
  else io.stdout(files.map(describeFile).join('\n\n') + '\n');

  let failed = false;
  for (const file of files) {
    for (const p of file.problems) io.stderr(`${p.file}:${p.line}:${p.column}: ${p.severity}: ${p.message}\n`);
    if (file.proposal) io.stderr(`${file.fileName}: answer with ${hintFlags(file)}\n`);
    if (file.problems.some((p) => p.severity === 'error')) failed = true;
  }
  if (flags.remember && memory && mappingPath && answer) {
    const remembered: string[] = [];
    for (const file of files) {
      if (file.mappingSource === 'answer' && !file.proposal) {
        memory.remember(file.headerSignature, answer);
        remembered.push(file.headerSignature);
      }
    }
    if (remembered.length > 0) {
      await writeFile(mappingPath, JSON.stringify(memory.toJSON(), null, 2) + '\n', 'utf8');
      io.stderr(`burrow inspect: remembered the mapping for ${[...new Set(remembered)].map((s) => `'${s}'`).join(', ')} in ${flags.mapping}\n`);
    } else io.stderr('burrow inspect: nothing remembered: the answer did not resolve any file\n');
  }
  return failed ? 2 : 0;
}

/** `burrow inspect <file|folder>...`: print what the importer detects; exit 2 when a file has errors. */
export const inspectCommand: Command = {
  name: 'inspect',
  summary: 'show what import detects in text exports: dialect, metadata, columns, curves, problems',
  usage: 'burrow inspect <file|folder>... [--json] [--role N=ROLE,...] [--unit N=UNIT,...] [--piezo-nm-per-v N] [--mapping FILE.json [--remember]]',
  flags: FLAGS,
  run,
};
