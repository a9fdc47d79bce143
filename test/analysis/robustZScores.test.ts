import { describe, expect, it } from 'vitest';
import { detectBatchOutliers, robustZScoreDetails, robustZScores } from '../../src/analysis/index.ts';
import { apparentBarrierErrorEV, apparentBarrierFromSlopeEV, mulberry32 } from '../../src/physics/index.ts';
import { expectRelClose } from '../helpers.ts';
import { cleanApproach, fitLine, uniformInteger } from './synthetic.ts';

/** Apparent barriers and their errors of `size` clean curves (φ_ap ≈ 4 eV), seeds from `firstSeed`. */
function cleanBatch(firstSeed: number, size: number): { barriersEV: number[]; errorsEV: number[] } {
  const barriersEV: number[] = [];
  const errorsEV: number[] = [];
  for (let k = 0; k < size; k++) {
    const curve = cleanApproach(firstSeed + k, { slopePerNm: -20.49 });
    const line = fitLine(curve.zNm, curve.currentA.map(Math.log));
    barriersEV.push(apparentBarrierFromSlopeEV(line.slope * 1e9));
    errorsEV.push(apparentBarrierErrorEV(line.slope * 1e9, line.slopeError * 1e9));
  }
  return { barriersEV, errorsEV };
}

describe('robustZScores', () => {
  it('robustZScores follows Iglewicz & Hoaglin, 0.6745 (x − median)/MAD', () => {
    // By hand: median 3, |x − 3| = 2, 1, 0, 1, 97 → MAD 1; M = 0.6745 (x − 3)
    const scores = robustZScores([1, 2, 3, 4, 100]);
    [-1.349, -0.6745, 0, 0.6745, 65.4265].forEach((expected, i) => expectRelClose(scores[i], expected, 1e-12));
  });

  it('robustZScores matches scipy.stats.median_abs_deviation on a batch of barriers', () => {
    const values = [4.12, 3.95, 4.31, 4.05, 3.88, 4.22, 4.01, 6.9, 4.15, 3.99, 2.1];
    const details = robustZScoreDetails(values);
    // scipy 1.17.1: median 4.05, median_abs_deviation 0.1, 0.6745 (x − median)/MAD
    expectRelClose(details.median, 4.05, 1e-14);
    expectRelClose(details.medianAbsoluteDeviation, 0.1, 1e-12);
    expectRelClose(details.scores[7], 19.2232499999999, 1e-10);
    expectRelClose(details.scores[10], -13.152749999999928, 1e-10);
    expect(details.scale).toBe('mad');
  });

  it('robustZScores falls back to the mean absolute deviation when the MAD is 0', () => {
    // By hand: median 10, MAD 0; mean |x − 10| = 90/8 = 11.25; M = 90/(1.253314 · 11.25) = 6.38308
    const details = robustZScoreDetails([10, 10, 10, 10, 10, 10, 10, 100]);
    expect(details.scale).toBe('mean-absolute-deviation');
    expectRelClose(details.scores[7], 90 / (1.253314 * 11.25), 1e-12);
    expect(details.scores.slice(0, 7)).toEqual([0, 0, 0, 0, 0, 0, 0]);
    expect(robustZScoreDetails([5, 5, 5])).toEqual({ scores: [0, 0, 0], median: 5, medianAbsoluteDeviation: 0, scale: 'none' });
  });

  it('robustZScores rejects an empty or non-finite batch', () => {
    expect(() => robustZScores([])).toThrow('robustZScores: values must hold at least 1 value, got 0');
    expect(() => robustZScores([1, NaN])).toThrow('robustZScores: values[1] must be a finite number, got NaN');
  });
});

describe('detectBatchOutliers', () => {
  it('detectBatchOutliers flags a curve whose barrier stands 3.5 robust σ out', () => {
    const { barriersEV, errorsEV } = cleanBatch(1, 40);
    barriersEV[17] = 6.5;
    const finding = detectBatchOutliers(barriersEV, errorsEV);
    expect(finding?.outlierIndices).toEqual([17]);
    expect(Math.abs(finding!.scores[17])).toBeGreaterThan(3.5);
  });

  it('detectBatchOutliers with standard errors spares a curve that is merely noisy', () => {
    const values = [4.1, 4.3, 3.9, 4.0, 4.2, 4.05, 4.15, 5.4];
    expect(detectBatchOutliers(values)?.outlierIndices).toEqual([7]);
    // Its own error bar of 0.5 eV reaches the median 4.125 eV within 3.29σ: noisy, not an outlier.
    expect(detectBatchOutliers(values, [0.1, 0.1, 0.1, 0.1, 0.1, 0.1, 0.1, 0.5])).toBeNull();
  });

  it('detectBatchOutliers flags no curve in a batch of 100 clean curves', () => {
    const { barriersEV, errorsEV } = cleanBatch(1, 100);
    expect(detectBatchOutliers(barriersEV, errorsEV)).toBeNull();
    expect(detectBatchOutliers(barriersEV)).toBeNull();
  });

  it('detectBatchOutliers marks fewer than 1 in 1000 clean curves over 100 seeded batches of 20–100', () => {
    // The 3.5 rule flags ≈ 5e-4 of normal values (P(|Z| > 3.5), from memory), so a few clean batches
    // in 100 may carry one; the rate, not zero, is what can be promised.
    let flaggedValues = 0;
    let values = 0;
    for (let batch = 1; batch <= 100; batch++) {
      const size = uniformInteger(mulberry32(batch), 20, 100);
      const { barriersEV, errorsEV } = cleanBatch(batch * 1000, size);
      values += size;
      flaggedValues += detectBatchOutliers(barriersEV, errorsEV)?.outlierIndices.length ?? 0;
    }
    expect(flaggedValues / values).toBeLessThan(1e-3);
  });

  it('detectBatchOutliers rejects caller mistakes', () => {
    expect(() => detectBatchOutliers([1, 2])).toThrow('detectBatchOutliers: values must hold at least 3 values, got 2');
    expect(() => detectBatchOutliers([1, 2, 3], [1, 2])).toThrow('detectBatchOutliers: standardErrors must have length 3 (one per point), got 2');
  });
});
