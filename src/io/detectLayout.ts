import { parseUnit } from './parseUnit.ts';
import { isNonFiniteSpelling } from './parseNumberCell.ts';
import { splitCells } from './splitCells.ts';
import type { MetadataLine } from './readMetadata.ts';
import { isCommentLine, stripCommentMarker } from './readMetadata.ts';
import type { DecimalMark, Delimiter, LineEnding } from './types.ts';

/** What the start of a file says about its layout. Lines are 1-based. */
export interface DetectedLayout {
  /** Separator handed to the CSV parser: '\r' only for files with no '\n' at all. */
  newline: '\n' | '\r';
  lineEnding: LineEnding;
  delimiter: Delimiter;
  decimalMark: DecimalMark;
  quoted: boolean;
  columnCount: number;
  headerLine: number | null;
  headerCells: string[] | null;
  unitsLine: number | null;
  unitsCells: string[] | null;
  metadataLines: MetadataLine[];
  /** Lines between the header and the data that are neither: reported, never used. */
  strayLines: { line: number; text: string; looksLikeData: boolean }[];
  dataStartLine: number;
  /** Character offset of the first data line in the text handed to detectLayout. */
  dataStartOffset: number;
  /** The first data rows split into cells, for column typing and dialogs. */
  sampleRows: string[][];
  /** Mean length of the sampled data lines in characters, line end included. */
  sampleCharsPerRow: number;
}

/** Outcome of detectLayout: a layout, a request for more text, or no data at all. */
export type LayoutResult =
  | { status: 'ok'; layout: DetectedLayout }
  | { status: 'needMore' }
  | { status: 'noData'; line: number; lineEnding: LineEnding; metadataLines: MetadataLine[] };

interface Line {
  number: number;
  offset: number;
  text: string;
}

const CANDIDATES: readonly Delimiter[] = ['\t', ';', ',', 'whitespace'];
const DOT_NUMBER = /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/;
const COMMA_NUMBER = /^[-+]?(\d+,?\d*|,\d+)([eE][-+]?\d+)?$/;
const INTEGER = /^[-+]?\d+([eE][-+]?\d+)?$/;
const CONFIRM_LINES = 5;
const SAMPLE_ROWS = 500;

function numericUnder(cell: string, mark: DecimalMark): boolean {
  return (mark === ',' ? COMMA_NUMBER : DOT_NUMBER).test(cell) || isNonFiniteSpelling(cell);
}

/** A header cell: not a number and not starting like one. */
function isNameLike(cell: string): boolean {
  if (cell === '') return true;
  if (DOT_NUMBER.test(cell) || COMMA_NUMBER.test(cell) || isNonFiniteSpelling(cell)) return false;
  return !/^[-+]?[.,]?\d/.test(cell);
}

function splitLines(text: string, complete: boolean): { lines: Line[]; newline: '\n' | '\r'; lineEnding: LineEnding } {
  const hasLF = text.includes('\n');
  const newline: '\n' | '\r' = hasLF || !text.includes('\r') ? '\n' : '\r';
  let crlf = 0;
  let lf = 0;
  const lines: Line[] = [];
  let start = 0;
  let number = 1;
  for (;;) {
    const end = text.indexOf(newline, start);
    if (end === -1) {
      if (complete && start < text.length) lines.push({ number, offset: start, text: text.slice(start) });
      break;
    }
    let lineText = text.slice(start, end);
    if (newline === '\n') {
      if (lineText.endsWith('\r')) {
        crlf++;
        lineText = lineText.slice(0, -1);
      } else lf++;
    }
    lines.push({ number, offset: start, text: lineText });
    number++;
    start = end + 1;
  }
  let lineEnding: LineEnding;
  if (newline === '\r') lineEnding = 'cr';
  else if (crlf > 0 && lf > 0) lineEnding = 'mixed';
  else if (crlf > 0) lineEnding = 'crlf';
  else if (lf > 0) lineEnding = 'lf';
  else lineEnding = 'none';
  return { lines, newline, lineEnding };
}

interface Candidate {
  delimiter: Delimiter;
  decimalMark: DecimalMark;
  columnCount: number;
  score: number;
  /** Per line: cell count when the line is a data row under this delimiter, else 0. */
  dataCells: Int32Array;
}

function evaluate(lines: readonly Line[], delimiter: Delimiter): Candidate {
  const split = lines.map((l) => (l.text.trim() === '' || isDataComment(l.text, delimiter) ? null : splitCells(l.text, delimiter)));
  // Decimal comma only where the delimiter leaves the comma free (';', tab, whitespace).
  let commaOnly = 0;
  let dotOnly = 0;
  if (delimiter !== ',') {
    for (const cells of split) {
      if (!cells) continue;
      for (const cell of cells) {
        if (INTEGER.test(cell)) continue;
        if (COMMA_NUMBER.test(cell)) commaOnly++;
        else if (DOT_NUMBER.test(cell)) dotOnly++;
      }
    }
  }
  const decimalMark: DecimalMark = commaOnly > dotOnly ? ',' : '.';
  const dataCells = new Int32Array(lines.length);
  const fractions = new Float64Array(lines.length);
  const countOfWidth = new Map<number, number>();
  split.forEach((cells, i) => {
    if (!cells || cells.length < 2) return;
    let nonEmpty = 0;
    let numeric = 0;
    for (const cell of cells) {
      if (cell === '') continue;
      nonEmpty++;
      if (numericUnder(cell, decimalMark)) numeric++;
    }
    if (numeric >= 2 && numeric * 2 >= nonEmpty) {
      dataCells[i] = cells.length;
      fractions[i] = numeric / nonEmpty;
      countOfWidth.set(cells.length, (countOfWidth.get(cells.length) ?? 0) + 1);
    }
  });
  let columnCount = 0;
  let best = 0;
  for (const [width, count] of countOfWidth) {
    if (count > best || (count === best && width > columnCount)) {
      best = count;
      columnCount = width;
    }
  }
  let score = 0;
  for (let i = 0; i < lines.length; i++) if (dataCells[i] === columnCount && columnCount > 0) score += fractions[i];
  return { delimiter, decimalMark, columnCount, score, dataCells };
}

/** A comment line inside data: '#', '%' or '//' (and ';' unless ';' is the delimiter). */
function isDataComment(text: string, delimiter: Delimiter): boolean {
  const t = text.trimStart();
  if (t.startsWith('#') || t.startsWith('%') || t.startsWith('//')) return true;
  return delimiter !== ';' && t.startsWith(';');
}

/** Header cells of a whitespace-delimited line, trying harder when names contain single spaces. */
function splitWhitespaceHeader(text: string, columnCount: number): string[] {
  const plain = splitCells(text, 'whitespace');
  if (plain.length === columnCount) return plain;
  const wide = text.trim().split(/\t+| {2,}/).map((c) => c.trim());
  if (wide.length === columnCount) return wide;
  // Re-attach unit tokens written apart from their name: 'z (nm)' split as 'z', '(nm)'.
  const merged: string[] = [];
  for (const token of plain) {
    const isUnitToken = /^(\(.*\)|\[.*\]|\/\S+)$/.test(token);
    if (isUnitToken && merged.length > 0) merged[merged.length - 1] += ` ${token}`;
    else merged.push(token);
  }
  return merged;
}

function headerCellsOf(text: string, delimiter: Delimiter, columnCount: number): string[] {
  return delimiter === 'whitespace' ? splitWhitespaceHeader(text, columnCount) : splitCells(text, delimiter);
}

function qualifiesAsHeader(cells: readonly string[], columnCount: number): boolean {
  if (cells.length !== columnCount) return false;
  let named = 0;
  for (const cell of cells) {
    if (!isNameLike(cell)) return false;
    if (cell !== '') named++;
  }
  return named > 0;
}

function isUnitsRow(cells: readonly string[]): boolean {
  let units = 0;
  for (const cell of cells) {
    const bare = cell.replace(/^[([]\s*|\s*[)\]]$/g, '');
    if (bare === '') continue;
    if (parseUnit(bare).length === 0) return false;
    units++;
  }
  return units > 0;
}

/**
 * Detect the layout of a file from its first part: line ending, delimiter (comma, semicolon, tab
 * or runs of blanks), decimal mark, header row (possibly below a metadata block, possibly behind a
 * comment marker, possibly followed by a row of units) and the first data line.
 * The delimiter is the candidate under which most lines split into the same number of numeric
 * cells; ties go to tab, then semicolon, then comma, then whitespace.
 * `complete` says the text is the whole file; otherwise the last (partial) line is ignored and
 * 'needMore' may be returned when no data was seen yet.
 * @example detectLayout('z (nm),I (pA)\n0.5,12\n0.6,10\n', true) // status 'ok', header line 1
 */
export function detectLayout(text: string, complete: boolean): LayoutResult {
  const { lines, newline, lineEnding } = splitLines(text, complete);
  let chosen: Candidate | undefined;
  for (const delimiter of CANDIDATES) {
    const candidate = evaluate(lines, delimiter);
    if (candidate.columnCount === 0) continue;
    if (!chosen || candidate.score > chosen.score + 1e-9) chosen = candidate;
  }
  const noData = (): LayoutResult => {
    if (!complete) return { status: 'needMore' };
    const metadataLines = lines.filter((l) => l.text.trim() !== '').map((l) => ({ line: l.number, text: l.text }));
    return { status: 'noData', line: Math.max(1, lines.length), lineEnding, metadataLines };
  };
  if (!chosen) return noData();
  const { delimiter, decimalMark, columnCount, dataCells } = chosen;

  let dataStart = -1;
  for (let i = 0; i < lines.length && dataStart < 0; i++) {
    if (dataCells[i] !== columnCount) continue;
    let seen = 0;
    let good = 0;
    for (let j = i + 1; j < lines.length && seen < CONFIRM_LINES; j++) {
      if (lines[j].text.trim() === '') continue;
      seen++;
      if (dataCells[j] === columnCount) good++;
    }
    if (seen === 0 || good * 2 >= seen) dataStart = i;
  }
  if (dataStart < 0) return noData();
  let followingData = 0;
  for (let j = dataStart; j < lines.length; j++) if (dataCells[j] === columnCount) followingData++;
  if (!complete && followingData < 3) return { status: 'needMore' };

  // Header: the nearest non-blank line above the data, as is or behind a comment marker.
  let headerIndex = -1;
  let headerCells: string[] | null = null;
  let unitsIndex = -1;
  let unitsCells: string[] | null = null;
  const nearestAbove = (from: number): number => {
    for (let i = from - 1; i >= 0; i--) if (lines[i].text.trim() !== '') return i;
    return -1;
  };
  const headerAt = (index: number): string[] | null => {
    if (index < 0) return null;
    const raw = lines[index].text;
    // A ';' line in a ';' file may be a header with an empty first cell, so try it as is too.
    if (isCommentLine(raw)) {
      const stripped = headerCellsOf(stripCommentMarker(raw), delimiter, columnCount);
      if (qualifiesAsHeader(stripped, columnCount)) return stripped;
    }
    const direct = headerCellsOf(raw, delimiter, columnCount);
    return qualifiesAsHeader(direct, columnCount) ? direct : null;
  };
  const above = nearestAbove(dataStart);
  const candidateCells = headerAt(above);
  if (candidateCells) {
    headerIndex = above;
    headerCells = candidateCells;
    if (isUnitsRow(candidateCells)) {
      const upper = nearestAbove(above);
      const upperCells = headerAt(upper);
      if (upperCells && !isUnitsRow(upperCells)) {
        unitsIndex = above;
        unitsCells = candidateCells.map((c) => c.replace(/^[([]\s*|\s*[)\]]$/g, ''));
        headerIndex = upper;
        headerCells = upperCells;
      }
    }
  }
  const metadataEnd = headerIndex >= 0 ? headerIndex : dataStart;
  const metadataLines: MetadataLine[] = [];
  for (let i = 0; i < metadataEnd; i++) {
    if (lines[i].text.trim() !== '') metadataLines.push({ line: lines[i].number, text: lines[i].text });
  }
  // Lines between the header (or units row) and the data: neither metadata nor data.
  const strayLines: DetectedLayout['strayLines'] = [];
  const afterHeader = Math.max(headerIndex, unitsIndex) + 1;
  for (let i = headerIndex >= 0 ? afterHeader : dataStart; i < dataStart; i++) {
    if (lines[i].text.trim() === '') continue;
    strayLines.push({ line: lines[i].number, text: lines[i].text, looksLikeData: dataCells[i] > 0 });
  }

  const sampleRows: string[][] = [];
  let sampleChars = 0;
  const newlineLength = lineEnding === 'crlf' ? 2 : 1;
  let quoted = headerIndex >= 0 && lines[headerIndex].text.includes('"');
  for (let i = dataStart; i < lines.length && sampleRows.length < SAMPLE_ROWS; i++) {
    if (dataCells[i] !== columnCount) continue;
    if (lines[i].text.includes('"')) quoted = true;
    sampleRows.push(splitCells(lines[i].text, delimiter));
    sampleChars += lines[i].text.length + newlineLength;
  }
  return {
    status: 'ok',
    layout: {
      newline,
      lineEnding,
      delimiter,
      decimalMark,
      quoted,
      columnCount,
      headerLine: headerIndex >= 0 ? lines[headerIndex].number : null,
      headerCells,
      unitsLine: unitsIndex >= 0 ? lines[unitsIndex].number : null,
      unitsCells,
      metadataLines,
      strayLines,
      dataStartLine: lines[dataStart].number,
      dataStartOffset: lines[dataStart].offset,
      sampleRows,
      sampleCharsPerRow: sampleRows.length > 0 ? sampleChars / sampleRows.length : 32,
    },
  };
}
