import type { DetectedLayout } from './detectLayout.ts';
import { DIMENSION_OF_ROLE, inferColumnRole, segmentFromWord } from './inferColumnRole.ts';
import { parseHeaderCell } from './parseHeaderCell.ts';
import { parseNumberCell, isNonFiniteSpelling } from './parseNumberCell.ts';
import { SI_UNIT_OF, parseUnit, type ParsedUnit, type UnitDimension } from './parseUnit.ts';
import type { ProblemLog } from './problemLog.ts';
import { delimiterName } from './splitCells.ts';
import { COLUMN_ROLES, type ColumnRole, type ImportColumn, type MappingAmbiguity, type MappingAnswer, type MetadataEntry } from './types.ts';

/** Thrown when a mapping answer names a column, role or unit that cannot apply: a caller mistake. */
export class MappingError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'MappingError';
  }
}

/** Columns with roles and SI factors, plus whatever still needs an answer. */
export interface ColumnPlan {
  columns: ImportColumn[];
  ambiguities: MappingAmbiguity[];
  suggested: MappingAnswer;
}

/** Unit texts offered when a unit is missing or unknown, per dimension. */
export const UNIT_CANDIDATES: Readonly<Partial<Record<UnitDimension, string[]>>> = {
  length: ['nm', 'pm', 'Å', 'm'],
  current: ['pA', 'nA', 'fA', 'A'],
  voltage: ['mV', 'V'],
  conductance: ['nS', 'µS', 'S', 'nA/V'],
  time: ['ms', 's'],
};

/**
 * Key for remembering a mapping: delimiter, column count and the header (or units) cells in lower
 * case. Two files written by the same program with the same settings share it.
 * @example headerSignature(layout) // 'semicolon|3|gap (pm)|i approach (pa)|i retract (pa)'
 */
export function headerSignature(layout: Pick<DetectedLayout, 'delimiter' | 'columnCount' | 'headerCells' | 'unitsCells'>): string {
  const normalise = (cells: readonly string[]) => cells.map((c) => c.toLowerCase().replace(/\s+/g, ' ').trim()).join('|');
  const head = layout.headerCells ? normalise(layout.headerCells) : 'no header';
  const units = layout.unitsCells ? `|units:${normalise(layout.unitsCells)}` : '';
  return `${delimiterName(layout.delimiter)}|${layout.columnCount}|${head}${units}`;
}

function checkAnswer(answer: MappingAnswer, columnCount: number): void {
  const checkColumn = (key: string, what: string) => {
    const index = Number(key);
    if (!Number.isInteger(index) || index < 1 || index > columnCount) {
      throw new MappingError(`mapping: ${what} column must be 1..${columnCount}, got ${key}`);
    }
  };
  for (const [key, role] of Object.entries(answer.columnRoles ?? {})) {
    checkColumn(key, 'columnRoles');
    if (!COLUMN_ROLES.includes(role)) throw new MappingError(`mapping: role of column ${key} must be one of ${COLUMN_ROLES.join('|')}, got '${role}'`);
  }
  for (const [key, unit] of Object.entries(answer.units ?? {})) {
    checkColumn(key, 'units');
    if (typeof unit !== 'string' || (unit.trim() !== '' && parseUnit(unit).length === 0)) {
      throw new MappingError(`mapping: unit of column ${key} must be a unit such as nm, pA or mV, got '${String(unit)}'`);
    }
  }
  const calibration = answer.piezoCalibrationMPerV;
  if (calibration !== undefined && !(Number.isFinite(calibration) && calibration > 0)) {
    throw new MappingError(`mapping: piezoCalibrationMPerV must be > 0, got ${calibration}`);
  }
}

function columnSamples(rows: readonly string[][], column: number): string[] {
  const values: string[] = [];
  for (const row of rows) {
    const cell = row[column];
    if (cell !== undefined && cell !== '') values.push(cell);
  }
  return values;
}

function isTextColumn(samples: readonly string[], layout: DetectedLayout): boolean {
  let text = 0;
  for (const cell of samples) {
    if (Number.isNaN(parseNumberCell(cell, layout.decimalMark)) && !isNonFiniteSpelling(cell)) text++;
  }
  return text * 2 > samples.length;
}

function pickUnit(readings: readonly ParsedUnit[], role: ColumnRole): ParsedUnit | undefined {
  if (role === 'piezo') return readings.find((u) => u.dimension === 'length' || u.dimension === 'voltage');
  const dimension = DIMENSION_OF_ROLE[role];
  return dimension ? readings.find((u) => u.dimension === dimension) : undefined;
}

/**
 * Decide each column's role, unit and factor to SI from the header, the units row, the sample
 * values, the metadata (piezo calibration) and an optional answer. Everything that cannot be
 * decided becomes an ambiguity for a mapping proposal; header-level doubts become warnings.
 * Throws MappingError when the answer itself is malformed.
 */
export function planColumns(
  layout: DetectedLayout,
  metadata: Readonly<Record<string, MetadataEntry>>,
  answer: MappingAnswer | undefined,
  problems: ProblemLog,
): ColumnPlan {
  const count = layout.columnCount;
  if (answer) checkAnswer(answer, count);
  const columns: ImportColumn[] = [];
  const ambiguities: MappingAmbiguity[] = [];
  const suggestedRoles: Record<number, ColumnRole> = {};
  const suggestedUnits: Record<number, string> = {};
  const headerLine = layout.headerLine ?? layout.dataStartLine;
  const calibration = answer?.piezoCalibrationMPerV ?? (metadata.piezoZCalibration?.unit === 'm/V' ? metadata.piezoZCalibration.value : undefined);

  for (let c = 0; c < count; c++) {
    const index = c + 1;
    const header = layout.headerCells?.[c] ?? '';
    const cell = parseHeaderCell(header);
    const unitsRowText = layout.unitsCells?.[c] ?? '';
    let unitText = unitsRowText !== '' ? unitsRowText : cell.unitText;
    const samples = columnSamples(layout.sampleRows, c);
    const text = isTextColumn(samples, layout);
    let role: ColumnRole = 'unknown';
    let segmentHint: ImportColumn['segmentHint'];
    if (layout.headerCells) {
      const guess = inferColumnRole(cell.name, parseUnit(unitText));
      role = guess.role;
      segmentHint = guess.segmentHint;
      if (guess.conflict) {
        problems.add({ code: 'unitConflict', severity: 'warning', line: headerLine, column: index, message: `column ${index} '${header}': ${guess.conflict}; read as ${role}` });
      }
      if (role === 'unknown' && text && samples.length > 0 && samples.every((s) => segmentFromWord(s) !== undefined)) role = 'segment';
      if (role === 'unknown') role = 'ignore';
    }
    const answeredRole = answer?.columnRoles?.[index];
    if (answeredRole) role = answeredRole;
    else if (answer && role === 'unknown') role = 'ignore';
    const answeredUnit = answer?.units?.[index];
    if (answeredUnit !== undefined) unitText = answeredUnit.trim();
    suggestedRoles[index] = role;

    const column: ImportColumn = {
      index,
      header,
      name: layout.headerCells ? cell.name : `column ${index}`,
      unit: unitText,
      siUnit: '',
      role,
      scaleToSI: 1,
      unitAssumed: false,
      valueType: text ? 'text' : 'number',
      segmentHint,
    };
    if (text && DIMENSION_OF_ROLE[role] !== undefined) {
      problems.add({ code: 'textInNumberColumn', severity: 'warning', line: layout.dataStartLine, column: index, message: `column ${index} '${header}' holds text, not numbers; it is left out` });
      column.role = 'ignore';
      role = 'ignore';
    }
    const dimension: UnitDimension | undefined = role === 'piezo' ? 'length' : DIMENSION_OF_ROLE[role];
    if (dimension && !text) {
      if (unitText === '') {
        column.siUnit = SI_UNIT_OF[dimension];
        column.unitAssumed = true;
      } else {
        const reading = pickUnit(parseUnit(unitText), role);
        if (!reading) {
          const candidates = UNIT_CANDIDATES[dimension] ?? [];
          ambiguities.push({
            kind: 'unit',
            columns: [index],
            candidates,
            message: `column ${index} '${header}' (${role}): unit '${unitText}' is not known; choose one of ${candidates.join(', ')}`,
          });
        } else if (reading.dimension === 'voltage' && role === 'piezo') {
          column.siUnit = 'm';
          if (calibration === undefined) {
            ambiguities.push({
              kind: 'calibration',
              columns: [index],
              candidates: [],
              message: `column ${index} '${header}' is a piezo voltage; give the z calibration in m/V (metadata 'z calibration: 2 nm/V' or the mapping answer)`,
            });
          } else column.scaleToSI = reading.scaleToSI * calibration;
          suggestedUnits[index] = unitText;
        } else {
          column.siUnit = reading.siUnit;
          column.scaleToSI = reading.scaleToSI;
          suggestedUnits[index] = unitText;
        }
      }
    }
    columns.push(column);
  }

  if (!layout.headerCells && !answer) {
    const suggestion: Record<number, ColumnRole> = {};
    columns.forEach((col, i) => (suggestion[col.index] = i === 0 ? 'distance' : i === 1 ? 'current' : 'ignore'));
    Object.assign(suggestedRoles, suggestion);
    ambiguities.push({
      kind: 'noHeader',
      columns: columns.map((c) => c.index),
      candidates: COLUMN_ROLES.filter((r) => r !== 'unknown'),
      message: `no header row: give each of the ${count} columns a role (and a unit), e.g. 1=distance in nm, 2=current in pA`,
    });
  }
  return { columns, ambiguities, suggested: { columnRoles: suggestedRoles, units: suggestedUnits } };
}
