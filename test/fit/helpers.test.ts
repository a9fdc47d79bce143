/**
 * The small fit helpers: weightedLine (closed-form weighted straight line), polynomialFit (normal
 * equations on scaled x) with polynomialValue and invertSymmetric, and selectMedian/selectKth
 * (quickselect) with selectMedianOfMagnitudes (bracketed), against hand values, NIST StRD
 * linear-regression data sets and sorting.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { invertSymmetric, polynomialFit, polynomialValue } from '../../src/fit/polynomialFit.ts';
import { selectKth, selectMedian, selectMedianOfMagnitudes } from '../../src/fit/selectMedian.ts';
import { gaussian, mulberry32 } from '../../src/fit/index.ts';
import { weightedLine } from '../../src/fit/weightedLine.ts';
import { expectRelClose, logRelativeError } from '../helpers.ts';

// NIST StRD linear regression, Norris (lower difficulty, 36 observations), data as transcribed in
// scipy's stats tests (test_nist_norris); y first in the NIST file, here split into x and y.
const NORRIS_X = [
  0.2, 337.4, 118.2, 884.6, 10.1, 226.5, 666.3, 996.3, 448.6, 777.0, 558.2, 0.4, 0.6, 775.5, 666.9, 338.0, 447.5, 11.6, 556.0, 228.1, 995.8, 887.6, 120.2, 0.3,
  0.3, 556.8, 339.1, 887.2, 999.0, 779.0, 11.1, 118.3, 229.2, 669.1, 448.9, 0.5,
];
const NORRIS_Y = [
  0.1, 338.8, 118.1, 888.0, 9.2, 228.1, 668.5, 998.5, 449.1, 778.9, 559.2, 0.3, 0.1, 778.1, 668.8, 339.3, 448.9, 10.8, 557.7, 228.3, 998.0, 888.8, 119.6, 0.3,
  0.6, 557.6, 339.3, 888.0, 998.5, 778.9, 10.2, 117.6, 228.9, 668.4, 449.2, 0.2,
];

// NIST StRD linear regression, Pontius (lower difficulty, quadratic, 40 observations), data as in
// the GSL and Octave StRD test files (the two transcriptions agree).
const PONTIUS_LOAD = [150000, 300000, 450000, 600000, 750000, 900000, 1050000, 1200000, 1350000, 1500000, 1650000, 1800000, 1950000, 2100000, 2250000, 2400000, 2550000, 2700000, 2850000, 3000000];
const PONTIUS_X = [...PONTIUS_LOAD, ...PONTIUS_LOAD];
const PONTIUS_Y = [
  0.11019, 0.21956, 0.32949, 0.43899, 0.54803, 0.65694, 0.76562, 0.87487, 0.98292, 1.09146, 1.20001, 1.30822, 1.41599, 1.52399, 1.63194, 1.73947, 1.84646, 1.95392,
  2.06128, 2.16844, 0.11052, 0.22018, 0.32939, 0.43886, 0.54798, 0.65739, 0.76596, 0.87474, 0.983, 1.0915, 1.20004, 1.30818, 1.41613, 1.52408, 1.63159, 1.73965,
  1.84696, 1.95445, 2.06177, 2.16829,
];

// NIST StRD linear regression, Wampler3 (higher difficulty, degree 5, 21 observations), data as in
// the Octave StRD test file.
const WAMPLER3_Y = [
  760, -2042, 2111, -1684, 3888, 1858, 11379, 17560, 39287, 64382, 113159, 175108, 273291, 400186, 581243, 811568, 1121004, 1506550, 2002767, 2611612, 3369180,
];
const WAMPLER_X = Float64Array.from({ length: 21 }, (_, i) => i);

const f64 = (values: number[]) => Float64Array.from(values);
const standardErrors = (covariance: Float64Array, m: number) => Array.from({ length: m }, (_, k) => Math.sqrt(covariance[k * m + k]));

describe('weightedLine', () => {
  it('weightedLine(y = 1 + 2x exactly) gives slope 2, intercept 1 and zero errors', () => {
    const x = f64([-3, -1, 0, 2, 5, 8]);
    const line = weightedLine(x, Float64Array.from(x, (value) => 1 + 2 * value), null, null);
    expect(line.slope).toBeCloseTo(2, 14);
    expect(line.intercept).toBeCloseTo(1, 14);
    expect(line.slopeError).toBeLessThan(1e-14);
    expect(line.interceptError).toBeLessThan(1e-14);
    expect(line.count).toBe(6);
    expectRelClose(line.meanX, 11 / 6, 1e-15);
    // the doc-comment example
    expect(weightedLine(f64([0, 1, 2]), f64([1, 3, 5]), null, null).slope).toBeCloseTo(2, 14);
  });

  it('weightedLine(x = 1…5, y = 2, 4, 5, 4, 5) gives the hand-computed line and standard errors', () => {
    // By hand: x̄ = 3, ȳ = 4, Sxx = 10, Sxy = 6 ⇒ slope 0.6, intercept 2.2; residuals −0.8, 0.6, 1, −0.6,
    // −0.2 ⇒ SSE = 2.4, s² = 0.8; SE(slope) = √(0.8/10), SE(intercept) = √(0.8·(1/5 + 9/10)), cov = −x̄·s²/Sxx
    const line = weightedLine(f64([1, 2, 3, 4, 5]), f64([2, 4, 5, 4, 5]), null, null);
    expectRelClose(line.slope, 0.6, 1e-14);
    expectRelClose(line.intercept, 2.2, 1e-14);
    expectRelClose(line.slopeError, Math.sqrt(0.08), 1e-14);
    expectRelClose(line.interceptError, Math.sqrt(0.88), 1e-14);
    expectRelClose(line.covarianceInterceptSlope, -0.24, 1e-14);
    expectRelClose(line.weightedResidualSumOfSquares, 2.4, 1e-14);
  });

  it('weightedLine(NIST Norris) matches the certified coefficients and standard deviations', () => {
    const line = weightedLine(f64(NORRIS_X), f64(NORRIS_Y), null, null);
    // NIST StRD Norris certified values: B1 1.00211681802045 (sd 0.429796848199937E-03),
    // B0 −0.262323073774029 (sd 0.232818234301152), residual sd 0.884796396144373
    // (log relative errors in digits, capped at 11)
    expect(logRelativeError(line.slope, 1.00211681802045)).toBeGreaterThanOrEqual(11);
    expect(logRelativeError(line.intercept, -0.262323073774029)).toBeGreaterThanOrEqual(11);
    expect(logRelativeError(line.slopeError, 0.429796848199937e-3)).toBeGreaterThanOrEqual(11);
    expect(logRelativeError(line.interceptError, 0.232818234301152)).toBeGreaterThanOrEqual(11);
    expect(logRelativeError(Math.sqrt(line.weightedResidualSumOfSquares / (line.count - 2)), 0.884796396144373)).toBeGreaterThanOrEqual(11);
    // GSL's Norris test (gsl_fit_linear): cov(B0, B1) = −7.74327536339570e-05 (derived, not certified)
    expectRelClose(line.covarianceInterceptSlope, -7.7432753633957e-5, 1e-9);
  });

  it('weightedLine(integer weights) gives the line of the data with each point repeated weight times', () => {
    // Weighted least squares with w_i = n_i equals ordinary least squares on n_i copies [textbook]
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.integer({ min: -50, max: 50 }), fc.integer({ min: -1000, max: 1000 }), fc.integer({ min: 1, max: 5 })), { minLength: 3, maxLength: 30 }),
        (points) => {
          fc.pre(new Set(points.map(([x]) => x)).size >= 2);
          const weighted = weightedLine(
            Float64Array.from(points, ([x]) => x),
            Float64Array.from(points, ([, y]) => y),
            Float64Array.from(points, ([, , w]) => w),
            null,
          );
          const repeated = points.flatMap(([x, y, w]) => Array.from({ length: w }, () => [x, y]));
          const plain = weightedLine(
            Float64Array.from(repeated, ([x]) => x),
            Float64Array.from(repeated, ([, y]) => y),
            null,
            null,
          );
          expect(weighted.slope).toBeCloseTo(plain.slope, 9);
          expect(weighted.intercept).toBeCloseTo(plain.intercept, 7);
          expect(weighted.weightedResidualSumOfSquares).toBeCloseTo(plain.weightedResidualSumOfSquares, 4);
        },
      ),
      { seed: 42, numRuns: 200 },
    );
  });

  it('weightedLine(weights × c) leaves the line and its errors unchanged (the scale comes from the scatter)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.integer({ min: -100, max: 100 }), fc.integer({ min: -1000, max: 1000 }), fc.double({ min: 0.1, max: 10, noNaN: true })), {
          minLength: 4,
          maxLength: 30,
        }),
        fc.double({ min: 1e-3, max: 1e3, noNaN: true }),
        (points, factor) => {
          fc.pre(new Set(points.map(([x]) => x)).size >= 3);
          const x = Float64Array.from(points, ([value]) => value);
          const y = Float64Array.from(points, ([, value]) => value);
          const w = Float64Array.from(points, ([, , value]) => value);
          const a = weightedLine(x, y, w, null);
          fc.pre(a.weightedResidualSumOfSquares > 1e-6);
          const b = weightedLine(x, y, Float64Array.from(w, (value) => value * factor), null);
          expect(Math.abs(b.slope - a.slope)).toBeLessThanOrEqual(1e-9 * (Math.abs(a.slope) + a.slopeError));
          expect(Math.abs(b.intercept - a.intercept)).toBeLessThanOrEqual(1e-9 * (Math.abs(a.intercept) + a.interceptError));
          expectRelClose(b.slopeError, a.slopeError, 1e-8);
          expectRelClose(b.interceptError, a.interceptError, 1e-8);
        },
      ),
      { seed: 7, numRuns: 200 },
    );
  });

  it('weightedLine(mask, from, to) fits only the selected points', () => {
    const x = f64([0, 1, 2, 3, 4, 5, 6, 7]);
    const y = f64([9, 1, 3, 5, 7, -4, 11, 13]);
    // mask out the two outliers (indices 0 and 5): the rest lie on y = 2x − 1
    const mask = Uint8Array.from([0, 1, 1, 1, 1, 0, 1, 1]);
    const masked = weightedLine(x, y, null, mask);
    expect(masked.count).toBe(6);
    expectRelClose(masked.slope, 2, 1e-14);
    expectRelClose(masked.intercept, -1, 1e-14);
    const ranged = weightedLine(x, y, null, null, 1, 5);
    expect(ranged.count).toBe(4);
    expectRelClose(ranged.slope, 2, 1e-14);
    const two = weightedLine(f64([0, 1]), f64([0, 1]), null, null);
    expect(Number.isNaN(two.slopeError)).toBe(true);
  });
});

describe('polynomialFit', () => {
  it('polynomialFit(exact cubic) recovers its coefficients', () => {
    const coefficients = [0.5, -2, 0.25, 3];
    const x = Float64Array.from({ length: 40 }, (_, i) => -1 + (2 * i) / 39);
    const y = Float64Array.from(x, (value) => polynomialValue(f64(coefficients), value));
    const fit = polynomialFit(x, y, 3);
    for (let k = 0; k < 4; k++) expect(fit.coefficients[k]).toBeCloseTo(coefficients[k], 12);
    expect(fit.residualStandardDeviation).toBeLessThan(1e-13);
  });

  it('polynomialFit(degree 5, an I(V)-like quintic in A over ±1 V) recovers the coefficients to 1e-9', () => {
    const coefficients = [0, 1e-9, -5e-11, 3e-10, 2e-12, 4e-11];
    const x = Float64Array.from({ length: 512 }, (_, i) => -1 + (2 * i) / 511);
    const fit = polynomialFit(x, Float64Array.from(x, (value) => polynomialValue(f64(coefficients), value)), 5);
    for (let k = 1; k < 6; k++) expectRelClose(fit.coefficients[k], coefficients[k], 1e-9);
    expect(Math.abs(fit.coefficients[0])).toBeLessThan(1e-22);
  });

  it('polynomialFit(degree 1) equals weightedLine, with its covariance', () => {
    const fit = polynomialFit(f64(NORRIS_X), f64(NORRIS_Y), 1);
    const line = weightedLine(f64(NORRIS_X), f64(NORRIS_Y), null, null);
    expectRelClose(fit.coefficients[0], line.intercept, 1e-11);
    expectRelClose(fit.coefficients[1], line.slope, 1e-13);
    const [interceptError, slopeError] = standardErrors(fit.covariance, 2);
    expectRelClose(interceptError, line.interceptError, 1e-10);
    expectRelClose(slopeError, line.slopeError, 1e-10);
    expectRelClose(fit.covariance[1], line.covarianceInterceptSlope, 1e-10);
  });

  it('polynomialFit(NIST Pontius, quadratic) matches the certified coefficients and standard deviations', () => {
    const fit = polynomialFit(f64(PONTIUS_X), f64(PONTIUS_Y), 2);
    // NIST StRD Pontius certified values: B0 0.673565789473684E-03 (sd 0.107938612033077E-03),
    // B1 0.732059160401003E-06 (sd 0.157817399981659E-09), B2 −0.316081871345029E-14
    // (sd 0.486652849992036E-16), residual sd 0.205177424076185E-03
    const certified = [0.673565789473684e-3, 0.732059160401003e-6, -0.316081871345029e-14];
    const certifiedErrors = [0.107938612033077e-3, 0.157817399981659e-9, 0.486652849992036e-16];
    const errors = standardErrors(fit.covariance, 3);
    for (let k = 0; k < 3; k++) {
      expect(logRelativeError(fit.coefficients[k], certified[k]), `B${k}`).toBeGreaterThanOrEqual(9);
      expect(logRelativeError(errors[k], certifiedErrors[k]), `sd B${k}`).toBeGreaterThanOrEqual(9);
    }
    expect(logRelativeError(fit.residualStandardDeviation, 0.205177424076185e-3)).toBeGreaterThanOrEqual(9);
  });

  it('polynomialFit(NIST Wampler1 and Wampler3, degree 5) matches the certified values to ≥ 6 digits', () => {
    // NIST StRD Wampler1: y = 1 + x + x² + x³ + x⁴ + x⁵ exactly on x = 0…20, every certified B = 1, sd 0
    const wampler1 = polynomialFit(WAMPLER_X, Float64Array.from(WAMPLER_X, (x) => 1 + x + x ** 2 + x ** 3 + x ** 4 + x ** 5), 5);
    for (let k = 0; k < 6; k++) expect(logRelativeError(wampler1.coefficients[k], 1), `Wampler1 B${k}`).toBeGreaterThanOrEqual(6);
    // NIST StRD Wampler3: every certified B = 1, sd 2152.32624678170, 2363.55173469681, 779.343524331583,
    // 101.475507550350, 5.64566512170752, 0.112324854679312
    const wampler3 = polynomialFit(WAMPLER_X, f64(WAMPLER3_Y), 5);
    const certifiedErrors = [2152.3262467817, 2363.55173469681, 779.343524331583, 101.47550755035, 5.64566512170752, 0.112324854679312];
    const errors = standardErrors(wampler3.covariance, 6);
    for (let k = 0; k < 6; k++) {
      expect(logRelativeError(wampler3.coefficients[k], 1), `Wampler3 B${k}`).toBeGreaterThanOrEqual(6);
      expect(logRelativeError(errors[k], certifiedErrors[k]), `Wampler3 sd B${k}`).toBeGreaterThanOrEqual(9);
    }
  });

  it('polynomialFit(degree ≥ points − 1) throws naming the function and the count', () => {
    expect(() => polynomialFit(f64([0, 1, 2]), f64([1, 2, 5]), 2)).toThrow('polynomialFit: needs more than 3 points for degree 2, got 3');
  });

  it('polynomialValue evaluates by Horner and invertSymmetric inverts a small SPD matrix', () => {
    expect(polynomialValue(f64([1, -3, 2]), 2)).toBe(3);
    expect(polynomialValue(f64([]), 2)).toBe(0);
    const matrix = f64([4, 1, 0.5, 1, 3, 0.2, 0.5, 0.2, 2]);
    const inverse = invertSymmetric(matrix, 3);
    for (let r = 0; r < 3; r++) {
      for (let c = 0; c < 3; c++) {
        let sum = 0;
        for (let k = 0; k < 3; k++) sum += matrix[r * 3 + k] * inverse[k * 3 + c];
        expect(sum).toBeCloseTo(r === c ? 1 : 0, 14);
      }
    }
  });
});

describe('selectMedian and selectKth', () => {
  function sortedMedian(values: number[]): number {
    const sorted = [...values].sort((a, b) => a - b);
    const middle = sorted.length >> 1;
    return sorted.length % 2 ? sorted[middle] : 0.5 * (sorted[middle - 1] + sorted[middle]);
  }

  it('selectMedian(random arrays) equals the median of the sorted array', () => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: -1e6, max: 1e6, noNaN: true }), { minLength: 1, maxLength: 200 }), (values) => {
        expect(selectMedian(Float64Array.from(values), values.length)).toBe(sortedMedian(values));
      }),
      { seed: 1, numRuns: 500 },
    );
  });

  it('selectMedian(arrays with many ties) equals the sorted median', () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: -3, max: 3 }), { minLength: 1, maxLength: 100 }), (values) => {
        expect(selectMedian(Float64Array.from(values), values.length)).toBe(sortedMedian(values));
      }),
      { seed: 2, numRuns: 500 },
    );
  });

  it('selectMedian(values, count) uses only the first count entries, reordering just those', () => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: -1e3, max: 1e3, noNaN: true }), { minLength: 2, maxLength: 100 }), fc.nat(), (drawn, pick) => {
        // −0 + 0 = +0: keeps the permutation check free of signed zeros, which sort as equal
        const values = drawn.map((value) => value + 0);
        const count = 1 + (pick % values.length);
        const array = Float64Array.from(values);
        expect(selectMedian(array, count)).toBe(sortedMedian(values.slice(0, count)));
        // the first count entries are a permutation of the originals; the rest are untouched
        expect(Array.from(array.subarray(0, count)).sort((a, b) => a - b)).toEqual(values.slice(0, count).sort((a, b) => a - b));
        expect(Array.from(array.subarray(count))).toEqual(values.slice(count));
      }),
      { seed: 3, numRuns: 300 },
    );
  });

  it('selectKth(values, count, k) is the k-th smallest for every k', () => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: -1e3, max: 1e3, noNaN: true }), { minLength: 1, maxLength: 60 }), (values) => {
        const sorted = [...values].sort((a, b) => a - b);
        for (let k = 0; k < values.length; k++) expect(selectKth(Float64Array.from(values), values.length, k)).toBe(sorted[k]);
      }),
      { seed: 4, numRuns: 200 },
    );
  });

  it('selectMedian(count 0) is NaN and the doc example gives 3', () => {
    expect(Number.isNaN(selectMedian(new Float64Array(4), 0))).toBe(true);
    expect(selectMedian(f64([5, 1, 3]), 3)).toBe(3);
  });

  function sum(values: ArrayLike<number>): number {
    let total = 0;
    for (let i = 0; i < values.length; i++) total += values[i];
    return total;
  }

  it('selectMedianOfMagnitudes(|normal| samples of 5–400) equals selectMedian, the bracket holding or not', () => {
    const random = mulberry32(11);
    const scratch = new Float64Array(400);
    for (let trial = 0; trial < 400; trial++) {
      const count = 5 + Math.floor(random() * 396);
      // a scale that changes midway makes the 0.845 × mean guess miss now and then
      const values = Float64Array.from({ length: count }, (_, i) => Math.abs(gaussian(random)) * (i < count * random() ? 1 : 1 + 3 * random()));
      const expected = selectMedian(Float64Array.from(values), count);
      expect(selectMedianOfMagnitudes(Float64Array.from(values), count, sum(values), scratch)).toBe(expected);
    }
  });

  it('selectMedianOfMagnitudes(any values, any sum) equals selectMedian: ties, signs, ±∞, NaN, wrong sums', () => {
    const entry = fc.oneof(fc.double({ min: -1e3, max: 1e3, noNaN: true }), fc.integer({ min: 0, max: 3 }), fc.constantFrom(Infinity, -Infinity, Number.NaN));
    fc.assert(
      fc.property(fc.array(entry, { minLength: 1, maxLength: 120 }), fc.oneof(fc.constant(null), fc.double()), (values, claimedSum) => {
        const array = Float64Array.from(values);
        const expected = selectMedian(Float64Array.from(values), values.length);
        const actual = selectMedianOfMagnitudes(array, values.length, claimedSum ?? sum(values), new Float64Array(values.length));
        expect(Object.is(actual, expected) || (Number.isNaN(actual) && Number.isNaN(expected))).toBe(true);
      }),
      { seed: 5, numRuns: 1000 },
    );
  });

  it('selectMedianOfMagnitudes leaves the values in place when the bracket holds, and the doc example gives 3', () => {
    const random = mulberry32(12);
    const values = Float64Array.from({ length: 200 }, () => Math.abs(gaussian(random)));
    const original = Float64Array.from(values);
    expect(selectMedianOfMagnitudes(values, 200, sum(values), new Float64Array(200))).toBe(selectMedian(Float64Array.from(original), 200));
    expect(values).toEqual(original);
    expect(selectMedianOfMagnitudes(f64([5, 1, 3]), 3, 9, new Float64Array(3))).toBe(3);
  });
});
