import { describe, expect, it } from 'vitest';
import { ProblemLog } from '../../src/io/problemLog.ts';

describe('ProblemLog', () => {
  it('ProblemLog.add(repeats) merges them into one problem with a count and the lines', () => {
    const log = new ProblemLog('a.csv');
    for (const line of [4, 9, 12]) log.add({ code: 'nonNumeric', severity: 'error', line, column: 2, message: "'x' is not a number" });
    log.add({ code: 'nonNumeric', severity: 'error', line: 5, column: 1, message: "'y' is not a number" });
    log.add({ code: 'emptyCell', severity: 'warning', line: 2, column: 2, message: 'empty' });
    const problems = log.list();
    expect(problems.map((p) => [p.line, p.column, p.code, p.count])).toEqual([
      [2, 2, 'emptyCell', 1],
      [4, 2, 'nonNumeric', 3],
      [5, 1, 'nonNumeric', 1],
    ]);
    expect(problems[1].message).toBe("'x' is not a number (3 times, lines 4, 9, 12)");
    expect(problems[1].lines).toEqual([4, 9, 12]);
    expect(problems[1].file).toBe('a.csv');
    expect(log.hasErrors).toBe(true);
  });

  it('ProblemLog shortens long line lists and raises locations below 1 to 1', () => {
    const log = new ProblemLog('b.csv');
    for (let line = 10; line < 30; line++) log.add({ code: 'ragged', severity: 'warning', line, column: 0, message: 'm' });
    const [problem] = log.list();
    expect(problem.column).toBe(1);
    expect(problem.message).toBe('m (20 times, lines 10, 11, 12, 13, 14, 15, 16, 17, … 29)');
    expect(log.hasErrors).toBe(false);
  });
});
