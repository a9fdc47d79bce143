/**
 * Test helper: write a table of SI values as a text export in a chosen dialect, so round-trip tests
 * can check that import gives back the same SI numbers. Not a product exporter.
 */

/** How to write: separator, decimal mark, quoting, byte order mark, line ending, metadata lines. */
export interface DialectSpec {
  delimiter: ',' | ';' | '\t' | 'spaces';
  decimalMark: '.' | ',';
  quoteAll?: boolean;
  bom?: boolean;
  lineEnding?: '\n' | '\r\n' | '\r';
  /** Lines written above the header, as is. */
  metadataLines?: string[];
  /** 'parentheses' → 'z (nm)', 'brackets' → 'z [nm]', 'slash' → 'z/nm', 'underscore' → 'z_nm'. */
  unitStyle?: 'parentheses' | 'brackets' | 'slash' | 'underscore';
}

/** One column to write: header name, unit text, factor from the unit to SI, and SI values (null = empty). */
export interface ColumnSpec {
  name: string;
  unit?: string;
  scaleToSI?: number;
  values: (number | string | null)[];
}

function headerOf(column: ColumnSpec, style: DialectSpec['unitStyle']): string {
  if (!column.unit) return column.name;
  switch (style ?? 'parentheses') {
    case 'brackets':
      return `${column.name} [${column.unit}]`;
    case 'slash':
      return `${column.name}/${column.unit}`;
    case 'underscore':
      return `${column.name}_${column.unit}`;
    default:
      return `${column.name} (${column.unit})`;
  }
}

function cellOf(value: number | string | null, column: ColumnSpec, spec: DialectSpec): string {
  if (value === null) return '';
  if (typeof value === 'string') return value;
  // String() gives the shortest text that reads back to the same double (ECMA-262, Number::toString).
  const text = String(value / (column.scaleToSI ?? 1));
  return spec.decimalMark === ',' ? text.replace('.', ',') : text;
}

function quote(text: string): string {
  // RFC 4180 section 2: wrap in double quotes and double any quote inside.
  return `"${text.replace(/"/g, '""')}"`;
}

/**
 * Write columns as a text file. Every column has the same number of rows (use null for empty cells).
 * @example writeDialect([{ name: 'z', unit: 'nm', scaleToSI: 1e-9, values: [5e-10] }], { delimiter: ',', decimalMark: '.' }) // 'z (nm)\n0.5\n'
 */
export function writeDialect(columns: readonly ColumnSpec[], spec: DialectSpec): string {
  const newline = spec.lineEnding ?? '\n';
  const rows = columns[0]?.values.length ?? 0;
  const lines: string[] = [...(spec.metadataLines ?? [])];
  const header = columns.map((c) => headerOf(c, spec.unitStyle));
  const body: string[][] = [];
  for (let r = 0; r < rows; r++) body.push(columns.map((c) => cellOf(c.values[r], c, spec)));
  const all = [header, ...body].map((cells) => (spec.quoteAll ? cells.map(quote) : cells));
  if (spec.delimiter === 'spaces') {
    const widths = columns.map((_, c) => Math.max(...all.map((row) => row[c].length)) + 3);
    for (const cells of all) lines.push('  ' + cells.map((cell, c) => (c < cells.length - 1 ? cell.padEnd(widths[c]) : cell)).join(''));
  } else {
    for (const cells of all) lines.push(cells.join(spec.delimiter));
  }
  return (spec.bom ? '\ufeff' : '') + lines.join(newline) + newline;
}
