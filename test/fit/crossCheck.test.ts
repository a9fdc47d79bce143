/**
 * The fits against general-purpose reference libraries from npm: ml-levenberg-marquardt (mljs) on
 * the same weighted I(V) least-squares problems, and simple-statistics' linearRegression on lines.
 * Each library gets the plain physics functions (physics/index.ts) and the same start, so a
 * disagreement points at a solver or at fitSpectrum's reparameterisation, not at the model.
 */
import fc from 'fast-check';
import { levenbergMarquardt as referenceLevenbergMarquardt } from 'ml-levenberg-marquardt';
import { linearRegression } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { levenbergMarquardt, mulberry32, gaussian, type LeastSquaresProblem } from '../../src/fit/index.ts';
import { fitSpectrum } from '../../src/fit/spectrumFit.ts';
import { weightedLine } from '../../src/fit/weightedLine.ts';
import {
  currentDensityModels,
  paraboloidTipAreaM2,
  simmonsDissimilarCurrentDensity,
  simulateCurve,
  trapezoidCurrentDensityWithGradient,
  type Junction,
} from '../../src/physics/index.ts';
import { expectRelClose } from '../helpers.ts';

const FERMI_ENERGY_EV = 5.5;
const TEMPERATURE_K = 300;
const TIP_RADIUS_M = 10e-9;
const ANGSTROM_M = 1e-10;

function noisySpectrum(junction: Junction, density: (junction: Junction, biasV: number, temperatureK: number) => number, area: { tipRadiusM: number } | { areaM2: number }, seed: number) {
  const simulation = simulateCurve({
    kind: 'iv',
    junction,
    currentDensity: density,
    area,
    temperatureK: TEMPERATURE_K,
    biasV: 0,
    sweep: { from: -1, to: 1, points: 256 },
    noise: { relative: 0.01, floorA: 2e-12, seed },
  });
  return {
    biasV: Float64Array.from(simulation.points, (p) => p.biasV),
    currentA: Float64Array.from(simulation.points, (p) => p.currentA),
  };
}

/**
 * A weighted model as ml-levenberg-marquardt wants it: x is the point index, y_i = I_i·w_i and the
 * model returns A·J_i·w_i, so its unweighted squared error is our χ² (the library's own `weights`
 * option is left at 1). Values are cached per parameter vector; both solvers share them.
 */
function weightedModel(nPoints: number, evaluate: (params: ArrayLike<number>, model: Float64Array, jacobian: Float64Array) => void, nParams: number) {
  const model = new Float64Array(nPoints);
  const jacobian = new Float64Array(nPoints * nParams);
  let cachedAt: number[] = [];
  const update = (params: ArrayLike<number>) => {
    if (cachedAt.length === nParams && cachedAt.every((value, k) => value === params[k])) return;
    evaluate(params, model, jacobian);
    cachedAt = Array.from(params);
  };
  return {
    /** For ml-levenberg-marquardt: params → (index → weighted model). */
    parameterizedFunction: (params: number[]) => {
      update(params);
      const values = Float64Array.from(model);
      return (index: number) => values[index];
    },
    /** For ml-levenberg-marquardt: params → (index → ∂(weighted model)/∂params). */
    jacobianFunction: (params: number[]) => {
      update(params);
      const values = Float64Array.from(jacobian);
      return (index: number) => Array.from(values.subarray(index * nParams, (index + 1) * nParams));
    },
    /** The same problem for our solver: residual y − model, Jacobian −∂model. */
    problem(weightedCurrent: Float64Array): LeastSquaresProblem {
      return {
        nParams,
        nResiduals: nPoints,
        residuals(params, out) {
          update(params);
          for (let i = 0; i < nPoints; i++) out[i] = weightedCurrent[i] - model[i];
        },
        jacobian(params, out) {
          update(params);
          for (let k = 0; k < out.length; k++) out[k] = -jacobian[k];
        },
      };
    },
  };
}

describe('cross-check against ml-levenberg-marquardt (mljs, npm reference library)', () => {
  it('WKB I(V), area from a 10 nm tip: ml-levenberg-marquardt, levenbergMarquardt and fitSpectrum reach the same optimum', () => {
    const junction: Junction = { tipWorkFunctionEV: 4.0, sampleWorkFunctionEV: 4.6, gapM: 0.6e-9, fermiEnergyEV: FERMI_ENERGY_EV };
    const spectrum = noisySpectrum(junction, currentDensityModels.wkb, { tipRadiusM: TIP_RADIUS_M }, 7);
    const fitted = fitSpectrum({ ...spectrum, temperatureK: TEMPERATURE_K, fermiEnergyEV: FERMI_ENERGY_EV, area: { mode: 'tip-radius', tipRadiusM: TIP_RADIUS_M } });
    const weights = fitted.weights;
    const n = spectrum.biasV.length;
    // Parameters (φ1 eV, φ2 eV, d Å), all O(1) as the library's unscaled damping prefers.
    // A = πR/κ(φ̄) (physics.md §9) ⇒ ∂ln A/∂φ1 = ∂ln A/∂φ2 = −1/(4φ̄).
    const gradient = new Float64Array(3);
    const model = weightedModel(
      n,
      (params, values, jacobian) => {
        const [tip, sample, widthA] = [params[0], params[1], params[2]];
        const trial: Junction = { tipWorkFunctionEV: tip, sampleWorkFunctionEV: sample, gapM: widthA * ANGSTROM_M, fermiEnergyEV: FERMI_ENERGY_EV };
        const mean = (tip + sample) / 2;
        const area = paraboloidTipAreaM2(TIP_RADIUS_M, mean);
        for (let i = 0; i < n; i++) {
          const density = trapezoidCurrentDensityWithGradient(trial, spectrum.biasV[i], TEMPERATURE_K, gradient);
          const w = weights[i];
          values[i] = area * density * w;
          jacobian[3 * i] = w * area * (gradient[0] - density / (4 * mean));
          jacobian[3 * i + 1] = w * area * (gradient[1] - density / (4 * mean));
          jacobian[3 * i + 2] = w * area * gradient[2] * ANGSTROM_M;
        }
      },
      3,
    );
    const weightedCurrent = Float64Array.from(spectrum.currentA, (current, i) => current * weights[i]);
    const start = [3.6, 4.2, 6.5];
    const lower = [0.5, 0.5, 2];
    const upper = [12, 12, 30];
    const reference = referenceLevenbergMarquardt({ x: Array.from({ length: n }, (_, i) => i), y: Array.from(weightedCurrent) }, model.parameterizedFunction, {
      initialValues: start,
      jacobianFunction: model.jacobianFunction,
      minValues: lower,
      maxValues: upper,
      maxIterations: 100,
      errorTolerance: 1e-10,
    });
    const ours = levenbergMarquardt(model.problem(weightedCurrent), start, { lower, upper });
    expect(ours.converged).toBe(true);
    // same χ² (the library's parameterError is Σ of squared residuals)
    expectRelClose(reference.parameterError, ours.chiSquare, 1e-6);
    for (let k = 0; k < 3; k++) {
      expect(Math.abs(reference.parameterValues[k] - ours.params[k]), `parameter ${k}`).toBeLessThanOrEqual(0.1 * ours.stderr[k]);
    }
    // fitSpectrum (log parameters, its own start, its sweep cache) lands on the same optimum
    expectRelClose(fitted.wkb.chiSquare, ours.chiSquare, 1e-6);
    expect(Math.abs(fitted.wkb.tipWorkFunctionEV - ours.params[0])).toBeLessThanOrEqual(0.1 * ours.stderr[0]);
    expect(Math.abs(fitted.wkb.sampleWorkFunctionEV - ours.params[1])).toBeLessThanOrEqual(0.1 * ours.stderr[1]);
    expect(Math.abs(fitted.wkb.widthM / ANGSTROM_M - ours.params[2])).toBeLessThanOrEqual(0.1 * ours.stderr[2]);
    // and both report the same uncertainties (linear propagation from log parameters)
    expectRelClose(fitted.wkb.tipWorkFunctionErrorEV, ours.stderr[0], 1e-3);
    expectRelClose(fitted.wkb.widthErrorM / ANGSTROM_M, ours.stderr[2], 1e-3);
  });

  it('Simmons I(V), fixed area: ml-levenberg-marquardt (central differences) and fitSpectrum reach the same optimum', () => {
    // Simmons' intermediate formula, symmetric barrier, β = 1 (J. Appl. Phys. 34, 1793 (1963))
    const simmons = (junction: Junction, biasV: number) => simmonsDissimilarCurrentDensity(junction, biasV, { useBeta: false });
    const junction: Junction = { tipWorkFunctionEV: 4.2, sampleWorkFunctionEV: 4.2, gapM: 0.6e-9, fermiEnergyEV: FERMI_ENERGY_EV };
    const areaM2 = 2e-18;
    const spectrum = noisySpectrum(junction, simmons, { areaM2 }, 3);
    const fitted = fitSpectrum({ ...spectrum, temperatureK: TEMPERATURE_K, fermiEnergyEV: FERMI_ENERGY_EV, area: { mode: 'fixed', areaM2 } });
    const weights = fitted.weights;
    const n = spectrum.biasV.length;
    const modelFor = ([barrierEV, widthA]: number[]) => {
      const trial: Junction = { tipWorkFunctionEV: barrierEV, sampleWorkFunctionEV: barrierEV, gapM: widthA * ANGSTROM_M, fermiEnergyEV: FERMI_ENERGY_EV };
      const values = Float64Array.from(spectrum.biasV, (biasV, i) => (biasV === 0 ? 0 : areaM2 * simmons(trial, biasV) * weights[i]));
      return (index: number) => values[index];
    };
    const reference = referenceLevenbergMarquardt(
      { x: Array.from({ length: n }, (_, i) => i), y: Array.from(spectrum.currentA, (current, i) => current * weights[i]) },
      modelFor,
      { initialValues: [3.5, 6.5], centralDifference: true, gradientDifference: 1e-6, minValues: [0.5, 2], maxValues: [12, 30], maxIterations: 100, errorTolerance: 1e-10 },
    );
    const estimate = fitted.simmons;
    expect(estimate.converged).toBe(true);
    expectRelClose(reference.parameterError, estimate.chiSquare, 1e-6);
    expect(Math.abs(reference.parameterValues[0] - estimate.meanBarrierEV)).toBeLessThanOrEqual(0.1 * estimate.meanBarrierErrorEV);
    expect(Math.abs(reference.parameterValues[1] - estimate.widthM / ANGSTROM_M)).toBeLessThanOrEqual((0.1 * estimate.widthErrorM) / ANGSTROM_M);
  });
});

describe('cross-check against simple-statistics linearRegression (npm reference library)', () => {
  it('weightedLine(unweighted) equals linearRegression on seeded random lines', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 3, max: 200 }),
        fc.double({ min: -1e3, max: 1e3, noNaN: true }),
        fc.double({ min: -1e3, max: 1e3, noNaN: true }),
        fc.integer({ min: 0, max: 2 ** 31 - 1 }),
        (count, slope, intercept, seed) => {
          const random = mulberry32(seed);
          const x = Float64Array.from({ length: count }, (_, i) => i + random());
          const y = Float64Array.from(x, (value) => intercept + slope * value + 10 * gaussian(random));
          const line = weightedLine(x, y, null, null);
          const reference = linearRegression(Array.from(x, (value, i) => [value, y[i]]));
          const scale = Math.abs(slope) + 10;
          expect(Math.abs(line.slope - reference.m)).toBeLessThanOrEqual(1e-9 * scale);
          expect(Math.abs(line.intercept - reference.b)).toBeLessThanOrEqual(1e-9 * (Math.abs(intercept) + scale * count));
        },
      ),
      { seed: 20240601, numRuns: 200 },
    );
  });
});
