import Papa from 'papaparse';
import { buildCurves, STORED_ROLES, type ParsedColumns } from './buildCurves.ts';
import { ChunkedArray } from './chunkedArray.ts';
import { ColumnValues, LineMap } from './columnValues.ts';
import { detectLayout, type DetectedLayout, type LayoutResult } from './detectLayout.ts';
import { isBlankCell, isNonFiniteSpelling, parseNumberCell } from './parseNumberCell.ts';
import { headerSignature, planColumns, type ColumnPlan } from './planColumns.ts';
import { ProblemLog } from './problemLog.ts';
import { readMetadata } from './readMetadata.ts';
import type { DecimalMark, Dialect, ImportedFile, ImportOptions, LineEnding, MappingAmbiguity, MappingAnswer, MetadataEntry } from './types.ts';

/** Feeds a file to the importer piece by piece; `finish` returns the result. */
export interface StreamingImporter {
  /** Hand over the next piece of text (any size, split anywhere, even inside a line). */
  push(chunk: string): void;
  /** Signal the end of the text and build the result. Call once. */
  finish(): ImportedFile;
}

/** Text gathered before detection: enough for a metadata block, a header and some data rows. */
const DETECT_CHARS = 64 * 1024;
/** Give up waiting for data rows after this much text and decide with what is there. */
const MAX_DETECT_CHARS = 8 * 1024 * 1024;
/**
 * Data text handed to papaparse per call. Measured with bench/import.bench.ts: 64 KB pieces ran
 * faster than 256 KB ones (fewer row arrays alive when the young-generation collector runs).
 */
const PARSE_CHARS = 64 * 1024;
const BINARY_SCAN_CHARS = 8192;

// Unicode Standard, section 23.8: U+FEFF at the start of a text is a byte order mark, not content.
const BOM = '\ufeff';

function findBinary(text: string): { line: number; column: number; what: string } | undefined {
  const end = Math.min(text.length, BINARY_SCAN_CHARS);
  let suspicious = 0;
  let first = -1;
  let nul = -1;
  for (let i = 0; i < end && nul < 0; i++) {
    const c = text.charCodeAt(i);
    // NUL never occurs in a text export. Other C0 controls (except tab, LF, FF, CR) and U+FFFD
    // (the decoder's stand-in for bytes that are not UTF-8) are counted.
    if (c === 0) nul = i;
    else if ((c < 32 && c !== 9 && c !== 10 && c !== 12 && c !== 13) || c === 0xfffd) {
      suspicious++;
      if (first < 0) first = i;
    }
  }
  if (nul < 0 && (suspicious < 4 || suspicious * 20 < end)) return undefined;
  const at = nul >= 0 ? nul : first;
  let line = 1;
  let lineStart = 0;
  for (let i = 0; i < at; i++) {
    if (text.charCodeAt(i) === 10) {
      line++;
      lineStart = i + 1;
    }
  }
  return { line, column: at - lineStart + 1, what: nul >= 0 ? 'a NUL character' : `${suspicious} control characters in the first ${end}` };
}

function defaultDialect(hasBOM: boolean, lineEnding: LineEnding): Dialect {
  return { delimiter: ',', decimalMark: '.', headerLine: null, unitsLine: null, dataStartLine: null, hasBOM, lineEnding, quoted: false };
}

/**
 * Start importing one file: push text chunks as they arrive (from a stream, a File in a worker,
 * or one big string), then call finish(). Never touches the file system and never throws for bad
 * input: every problem in the text ends up in ImportedFile.problems with its line and column.
 * Memory stays near the size of the numbers kept (8 bytes per value of a used column).
 * Throws only for caller mistakes: push after finish, or a malformed mapping answer (MappingError).
 * @example const im = createImporter('a.csv'); im.push('z (nm),I (pA)\n0.5,1\n0.6,'); im.push('0.8\n'); im.finish().curves.length // 1
 */
export function createImporter(fileName: string, options: ImportOptions = {}): StreamingImporter {
  const problems = new ProblemLog(fileName);
  const keepRawText = options.keepRawText === true;
  const rawParts: string[] = [];
  let phase: 'detect' | 'rows' | 'stopped' | 'finished' = 'detect';
  let prefixParts: string[] = [];
  let prefixLength = 0;
  let detectAt = DETECT_CHARS;
  let binaryChecked = false;
  let hasBOM = false;
  let firstChunk = true;
  let lineEnding: LineEnding = 'none';

  let layout: DetectedLayout | undefined;
  let metadata: Record<string, MetadataEntry> = {};
  let plan: ColumnPlan | undefined;
  let signature = 'empty';
  let mappingSource: ImportedFile['mappingSource'] = 'detected';

  // Row state.
  let pending = '';
  /** Whether `pending` may contain a double quote (only then must cuts respect quoting). */
  let pendingHasQuote = false;
  let nextLine = 1;
  let rowCount = 0;
  let columnCount = 0;
  let decimalMark: DecimalMark = '.';
  let papaDelimiter = ',';
  let newline: '\n' | '\r' = '\n';
  let whitespace = false;
  let semicolonDelimited = false;
  let numeric: (ColumnValues | null)[] = [];
  let scales = new Float64Array(0);
  let text: (string[] | null)[] = [];
  let emptyRows: (ChunkedArray | null)[] = [];
  let lastFilledRow = new Int32Array(0);
  let reportCells: boolean[] = [];
  let cellLabels: string[] = [];
  let lineOfRow = new LineMap();
  const blocks: { startRow: number; label: string }[] = [{ startRow: 0, label: '' }];
  let blockBreak = false;
  let blockLabel = '';

  function stop(code: string, line: number, column: number, message: string): void {
    problems.add({ code, severity: 'error', line, column, message });
    phase = 'stopped';
    prefixParts = [];
    pending = '';
  }

  function startRows(found: DetectedLayout): void {
    layout = found;
    lineEnding = found.lineEnding;
    metadata = readMetadata(found.metadataLines, found.delimiter, found.decimalMark, problems);
    signature = headerSignature(found);
    let answer: MappingAnswer | undefined = options.mapping;
    if (answer) mappingSource = 'answer';
    else {
      answer = options.memory?.get(signature);
      if (answer) mappingSource = 'memory';
    }
    plan = planColumns(found, metadata, answer, problems);
    for (const stray of found.strayLines) {
      problems.add({
        code: stray.looksLikeData ? 'ragged' : 'strayLine',
        severity: stray.looksLikeData ? 'error' : 'warning',
        line: stray.line,
        column: 1,
        message: stray.looksLikeData
          ? `row does not have the ${found.columnCount} cells of the data rows; it is left out — make every row the same width`
          : `line between the header and the data is neither a row of units nor data; it is left out`,
      });
    }
    columnCount = found.columnCount;
    decimalMark = found.decimalMark;
    newline = found.newline;
    whitespace = found.delimiter === 'whitespace';
    semicolonDelimited = found.delimiter === ';';
    papaDelimiter = whitespace ? ' ' : found.delimiter;
    numeric = [];
    text = [];
    emptyRows = [];
    reportCells = [];
    cellLabels = [];
    lastFilledRow = new Int32Array(columnCount).fill(-1);
    scales = new Float64Array(plan.columns.map((c) => c.scaleToSI));
    // Rows expected from the size hint and the mean length of the sampled data lines (+2 % margin).
    const expectedRows = options.sizeHintChars ? (1.02 * Math.max(0, options.sizeHintChars - found.dataStartOffset)) / found.sampleCharsPerRow + 16 : 0;
    for (const column of plan.columns) {
      const stored = STORED_ROLES.has(column.role);
      numeric.push(stored && column.valueType === 'number' ? new ColumnValues(expectedRows) : null);
      text.push(stored && column.valueType === 'text' ? [] : null);
      emptyRows.push(stored && column.valueType === 'number' ? new ChunkedArray('int32') : null);
      reportCells.push(stored && column.valueType === 'number');
      cellLabels.push(column.header ? `column ${column.index} '${column.header}'` : `column ${column.index}`);
    }
    phase = 'rows';
    nextLine = found.dataStartLine;
  }

  function tryDetect(complete: boolean): void {
    let all = prefixParts.join('');
    prefixParts = [all];
    if (firstChunk) {
      firstChunk = false;
      if (all.startsWith(BOM)) {
        hasBOM = true;
        all = all.slice(1);
        prefixParts = [all];
        prefixLength = all.length;
      }
    }
    if (!binaryChecked && (complete || all.length >= BINARY_SCAN_CHARS)) {
      binaryChecked = true;
      const binary = findBinary(all);
      if (binary) {
        stop('binary', binary.line, binary.column, `this looks like a binary file (${binary.what}), not a text export; export the data as CSV or text`);
        return;
      }
    }
    if (complete && all.trim() === '') {
      stop('empty', 1, 1, all === '' ? 'the file is empty; nothing to import' : 'the file holds only blank lines; nothing to import');
      return;
    }
    // Detect on a window of the first detectAt characters (a large first chunk need not be scanned
    // whole); widen it while more is needed and the text is there.
    let result: LayoutResult;
    for (;;) {
      const whole = all.length <= detectAt;
      const mustDecide = (complete && whole) || detectAt >= MAX_DETECT_CHARS;
      result = detectLayout(whole ? all : all.slice(0, detectAt), mustDecide);
      if (result.status !== 'needMore' || whole || detectAt >= MAX_DETECT_CHARS) break;
      detectAt = Math.min(MAX_DETECT_CHARS, detectAt * 2);
    }
    if (result.status === 'needMore') {
      detectAt = Math.min(MAX_DETECT_CHARS, Math.max(detectAt, all.length) * 2);
      return;
    }
    if (result.status === 'noData') {
      lineEnding = result.lineEnding;
      metadata = readMetadata(result.metadataLines, ',', '.', problems);
      stop('noData', result.line, 1, 'no rows of numbers found (a data row needs at least two numeric cells); check the delimiter or remove text between the numbers');
      return;
    }
    prefixParts = [];
    prefixLength = 0;
    startRows(result.layout);
    feed(all.slice(result.layout.dataStartOffset), complete);
  }

  function feed(chunk: string, final: boolean): void {
    pending = pending.length === 0 ? chunk : pending + chunk;
    if (!pendingHasQuote && chunk.indexOf('"') >= 0) pendingHasQuote = true;
    while (pending.length >= PARSE_CHARS) {
      const cut = safeCut(pending, PARSE_CHARS);
      if (cut < 0) break;
      const piece = pending.slice(0, cut);
      pending = pending.slice(cut + 1);
      if (pendingHasQuote && pending.indexOf('"') < 0) pendingHasQuote = false;
      parsePiece(piece);
    }
    if (final && pending.length > 0) {
      const piece = pending.endsWith(newline) ? pending.slice(0, -1) : pending;
      pending = '';
      if (piece.length > 0) parsePiece(piece);
    }
  }

  /** Index of a newline at or after `from` outside quotes, or -1 (RFC 4180: quotes come in pairs). */
  function safeCut(buffer: string, from: number): number {
    let cut = buffer.indexOf(newline, from);
    if (cut < 0) cut = buffer.lastIndexOf(newline);
    if (cut < 0) return -1;
    if (!pendingHasQuote) return cut;
    for (;;) {
      let quotes = 0;
      for (let i = buffer.indexOf('"'); i >= 0 && i < cut; i = buffer.indexOf('"', i + 1)) quotes++;
      if (quotes % 2 === 0) return cut;
      cut = buffer.indexOf(newline, cut + 1);
      if (cut < 0) return -1;
    }
  }

  function parsePiece(piece: string): void {
    const hasQuote = piece.indexOf('"') >= 0;
    const input = whitespace ? piece.replace(/[ \t]+/g, ' ') : piece;
    // Papa Parse's fast mode (split on newline, then on delimiter) is exact when no quotes occur.
    const result = Papa.parse<string[]>(input, { delimiter: papaDelimiter, newline, quoteChar: '"', fastMode: !hasQuote, header: false, dynamicTyping: false, skipEmptyLines: false });
    const rows = result.data;
    for (const error of result.errors) {
      problems.add({ code: 'quotes', severity: 'warning', line: nextLine + (error.row ?? 0), column: 1, message: `quoting: ${error.message}; check the double quotes on this line (RFC 4180)` });
    }
    const count = columnCount;
    for (let r = 0; r < rows.length; r++) {
      const cells = rows[r];
      const line = nextLine;
      nextLine++;
      if (hasQuote) for (const cell of cells) for (let i = cell.indexOf('\n'); i >= 0; i = cell.indexOf('\n', i + 1)) nextLine++;
      let first = 0;
      let width = cells.length;
      if (whitespace) {
        if (width > 0 && isBlankCell(cells[0])) first = 1;
        if (width > first && isBlankCell(cells[width - 1])) width--;
      }
      const used = width - first;
      if (used <= 0 || (used === 1 && isBlankCell(cells[first]))) {
        blockBreak = true;
        continue;
      }
      const head = cells[first];
      const c0 = head.charCodeAt(0);
      if (c0 === 35 /* # */ || c0 === 37 /* % */ || (c0 === 47 && head.charCodeAt(1) === 47) || (c0 === 59 && !semicolonDelimited) || (c0 === 32 && isCommentCell(head))) {
        blockBreak = true;
        blockLabel = cells.slice(first, width).join(papaDelimiter).replace(/^\s*(#+|%+|;+|\/\/+)\s*/, '').trim();
        continue;
      }
      if (used !== count) {
        if (isBlankCell(head) && allBlank(cells, first, width)) {
          blockBreak = true;
          continue;
        }
        if (used < count || !allBlank(cells, first + count, width)) {
          problems.add({
            code: 'ragged',
            severity: 'error',
            line,
            column: Math.min(used, count) + 1,
            message: `row has ${used} cell${used === 1 ? '' : 's'} but the header and data have ${count}; the row is left out — make every row the same width`,
          });
          continue;
        }
      } else if (isBlankCell(head) && allBlank(cells, first, width)) {
        blockBreak = true;
        continue;
      }
      if (blockBreak) {
        if (rowCount > 0) blocks.push({ startRow: rowCount, label: blockLabel });
        else blocks[0].label = blockLabel;
        blockBreak = false;
        blockLabel = '';
      }
      for (let c = 0; c < count; c++) {
        const store = numeric[c];
        const cell = cells[first + c];
        if (store) {
          const value = parseNumberCell(cell, decimalMark);
          if (value !== value) {
            if (isBlankCell(cell)) emptyRows[c]!.push(rowCount);
            else if (reportCells[c]) reportBadCell(cell, line, c, isNonFiniteSpelling(cell));
            store.push(Number.NaN);
          } else if (value === Infinity || value === -Infinity) {
            if (reportCells[c]) reportBadCell(cell, line, c, true);
            store.push(Number.NaN);
          } else {
            lastFilledRow[c] = rowCount;
            store.push(value * scales[c]);
          }
        } else {
          const words = text[c];
          if (words) {
            words.push(cell.trim());
            lastFilledRow[c] = rowCount;
          }
        }
      }
      lineOfRow.record(rowCount, line);
      rowCount++;
    }
  }

  function isCommentCell(cell: string): boolean {
    return /^\s*(#|%|\/\/)/.test(cell) || (!semicolonDelimited && /^\s*;/.test(cell));
  }

  function allBlank(cells: readonly string[], from: number, to: number): boolean {
    for (let i = from; i < to; i++) if (!isBlankCell(cells[i])) return false;
    return true;
  }

  function reportBadCell(cell: string, line: number, c: number, nonFinite: boolean): void {
    const shown = cell.trim().length > 24 ? `${cell.trim().slice(0, 24)}…` : cell.trim();
    if (nonFinite) {
      problems.add({ code: 'notFinite', severity: 'error', line, column: c + 1, message: `'${shown}' in ${cellLabels[c]} is not a finite number; that point is left out — remove or correct the cell` });
    } else {
      problems.add({ code: 'nonNumeric', severity: 'error', line, column: c + 1, message: `'${shown}' in ${cellLabels[c]} is not a number${decimalMark === ',' ? ' (decimal comma expected)' : ''}; that point is left out — correct the cell or delete the row` });
    }
  }

  function result(): ImportedFile {
    const base = {
      fileName,
      ...(options.sourcePath !== undefined ? { sourcePath: options.sourcePath } : {}),
      ...(keepRawText ? { rawText: rawParts.join('') } : {}),
      metadata,
      headerSignature: signature,
      mappingSource,
      rowCount,
    };
    if (!layout || !plan) {
      return { ...base, dialect: defaultDialect(hasBOM, lineEnding), columns: [], curves: [], problems: problems.list(), rowCount: 0 };
    }
    const dialect: Dialect = {
      delimiter: layout.delimiter,
      decimalMark: layout.decimalMark,
      headerLine: layout.headerLine,
      unitsLine: layout.unitsLine,
      dataStartLine: layout.dataStartLine,
      hasBOM,
      lineEnding: layout.lineEnding,
      quoted: layout.quoted,
    };
    const parsed: ParsedColumns = { columns: plan.columns, numeric, text, lineOfRow, rowCount, blocks, emptyRows, lastFilledRow };
    let ambiguities: MappingAmbiguity[] = plan.ambiguities;
    let curves: ImportedFile['curves'] = [];
    if (ambiguities.length === 0) {
      const built = buildCurves(parsed, metadata, fileName, problems);
      ambiguities = built.ambiguities;
      curves = built.curves;
    }
    let proposal: ImportedFile['proposal'];
    if (ambiguities.length > 0) {
      const line = layout.headerLine ?? layout.dataStartLine;
      for (const [i, ambiguity] of ambiguities.entries()) {
        problems.add({ code: 'needsMapping', severity: 'error', line, column: ambiguity.columns[0] ?? 1, mergeKey: `needsMapping|${i}`, message: `needs a mapping answer: ${ambiguity.message}` });
      }
      proposal = {
        headerSignature: signature,
        ambiguities,
        suggested: plan.suggested,
        columns: plan.columns.map((c) => ({ index: c.index, header: c.header, samples: layout!.sampleRows.slice(0, 5).map((row) => row[c.index - 1] ?? '') })),
      };
    } else if (curves.length === 0 && rowCount > 0 && !problems.hasErrors) {
      problems.add({ code: 'noCurves', severity: 'error', line: layout.dataStartLine, column: 1, message: 'no curve could be built from the rows read' });
    } else if (rowCount === 0) {
      problems.add({ code: 'noData', severity: 'error', line: layout.dataStartLine, column: 1, message: 'no data row could be read; see the problems above' });
    }
    // The numbers now live in the curves; drop the column stores.
    numeric = [];
    text = [];
    lineOfRow = new LineMap();
    return { ...base, dialect, columns: plan.columns, curves, problems: problems.list(), ...(proposal ? { proposal } : {}) };
  }

  return {
    push(chunk: string): void {
      if (phase === 'finished') throw new Error(`createImporter(${fileName}): push after finish`);
      if (typeof chunk !== 'string') throw new Error(`createImporter(${fileName}): chunk must be a string, got ${typeof chunk}`);
      if (chunk.length === 0) return;
      if (keepRawText) rawParts.push(chunk);
      if (phase === 'stopped') return;
      if (phase === 'rows') {
        feed(chunk, false);
        return;
      }
      prefixParts.push(chunk);
      prefixLength += chunk.length;
      if (prefixLength >= detectAt || (!binaryChecked && prefixLength >= BINARY_SCAN_CHARS)) tryDetect(false);
    },
    finish(): ImportedFile {
      if (phase === 'finished') throw new Error(`createImporter(${fileName}): finish called twice`);
      if (phase === 'detect') tryDetect(true);
      else if (phase === 'rows') feed('', true);
      phase = 'finished';
      return result();
    },
  };
}
