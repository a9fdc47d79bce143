import type { DecimalMark } from './types.ts';

/**
 * Powers of ten that are exact doubles: 10^0 … 10^22 (10^22 < 2^53 · 2^22, the largest exact one).
 */
const EXACT_POWERS_OF_TEN = [
  1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22,
];

const CODE_0 = 48;
const CODE_9 = 57;
const CODE_MINUS = 45;
const CODE_PLUS = 43;
const CODE_E_LOWER = 101;
const CODE_E_UPPER = 69;
const CODE_SPACE = 32;
const CODE_TAB = 9;
const CODE_CR = 13;

/** Result of parsing a cell that is not a plain number. */
export const CELL_EMPTY = 'empty';

/**
 * Parse a numeric cell the way Number() would, bit for bit, but faster for the common short forms.
 * Fast path (W. D. Clinger, "How to Read Floating Point Numbers Accurately", PLDI 1990): when the
 * decimal significand has at most 15 digits (< 2^53) and the power of ten is within ±22, both are
 * exact doubles, so one IEEE multiplication or division rounds correctly and equals Number().
 * Anything else (more digits, hex, 'Infinity', stray text) goes through Number().
 * Returns NaN for text that is not a number, and for an empty cell (see isBlankCell).
 * @example parseNumberCell('1,25e-3', ',') // 0.00125
 */
export function parseNumberCell(cell: string, decimalMark: DecimalMark): number {
  const length = cell.length;
  const dotCode = decimalMark === ',' ? 44 : 46;
  let i = 0;
  let c = 0;
  // Leading and trailing blanks (spaces, tabs, the CR of a CRLF line) are allowed, as in Number().
  while (i < length && ((c = cell.charCodeAt(i)) === CODE_SPACE || c === CODE_TAB)) i++;
  let end = length;
  while (end > i && ((c = cell.charCodeAt(end - 1)) === CODE_SPACE || c === CODE_TAB || c === CODE_CR)) end--;
  if (i >= end) return Number.NaN;
  let negative = false;
  c = cell.charCodeAt(i);
  if (c === CODE_MINUS) {
    negative = true;
    i++;
  } else if (c === CODE_PLUS) i++;
  let significand = 0;
  let digits = 0;
  let fractionDigits = 0;
  let seenDot = false;
  let anyDigit = false;
  for (; i < end; i++) {
    c = cell.charCodeAt(i);
    if (c >= CODE_0 && c <= CODE_9) {
      if (digits > 0 || c !== CODE_0) {
        significand = significand * 10 + (c - CODE_0);
        digits++;
      }
      anyDigit = true;
      if (seenDot) fractionDigits++;
    } else if (c === dotCode && !seenDot) seenDot = true;
    else break;
  }
  if (!anyDigit) return slowPath(cell, decimalMark);
  let exponent = 0;
  if (i < end) {
    if (c !== CODE_E_LOWER && c !== CODE_E_UPPER) return slowPath(cell, decimalMark);
    i++;
    let exponentNegative = false;
    c = cell.charCodeAt(i);
    if (c === CODE_MINUS) {
      exponentNegative = true;
      i++;
    } else if (c === CODE_PLUS) i++;
    let exponentDigits = 0;
    for (; i < end; i++) {
      c = cell.charCodeAt(i);
      if (c < CODE_0 || c > CODE_9 || exponentDigits > 5) break;
      exponent = exponent * 10 + (c - CODE_0);
      exponentDigits++;
    }
    if (exponentDigits === 0 || i < end) return slowPath(cell, decimalMark);
    if (exponentNegative) exponent = -exponent;
  }
  if (digits > 15) return slowPath(cell, decimalMark);
  const power = exponent - fractionDigits;
  let value: number;
  if (significand === 0) value = 0;
  else if (power === 0) value = significand;
  else if (power < 0 && power >= -22) value = significand / EXACT_POWERS_OF_TEN[-power];
  else if (power > 0 && power <= 22) value = significand * EXACT_POWERS_OF_TEN[power];
  else return slowPath(cell, decimalMark);
  return negative ? -value : value;
}

function slowPath(cell: string, decimalMark: DecimalMark): number {
  let text = cell.trim();
  if (decimalMark === ',') {
    if (text.includes('.')) return Number.NaN;
    text = text.replace(',', '.');
  } else if (text.includes(',')) return Number.NaN;
  // Number() also reads hex, octal and binary literals and the empty string; a data cell is none of those.
  if (text === '' || /^[-+]?0[xXoObB]/.test(text)) return Number.NaN;
  return Number(text);
}

/** True for a cell with nothing but blanks (an empty value, not a bad one). */
export function isBlankCell(cell: string): boolean {
  for (let i = 0; i < cell.length; i++) {
    const c = cell.charCodeAt(i);
    if (c !== CODE_SPACE && c !== CODE_TAB && c !== CODE_CR) return false;
  }
  return true;
}

/** True for the spellings of not-a-number and infinity that exports write: NaN, inf, -Infinity, 1.#INF. */
export function isNonFiniteSpelling(cell: string): boolean {
  return /^[-+]?(nan|inf|infinity|1\.#(inf|ind|qnan|snan)\d*)$/i.test(cell.trim());
}
