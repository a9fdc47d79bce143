import { describe, expect, it } from 'vitest';
import { holmAdjust } from '../../src/analysis/index.ts';

describe('holmAdjust', () => {
  it('holmAdjust matches statsmodels multipletests(method="holm")', () => {
    // statsmodels 0.15.0: multipletests([0.01, 0.04, 0.03, 0.005, 0.2], method='holm')[1]
    const adjusted = holmAdjust([0.01, 0.04, 0.03, 0.005, 0.2]);
    const expected = [0.04, 0.09, 0.09, 0.025, 0.2];
    adjusted.forEach((p, i) => expect(p).toBeCloseTo(expected[i], 14));
  });

  it('holmAdjust keeps a single p and rejects values outside [0, 1]', () => {
    expect(holmAdjust([0.3])).toEqual([0.3]);
    expect(holmAdjust([])).toEqual([]);
    expect(() => holmAdjust([0.1, 1.5])).toThrow('holmAdjust: pValues[1] must be within [0, 1], got 1.5');
  });
});
