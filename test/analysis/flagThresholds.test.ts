import { describe, expect, it } from 'vitest';
import { FLAG_CODES, FLAG_THRESHOLDS } from '../../src/analysis/index.ts';

describe('FLAG_THRESHOLDS and FLAG_CODES', () => {
  it('FLAG_CODES lists the eleven stable codes once each', () => {
    expect([...FLAG_CODES]).toEqual([
      'saturation',
      'noise-floor',
      'tip-change',
      'point-contact',
      'non-exponential',
      'hysteresis',
      'poor-fit',
      'no-convergence',
      'degenerate',
      'implausible',
      'batch-outlier',
    ]);
  });

  it('FLAG_THRESHOLDS gives every entry a finite value, a unit and a one-line rationale', () => {
    for (const [name, threshold] of Object.entries(FLAG_THRESHOLDS)) {
      expect(Number.isFinite(threshold.value), name).toBe(true);
      expect(threshold.unit.length, name).toBeGreaterThan(0);
      expect(threshold.rationale.length, name).toBeGreaterThan(20);
      expect(threshold.rationale.includes('\n'), name).toBe(false);
    }
  });

  it('FLAG_THRESHOLDS holds the published and stated limits', () => {
    // Iglewicz & Hoaglin (1993): |modified z| > 3.5
    expect(FLAG_THRESHOLDS.batchOutlierModifiedZ.value).toBe(3.5);
    // physics.md §3: flag G > ~0.01 G0 as near contact [common practice, no source]
    expect(FLAG_THRESHOLDS.nearContactConductanceG0.value).toBe(0.01);
    expect([FLAG_THRESHOLDS.barrierMinimumEV.value, FLAG_THRESHOLDS.barrierMaximumEV.value]).toEqual([0.05, 10]);
    expect([FLAG_THRESHOLDS.widthMinimumNm.value, FLAG_THRESHOLDS.widthMaximumNm.value]).toEqual([0.1, 5]);
    expect(FLAG_THRESHOLDS.degenerateCorrelation.value).toBe(0.999);
  });
});
