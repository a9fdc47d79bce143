import { describe, expect, it } from 'vitest';
import { compareRuns, type CurveResult } from '../../src/analysis/index.ts';
import { driftPlotSvg, gridMapSvg, stripBoxPlotSvg } from '../../src/io/reportSvg.ts';

function curve(curveId: string, run: string, value: number, options: { flagged?: boolean; position?: { xNm: number; yNm: number } } = {}): CurveResult {
  return {
    curve: curveId,
    run,
    file: `${run}.csv`,
    index: 0,
    kind: 'iz',
    status: 'ok',
    apparentBarrierEV: value,
    apparentBarrierErrEV: 0.01,
    flags: options.flagged ? [{ code: 'tip-change', reason: 'a step' }] : [],
    position: options.position ?? null,
  } as unknown as CurveResult;
}

const runA = [5.6, 5.62, 5.61, 5.63, 5.59].map((v, i) => curve(`a#${i}`, 'A', v));
const runB = [5.3, 5.32, 5.31, 5.29].map((v, i) => curve(`b#${i}`, 'B', v));
const flaggedOff = curve('a#off', 'A', 9.9, { flagged: true });
const flaggedIn = curve('a#in', 'A', 5.605, { flagged: true });

describe('stripBoxPlotSvg', () => {
  it('stripBoxPlotSvg draws every curve: filled when used, hollow when flagged, a triangle when off scale', () => {
    const svg = stripBoxPlotSvg(compareRuns({ results: [...runA, flaggedOff, flaggedIn, ...runB] }));
    expect(svg.startsWith('<svg class="plot strip-box"')).toBe(true);
    expect(svg.match(/class="point"/g)).toHaveLength(9);
    expect(svg.match(/class="point flagged"/g)).toHaveLength(2);
    expect(svg).toMatch(/<path data-curve-id="a#off" class="point flagged" d="M[^"]+Z" fill="none"/);
    expect(svg).toMatch(/<circle data-curve-id="a#in" class="point flagged"[^>]*fill="none"/);
    expect(svg.match(/<g class="box">/g)).toHaveLength(2);
    expect(svg.match(/<g class="mean">/g)).toHaveLength(2);
    expect(svg).toContain('apparent barrier height (eV)');
    expect(svg).not.toContain('xmlns');
  });
});

describe('driftPlotSvg', () => {
  it('driftPlotSvg draws the trend line and a dashed mark at a change point', () => {
    const values = Array.from({ length: 16 }, (_, i) => 5.6 + (i % 3) * 0.004 + (i >= 8 ? 0.3 : 0));
    const results = values.map((v, i) => curve(`d#${i}`, 'D', v));
    const report = compareRuns({ results }).groups[0];
    expect(report.drift.changePoints).toHaveLength(1);
    const svg = driftPlotSvg(report.drift, { unit: 'eV', valueLabel: 'apparent barrier height' });
    expect(svg).toContain('class="trend"');
    expect(svg.match(/class="change-point"/g)).toHaveLength(1);
    expect(svg).toContain('step +0.3 eV');
    expect(svg).toContain('acquisition order (curve number)');
  });
});

describe('gridMapSvg', () => {
  it('gridMapSvg draws one square per site, crosses flagged sites and labels the colour bar in eV', () => {
    const results: CurveResult[] = [];
    for (let row = 0; row < 3; row++) for (let column = 0; column < 4; column++) results.push(curve(`g#${column},${row}`, 'G', 5.5 + 0.05 * column + 0.02 * row, { flagged: row === 2 && column === 0, position: { xNm: 1.5 * column, yNm: 1.5 * row } }));
    const map = compareRuns({ results }).groups[0].grid!;
    const svg = gridMapSvg(map, 'map <1>');
    expect(svg.match(/<rect class="cell/g)).toHaveLength(12);
    expect(svg.match(/<rect class="cell flagged"/g)).toHaveLength(1);
    expect(svg).toContain('<linearGradient id="map1-gradient"');
    expect(svg).toContain('fill="url(#map1-gradient)"');
    expect(svg.match(/class="legend-tick"[^>]*>[^<]* eV</g)!.length).toBeGreaterThanOrEqual(3);
    expect(svg).toContain('x (nm)');
  });
});
