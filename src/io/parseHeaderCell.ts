import { parseUnit } from './parseUnit.ts';

/** A header cell split into the quantity name and the unit text. */
export interface HeaderCell {
  /** Header text without quotes and unit, e.g. 'Current' for 'Current [pA]'. */
  name: string;
  /** Unit as written ('' when none), e.g. 'pA'. */
  unitText: string;
  /** Which way the unit was written. */
  form: 'parentheses' | 'brackets' | 'slash' | 'underscore' | 'in' | 'space' | 'none';
}

function isUnit(text: string): boolean {
  return parseUnit(text).length > 0;
}

/** Unknown text in brackets still counts as a unit when it is short and has no spaces. */
function looksLikeUnknownUnit(text: string): boolean {
  return text.length > 0 && text.length <= 8 && !/\s/.test(text) && /\p{L}/u.test(text);
}

/**
 * Split a header cell into name and unit. Recognised forms: 'z (nm)', 'Current [pA]', 'bias/mV',
 * 'I_A', 'Z_m', 'current in pA', 'Bias V', and a bare name (no unit: SI is assumed later).
 * Brackets may hold an unknown unit (reported later as a mapping question); the other forms only
 * count when the text after the separator is a known unit, so 'dI/dV' stays a name.
 * @example parseHeaderCell('Current [pA]') // { name: 'Current', unitText: 'pA', form: 'brackets' }
 */
export function parseHeaderCell(text: string): HeaderCell {
  let cell = text.trim();
  // RFC 4180 section 2: a quoted field is wrapped in double quotes; "" stands for one quote.
  if (cell.length >= 2 && cell.startsWith('"') && cell.endsWith('"')) cell = cell.slice(1, -1).replace(/""/g, '"').trim();

  const bracket = /^(.*?)\s*(\(([^()]*)\)|\[([^[\]]*)\])\s*$/.exec(cell);
  if (bracket && bracket[1].trim() !== '') {
    const inner = (bracket[3] ?? bracket[4] ?? '').trim();
    if (isUnit(inner) || looksLikeUnknownUnit(inner)) {
      return { name: bracket[1].trim(), unitText: inner, form: bracket[3] !== undefined ? 'parentheses' : 'brackets' };
    }
  }
  const slash = cell.lastIndexOf('/');
  if (slash > 0 && isUnit(cell.slice(slash + 1)) && cell.slice(0, slash).trim() !== '') {
    return { name: cell.slice(0, slash).trim(), unitText: cell.slice(slash + 1).trim(), form: 'slash' };
  }
  const underscore = cell.lastIndexOf('_');
  if (underscore > 0 && isUnit(cell.slice(underscore + 1))) {
    return { name: cell.slice(0, underscore).trim(), unitText: cell.slice(underscore + 1), form: 'underscore' };
  }
  const inWord = /^(.+?)\s+in\s+(\S+)$/i.exec(cell);
  if (inWord && isUnit(inWord[2])) return { name: inWord[1].trim(), unitText: inWord[2], form: 'in' };
  const space = /^(.+?)\s+(\S+)$/.exec(cell);
  if (space && isUnit(space[2])) return { name: space[1].trim(), unitText: space[2], form: 'space' };
  return { name: cell, unitText: '', form: 'none' };
}
