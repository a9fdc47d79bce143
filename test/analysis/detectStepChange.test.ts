import { tTestTwoSample } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { detectStepChange, FLAG_THRESHOLDS, stepChangeStatistic } from '../../src/analysis/index.ts';
import { mulberry32 } from '../../src/physics/index.ts';
import { expectRelClose } from '../helpers.ts';
import { cleanApproach, uniformInteger, whiteNoise } from './synthetic.ts';

const referenceWiggle = [
  0.12, -0.31, 0.05, 0.22, -0.18, 0.09, -0.04, 0.27, -0.22, 0.15, -0.08, 0.19, -0.26, 0.03, 0.11, -0.14, 0.24, -0.06, 0.01, -0.17,
];
const referenceSeries = referenceWiggle.map((wiggle, i) => 0.3 * i + (i >= 12 ? 2 : 0) + wiggle);

describe('stepChangeStatistic', () => {
  it('stepChangeStatistic(trendDegree 0) is the largest pooled two-sample t over all splits', () => {
    const series = whiteNoise(11, 40).map((value, i) => value + (i >= 25 ? 1.5 : 0));
    const statistic = stepChangeStatistic(series);
    // simple-statistics tTestTwoSample: pooled-variance two-sample t, (mean x − mean y)/SE, an independent implementation
    let bestIndex = -1;
    let bestT = 0;
    for (let k = 2; k <= series.length - 2; k++) {
      const t = tTestTwoSample(series.slice(k), series.slice(0, k), 0) as number;
      if (Math.abs(t) > Math.abs(bestT)) {
        bestT = t;
        bestIndex = k;
      }
    }
    expect(statistic.index).toBe(bestIndex);
    expectRelClose(statistic.statistic, bestT, 1e-10);
    expect(statistic.statisticKind).toBe('t');
    expect(statistic.positionsSearched).toBe(40 - 2 * FLAG_THRESHOLDS.stepMinimumSegment.value + 1);
    expectRelClose(statistic.adjustedPValue, Math.min(1, statistic.pValue * statistic.positionsSearched), 1e-12);
  });

  it('stepChangeStatistic(trendDegree 1 and 2) matches statsmodels OLS with a step regressor', () => {
    // statsmodels 0.15.0, test/analysis/reference/detectStepChange_reference.py: y ~ 1 + x + H_k, best k
    const line = stepChangeStatistic(referenceSeries, undefined, { trendDegree: 1 });
    expect(line.index).toBe(12);
    expectRelClose(line.statistic, 11.9432363721408, 1e-9);
    expectRelClose(line.stepSize, 1.86833333333333, 1e-9);
    expectRelClose(line.pValue, 1.08189695862451e-9, 1e-7);
    expectRelClose(line.sigma, 0.180770681294524, 1e-9);
    // statsmodels 0.15.0, same script: y ~ 1 + x + x² + H_k, best k
    const parabola = stepChangeStatistic(referenceSeries, undefined, { trendDegree: 2 });
    expect(parabola.index).toBe(12);
    expectRelClose(parabola.statistic, 10.6430650142138, 1e-9);
    expectRelClose(parabola.stepSize, 1.88584353291433, 1e-9);
    expectRelClose(parabola.pValue, 1.14626747461282e-8, 1e-7);
  });

  it('stepChangeStatistic(sigma) uses the normal reference', () => {
    const statistic = stepChangeStatistic([0, 0, 0, 0, 1, 1, 1, 1], 0.5);
    // By hand: δ = 1, √(1/4 + 1/4) = 0.7071, z = 1/(0.5·0.7071) = 2.828
    expect(statistic.index).toBe(4);
    expectRelClose(statistic.statistic, 2 * Math.SQRT2, 1e-12);
    expect(statistic.statisticKind).toBe('z');
  });

  it('stepChangeStatistic rejects caller mistakes', () => {
    expect(() => stepChangeStatistic([1, 2, 3, 4])).toThrow('stepChangeStatistic: series must hold at least 5 values, got 4');
    expect(() => stepChangeStatistic([1, 2, 3, 4, 5], -1)).toThrow('stepChangeStatistic: sigma must be a finite number > 0, got -1');
    expect(() => stepChangeStatistic([1, 2, 3, 4, 5, 6], undefined, { trendDegree: 3 as 2 })).toThrow(
      'stepChangeStatistic: trendDegree must be 0, 1 or 2, got 3',
    );
    expect(() => stepChangeStatistic([1, 2, 3, 4, 5, 6], undefined, { x: [1, 2] })).toThrow(
      'stepChangeStatistic: x must have length 6 (one per point), got 2',
    );
  });
});

describe('detectStepChange', () => {
  it('detectStepChange stays silent on 100 seeded white-noise series of length 64–512', () => {
    let unknownSigmaAlarms = 0;
    let knownSigmaAlarms = 0;
    for (let seed = 1; seed <= 100; seed++) {
      const length = uniformInteger(mulberry32(1000 + seed), 64, 512);
      const series = whiteNoise(seed, length, 0.05);
      if (detectStepChange(series)) unknownSigmaAlarms++;
      if (detectStepChange(series, 0.05)) knownSigmaAlarms++;
    }
    expect(unknownSigmaAlarms).toBe(0);
    expect(knownSigmaAlarms).toBe(0);
  });

  it('detectStepChange finds a 5σ step at a random position in 100 seeded series', () => {
    let found = 0;
    let exact = 0;
    for (let seed = 1; seed <= 100; seed++) {
      const random = mulberry32(5000 + seed);
      const length = uniformInteger(random, 64, 512);
      const position = uniformInteger(random, 2, length - 2);
      const series = whiteNoise(seed, length).map((value, i) => value + (i >= position ? 5 : 0));
      const finding = detectStepChange(series);
      if (!finding) continue;
      found++;
      if (finding.index === position) exact++;
      expect(Math.abs(finding.index - position)).toBeLessThanOrEqual(2);
      expect(finding.stepSize).toBeGreaterThan(3.5);
      expect(finding.stepSize).toBeLessThan(6.5);
    }
    expect(found).toBe(100);
    expect(exact).toBeGreaterThanOrEqual(90);
  });

  it('detectStepChange(ln I, quadratic trend) finds a 5σ tip change in 100 clean approach curves', () => {
    let found = 0;
    for (let seed = 1; seed <= 100; seed++) {
      const curve = cleanApproach(seed);
      const position = uniformInteger(mulberry32(7000 + seed), 2, curve.zNm.length - 2);
      const logCurrent = curve.currentA.map((current, i) => Math.log(current) + (i >= position ? 5 * curve.noiseRelative : 0));
      const finding = detectStepChange(logCurrent, undefined, { trendDegree: 2, x: curve.zNm });
      if (!finding) continue;
      found++;
      expect(Math.abs(finding.index - position)).toBeLessThanOrEqual(3);
    }
    expect(found).toBe(100);
  });

  it('detectStepChange(ln I, quadratic trend) stays silent on 100 clean and 100 smoothly curved approach curves', () => {
    let cleanAlarms = 0;
    let curvedAlarms = 0;
    for (let seed = 1; seed <= 100; seed++) {
      const curve = cleanApproach(seed);
      const logCurrent = curve.currentA.map((current) => Math.log(current));
      if (detectStepChange(logCurrent, undefined, { trendDegree: 2, x: curve.zNm })) cleanAlarms++;
      // The slope changes by 30 % across the window: curvature, not a step.
      const first = curve.zNm[0];
      const span = curve.zNm[curve.zNm.length - 1] - first;
      const curvature = (-0.3 * curve.slopePerNm) / (2 * span);
      const curved = logCurrent.map((value, i) => value + curvature * (curve.zNm[i] - first) ** 2);
      if (detectStepChange(curved, undefined, { trendDegree: 2, x: curve.zNm })) curvedAlarms++;
    }
    expect(cleanAlarms).toBe(0);
    expect(curvedAlarms).toBe(0);
  });

  it('detectStepChange lists the shorter side as the displaced points', () => {
    const series = [0, 0.1, -0.1, 0, 0.05, 0.02, -0.04, 5, 5.1, 4.9];
    const finding = detectStepChange(series, 0.1);
    expect(finding?.index).toBe(7);
    expect(finding?.pointIndices).toEqual([7, 8, 9]);
    expect(finding?.points).toBe(10);
  });
});
