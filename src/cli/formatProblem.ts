import type { ImportProblem } from '../io/index.ts';

/** `file:line:column: severity: message` (with ` (×N)` when merged), the compiler-style location editors understand. */
export function formatProblem(problem: ImportProblem): string {
  const count = problem.count > 1 ? ` (×${problem.count})` : '';
  return `${problem.file}:${problem.line}:${problem.column}: ${problem.severity}: ${problem.message}${count}`;
}
