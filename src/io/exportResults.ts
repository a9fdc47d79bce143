/**
 * Result tables for spreadsheets and scripts: one row per curve, units in the column headers, the
 * same columns as the dashboard's batch table. Text cells that a spreadsheet would run as a formula
 * (starting with = + - @, or a tab or carriage return) get a leading apostrophe.
 * Source: OWASP, "CSV Injection" (common practice for the escape; from memory); RFC 4180 quoting.
 */

/** A flat result row: column name → number, text or null. */
export type ResultRow = Record<string, number | string | null | undefined>;

/** One column of the table: its header (with unit) and how to read it from a record. */
export interface ResultColumn<T> {
  header: string;
  value: (record: T) => number | string | null | undefined;
}

/**
 * Quote a cell for CSV (RFC 4180) and defuse formulas: text starting with = + - @ or a control
 * character gets a leading apostrophe; numbers are written as they are (a negative number stays a number).
 * @example csvCell('=1+2') // "'=1+2"
 */
export function csvCell(value: number | string | null | undefined): string {
  if (value === null || value === undefined) return '';
  if (typeof value === 'number') return Number.isFinite(value) ? String(value) : '';
  let text = value;
  if (/^[=+\-@\t\r]/.test(text)) text = `'${text}`;
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/**
 * Write records as CSV with the given columns (header row first, CRLF line ends per RFC 4180).
 * @example toCsv([{ a: 1 }], [{ header: 'a (V)', value: (r) => r.a }]) // "a (V)\r\n1\r\n"
 */
export function toCsv<T>(records: readonly T[], columns: readonly ResultColumn<T>[]): string {
  const lines = [columns.map((c) => csvCell(c.header)).join(',')];
  for (const record of records) lines.push(columns.map((c) => csvCell(c.value(record))).join(','));
  return lines.join('\r\n') + '\r\n';
}
