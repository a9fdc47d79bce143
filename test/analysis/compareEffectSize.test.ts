import { describe, expect, it } from 'vitest';
import { cohensD } from '../../src/analysis/index.ts';
import { expectRelClose } from '../helpers.ts';

describe('cohensD', () => {
  it('cohensD reproduces the worked example of Lakens (2013): d_s = 1.13, g_s = 1.08', () => {
    const r = cohensD([9, 7, 8, 9, 8, 9, 9, 10, 9, 9], [9, 6, 7, 8, 7, 9, 8, 8, 8, 7]);
    // D. Lakens, Front. Psychol. 4, 863 (2013), movie-rating example [from memory], two decimals
    expect(r.cohensD as number).toBeCloseTo(1.13, 2);
    expect(r.hedgesG as number).toBeCloseTo(1.08, 2);
    // statsmodels 0.15.0: effectsize_smd(...) = g; d = g/(1 − 3/(4N − 9))
    expectRelClose(r.hedgesG as number, 1.07830754583326, 1e-12);
    expectRelClose(r.cohensD as number, 1.1258799375612, 1e-12);
  });

  it('cohensD on unequal groups matches statsmodels effectsize_smd', () => {
    const r = cohensD([4.92, 5.13, 5.05, 4.88, 5.21, 5.02, 4.97, 5.1], [5.31, 5.18, 5.45, 5.6, 5.27, 5.39, 5.52, 5.12, 5.66, 5.34, 5.41, 5.23]);
    // statsmodels 0.15.0: effectsize_smd(mean1, sd1, 8, mean2, sd2, 12)
    expectRelClose(r.hedgesG as number, -2.21201459510276, 1e-12);
    expectRelClose(r.cohensD as number, -2.30960347429847, 1e-12);
  });

  it('cohensD is null when neither group has spread', () => {
    expect(cohensD([1, 1], [2, 2]).cohensD).toBeNull();
    expect(() => cohensD([1], [2, 3])).toThrow('cohensD: sampleA must hold at least 2 values, got 1');
  });
});
