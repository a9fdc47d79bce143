import type { Delimiter } from './types.ts';

/**
 * Split one line into cells for detection and headers, honouring double quotes as in RFC 4180
 * section 2 (a field may be wrapped in quotes; inside, "" stands for one quote and the delimiter
 * is plain text). Quotes are removed and cells trimmed. 'whitespace' splits at runs of spaces and
 * tabs and ignores leading and trailing blanks.
 * @example splitCells('"a, b",2', ',') // ['a, b', '2']
 */
export function splitCells(line: string, delimiter: Delimiter): string[] {
  const cells: string[] = [];
  const whitespace = delimiter === 'whitespace';
  const text = whitespace ? line.trim() : line;
  if (whitespace && text === '') return [''];
  let cell = '';
  let inQuotes = false;
  for (let i = 0; i < text.length; i++) {
    const ch = text[i];
    if (inQuotes) {
      if (ch === '"') {
        if (text[i + 1] === '"') {
          cell += '"';
          i++;
        } else inQuotes = false;
      } else cell += ch;
      continue;
    }
    if (ch === '"' && cell.trim() === '') {
      inQuotes = true;
      cell = '';
      continue;
    }
    const isSeparator = whitespace ? ch === ' ' || ch === '\t' : ch === delimiter;
    if (isSeparator) {
      cells.push(cell.trim());
      cell = '';
      if (whitespace) while (i + 1 < text.length && (text[i + 1] === ' ' || text[i + 1] === '\t')) i++;
      continue;
    }
    cell += ch;
  }
  cells.push(cell.trim());
  return cells;
}

/** The delimiter as a printable word: 'comma', 'semicolon', 'tab' or 'whitespace'. */
export function delimiterName(delimiter: Delimiter): string {
  switch (delimiter) {
    case ',':
      return 'comma';
    case ';':
      return 'semicolon';
    case '\t':
      return 'tab';
    default:
      return 'whitespace';
  }
}
