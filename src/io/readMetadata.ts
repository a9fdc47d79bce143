import { parseHeaderCell } from './parseHeaderCell.ts';
import { parseUnit, type UnitDimension } from './parseUnit.ts';
import type { ProblemLog } from './problemLog.ts';
import type { DecimalMark, Delimiter, MetadataEntry } from './types.ts';

/** A line of the block above the header, with its 1-based line number. */
export interface MetadataLine {
  line: number;
  text: string;
}

/** A metadata line split into key and value; key '' for free text. */
export interface MetadataPair {
  label: string;
  value: string;
}

// Comment markers at the start of a metadata line (as listed in the import issue):
// '#', '%', ';' and '//', possibly repeated.
const COMMENT_MARKER = /^\s*(?:#+|%+|;+|\/\/+)\s?/;

/** True when a line starts with a comment marker: #, %, ; or //. */
export function isCommentLine(text: string): boolean {
  return COMMENT_MARKER.test(text);
}

/** The line without its comment marker (unchanged when it has none). */
export function stripCommentMarker(text: string): string {
  return text.replace(COMMENT_MARKER, '');
}

function looksLikeKey(text: string): boolean {
  const key = text.trim();
  return key.length > 0 && key.length <= 80 && /^[\p{L}_"']/u.test(key);
}

/**
 * Split one metadata line into key and value. Accepted: 'key: value', 'key = value', 'key<TAB>value'
 * and, on lines without a comment marker in files delimited by ';' or ',', 'key;value[;unit]'.
 * Any marker (#, %, ;, //) is removed first.
 * Lines without a key become free text (label ''); lines with no letter or digit give null.
 * @example parseMetadataLine('# Bias = -0.5 V', ',') // { label: 'Bias', value: '-0.5 V' }
 */
export function parseMetadataLine(text: string, delimiter: Delimiter): MetadataPair | null {
  const body = stripCommentMarker(text).trim();
  if (!/[\p{L}\p{N}]/u.test(body)) return null;
  const colonOrEquals = /^([^:=\t]{1,80}?)\s*[:=]\s*(.*)$/.exec(body);
  if (colonOrEquals && looksLikeKey(colonOrEquals[1])) return { label: unquote(colonOrEquals[1]), value: unquote(colonOrEquals[2]) };
  const tab = body.indexOf('\t');
  if (tab > 0 && looksLikeKey(body.slice(0, tab))) {
    const parts = body.split('\t').map((p) => p.trim()).filter((p) => p !== '');
    return { label: unquote(parts[0]), value: parts.slice(1).map(unquote).join(' ') };
  }
  if ((delimiter === ';' || delimiter === ',') && !isCommentLine(text)) {
    const parts = body.split(delimiter).map((p) => unquote(p.trim()));
    if (parts.length >= 2 && parts.length <= 3 && looksLikeKey(parts[0])) {
      return { label: parts[0], value: parts.slice(1).filter((p) => p !== '').join(' ') };
    }
  }
  return { label: '', value: body };
}

function unquote(text: string): string {
  const t = text.trim();
  // RFC 4180 section 2: doubled quotes inside a quoted field stand for one quote.
  if (t.length >= 2 && t.startsWith('"') && t.endsWith('"')) return t.slice(1, -1).replace(/""/g, '"');
  return t;
}

interface KnownQuantity {
  key: string;
  /** Physical dimension, or 'text' for values kept as written. */
  dimension: UnitDimension | 'text';
  names: string[];
  /** Largest plausible |SI value| when no unit is written (assume SI up to this). */
  plainSIUpTo?: number;
}

// Neutral key vocabulary of Burrow. Names are compared after lower-casing and removing everything
// but letters and digits. The plausibility limits for unit-less values are rough trade knowledge
// (common practice, no source): tunnel currents stay below a microampere, biases below ten volts.
const KNOWN_QUANTITIES: KnownQuantity[] = [
  {
    key: 'setpointCurrent',
    dimension: 'current',
    names: ['setpoint', 'setpointcurrent', 'currentsetpoint', 'iset', 'isetpoint', 'setcurrent', 'feedbackcurrent', 'regulationcurrent', 'tunnelcurrentsetpoint', 'targetcurrent', 'setpointi'],
    plainSIUpTo: 1e-6,
  },
  {
    key: 'biasVoltage',
    dimension: 'voltage',
    names: ['bias', 'samplebias', 'biasvoltage', 'vbias', 'ubias', 'gapvoltage', 'samplevoltage', 'setpointbias', 'biassetpoint'],
    plainSIUpTo: 10,
  },
  {
    key: 'temperature',
    dimension: 'temperature',
    names: ['temperature', 'temp', 't', 'sampletemperature', 'stmtemperature', 'cryostattemperature', 'heattemperature', 'basetemperature'],
    plainSIUpTo: 2000,
  },
  {
    key: 'date',
    dimension: 'text',
    names: ['date', 'recorded', 'recordedon', 'acquired', 'acquiredon', 'acquisitiondate', 'timestamp', 'starttime', 'measuredon', 'datetime', 'dateandtime', 'measurementdate', 'created'],
  },
  { key: 'tip', dimension: 'text', names: ['tip', 'tipmaterial', 'probe', 'tipid', 'tipname', 'probetip'] },
  { key: 'sample', dimension: 'text', names: ['sample', 'specimen', 'substrate', 'samplename', 'sampleid'] },
  {
    key: 'positionX',
    dimension: 'length',
    names: ['x', 'xposition', 'positionx', 'xpos', 'posx', 'xoffset', 'xcoordinate', 'tipx'],
    plainSIUpTo: 1e-3,
  },
  {
    key: 'positionY',
    dimension: 'length',
    names: ['y', 'yposition', 'positiony', 'ypos', 'posy', 'yoffset', 'ycoordinate', 'tipy'],
    plainSIUpTo: 1e-3,
  },
  {
    key: 'piezoZCalibration',
    dimension: 'lengthPerVoltage',
    names: ['zcalibration', 'piezozcalibration', 'zpiezocalibration', 'piezocalibration', 'zsensitivity', 'zpiezosensitivity', 'piezozsensitivity', 'zpiezoconstant', 'piezoconstantz', 'zcalibrationfactor', 'zgain'],
    plainSIUpTo: 1e-6,
  },
];

const QUANTITY_BY_NAME = new Map<string, KnownQuantity>();
for (const q of KNOWN_QUANTITIES) for (const n of q.names) QUANTITY_BY_NAME.set(n, q);

/** Known metadata keys Burrow fills in SI: setpointCurrent (A), biasVoltage (V), temperature (K), ... */
export const KNOWN_METADATA_KEYS: readonly string[] = KNOWN_QUANTITIES.map((q) => q.key);

function compactKey(label: string): string {
  return label.toLowerCase().normalize('NFC').replace(/[^\p{L}\p{N}]+/gu, '');
}

/**
 * Split '0,5 V' into a number and the rest; undefined when no number leads. The file's decimal
 * mark is tried first; when the other mark follows the digits ('0.1 V' in a decimal-comma file),
 * the other mark is used, since metadata is often written by a different routine than the table.
 */
function splitNumber(text: string, decimalMark: DecimalMark): { value: number; rest: string } | undefined {
  const first = splitNumberWith(text, decimalMark);
  if (first && !/^[.,]\d/.test(first.rest)) return first;
  return splitNumberWith(text, decimalMark === ',' ? '.' : ',') ?? first;
}

function splitNumberWith(text: string, decimalMark: DecimalMark): { value: number; rest: string } | undefined {
  const pattern =
    decimalMark === ','
      ? /^([-+]?(?:\d+(?:,\d*)?|,\d+)(?:[eE][-+]?\d+)?)(?:\s*(.*))?$/
      : /^([-+]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][-+]?\d+)?)(?:\s*(.*))?$/;
  const match = pattern.exec(text.trim());
  if (!match) return undefined;
  const value = Number(decimalMark === ',' ? match[1].replace(',', '.') : match[1]);
  if (!Number.isFinite(value)) return undefined;
  return { value, rest: (match[2] ?? '').trim() };
}

function uniqueKey(metadata: Record<string, MetadataEntry>, key: string): string {
  if (!(key in metadata)) return key;
  let n = 2;
  while (`${key} (${n})` in metadata) n++;
  return `${key} (${n})`;
}

/**
 * Read the lines above the header into a metadata map. Known quantities (setpoint current, bias,
 * temperature, date, tip, sample, x/y position, piezo z calibration) get Burrow's key and an SI
 * value; every other key is kept under its own label, and free text as note1, note2, ...
 * A number with a unit under an unknown key is still converted to SI. Unit problems are warnings.
 * @example readMetadata([{ line: 1, text: '# setpoint: 50 pA' }], ',', '.', log).setpointCurrent.value // 5e-11
 */
export function readMetadata(
  lines: readonly MetadataLine[],
  delimiter: Delimiter,
  decimalMark: DecimalMark,
  problems: ProblemLog,
): Record<string, MetadataEntry> {
  const metadata: Record<string, MetadataEntry> = {};
  let notes = 0;
  for (const { line, text } of lines) {
    const pair = parseMetadataLine(text, delimiter);
    if (!pair) continue;
    if (pair.label === '') {
      notes++;
      metadata[uniqueKey(metadata, `note${notes}`)] = { raw: pair.value, label: '', line };
      continue;
    }
    // A unit may sit in the key itself: 'Bias (V): 0.5'.
    const keyCell = parseHeaderCell(pair.label);
    const quantity = QUANTITY_BY_NAME.get(compactKey(keyCell.name));
    const entry: MetadataEntry = { raw: pair.value, label: pair.label, line };
    const key = uniqueKey(metadata, quantity?.key ?? pair.label);
    metadata[key] = entry;
    if (quantity?.dimension === 'text') continue;
    const number = splitNumber(pair.value, decimalMark);
    if (!number) {
      if (quantity) {
        problems.add({ code: 'metadataValue', severity: 'warning', line, column: 1, mergeKey: `metadata|${line}`, message: `metadata '${pair.label}' has no number ('${pair.value}'); kept as text only` });
      }
      continue;
    }
    const unitText = number.rest !== '' ? number.rest : keyCell.unitText;
    if (unitText === '') {
      if (!quantity) {
        entry.value = number.value;
        entry.unit = '';
      } else if (quantity.plainSIUpTo !== undefined && Math.abs(number.value) <= quantity.plainSIUpTo) {
        entry.value = number.value;
        entry.unit = parseUnit(siSymbol(quantity.dimension))[0]?.siUnit ?? '';
      } else {
        problems.add({ code: 'metadataUnit', severity: 'warning', line, column: 1, mergeKey: `metadata|${line}`, message: `metadata '${pair.label}' = ${pair.value} has no unit and is implausible in SI; write a unit such as ${exampleUnit(quantity.dimension)}` });
      }
      continue;
    }
    const readings = parseUnit(unitText);
    const reading = quantity ? readings.find((u) => u.dimension === quantity.dimension) : readings[0];
    if (reading) {
      entry.value = number.value * reading.scaleToSI + reading.offsetToSI;
      entry.unit = reading.siUnit;
    } else if (quantity) {
      problems.add({ code: 'metadataUnit', severity: 'warning', line, column: 1, mergeKey: `metadata|${line}`, message: `metadata '${pair.label}': unit '${unitText}' is not a ${quantity.dimension} unit; kept as text only` });
    }
  }
  return metadata;
}

function siSymbol(dimension: UnitDimension | 'text'): string {
  switch (dimension) {
    case 'current':
      return 'A';
    case 'voltage':
      return 'V';
    case 'temperature':
      return 'K';
    case 'length':
      return 'm';
    case 'lengthPerVoltage':
      return 'm/V';
    default:
      return '';
  }
}

function exampleUnit(dimension: UnitDimension | 'text'): string {
  switch (dimension) {
    case 'current':
      return 'pA or nA';
    case 'voltage':
      return 'mV or V';
    case 'temperature':
      return 'K';
    case 'length':
      return 'nm';
    case 'lengthPerVoltage':
      return 'nm/V';
    default:
      return 'an SI unit';
  }
}
