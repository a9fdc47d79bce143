import { describe, expect, it } from 'vitest';
import {
  chiSquareUpperTailProbability,
  normalLowerTailProbability,
  normalTwoSidedPValue,
  regularizedGammaUpper,
  regularizedIncompleteBeta,
  studentTTwoSidedPValue,
} from '../../src/analysis/index.ts';
import { expectRelClose } from '../helpers.ts';

describe('regularizedIncompleteBeta', () => {
  it('regularizedIncompleteBeta matches its closed forms', () => {
    for (const x of [0.01, 0.2, 0.5, 0.77, 0.99]) {
      // A&S 26.5 special cases [from memory]: I_x(a, 1) = x^a
      expectRelClose(regularizedIncompleteBeta(x, 3.7, 1), x ** 3.7, 1e-13);
      // I_x(1, b) = 1 − (1 − x)^b
      expectRelClose(regularizedIncompleteBeta(x, 1, 2.5), 1 - (1 - x) ** 2.5, 1e-13);
      // I_x(1/2, 1/2) = (2/π) arcsin √x (arcsine distribution)
      expectRelClose(regularizedIncompleteBeta(x, 0.5, 0.5), (2 / Math.PI) * Math.asin(Math.sqrt(x)), 1e-13);
    }
  });

  it('regularizedIncompleteBeta matches scipy.special.betainc', () => {
    // scipy 1.17.1 special.betainc(2.5, 7.1, 0.3), recomputed
    expectRelClose(regularizedIncompleteBeta(0.3, 2.5, 7.1), 0.649022579021013, 1e-12);
    // scipy 1.17.1 special.betainc(200, 3, 0.9): deep lower tail
    expectRelClose(regularizedIncompleteBeta(0.9, 200, 3), 1.56622756212149e-7, 1e-10);
  });

  it('regularizedIncompleteBeta rejects x outside [0, 1] and non-positive shapes', () => {
    expect(() => regularizedIncompleteBeta(1.2, 1, 1)).toThrow('regularizedIncompleteBeta: x must be within [0, 1], got 1.2');
    expect(() => regularizedIncompleteBeta(0.5, 0, 1)).toThrow('regularizedIncompleteBeta: a must be a finite number > 0, got 0');
    expect(() => regularizedIncompleteBeta(0.5, 1, -2)).toThrow('regularizedIncompleteBeta: b must be a finite number > 0, got -2');
  });
});

describe('studentTTwoSidedPValue', () => {
  // NIST/SEMATECH e-Handbook of Statistical Methods, §1.3.6.7.2, upper critical values of Student's t
  // (3 decimals, so the exact quantile lies within ±0.0005 of each entry): [ν, upper-tail α, t]
  const table: [number, number, number][] = [
    [5, 0.05, 2.015],
    [10, 0.025, 2.228],
    [20, 0.005, 2.845],
    [30, 0.01, 2.457],
    [100, 0.001, 3.174],
  ];
  it.each(table)('studentTTwoSidedPValue brackets 2α at the table value (ν = %d, α = %f)', (degreesOfFreedom, alpha, t) => {
    expect(studentTTwoSidedPValue(t - 0.0005, degreesOfFreedom)).toBeGreaterThan(2 * alpha);
    expect(studentTTwoSidedPValue(t + 0.0005, degreesOfFreedom)).toBeLessThan(2 * alpha);
  });

  it('studentTTwoSidedPValue matches scipy.stats.t.sf in the far tail', () => {
    // scipy 1.17.1: 2·t.sf(12.4, 62), recomputed
    expectRelClose(studentTTwoSidedPValue(12.4, 62), 1.93154337512344e-18, 1e-10);
    // scipy 1.17.1: 2·t.sf(30, 200)
    expectRelClose(studentTTwoSidedPValue(30, 200), 5.72416120882785e-76, 1e-10);
    // scipy 1.17.1: 2·t.sf(0.5, 3.5), non-integer ν
    expectRelClose(studentTTwoSidedPValue(-0.5, 3.5), 0.646850439322551, 1e-12);
  });

  it('studentTTwoSidedPValue(t, 1) follows the Cauchy closed form', () => {
    // Student t with ν = 1 is the Cauchy distribution: P(|T| ≥ t) = 1 − (2/π) arctan t (textbook).
    // (The table's ν = 1, α = 0.001 entry 318.313 is not used: the exact quantile is tan(0.499π) = 318.309.)
    for (const t of [0.3, 1, 7, 318.309]) expectRelClose(studentTTwoSidedPValue(t, 1), 1 - (2 / Math.PI) * Math.atan(t), 1e-10);
  });

  it('studentTTwoSidedPValue rejects non-positive degrees of freedom', () => {
    expect(() => studentTTwoSidedPValue(1, 0)).toThrow('studentTTwoSidedPValue: degreesOfFreedom must be a finite number > 0, got 0');
  });
});

describe('normal and χ² tails', () => {
  it('regularizedGammaUpper(1, x) is e^{−x}', () => {
    // Q(1, x) = e^{−x} (exponential distribution; A&S 6.5.2 [from memory])
    for (const x of [0.1, 1, 2, 10, 50]) expectRelClose(regularizedGammaUpper(1, x), Math.exp(-x), 1e-13);
  });

  it('normalTwoSidedPValue matches the normal quantiles', () => {
    // 1.959963984540054 is the 97.5 % normal quantile [from memory; scipy 1.17.1 norm.ppf(0.975)]
    expectRelClose(normalTwoSidedPValue(1.959963984540054), 0.05, 1e-12);
    // scipy 1.17.1: 2·norm.sf(5), recomputed
    expectRelClose(normalTwoSidedPValue(5), 5.73303143758387e-7, 1e-12);
    // scipy 1.17.1: 2·norm.sf(20), far tail kept to full relative accuracy
    expectRelClose(normalTwoSidedPValue(20), 5.50724823721231e-89, 1e-10);
    // Φ(−3) = 0.0013498980316301 [from memory; scipy 1.17.1 norm.cdf(-3)]
    expectRelClose(normalLowerTailProbability(-3), 0.0013498980316301, 1e-12);
    // same value by symmetry: Φ(3) = 1 − Φ(−3)
    expectRelClose(normalLowerTailProbability(3), 1 - 0.0013498980316301, 1e-14);
  });

  it('chiSquareUpperTailProbability brackets 0.05 at the χ² table value', () => {
    // NIST/SEMATECH e-Handbook §1.3.6.7.4, upper critical value χ²_0.05(10) = 18.307 [from memory]
    expect(chiSquareUpperTailProbability(18.3065, 10)).toBeGreaterThan(0.05);
    expect(chiSquareUpperTailProbability(18.3075, 10)).toBeLessThan(0.05);
    // scipy 1.17.1: chi2.sf(300, 62), recomputed
    expectRelClose(chiSquareUpperTailProbability(300, 62), 6.47037961367036e-33, 1e-10);
    // scipy 1.17.1: chi2.sf(0.5, 1)
    expectRelClose(chiSquareUpperTailProbability(0.5, 1), 0.479500122186953, 1e-12);
  });

  it('chiSquareUpperTailProbability rejects a negative statistic', () => {
    expect(() => chiSquareUpperTailProbability(-1, 3)).toThrow('chiSquareUpperTailProbability: chiSquare must be ≥ 0, got -1');
  });
});
