import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../../src/cli/main.ts';
import { compareRuns, type CurveResult } from '../../src/analysis/index.ts';

const repo = fileURLToPath(new URL('../..', import.meta.url));
let results: CurveResult[] = [];

beforeAll(async () => {
  let out = '';
  const io = { stdout: (t: string) => void (out += t), stderr: () => {}, stderrIsTTY: false, cwd: repo };
  const code = await runCli(['fit', 'sample-data', '--settings', 'sample-data/settings.json', '--workers', '1'], io);
  expect(code).toBe(0);
  results = JSON.parse(out);
});

interface TruthApproach {
  file: string;
  run: string;
  apparentBarrierEV: number | null;
  spoiled: string | null;
}

describe('compareRuns on the demo scenario', () => {
  it('compareRuns: run A-gold has a higher apparent barrier than A-graphite, p < 0.01 by both tests, and the CI holds the true difference', () => {
    const comparison = compareRuns({ results, quantity: 'apparentBarrierEV' });
    const pair = comparison.pairs.find((p) => p.keyA === 'A-gold' && p.keyB === 'A-graphite')!;
    expect(pair).toBeDefined();
    expect(pair.welch!.meanA).toBeGreaterThan(pair.welch!.meanB);
    expect(pair.welch!.pValue).toBeLessThan(0.01);
    expect(pair.mannWhitney!.pValue).toBeLessThan(0.01);
    expect(pair.welch!.confidenceInterval.low).toBeGreaterThan(0);
    // The spoiled A-gold curves are flagged and left out (6 single curves and the blunted approach
    // and retract pair): 10 clean curves + the site S7 approach curve remain.
    expect(pair.nUsedA).toBe(11);
    expect(pair.nExcludedA).toBe(8);
    expect(pair.nUsedB).toBe(10);
    // sample-data/truth.json: simulated apparent barriers of the clean curves of each run
    const truth: { approach: TruthApproach[] } = JSON.parse(readFileSync(new URL('../../sample-data/truth.json', import.meta.url), 'utf8'));
    const meanOf = (run: string) => {
      const values = truth.approach.filter((t) => t.run === run && !t.spoiled && t.apparentBarrierEV !== null).map((t) => t.apparentBarrierEV as number);
      return values.reduce((a, b) => a + b, 0) / values.length;
    };
    const trueDifference = meanOf('A-gold') - meanOf('A-graphite');
    expect(trueDifference).toBeGreaterThan(pair.welch!.confidenceInterval.low);
    expect(trueDifference).toBeLessThan(pair.welch!.confidenceInterval.high);
  });

  it('compareRuns: the grid run maps 36 sites at 2 nm pitch, the low-work-function corner lower than the rest', () => {
    const comparison = compareRuns({ results });
    const grid = comparison.groups.find((g) => g.group.key === 'B-gold-grid')!.grid!;
    expect(grid.cells).toHaveLength(36);
    expect([grid.columns, grid.rows, grid.spacingXNm, grid.spacingYNm]).toEqual([6, 6, 2, 2]);
    // sample-data/README.md: the corner x, y ≥ 6 nm has a 4.6 eV sample work function instead of 5.1 eV
    const corner = grid.cells.filter((c) => c.xNm >= 6 && c.yNm >= 6).map((c) => c.value as number);
    const rest = grid.cells.filter((c) => !(c.xNm >= 6 && c.yNm >= 6)).map((c) => c.value as number);
    expect(corner).toHaveLength(9);
    expect(Math.max(...corner)).toBeLessThan(Math.min(...rest));
  });

  it('compareRuns: the weighted summary finds the map spread far beyond the fit errors, and no tip change in the clean runs', () => {
    const comparison = compareRuns({ results });
    const byKey = new Map(comparison.groups.map((g) => [g.group.key, g]));
    expect(byKey.get('B-gold-grid')!.weighted!.spreadExceedsErrors).toBe(true);
    for (const key of ['A-gold', 'A-graphite', 'B-gold', 'B-graphite']) expect(byKey.get(key)!.drift.changePoints, key).toEqual([]);
    expect(comparison.groupsWithoutQuantity).toEqual([]);
  });

  it('compareRuns on a spectrum quantity leaves out approach-only groups', () => {
    const comparison = compareRuns({ results, quantity: 'phi2EV' });
    expect(comparison.groupsWithoutQuantity).toContain('B-gold-grid');
    expect(comparison.groups.every((g) => g.values.points.length > 0)).toBe(true);
  });
});
