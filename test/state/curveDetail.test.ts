import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { analyzeCurve } from '../../src/analysis/index.ts';
import { validateSettings } from '../../src/fit/index.ts';
import { importText } from '../../src/io/index.ts';
import { approachDetail, conductanceViews, exclusionRegions, spectrumDetail } from '../../src/state/curveDetail.ts';
import { curveInput } from '../../src/state/fitKey.ts';

const sample = (name: string) => readFileSync(new URL(`../../sample-data/${name}`, import.meta.url), 'utf8');
const settings = validateSettings(JSON.parse(sample('settings.json'))).settings;

describe('state/curveDetail', () => {
  it('approachDetail draws the same fit analyzeCurve reports, with its exclusions in curve order', () => {
    const curve = importText(sample('approach-A-gold-clipped.csv'), 'approach-A-gold-clipped.csv').curves[0];
    const result = analyzeCurve(curve, settings);
    const detail = approachDetail(curveInput(curve, null), settings);
    const used = detail.exclusion.filter((code) => code === 0).length;
    expect(used).toBe(result.quality.pointsUsed);
    const saturation = result.flags.find((f) => f.code === 'saturation')!;
    for (const i of saturation.pointIndices!) expect(detail.exclusion[i]).toBe(3);
    // The line's slope in ln I per nm is the one in the record.
    const k = detail.lineZNm.length - 1;
    const slope = (Math.log(detail.lineCurrentA[k]) - Math.log(detail.lineCurrentA[0])) / (detail.lineZNm[k] - detail.lineZNm[0]);
    expect(slope).toBeCloseTo(result.line!.slopePerNm, 9);
    for (let i = 0; i <= k; i++) {
      expect(detail.bandLowA[i]).toBeLessThan(detail.lineCurrentA[i]);
      expect(detail.bandHighA[i]).toBeGreaterThan(detail.lineCurrentA[i]);
    }
    expect(detail.profileEV.length).toBeGreaterThan(10);
  });

  it('approachDetail honours a manual window the way analyzeCurve does', () => {
    const curve = importText(sample('approach-A-gold.csv'), 'approach-A-gold.csv').curves[0];
    const window = { fromNm: 0.03, toNm: 0.15 };
    const result = analyzeCurve(curveInput(curve, window), settings);
    const detail = approachDetail(curveInput(curve, window), settings);
    expect(detail.windowNm).toEqual(window);
    expect(detail.exclusion.filter((code) => code === 0).length).toBe(result.quality.pointsUsed);
    detail.zNm.forEach((z, i) => {
      if (z < 0.03 || z > 0.15) expect(detail.exclusion[i]).toBe(1);
    });
  });

  it('spectrumDetail gives the model current of the chosen fit and its residuals', () => {
    const curve = importText(sample('spectra-A-gold.tsv'), 'spectra-A-gold.tsv').curves[0];
    const result = analyzeCurve(curve, settings);
    const detail = spectrumDetail(curveInput(curve, null), settings);
    expect(detail.model).toBe(result.model);
    expect(detail.status).toBe(result.status);
    expect(detail.fittedCurrentA.length).toBe(curve.x.length);
    const rms = Math.sqrt(detail.residual.reduce((s, r) => s + r * r, 0) / detail.residual.length);
    expect(rms).toBeGreaterThan(0.5);
    expect(rms).toBeLessThan(2);
  });

  it('conductanceViews recovers dI/dV of a cubic and masks I/V near zero bias', () => {
    // I = G·V + c·V³ → dI/dV = G + 3c·V². A local quadratic over 7 points h apart reads the cubic
    // term with the known bias c·Σd⁴/Σd² = 7c·h² (by hand from the normal equations).
    const bias = Array.from({ length: 101 }, (_, i) => -1 + i * 0.02);
    const g = 1e-9;
    const c = 5e-10;
    const current = bias.map((v) => g * v + c * v ** 3);
    const views = conductanceViews(bias, current, current, 1e-13, 7);
    for (const i of [10, 50, 90]) {
      const v = bias[i];
      expect(views.conductanceS[i]).toBeCloseTo(g + 3 * c * v * v + 7 * c * 0.02 ** 2, 17);
    }
    expect(views.normalized[50]).toBeNaN();
    expect(views.normalized[90]).toBeCloseTo((g + 3 * c * 0.64 + 7 * c * 0.02 ** 2) / (g + c * 0.64), 2);
    expect(views.inverseBiasPerV[50]).toBeNaN();
    expect(views.fowlerNordheimY[100]).toBeCloseTo(Math.log(g + c), 12);
  });

  it('exclusionRegions merges runs of one reason and reaches halfway to the neighbours', () => {
    const regions = exclusionRegions(Float64Array.of(0.3, 0, 0.1, 0.2, 0.4), Uint8Array.of(0, 3, 3, 0, 4));
    expect(regions).toEqual([
      { fromNm: 0, toNm: 0.15000000000000002, code: 3, reason: 'preamp saturation', points: 2 },
      { fromNm: 0.35, toNm: 0.4, code: 4, reason: 'below the noise floor', points: 1 },
    ]);
  });
});
