import { describe, expect, it } from 'vitest';
import { analyzeCurve, type CurveInput } from '../../src/analysis/index.ts';
import { DEFAULT_SETTINGS } from '../../src/fit/index.ts';
import { gaussian, mulberry32 } from '../../src/physics/index.ts';

/** A clean approach curve: I = I0·e^{slope·z}, 2–3 % relative noise and a 1 pA floor, never clipped. */
function cleanApproach(seed: number): CurveInput {
  const rng = mulberry32(seed);
  const points = 128 + (seed % 3) * 64;
  const barrierEV = 3.5 + (seed % 7) * 0.25;
  // physics.md §2: |d lnI/dz| = √(φ/0.95249553 eV Å²)
  const slopePerM = -Math.sqrt(barrierEV / 0.95249553) * 1e10;
  const x = new Float64Array(points);
  const current = new Float64Array(points);
  for (let i = 0; i < points; i++) {
    x[i] = (i * 3e-10) / (points - 1);
    current[i] = 2e-9 * Math.exp(slopePerM * x[i]) * (1 + (0.02 + 0.01 * (seed % 2)) * gaussian(rng)) + 1e-12 * gaussian(rng);
  }
  return { id: `clean#${seed}`, fileName: 'clean.csv', index: seed, segment: 'single', kind: 'iz', x, current, fixedBiasV: 0.1 };
}

describe('analyzeCurve on clean approach curves', () => {
  it('raises no flag on 200 clean seeded curves (the whole per-curve path: fit exclusions and detectors)', () => {
    const flagged: string[] = [];
    for (let seed = 1; seed <= 200; seed++) {
      const result = analyzeCurve(cleanApproach(seed), DEFAULT_SETTINGS);
      expect(result.status).toBe('ok');
      if (result.flags.length) flagged.push(`${seed}: ${result.flags.map((f) => `${f.code} (${f.reason})`).join('; ')}`);
    }
    expect(flagged).toEqual([]);
  });

  it('reports the curve length as points and the used count separately', () => {
    const result = analyzeCurve(cleanApproach(3), DEFAULT_SETTINGS);
    expect(result.quality.points).toBe(128);
    expect(result.quality.pointsUsed).toBeLessThanOrEqual(128);
  });

  it('flags a clipped curve as saturation and points at exactly the clipped points', () => {
    const curve = cleanApproach(5);
    const clipped = { ...curve, current: Float64Array.from(curve.current, (c) => Math.min(c, 1e-9)) };
    const expected = Array.from(clipped.current.keys()).filter((i) => clipped.current[i] === 1e-9);
    const result = analyzeCurve(clipped, DEFAULT_SETTINGS);
    const flag = result.flags.find((f) => f.code === 'saturation');
    expect(flag?.pointIndices).toEqual(expected);
  });
});

describe('analyzeCurve with non-finite points (API callers)', () => {
  it('fits a spectrum with a NaN current and reports the points it used', () => {
    const biasV = Float64Array.from({ length: 101 }, (_, i) => -1 + i * 0.02);
    // a smooth tunnel-like I(V): I = G0·(V + 0.3 V³), 1 nS
    const current = Float64Array.from(biasV, (v) => 1e-9 * (v + 0.3 * v ** 3));
    current[40] = Number.NaN;
    const result = analyzeCurve({ id: 'iv#0', fileName: 'iv.csv', index: 0, segment: 'single', kind: 'iv', x: biasV, current }, { ...DEFAULT_SETTINGS, tipRadiusNm: 10 });
    expect(result.message).not.toContain('analysis failed');
    expect(result.quality.pointsUsed).toBe(100);
  });
});
