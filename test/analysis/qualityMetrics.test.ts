import { describe, expect, it } from 'vitest';
import { qualityMetrics } from '../../src/analysis/index.ts';
import { expectRelClose } from '../helpers.ts';

// Data and reference values: test/analysis/reference/qualityMetrics_reference.py (statsmodels 0.15.0).
const zNm = [0.4, 0.42, 0.44, 0.46, 0.48, 0.5, 0.52, 0.54, 0.56, 0.58, 0.6, 0.62];
const logCurrent = [-20.7, -21.13, -21.49, -21.95, -22.31, -22.72, -23.18, -23.52, -23.97, -24.4, -24.77, -25.23];
const sigma = [0.02, 0.02, 0.03, 0.03, 0.04, 0.04, 0.05, 0.05, 0.06, 0.06, 0.07, 0.07];
const olsFitted = [
  -20.694615384615382, -21.104230769230764, -21.51384615384615, -21.92346153846153, -22.333076923076916, -22.7426923076923,
  -23.152307692307687, -23.561923076923073, -23.971538461538458, -24.381153846153836, -24.79076923076922, -25.200384615384607,
];
const wlsFitted = [
  -20.70478033388326, -21.112572141949016, -21.520363950014776, -21.928155758080536, -22.335947566146295, -22.74373937421205,
  -23.151531182277807, -23.559322990343567, -23.967114798409327, -24.374906606475083, -24.782698414540842, -25.1904902226066,
];

describe('qualityMetrics', () => {
  it('qualityMetrics(hand-worked) gives R², χ²/ν, rms and Durbin–Watson by the definitions', () => {
    // By hand: residuals −0.1, 0.1, −0.1, 0.1; SS_res 0.04, SS_tot 5, R² = 0.992;
    // Durbin & Watson 1950 definition: Σ(Δe)² = 3·0.04 = 0.12, Σe² = 0.04, d = 3
    const metrics = qualityMetrics({ observed: [1, 2, 3, 4], fitted: [1.1, 1.9, 3.1, 3.9], nParams: 2 });
    expectRelClose(metrics.r2, 0.992, 1e-12);
    expectRelClose(metrics.reducedChi2, 0.02, 1e-12);
    expectRelClose(metrics.rmsResidual, 0.1, 1e-12);
    expectRelClose(metrics.durbinWatson, 3, 1e-12);
    expect(metrics).toMatchObject({ pointsUsed: 4, degreesOfFreedom: 2, points: 4 });
  });

  it('qualityMetrics(constant residuals) gives Durbin–Watson 0', () => {
    // By hand: residuals 0.5, 0.5, 0.5, 0.5 → no change between neighbours, d = 0
    const metrics = qualityMetrics({ observed: [1, 2, 3, 4], fitted: [0.5, 1.5, 2.5, 3.5], nParams: 2 });
    expect(metrics.durbinWatson).toBe(0);
  });

  it('qualityMetrics(OLS line) matches statsmodels OLS', () => {
    const metrics = qualityMetrics({ observed: logCurrent, fitted: olsFitted, nParams: 2 });
    // statsmodels 0.15.0 OLS(lnI, [1, z]).rsquared
    expectRelClose(metrics.r2, 0.999699845058833, 1e-9);
    // statsmodels 0.15.0 stattools.durbin_watson(OLS resid)
    expectRelClose(metrics.durbinWatson, 2.97299683765244, 1e-9);
    // statsmodels 0.15.0 OLS ssr/df_resid
    expectRelClose(metrics.reducedChi2, 0.000720384615384656, 1e-9);
    // numpy 2.4.6 sqrt(mean(resid²))
    expectRelClose(metrics.rmsResidual, 0.0245014389948947, 1e-9);
  });

  it('qualityMetrics(WLS line, weights 1/σ) matches statsmodels WLS with weights 1/σ²', () => {
    const metrics = qualityMetrics({ observed: logCurrent, fitted: wlsFitted, weights: sigma.map((s) => 1 / s), nParams: 2 });
    // statsmodels 0.15.0 WLS(lnI, [1, z], weights=1/σ²).rsquared
    expectRelClose(metrics.r2, 0.999677241324166, 1e-9);
    // statsmodels 0.15.0 stattools.durbin_watson(WLS wresid)
    expectRelClose(metrics.durbinWatson, 3.1736075133481, 1e-9);
    // statsmodels 0.15.0 WLS ssr/df_resid
    expectRelClose(metrics.reducedChi2, 0.461549186299807, 1e-9);
    // numpy 2.4.6 sqrt(mean(unweighted resid²))
    expectRelClose(metrics.rmsResidual, 0.025297566502062, 1e-9);
  });

  it('qualityMetrics(used) ignores excluded points', () => {
    const observed = [...logCurrent, 99];
    const fitted = [...olsFitted, -30];
    const used = [...logCurrent.map(() => true), false];
    const metrics = qualityMetrics({ observed, fitted, nParams: 2, used });
    // statsmodels 0.15.0 OLS on the 12 used points, as above
    expectRelClose(metrics.r2, 0.999699845058833, 1e-9);
    expect(metrics).toMatchObject({ pointsUsed: 12, points: 13, degreesOfFreedom: 10 });
  });

  it('qualityMetrics rejects caller mistakes with the argument, range and value', () => {
    expect(() => qualityMetrics({ observed: [1, 2], fitted: [1], nParams: 1 })).toThrow(
      'qualityMetrics: fitted must have length 2 (one per point), got 1',
    );
    expect(() => qualityMetrics({ observed: [1, NaN], fitted: [1, 2], nParams: 1 })).toThrow(
      'qualityMetrics: observed[1] must be a finite number, got NaN',
    );
    expect(() => qualityMetrics({ observed: [1, 2], fitted: [1, 2], nParams: -1 })).toThrow(
      'qualityMetrics: nParams must be an integer ≥ 0, got -1',
    );
    expect(() => qualityMetrics({ observed: [1, 2], fitted: [1, 2], weights: [1, -1], nParams: 1 })).toThrow(
      'qualityMetrics: weights[1] must be ≥ 0, got -1',
    );
    expect(() => qualityMetrics({ observed: [1, 2], fitted: [1, 2], nParams: 1, used: [false, false] })).toThrow(
      'qualityMetrics: used must select at least 1 point with weight > 0, got 0',
    );
  });

  it('qualityMetrics gives NaN reduced χ² when no degrees of freedom are left', () => {
    const metrics = qualityMetrics({ observed: [1, 2], fitted: [1.1, 1.9], nParams: 2 });
    expect(metrics.reducedChi2).toBeNaN();
    expect(metrics.degreesOfFreedom).toBe(0);
  });
});
