import { describe, expect, it } from 'vitest';
import { acquisitionTimes, driftAnalysis, groupValues, type CurveResult } from '../../src/analysis/index.ts';
import { gaussian, mulberry32 } from '../../src/physics/index.ts';

function series(values: readonly number[], flaggedAt: readonly number[] = []): CurveResult[] {
  return values.map(
    (value, i) =>
      ({
        curve: `run.csv#${i}/single`,
        run: 'r',
        file: 'run.csv',
        index: i,
        kind: 'iz',
        status: 'ok',
        apparentBarrierEV: value,
        apparentBarrierErrEV: 0.01,
        flags: flaggedAt.includes(i) ? [{ code: 'poor-fit', reason: 'test' }] : [],
        position: null,
      }) as unknown as CurveResult,
  );
}

function drift(results: CurveResult[], timeSByCurve?: Record<string, number>) {
  const group = { key: 'r', label: 'r', curveIds: results.map((r) => r.curve) };
  return driftAnalysis(groupValues(results, group, 'apparentBarrierEV'), { timeSByCurve });
}

describe('driftAnalysis', () => {
  it('driftAnalysis marks a tip change where the barrier jumps, and only there', () => {
    const rng = mulberry32(3);
    const values = Array.from({ length: 24 }, (_, i) => 5.6 + 0.01 * gaussian(rng) + (i >= 15 ? -0.25 : 0));
    const result = drift(series(values));
    expect(result.abscissa).toBe('order');
    expect(result.changePoints).toHaveLength(1);
    expect(result.changePoints[0].indexAfter).toBe(15);
    expect(result.changePoints[0].curveIdAfter).toBe('run.csv#15/single');
    expect(result.changePoints[0].stepSize).toBeCloseTo(-0.25, 1);
    expect(result.changePoints[0].x).toBe(15.5);
  });

  it('driftAnalysis finds two steps by binary segmentation', () => {
    const rng = mulberry32(8);
    const values = Array.from({ length: 36 }, (_, i) => 5.6 + 0.01 * gaussian(rng) + (i >= 12 ? 0.3 : 0) + (i >= 24 ? -0.5 : 0));
    expect(drift(series(values)).changePoints.map((c) => c.indexAfter)).toEqual([12, 24]);
  });

  it('driftAnalysis fits a steady drift with a Theil–Sen slope whose CI holds the true slope, and finds no step in it', () => {
    const rng = mulberry32(21);
    const values = Array.from({ length: 30 }, (_, i) => 5.6 + 0.004 * i + 0.01 * gaussian(rng));
    const result = drift(series(values));
    expect(result.changePoints).toEqual([]);
    expect(result.slopeUnit).toBe('eV per curve');
    expect(result.trend!.slopeConfidenceInterval!.low).toBeLessThan(0.004);
    expect(result.trend!.slopeConfidenceInterval!.high).toBeGreaterThan(0.004);
    expect(result.trend!.slopeConfidenceInterval!.low).toBeGreaterThan(0);
  });

  it('driftAnalysis finds no change point in 200 clean seeded runs more often than the 1e-3 false-alarm rate allows', () => {
    let alarms = 0;
    for (let seed = 0; seed < 200; seed++) {
      const rng = mulberry32(1000 + seed);
      if (drift(series(Array.from({ length: 20 }, () => 5.6 + 0.02 * gaussian(rng)))).changePoints.length) alarms++;
    }
    expect(alarms).toBeLessThanOrEqual(2);
  });

  it('driftAnalysis keeps flagged curves in place but out of the trend', () => {
    const result = drift(series([5.6, 5.61, 9.9, 5.62, 5.63], [2]));
    expect(result.points.map((p) => p.acquisitionNumber)).toEqual([1, 2, 3, 4, 5]);
    expect(result.points[2].used).toBe(false);
    // By hand: pairwise slopes of (1, 5.6), (2, 5.61), (4, 5.62), (5, 5.63) are 0.005, 1/150, 1/150,
    // 0.0075, 0.01, 0.01; their median is (1/150 + 0.0075)/2
    expect(result.trend!.slope).toBeCloseTo((1 / 150 + 0.0075) / 2, 12);
  });

  it('driftAnalysis orders by acquisition time when every used curve has one', () => {
    const results = series([5.6, 5.7, 5.65]);
    const times = { [results[0].curve]: 600, [results[1].curve]: 0, [results[2].curve]: 300 };
    const result = drift(results, times);
    expect(result.abscissa).toBe('time');
    expect(result.slopeUnit).toBe('eV/min');
    expect(result.points.map((p) => [p.curveId, p.elapsedMin])).toEqual([
      [results[1].curve, 0],
      [results[2].curve, 5],
      [results[0].curve, 10],
    ]);
  });

  it('acquisitionTimes reads ISO 8601 dates and skips other forms', () => {
    const times = acquisitionTimes({
      a: { date: '2024-06-11 14:03:20' },
      b: { date: '2024-06-11T16:03:20+02:00' },
      c: { date: '11/06/2024' },
      d: { Date: '2024-06-11T14:03:20.5Z' },
    });
    // ECMAScript Date.UTC(2024, 5, 11, 14, 3, 20) / 1000, computed by hand: 1718114600
    expect(times.a).toBe(1718114600);
    expect(times.b).toBe(1718114600);
    expect(times.c).toBeUndefined();
    expect(times.d).toBe(1718114600.5);
  });
});
