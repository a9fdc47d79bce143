/**
 * The friendly fitting layer: named parameters in, named results out. The model is a pure function
 * of ALL parameters (fixed ones included); this layer holds the fixed ones, hands only the varying
 * ones to the solver, and builds residuals (measured − model) × weight.
 */
import type { FittedParameter, Parameter } from './parameters.ts';
import { robustLevenbergMarquardt, type RobustLoss } from './robust.ts';
import {
  createSolver,
  type LeastSquaresProblem,
  type LevenbergMarquardtSolver,
  type SolverOptions,
  type SolverResult,
} from './solver.ts';

/** Solver options that fitModel forwards unchanged (bounds and names come from the parameters). */
export type FitSolverOptions = Omit<SolverOptions, 'lower' | 'upper' | 'parameterNames'>;

/** Input of {@link fitModel}. */
export interface FitModelInput extends FitSolverOptions {
  /** All model parameters, in the order `evaluate` and `jacobian` use. */
  parameters: readonly Parameter[];
  /** Number of data points n (≥ number of varying parameters). */
  nPoints: number;
  /** Writes the model at every point into out (length nPoints), given every parameter's value. */
  evaluate(paramsFull: Float64Array, out: Float64Array): void;
  /**
   * Optional analytic Jacobian of the MODEL (not the residual) with respect to ALL parameters:
   * writes ∂model_i/∂param_j at out[i · parameters.length + j] (row-major). The layer picks the
   * columns of the varying parameters and applies −weight.
   */
  jacobian?(paramsFull: Float64Array, outRowMajor: Float64Array): void;
  /** Measured values, one per point, in the model's unit. */
  measured: ArrayLike<number>;
  /** Residual weights (typically 1/σ_i), one per point, finite and ≥ 0; default 1. */
  weights?: ArrayLike<number>;
  /** Robust loss; default 'linear' (ordinary least squares). See robust.ts. */
  loss?: RobustLoss;
  /** Loss scale in weighted-residual units (robust losses only). */
  lossScale?: number;
  /** Reuse a workspace from createSolver(number of varying parameters, nPoints). */
  solver?: LevenbergMarquardtSolver;
}

/**
 * Result of {@link fitModel}: the solver result (params, covariance, stderr, correlation, atBound
 * over the varying parameters, in `freeNames` order) plus one entry per parameter and the model
 * at the best fit.
 */
export interface FitModelResult extends SolverResult {
  /** Every parameter, in input order, with value, stderr (NaN if fixed), atBound and correlations. */
  parameters: FittedParameter[];
  /** Names of the varying parameters: the order of params, covariance and correlation. */
  freeNames: string[];
  /** The model evaluated at the fitted parameters, one value per point. */
  bestFit: Float64Array;
  loss: RobustLoss;
  /** Loss scale used (robust losses only; NaN for 'linear'). */
  lossScale: number;
  /** IRLS weights (robust losses only; all 1 for 'linear'). */
  robustWeights: Float64Array;
}

/**
 * Fit a model to data by (robust) Levenberg–Marquardt with named, boundable, fixable parameters.
 * Residual_i = (measured_i − model_i(params)) · weight_i; χ² = Σ residual_i². Fixed parameters
 * (vary: false) are held at their value. Each varying parameter is boxed by its [min, max].
 * Source: Moré (1978) for the solver (see solver.ts); the layer follows lmfit's Model/Parameters
 * design (M. Newville et al., lmfit documentation; from memory).
 * @example
 * // y = amplitude · exp(−decayPerNm · gapNm), decayPerNm fitted, amplitude fixed at 2
 * const fit = fitModel({
 *   parameters: [makeParameter({ name: 'amplitude', value: 2, vary: false }),
 *                makeParameter({ name: 'decayPerNm', value: 5, min: 0 })],
 *   nPoints: gapNm.length, measured: currentNA,
 *   evaluate: (p, out) => { for (let i = 0; i < out.length; i++) out[i] = p[0] * Math.exp(-p[1] * gapNm[i]); },
 * });
 * fit.parameters[1].value // the fitted decay constant, in 1/nm
 */
export function fitModel(input: FitModelInput): FitModelResult {
  const where = 'fitModel';
  const { parameters, nPoints, evaluate, jacobian, measured, weights, loss = 'linear', lossScale, solver: given, ...solverOptions } = input;
  if (!Array.isArray(parameters) || parameters.length === 0) {
    throw new RangeError(`${where}: parameters must be a non-empty array, got ${Array.isArray(parameters) ? 0 : typeof parameters}`);
  }
  if (!Number.isInteger(nPoints) || nPoints < 1) {
    throw new RangeError(`${where}: nPoints must be an integer ≥ 1, got ${nPoints}`);
  }
  if (measured.length !== nPoints) {
    throw new RangeError(`${where}: measured must have nPoints (${nPoints}) entries, got ${measured.length}`);
  }
  if (weights !== undefined) {
    if (weights.length !== nPoints) {
      throw new RangeError(`${where}: weights must have nPoints (${nPoints}) entries, got ${weights.length}`);
    }
    for (let i = 0; i < nPoints; i++) {
      if (!(weights[i] >= 0 && Number.isFinite(weights[i]))) {
        throw new RangeError(`${where}: weights[${i}] must be finite and ≥ 0, got ${weights[i]}`);
      }
    }
  }
  const nAll = parameters.length;
  const names = new Set<string>();
  const freeIndex: number[] = [];
  for (let j = 0; j < nAll; j++) {
    const parameter = parameters[j];
    if (names.has(parameter.name)) {
      throw new RangeError(`${where}: parameter names must be unique, got ${parameter.name} twice`);
    }
    names.add(parameter.name);
    if (!(parameter.min < parameter.max) || parameter.value < parameter.min || parameter.value > parameter.max) {
      throw new RangeError(
        `${where}: parameter ${parameter.name} must satisfy min < max and min ≤ value ≤ max, got min ${parameter.min}, value ${parameter.value}, max ${parameter.max}`,
      );
    }
    if (parameter.vary) freeIndex.push(j);
  }
  const nFree = freeIndex.length;
  if (nFree === 0) {
    throw new RangeError(`${where}: at least one parameter must have vary: true, got 0 of ${nAll}`);
  }
  if (nPoints < nFree) {
    throw new RangeError(`${where}: nPoints must be ≥ the number of varying parameters (${nFree}), got ${nPoints}`);
  }
  if (given && (given.nParams !== nFree || given.nResiduals !== nPoints)) {
    throw new RangeError(
      `${where}: solver must be sized ${nFree} params × ${nPoints} points, got ${given.nParams} × ${given.nResiduals}`,
    );
  }

  // Buffers for this fit, allocated once.
  const paramsFull = new Float64Array(nAll);
  for (let j = 0; j < nAll; j++) paramsFull[j] = parameters[j].value;
  const modelValues = new Float64Array(nPoints);
  const modelJacobian = jacobian ? new Float64Array(nPoints * nAll) : null;
  const weightOf = (i: number): number => (weights === undefined ? 1 : weights[i]);

  const problem: LeastSquaresProblem = {
    nParams: nFree,
    nResiduals: nPoints,
    residuals(params, out) {
      for (let l = 0; l < nFree; l++) paramsFull[freeIndex[l]] = params[l];
      evaluate(paramsFull, modelValues);
      for (let i = 0; i < nPoints; i++) out[i] = (measured[i] - modelValues[i]) * weightOf(i);
    },
    jacobian:
      jacobian && modelJacobian
        ? (params, outRowMajor) => {
            for (let l = 0; l < nFree; l++) paramsFull[freeIndex[l]] = params[l];
            jacobian(paramsFull, modelJacobian);
            for (let i = 0; i < nPoints; i++) {
              const factor = -weightOf(i);
              for (let l = 0; l < nFree; l++) outRowMajor[i * nFree + l] = factor * modelJacobian[i * nAll + freeIndex[l]];
            }
          }
        : undefined,
  };

  const freeNames = freeIndex.map((j) => parameters[j].name);
  const start = freeIndex.map((j) => parameters[j].value);
  const options: SolverOptions = {
    ...solverOptions,
    lower: freeIndex.map((j) => parameters[j].min),
    upper: freeIndex.map((j) => parameters[j].max),
    parameterNames: freeNames,
  };
  const solver = given ?? createSolver(nFree, nPoints);

  let result: SolverResult;
  let usedScale = NaN;
  let robustWeights: Float64Array;
  if (loss === 'linear') {
    result = solver.solve(problem, start, options);
    robustWeights = new Float64Array(nPoints).fill(1);
  } else {
    const robust = robustLevenbergMarquardt(problem, start, { ...options, loss, lossScale, solver });
    result = robust;
    usedScale = robust.lossScale;
    robustWeights = robust.robustWeights;
  }

  for (let l = 0; l < nFree; l++) paramsFull[freeIndex[l]] = result.params[l];
  const bestFit = new Float64Array(nPoints);
  evaluate(paramsFull, bestFit);

  const fitted: FittedParameter[] = [];
  for (let j = 0; j < nAll; j++) {
    const parameter = parameters[j];
    const local = freeIndex.indexOf(j);
    if (local < 0) {
      fitted.push({ ...parameter, stderr: NaN, atBound: null, correlations: {} });
      continue;
    }
    const correlations: Record<string, number> = {};
    for (let other = 0; other < nFree; other++) {
      if (other !== local) correlations[freeNames[other]] = result.correlation[local * nFree + other];
    }
    fitted.push({
      ...parameter,
      value: result.params[local],
      stderr: result.stderr[local],
      atBound: result.atBound[local],
      correlations,
    });
  }

  return {
    ...result,
    parameters: fitted,
    freeNames,
    bestFit,
    loss,
    lossScale: usedScale,
    robustWeights,
  };
}
