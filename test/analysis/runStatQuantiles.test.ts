import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { normalQuantile, studentTLowerTailProbability, studentTQuantile } from '../../src/analysis/index.ts';
import { expectRelClose } from '../helpers.ts';

describe('studentTQuantile', () => {
  it('studentTQuantile matches scipy.stats.t.ppf across degrees of freedom and tails', () => {
    // scipy 1.17.1, scipy.stats.t.ppf (test/analysis/reference/runComparison_reference.py): [p, ν, t]
    const table: [number, number, number][] = [
      [0.975, 1, 12.7062047361747],
      [0.975, 2, 4.30265272974946],
      [0.975, 5, 2.57058183563631],
      [0.975, 10, 2.22813885198627],
      [0.975, 30, 2.04227245630124],
      [0.975, 1000, 1.96233908082641],
      [0.995, 3.5, 5.08570222309126],
      [1e-6, 4, -41.577854150451],
      [0.6, 7, 0.263166861352023],
    ];
    for (const [p, degreesOfFreedom, t] of table) expectRelClose(studentTQuantile(p, degreesOfFreedom), t, 1e-11);
  });

  it('studentTQuantile reproduces the NIST t table to its three decimals', () => {
    // NIST/SEMATECH e-Handbook of Statistical Methods §1.3.6.7.2: t_0.975(10) = 2.228, t_0.995(20) = 2.845
    expect(studentTQuantile(0.975, 10)).toBeCloseTo(2.228, 3);
    expect(studentTQuantile(0.995, 20)).toBeCloseTo(2.845, 3);
  });

  it('studentTQuantile inverts studentTLowerTailProbability and is odd about 0.5', () => {
    fc.assert(
      fc.property(fc.double({ min: 0.001, max: 0.999, noNaN: true }), fc.double({ min: 0.5, max: 500, noNaN: true }), (p, degreesOfFreedom) => {
        const t = studentTQuantile(p, degreesOfFreedom);
        expect(Math.abs(studentTLowerTailProbability(t, degreesOfFreedom) - p)).toBeLessThan(1e-12);
        expect(Math.abs(studentTQuantile(1 - p, degreesOfFreedom) + t)).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(t)));
      }),
      { seed: 20240611, numRuns: 200 },
    );
  });

  it('studentTQuantile rejects probabilities outside (0, 1) and bad degrees of freedom', () => {
    expect(() => studentTQuantile(1, 5)).toThrow('studentTQuantile: probability must be within (0, 1), got 1');
    expect(() => studentTQuantile(0.5, 0)).toThrow('studentTQuantile: degreesOfFreedom must be a finite number > 0, got 0');
  });
});

describe('normalQuantile', () => {
  it('normalQuantile matches scipy.stats.norm.ppf, unlike the coarser simple-statistics probit', () => {
    // scipy 1.17.1, scipy.stats.norm.ppf
    expectRelClose(normalQuantile(0.975), 1.95996398454005, 1e-13);
    expectRelClose(normalQuantile(1e-10), -6.36134090240406, 1e-12);
    expectRelClose(normalQuantile(0.3), -0.524400512708041, 1e-12);
    expect(normalQuantile(0.5)).toBe(0);
  });

  it('normalQuantile rejects 0', () => {
    expect(() => normalQuantile(0)).toThrow('normalQuantile: probability must be within (0, 1), got 0');
  });
});
