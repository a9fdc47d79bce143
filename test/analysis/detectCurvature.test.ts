import { describe, expect, it } from 'vitest';
import { detectCurvature, detectStepChange } from '../../src/analysis/index.ts';
import { mulberry32 } from '../../src/physics/index.ts';
import { expectRelClose } from '../helpers.ts';
import { cleanApproach, uniformInteger, type SyntheticApproach } from './synthetic.ts';

// Data and reference values: test/analysis/reference/qualityMetrics_reference.py (statsmodels 0.15.0).
const zNm = [0.4, 0.42, 0.44, 0.46, 0.48, 0.5, 0.52, 0.54, 0.56, 0.58, 0.6, 0.62];
const logCurrent = [-20.7, -21.13, -21.49, -21.95, -22.31, -22.72, -23.18, -23.52, -23.97, -24.4, -24.77, -25.23];
const sigma = [0.02, 0.02, 0.03, 0.03, 0.04, 0.04, 0.05, 0.05, 0.06, 0.06, 0.07, 0.07];

/** ln I of a curve whose slope changes by `fraction` of the initial slope across the window. */
function curvedLogCurrent(curve: SyntheticApproach, fraction: number): number[] {
  const first = curve.zNm[0];
  const span = curve.zNm[curve.zNm.length - 1] - first;
  const curvature = (-fraction * curve.slopePerNm) / (2 * span);
  return curve.currentA.map((current, i) => Math.log(current) + curvature * (curve.zNm[i] - first) ** 2);
}

describe('detectCurvature', () => {
  it('detectCurvature(weighted) matches statsmodels WLS of y on [1, z, z²]', () => {
    const result = detectCurvature(zNm, logCurrent, sigma.map((s) => 1 / s));
    // statsmodels 0.15.0 WLS(lnI, [1, z, z²], weights=1/σ²): params, bse, t and p of the z² term
    expectRelClose(result.intercept, -12.888978749682053, 1e-8);
    expectRelClose(result.linear, -18.97103792190478, 1e-8);
    expectRelClose(result.curvature, -1.451423073816727, 1e-7);
    expectRelClose(result.curvatureStandardError, 1.9338545530132658, 1e-8);
    expectRelClose(result.tStatistic, -0.750533731482117, 1e-7);
    expectRelClose(result.pValue, 0.472098606878669, 1e-8);
    expect(result.degreesOfFreedom).toBe(9);
    expect(result.nonExponential).toBe(false);
  });

  it('detectCurvature(unweighted) matches statsmodels OLS on [1, z, z²]', () => {
    const result = detectCurvature(zNm, logCurrent);
    // statsmodels 0.15.0 OLS(lnI, [1, z, z²]): z² coefficient, its bse, t and p
    expectRelClose(result.curvature, -2.0791708291710336, 1e-7);
    expectRelClose(result.curvatureStandardError, 1.807740861920944, 1e-8);
    expectRelClose(result.pValue, 0.279725476895959, 1e-8);
  });

  it('detectCurvature(a clear parabola) is significant and calls it non-exponential', () => {
    const x = [0, 1, 2, 3, 4, 5, 6, 7, 8, 9];
    const wiggle = [0.3, -0.2, 0.1, -0.4, 0.2, 0, -0.1, 0.3, -0.3, 0.1];
    const y = x.map((value, i) => 1 + 2 * value + 0.5 * value * value + wiggle[i]);
    const result = detectCurvature(x, y);
    // statsmodels 0.15.0 OLS(y, [1, x, x²]) (reference script): c, bse, t, p
    expectRelClose(result.curvature, 0.5064393939393936, 1e-9);
    expectRelClose(result.curvatureStandardError, 0.01181759211537962, 1e-8);
    expectRelClose(result.tStatistic, 42.8547024634828, 1e-8);
    expectRelClose(result.pValue, 9.8320817114518e-10, 1e-6);
    // By hand from those coefficients: slope 1.937 at x = 0, 11.053 at x = 9, 6.495 mid-window → change 1.404
    expectRelClose(result.relativeSlopeChange, (2 * 0.5064393939393936 * 9) / (1.9371969696969717 + 0.5064393939393936 * 9), 1e-8);
    expect(result.nonExponential).toBe(true);
  });

  it('detectCurvature stays silent on 100 clean approach curves', () => {
    let nonExponential = 0;
    for (let seed = 1; seed <= 100; seed++) {
      const curve = cleanApproach(seed);
      if (detectCurvature(curve.zNm, curve.currentA.map(Math.log)).nonExponential) nonExponential++;
    }
    expect(nonExponential).toBe(0);
  });

  it('detectCurvature flags 100 approach curves whose slope changes by 30 %', () => {
    let nonExponential = 0;
    for (let seed = 1; seed <= 100; seed++) {
      const curve = cleanApproach(seed);
      const result = detectCurvature(curve.zNm, curvedLogCurrent(curve, 0.3));
      if (result.nonExponential) nonExponential++;
      expect(result.relativeSlopeChange).toBeGreaterThan(0.2);
    }
    expect(nonExponential).toBe(100);
  });

  it('detectCurvature(stepAtIndex) does not read a tip change as curvature', () => {
    let withoutStepTerm = 0;
    let withStepTerm = 0;
    for (let seed = 1; seed <= 100; seed++) {
      const curve = cleanApproach(seed);
      const position = uniformInteger(mulberry32(7000 + seed), 2, curve.zNm.length - 2);
      const logCurrent = curve.currentA.map((current, i) => Math.log(current) + (i >= position ? 5 * curve.noiseRelative : 0));
      const step = detectStepChange(logCurrent, undefined, { trendDegree: 2, x: curve.zNm });
      expect(step).not.toBeNull();
      if (detectCurvature(curve.zNm, logCurrent).nonExponential) withoutStepTerm++;
      if (detectCurvature(curve.zNm, logCurrent, undefined, { stepAtIndex: step!.index }).nonExponential) withStepTerm++;
    }
    // Without the step term a 5σ tip change looks curved in several curves; with it, in none.
    expect(withoutStepTerm).toBeGreaterThanOrEqual(5);
    expect(withStepTerm).toBe(0);
  });

  it('detectCurvature(weight 0) leaves points out', () => {
    const x = [...zNm, 0.64];
    const y = [...logCurrent, 0];
    const weights = [...sigma.map((s) => 1 / s), 0];
    const result = detectCurvature(x, y, weights);
    // statsmodels 0.15.0 WLS on the 12 weighted points, as above
    expectRelClose(result.curvature, -1.451423073816727, 1e-7);
    expect(result.pointsUsed).toBe(12);
  });

  it('detectCurvature rejects caller mistakes', () => {
    expect(() => detectCurvature([1, 2, 3], [1, 2, 3])).toThrow('detectCurvature: x must hold at least 4 values, got 3');
    expect(() => detectCurvature([1, 1, 1, 1], [1, 2, 3, 4])).toThrow('detectCurvature: x must span a range > 0, got all x = 1');
    expect(() => detectCurvature([1, 2, 1, 2], [1, 2, 3, 4])).toThrow('detectCurvature: x must hold at least 3 distinct values');
    expect(() => detectCurvature([1, 2, 3, 4, 5], [1, 2, 3, 4, 5], undefined, { stepAtIndex: 9 })).toThrow(
      'detectCurvature: stepAtIndex must be an integer within [1, 4], got 9',
    );
  });
});
