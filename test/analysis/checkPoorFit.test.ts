import { describe, expect, it } from 'vitest';
import { checkPoorFit, qualityMetrics, type QualityMetrics } from '../../src/analysis/index.ts';
import { cleanApproach, fitLine } from './synthetic.ts';

function metricsWith(overrides: Partial<QualityMetrics>): QualityMetrics {
  return { r2: 0.999, reducedChi2: 1, rmsResidual: 0.03, durbinWatson: 2, pointsUsed: 64, degreesOfFreedom: 62, points: 64, ...overrides };
}

describe('checkPoorFit', () => {
  it('checkPoorFit flags R² below 0.95', () => {
    expect(checkPoorFit(metricsWith({ r2: 0.9 }), { noiseKnown: false })?.failures).toEqual([
      { test: 'r-squared', value: 0.9, limit: 0.95, pValue: NaN },
    ]);
    expect(checkPoorFit(metricsWith({ r2: 0.96 }), { noiseKnown: false })).toBeNull();
  });

  it('checkPoorFit uses χ²/ν only when the noise is known, and only when it is both large and significant', () => {
    expect(checkPoorFit(metricsWith({ reducedChi2: 3 }), { noiseKnown: false })).toBeNull();
    const failure = checkPoorFit(metricsWith({ reducedChi2: 3 }), { noiseKnown: true })?.failures[0];
    expect(failure?.test).toBe('reduced-chi-square');
    expect(failure!.pValue).toBeLessThan(1e-10);
    // Significant (ν = 10000) but small: 1.3× the noise variance is not a poor fit.
    expect(checkPoorFit(metricsWith({ reducedChi2: 1.3, degreesOfFreedom: 10000, pointsUsed: 10002 }), { noiseKnown: true })).toBeNull();
    // Large but not significant: χ²/ν = 2 on ν = 3 has p = 0.11.
    expect(checkPoorFit(metricsWith({ reducedChi2: 2, degreesOfFreedom: 3, pointsUsed: 5 }), { noiseKnown: true })).toBeNull();
  });

  it('checkPoorFit flags Durbin–Watson below 1 when n makes it significant', () => {
    const long = checkPoorFit(metricsWith({ durbinWatson: 0.8, pointsUsed: 64 }), { noiseKnown: false })?.failures[0];
    expect(long?.test).toBe('durbin-watson');
    // Large-sample null d ≈ N(2, 4/n) [from memory]: n = 64, d = 0.8 → z = −4.8
    expect(long!.pValue).toBeLessThan(1e-5);
    // n = 16: z = (0.9 − 2)/0.5 = −2.2, p = 0.014 — not enough on a short curve.
    expect(checkPoorFit(metricsWith({ durbinWatson: 0.9, pointsUsed: 16, degreesOfFreedom: 14 }), { noiseKnown: false })).toBeNull();
  });

  it('checkPoorFit stays silent on 100 clean approach curves fitted with weights 1/σ', () => {
    let alarms = 0;
    for (let seed = 1; seed <= 100; seed++) {
      const curve = cleanApproach(seed);
      const logCurrent = curve.currentA.map(Math.log);
      const line = fitLine(curve.zNm, logCurrent);
      const weights = curve.zNm.map(() => 1 / curve.noiseRelative);
      const metrics = qualityMetrics({ observed: logCurrent, fitted: line.fitted, weights, nParams: 2 });
      if (checkPoorFit(metrics, { noiseKnown: true })) alarms++;
    }
    expect(alarms).toBe(0);
  });

  it('checkPoorFit flags a straight line through a curved ln I by its Durbin–Watson', () => {
    const curve = cleanApproach(5, { points: 128, noiseRelative: 0.02 });
    const first = curve.zNm[0];
    const span = curve.zNm[curve.zNm.length - 1] - first;
    const logCurrent = curve.currentA.map((current, i) => Math.log(current) + ((-0.3 * curve.slopePerNm) / (2 * span)) * (curve.zNm[i] - first) ** 2);
    const line = fitLine(curve.zNm, logCurrent);
    const metrics = qualityMetrics({ observed: logCurrent, fitted: line.fitted, nParams: 2 });
    expect(checkPoorFit(metrics, { noiseKnown: false })?.failures.map((failure) => failure.test)).toEqual(['durbin-watson']);
  });

  it('checkPoorFit rejects a missing noiseKnown', () => {
    expect(() => checkPoorFit(metricsWith({}), {} as { noiseKnown: boolean })).toThrow('checkPoorFit: options.noiseKnown must be a boolean, got undefined');
  });
});
