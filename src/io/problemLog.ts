import type { ImportProblem } from './types.ts';

/** One occurrence handed to ProblemLog.add. */
export interface ProblemInput {
  code: string;
  severity: 'error' | 'warning';
  line: number;
  column: number;
  message: string;
  /** Occurrences with the same key merge into one problem; default: code and column. */
  mergeKey?: string;
}

interface Entry {
  first: ProblemInput;
  count: number;
  lines: number[];
  lastLine: number;
}

const MAX_LINES_KEPT = 1000;
const MAX_LINES_SHOWN = 8;

/**
 * Collects the problems of one file and merges repeats: the first occurrence keeps its message and
 * location, and the merged problem says how many more there were and on which lines.
 * @example new ProblemLog('a.csv').add({ code: 'x', severity: 'warning', line: 3, column: 1, message: 'm' })
 */
export class ProblemLog {
  readonly file: string;
  #entries = new Map<string, Entry>();

  constructor(file: string) {
    this.file = file;
  }

  /** Record one occurrence. Lines and columns are 1-based; smaller values are raised to 1. */
  add(problem: ProblemInput): void {
    const key = problem.mergeKey ?? `${problem.code}|${problem.column}`;
    const line = Math.max(1, Math.floor(problem.line));
    const existing = this.#entries.get(key);
    if (existing) {
      existing.count++;
      existing.lastLine = line;
      if (existing.lines.length < MAX_LINES_KEPT) existing.lines.push(line);
      return;
    }
    this.#entries.set(key, { first: { ...problem, line, column: Math.max(1, Math.floor(problem.column)) }, count: 1, lines: [line], lastLine: line });
  }

  /** True when an error (not only warnings) was recorded. */
  get hasErrors(): boolean {
    for (const entry of this.#entries.values()) if (entry.first.severity === 'error') return true;
    return false;
  }

  /** Number of distinct (merged) problems so far. */
  get size(): number {
    return this.#entries.size;
  }

  /** Merged problems, ordered by line then column. */
  list(): ImportProblem[] {
    const problems: ImportProblem[] = [];
    for (const entry of this.#entries.values()) {
      const { first, count, lines } = entry;
      let message = first.message;
      if (count > 1) {
        const shown = lines.slice(0, MAX_LINES_SHOWN).join(', ');
        const more = count > MAX_LINES_SHOWN ? `, … ${entry.lastLine}` : '';
        message += ` (${count} times, lines ${shown}${more})`;
      }
      problems.push({
        file: this.file,
        line: first.line,
        column: first.column,
        message,
        severity: first.severity,
        code: first.code,
        count,
        lines: [...lines],
      });
    }
    problems.sort((a, b) => a.line - b.line || a.column - b.column);
    return problems;
  }
}
