import { describe, expect, it } from 'vitest';
import { gridColour, gridColourScale, gridMap, groupValues, type CurveResult } from '../../src/analysis/index.ts';

function site(xNm: number, yNm: number, value: number, flagged = false, segment = 'single'): CurveResult {
  return {
    curve: `grid.csv#${xNm},${yNm}/${segment}`,
    run: 'grid',
    file: 'grid.csv',
    index: 0,
    kind: 'iz',
    status: 'ok',
    apparentBarrierEV: value,
    apparentBarrierErrEV: 0.01,
    flags: flagged ? [{ code: 'tip-change', reason: 'test' }] : [],
    position: { xNm, yNm },
  } as unknown as CurveResult;
}

function mapOf(results: CurveResult[]) {
  return gridMap(groupValues(results, { key: 'grid', label: 'grid', curveIds: results.map((r) => r.curve) }, 'apparentBarrierEV'));
}

describe('gridMap', () => {
  it('gridMap infers the pitch, places every site and colours it, one cell per site', () => {
    const results: CurveResult[] = [];
    for (let row = 0; row < 4; row++) for (let column = 0; column < 5; column++) results.push(site(10 + 2.5 * column, -3 + 2.5 * row, 5 + 0.1 * column, column === 2 && row === 1));
    const map = mapOf(results)!;
    expect(map.cells).toHaveLength(20);
    expect([map.columns, map.rows, map.spacingXNm, map.spacingYNm, map.originXNm, map.originYNm]).toEqual([5, 4, 2.5, 2.5, 10, -3]);
    expect(map.regular).toBe(true);
    const flagged = map.cells.filter((cell) => cell.flagged);
    expect(flagged.map((cell) => [cell.column, cell.row, cell.value])).toEqual([[2, 1, null]]);
    expect(map.scale!.minimum).toBe(5);
    expect(map.scale!.maximum).toBeCloseTo(5.4, 12);
    // d3-scale-chromatic interpolateViridis(0) = #440154 and (1) = #fde725, the ends of viridis
    expect(map.cells[0].colour).toBe('#440154');
    expect(map.cells[4].colour).toBe('#fde725');
  });

  it('gridMap keeps the pitch when a column is missing and merges approach and retract of a site', () => {
    const results = [site(0, 0, 5), site(2, 0, 5.2), site(6, 0, 5.4), site(6, 0, 5.6, false, 'retract'), site(0, 2, 5)];
    const map = mapOf(results)!;
    expect(map.spacingXNm).toBe(2);
    expect(map.columns).toBe(4);
    const merged = map.cells.find((cell) => cell.column === 3)!;
    expect(merged.curveIds).toHaveLength(2);
    expect(merged.value).toBeCloseTo(5.5, 12);
  });

  it('gridMap returns null without two positioned sites', () => {
    expect(mapOf([site(0, 0, 5)])).toBeNull();
  });
});

describe('gridColourScale', () => {
  it('gridColourScale gives round ticks in the unit and eleven stops from the dark end', () => {
    const scale = gridColourScale(5.65, 6.1, 'eV');
    // d3 scaleLinear().domain([5.65, 6.1]).ticks(5)
    expect(scale.ticks).toEqual([5.7, 5.8, 5.9, 6, 6.1]);
    expect(scale.stops).toHaveLength(11);
    expect(scale.stops[0]).toEqual({ offset: 0, colour: '#440154' });
    // d3 interpolateCividis(0.5) = rgb(127, 124, 117)
    expect(gridColour(gridColourScale(0, 1, 'eV', 'cividis'), 0.5)).toBe('#7f7c75');
  });

  it('gridColourScale widens a flat domain and rejects a reversed one', () => {
    const flat = gridColourScale(5, 5, 'eV');
    expect(flat.minimum).toBeLessThan(5);
    expect(flat.maximum).toBeGreaterThan(5);
    expect(() => gridColourScale(2, 1, 'eV')).toThrow('gridColourScale: maximum must be a finite number ≥ minimum (2), got 1');
  });
});
