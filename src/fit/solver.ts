/*
 * Levenberg–Marquardt in Moré's scaled trust-region form.
 *
 * Source: J. J. Moré, "The Levenberg–Marquardt algorithm: implementation and theory", in
 * G. A. Watson (ed.), Numerical Analysis, Lecture Notes in Mathematics 630, Springer (1978), pp. 105–116.
 * The same algorithm underlies MINPACK's lmder (Moré, Garbow, Hillstrom, Argonne report ANL-80-74,
 * 1980; from memory). This file is an independent TypeScript implementation of the method as
 * described there; no MINPACK code is used.
 *
 * Problem. Residuals f(p) ∈ Rᵐ (already weighted: (measured − model)·weight), parameters p ∈ Rⁿ,
 * m ≥ n, Jacobian J = ∂f/∂p (m × n). Minimise ½‖f(p)‖².
 *
 * Step. Near p the residuals are f(p + s) ≈ f + J s. With a diagonal scaling D > 0 and a trust
 * radius Δ, the step solves
 *     minimise ‖f + J s‖   subject to   ‖D s‖ ≤ Δ.
 * Its Lagrange condition is (JᵀJ + λ DᵀD) s = −Jᵀf with λ ≥ 0, and λ·(‖D s‖ − Δ) = 0:
 *   • if the Gauss–Newton step s(0) fits (‖D s(0)‖ ≤ Δ), take λ = 0;
 *   • otherwise find λ > 0 with φ(λ) = ‖D s(λ)‖ − Δ = 0. Moré solves this with a safeguarded Newton
 *     iteration on φ (it is convex and decreasing in λ), accepting |φ| ≤ 0.1·Δ, with bounds
 *     l ≤ λ ≤ u from  l = −φ(0)/φ'(0)  (when J has full rank)  and  u = ‖D⁻¹Jᵀf‖/Δ.
 *     φ'(λ) = −‖D s‖⁻¹ · ‖S⁻ᵀ Πᵀ Dᵀ D s‖², where SᵀS = Πᵀ(JᵀJ + λDᵀD)Π.
 * Normal equations are never formed. J is factored once per iteration as J Π = Q R (Householder,
 * column pivoting), and for each trial λ the stacked least-squares problem
 *     minimise ‖ [R; √λ ΠᵀDΠ] z − [Qᵀf; 0] ‖
 * is reduced to triangular form S by Givens rotations, O(n²) per λ. Then s = −Π z.
 *
 * Scaling. D = diag(max over iterations of the column norms of J) (Moré's choice), so the method
 * is invariant to the units of each parameter.
 *
 * Radius update. ρ = actual / predicted relative reduction of ‖f‖²:
 *     actual    = 1 − (‖f(p+s)‖/‖f(p)‖)²
 *     predicted = (‖J s‖² + 2 λ ‖D s‖²) / ‖f‖²      (= 1 − ‖f + J s‖²/‖f‖² at the LM step)
 * ρ ≤ ¼ shrinks Δ (by a factor in [0.1, 0.5] from a quadratic fit along s); ρ ≥ ¾, or λ = 0,
 * sets Δ = 2‖D s‖; the step is accepted when ρ ≥ 1e-4. J is re-evaluated only after acceptance.
 *
 * Stopping (all relative, so unit-free):
 *   ftol  |actual| ≤ functionTolerance and predicted ≤ functionTolerance and ρ ≤ 2
 *   xtol  Δ ≤ stepTolerance · ‖D p‖
 *   gtol  max_j |J_jᵀ f| / (‖J_j‖ ‖f‖) ≤ gradientTolerance   (cosine between f and each column)
 * If a tolerance is set below what rounding allows, the same test with ε = 2.2e-16 in its place
 * ends the run and reports that test (the result is converged to machine precision).
 *
 * Box bounds: active-set projection. At each iteration a parameter sitting on a bound whose
 * gradient component (Jᵀf)_j points out of the box is "active": its column is left out of the
 * trust-region subproblem, so the step does not move it. The step of the remaining "free"
 * parameters is then projected onto the box (clipped). For a clipped step the predicted reduction
 * is recomputed directly from the linear model, 1 − ‖f + J s‖²/‖f‖², so the ratio test stays
 * honest. A parameter that leaves a bound again (gradient pointing inward) rejoins the free set.
 * This keeps the parameters and their meaning untouched (no transform), never evaluates the model
 * outside the box, and leaves the unbounded path identical to Moré's algorithm. At the end,
 * parameters lying on a bound are reported in `atBound`, excluded from the covariance (their
 * uncertainty is undefined) and, when the run converged, give status 'stuck-at-bound'.
 *
 * Uncertainty. After stopping, J is evaluated at the final point. Its columns are scaled to unit
 * norm, factored again with pivoted QR, and Cov = s² (JᵀJ)⁻¹ = s² D⁻¹ R⁻¹ R⁻ᵀ D⁻¹ (permuted back),
 * s² = χ²/(n − p). A pivot |R_kk| ≤ rank tolerance means J is rank-deficient; a column whose effect
 * on the residuals is below √ε of the largest (or of ‖f‖) means a parameter that does nothing.
 * Either makes a converged run 'singular' (not converged) and names the parameters. A condition
 * number of the scaled J above `illConditionLimit` keeps the numbers but sets
 * uncertaintiesOk = false.
 */
import {
  createFiniteDifferenceWork,
  finiteDifferenceJacobian,
  type FiniteDifferenceOptions,
  type JacobianMethod,
} from './finiteDifference.ts';

const MACHINE_EPSILON = 2.220446049250313e-16;
const SMALLEST_NORMAL = 2.2250738585072014e-308;
const SQRT_EPSILON = Math.sqrt(MACHINE_EPSILON);

/**
 * A nonlinear least-squares problem for {@link levenbergMarquardt}.
 * `residuals(p, out)` writes f_i(p) = (measured_i − model_i(p))·weight_i into out (length nResiduals).
 * `jacobian(p, out)`, if given, writes ∂f_i/∂p_j at out[i·nParams + j] (row-major, nResiduals × nParams).
 * Note the sign: this is the derivative of the residual, i.e. −weight·∂model/∂p.
 * Neither function may keep a reference to its arguments. Units: those of the residuals and parameters.
 * @example
 * // fit y = a·x to (1, 2), (2, 4): residual y − a·x
 * const problem = { nParams: 1, nResiduals: 2,
 *   residuals: (p, out) => { out[0] = 2 - p[0] * 1; out[1] = 4 - p[0] * 2; },
 *   jacobian: (p, out) => { out[0] = -1; out[1] = -2; } };
 */
export interface LeastSquaresProblem {
  readonly nParams: number;
  readonly nResiduals: number;
  residuals(params: Float64Array, out: Float64Array): void;
  jacobian?(params: Float64Array, outRowMajor: Float64Array): void;
}

/** Why the solver stopped. Messages live in {@link SOLVER_STATUS}. */
export type SolverStatus =
  | 'converged-ftol'
  | 'converged-xtol'
  | 'converged-gtol'
  | 'converged-zero-residual'
  | 'max-iterations'
  | 'max-evaluations'
  | 'singular'
  | 'stuck-at-bound'
  | 'non-finite';

/**
 * The one table of solver outcomes: for each status, whether it counts as converged and the
 * message shown to people. Details (parameter names, values) are appended after a colon.
 * Source: the termination tests of Moré (1978), plus this project's post-checks.
 * @example SOLVER_STATUS['converged-xtol'].converged // true
 */
export const SOLVER_STATUS: Readonly<Record<SolverStatus, { readonly converged: boolean; readonly message: string }>> = {
  'converged-ftol': {
    converged: true,
    message: 'converged: relative reduction of chi-square below functionTolerance',
  },
  'converged-xtol': {
    converged: true,
    message: 'converged: relative step size below stepTolerance',
  },
  'converged-gtol': {
    converged: true,
    message: 'converged: gradient orthogonal to the residuals within gradientTolerance',
  },
  'converged-zero-residual': {
    converged: true,
    message: 'converged: residuals are zero (exact fit)',
  },
  'max-iterations': {
    converged: false,
    message: 'not converged: maxIterations reached',
  },
  'max-evaluations': {
    converged: false,
    message: 'not converged: maxEvaluations reached',
  },
  singular: {
    converged: false,
    message: 'failed: Jacobian is singular at the end point, the parameters are not determined',
  },
  'stuck-at-bound': {
    converged: true,
    message: 'converged with parameters on a bound: the unconstrained optimum lies outside the box',
  },
  'non-finite': {
    converged: false,
    message: 'failed: residuals or Jacobian not finite',
  },
};

/** Which side of its box a parameter ended on, or null when inside. */
export type BoundSide = 'lower' | 'upper' | null;

/** Options of {@link levenbergMarquardt}; every field is optional. */
export interface SolverOptions {
  /** Lower bounds, one per parameter (−Infinity for none). The start must lie inside. */
  lower?: ArrayLike<number>;
  /** Upper bounds, one per parameter (+Infinity for none). */
  upper?: ArrayLike<number>;
  /** Maximum Jacobian evaluations (outer iterations); default 1000. */
  maxIterations?: number;
  /** Maximum residual evaluations, not counting finite-difference ones; default 200·(nParams + 1) + 1000. */
  maxEvaluations?: number;
  /** Relative reduction test on χ² (MINPACK ftol); default 1e-15. */
  functionTolerance?: number;
  /** Relative step test on ‖D p‖ (MINPACK xtol); default 1e-13. */
  stepTolerance?: number;
  /** Scaled gradient test, cosine of f with each column of J (MINPACK gtol); default 1e-15. */
  gradientTolerance?: number;
  /** Stop with 'converged-zero-residual' when ‖f‖ ≤ this (absolute, residual units); default 0. */
  zeroResidualTolerance?: number;
  /** Finite-difference stencil used when the problem has no jacobian; default 'central'. */
  jacobianMethod?: JacobianMethod;
  /** Relative finite-difference step; default per stencil (see finiteDifference.ts). */
  finiteDifferenceStep?: number;
  /** Initial trust radius as a multiple of ‖D p₀‖ (Moré's "factor"); default 100. */
  initialStepBound?: number;
  /** Names used in messages; default p0, p1, … */
  parameterNames?: readonly string[];
  /** Relative pivot size (of the unit-column R) under which J counts as rank-deficient; default 1e-13. */
  rankTolerance?: number;
  /** Condition number of the column-scaled J above which uncertainties are flagged; default 1e12. */
  illConditionLimit?: number;
}

/**
 * Outcome of a fit. Matrices are row-major Float64Array (nParams × nParams).
 * chiSquare = Σ f_i² (weighted); reducedChiSquare = χ²/(n − p);
 * aic = n ln(χ²/n) + 2p and bic = n ln(χ²/n) + p ln n (the forms lmfit reports; from memory);
 * covariance = χ²/(n − p) · (JᵀJ)⁻¹; stderr = √diag; correlation_ij = cov_ij/(stderr_i stderr_j).
 * Parameters on a bound (atBound ≠ null) get NaN rows in the matrices.
 */
export interface SolverResult {
  params: Float64Array;
  covariance: Float64Array;
  stderr: Float64Array;
  correlation: Float64Array;
  /** Final weighted residuals f(params). */
  residuals: Float64Array;
  chiSquare: number;
  reducedChiSquare: number;
  aic: number;
  bic: number;
  nPoints: number;
  nFree: number;
  /** Residual evaluations for steps (finite-difference ones not included). */
  nEvaluations: number;
  /** Jacobian evaluations (analytic or finite-difference). */
  nJacobianEvaluations: number;
  /** Residual evaluations spent on finite-difference Jacobians (0 with an analytic Jacobian). */
  nFiniteDifferenceEvaluations: number;
  iterations: number;
  status: SolverStatus;
  message: string;
  converged: boolean;
  uncertaintiesOk: boolean;
  /** Empty when uncertaintiesOk, otherwise the reason, naming the parameters. */
  uncertaintyNote: string;
  atBound: BoundSide[];
  /** Estimated 2-norm condition number of J with unit-norm columns (NaN if not computed). */
  conditionNumber: number;
}

/**
 * A reusable solver for problems of one size: every work array is allocated here, once, so that
 * thousands of fits (e.g. 16,384 curves of 512 points × 4 parameters) cost no allocation inside the
 * iteration. Only the result object is new per call.
 */
export interface LevenbergMarquardtSolver {
  readonly nParams: number;
  readonly nResiduals: number;
  /** Same contract as {@link levenbergMarquardt}; problem sizes must equal the solver's. */
  solve(problem: LeastSquaresProblem, start: ArrayLike<number>, options?: SolverOptions): SolverResult;
}

/**
 * Fit a nonlinear least-squares problem by Levenberg–Marquardt (Moré's scaled trust-region form,
 * see the comment at the top of solver.ts), with optional box bounds and finite-difference
 * Jacobian when none is given. Minimises χ² = Σ f_i(p)², f_i = (measured − model)·weight.
 * Not converging is an outcome (status), not an exception; caller mistakes throw.
 * Source: J. J. Moré, Lecture Notes in Math. 630 (1978) 105–116.
 * @example
 * // NIST Misra1a from Start 1 (500, 1e-4) gives b1 ≈ 238.94212918, b2 ≈ 5.5015643181e-4
 * const result = levenbergMarquardt(problem, [500, 1e-4], { parameterNames: ['b1', 'b2'] });
 * result.converged // true
 */
export function levenbergMarquardt(
  problem: LeastSquaresProblem,
  start: ArrayLike<number>,
  options: SolverOptions = {},
): SolverResult {
  return createSolver(problem.nParams, problem.nResiduals).solve(problem, start, options);
}

/**
 * Create a {@link LevenbergMarquardtSolver} for problems with `nParams` parameters and `nResiduals`
 * residuals (counts, nResiduals ≥ nParams ≥ 1). Allocates all work arrays now.
 * Source: Moré (1978) for the method; workspace reuse is common practice, no source.
 * @example
 * const solver = createSolver(4, 512);
 * for (const curve of curves) results.push(solver.solve(problemFor(curve), start));
 */
export function createSolver(nParams: number, nResiduals: number): LevenbergMarquardtSolver {
  if (!Number.isInteger(nParams) || nParams < 1) {
    throw new RangeError(`createSolver: nParams must be an integer ≥ 1, got ${nParams}`);
  }
  if (!Number.isInteger(nResiduals) || nResiduals < nParams) {
    throw new RangeError(`createSolver: nResiduals must be an integer ≥ nParams (${nParams}), got ${nResiduals}`);
  }
  const n = nParams;
  const m = nResiduals;
  const work: Workspace = {
    x: new Float64Array(n),
    xTrial: new Float64Array(n),
    step: new Float64Array(n),
    startCopy: new Float64Array(n),
    f: new Float64Array(m),
    fTrial: new Float64Array(m),
    jacobianRowMajor: new Float64Array(m * n),
    qr: new Float64Array(m * n),
    linearModel: new Float64Array(m),
    qtResidualsWork: new Float64Array(m),
    diag: new Float64Array(n),
    columnNorms: new Float64Array(n),
    gradient: new Float64Array(n),
    freeIndex: new Int32Array(n),
    diagLocal: new Float64Array(n),
    qtResiduals: new Float64Array(n),
    rDiagonal: new Float64Array(n),
    originalColumnNorms: new Float64Array(n),
    pivot: new Int32Array(n),
    stepLocal: new Float64Array(n),
    sDiagonal: new Float64Array(n),
    work1: new Float64Array(n),
    work2: new Float64Array(n),
    work3: new Float64Array(n),
    lowerBound: new Float64Array(n),
    upperBound: new Float64Array(n),
    rInverse: new Float64Array(n * n),
    finiteDifference: createFiniteDifferenceWork(n, m),
  };
  return {
    nParams,
    nResiduals,
    solve(problem, start, options = {}) {
      if (problem.nParams !== n || problem.nResiduals !== m) {
        throw new RangeError(
          `createSolver.solve: problem must be ${n} params × ${m} residuals, got ${problem.nParams} × ${problem.nResiduals}`,
        );
      }
      return solveWithWorkspace(problem, start, options, work);
    },
  };
}

interface Workspace {
  x: Float64Array;
  xTrial: Float64Array;
  step: Float64Array;
  startCopy: Float64Array;
  f: Float64Array;
  fTrial: Float64Array;
  jacobianRowMajor: Float64Array;
  qr: Float64Array;
  linearModel: Float64Array;
  qtResidualsWork: Float64Array;
  diag: Float64Array;
  columnNorms: Float64Array;
  gradient: Float64Array;
  freeIndex: Int32Array;
  diagLocal: Float64Array;
  qtResiduals: Float64Array;
  rDiagonal: Float64Array;
  originalColumnNorms: Float64Array;
  pivot: Int32Array;
  stepLocal: Float64Array;
  sDiagonal: Float64Array;
  work1: Float64Array;
  work2: Float64Array;
  work3: Float64Array;
  lowerBound: Float64Array;
  upperBound: Float64Array;
  rInverse: Float64Array;
  finiteDifference: ReturnType<typeof createFiniteDifferenceWork>;
}

interface ResolvedOptions {
  maxIterations: number;
  maxEvaluations: number;
  functionTolerance: number;
  stepTolerance: number;
  gradientTolerance: number;
  zeroResidualTolerance: number;
  initialStepBound: number;
  rankTolerance: number;
  illConditionLimit: number;
  names: string[];
  hasBounds: boolean;
}

function resolveOptions(nParams: number, options: SolverOptions, work: Workspace, start: ArrayLike<number>): ResolvedOptions {
  const where = 'levenbergMarquardt';
  const positiveInteger = (name: string, value: number | undefined, fallback: number): number => {
    if (value === undefined) return fallback;
    if (!Number.isInteger(value) || value < 1) {
      throw new RangeError(`${where}: ${name} must be an integer ≥ 1, got ${value}`);
    }
    return value;
  };
  const nonNegative = (name: string, value: number | undefined, fallback: number): number => {
    if (value === undefined) return fallback;
    if (!(value >= 0) || !Number.isFinite(value)) {
      throw new RangeError(`${where}: ${name} must be a finite number ≥ 0, got ${value}`);
    }
    return value;
  };
  const positive = (name: string, value: number | undefined, fallback: number): number => {
    if (value === undefined) return fallback;
    if (!(value > 0)) throw new RangeError(`${where}: ${name} must be > 0, got ${value}`);
    return value;
  };
  if (start.length !== nParams) {
    throw new RangeError(`${where}: start must have ${nParams} entries, got ${start.length}`);
  }
  let names: string[];
  if (options.parameterNames) {
    if (options.parameterNames.length !== nParams) {
      throw new RangeError(`${where}: parameterNames must have ${nParams} entries, got ${options.parameterNames.length}`);
    }
    names = [...options.parameterNames];
  } else {
    names = [];
    for (let j = 0; j < nParams; j++) names.push(`p${j}`);
  }
  for (const [label, bounds] of [['lower', options.lower], ['upper', options.upper]] as const) {
    if (bounds !== undefined && bounds.length !== nParams) {
      throw new RangeError(`${where}: ${label} must have ${nParams} entries, got ${bounds.length}`);
    }
  }
  let hasBounds = false;
  for (let j = 0; j < nParams; j++) {
    const value = start[j];
    if (!Number.isFinite(value)) {
      throw new RangeError(`${where}: start[${j}] (${names[j]}) must be finite, got ${value}`);
    }
    const lower = options.lower ? options.lower[j] : -Infinity;
    const upper = options.upper ? options.upper[j] : Infinity;
    if (Number.isNaN(lower) || Number.isNaN(upper) || !(lower < upper)) {
      throw new RangeError(`${where}: lower[${j}] must be < upper[${j}] (${names[j]}), got lower ${lower}, upper ${upper}`);
    }
    if (value < lower || value > upper) {
      throw new RangeError(`${where}: start[${j}] (${names[j]}) must be within [${lower}, ${upper}], got ${value}`);
    }
    work.lowerBound[j] = lower;
    work.upperBound[j] = upper;
    if (lower > -Infinity || upper < Infinity) hasBounds = true;
  }
  return {
    maxIterations: positiveInteger('maxIterations', options.maxIterations, 1000),
    maxEvaluations: positiveInteger('maxEvaluations', options.maxEvaluations, 200 * (nParams + 1) + 1000),
    functionTolerance: nonNegative('functionTolerance', options.functionTolerance, 1e-15),
    stepTolerance: nonNegative('stepTolerance', options.stepTolerance, 1e-13),
    gradientTolerance: nonNegative('gradientTolerance', options.gradientTolerance, 1e-15),
    zeroResidualTolerance: nonNegative('zeroResidualTolerance', options.zeroResidualTolerance, 0),
    initialStepBound: positive('initialStepBound', options.initialStepBound, 100),
    rankTolerance: positive('rankTolerance', options.rankTolerance, 1e-13),
    illConditionLimit: positive('illConditionLimit', options.illConditionLimit, 1e12),
    names,
    hasBounds,
  };
}

function solveWithWorkspace(
  problem: LeastSquaresProblem,
  start: ArrayLike<number>,
  options: SolverOptions,
  work: Workspace,
): SolverResult {
  const n = problem.nParams;
  const m = problem.nResiduals;
  const settings = resolveOptions(n, options, work, start);
  const { x, xTrial, step, f, fTrial, jacobianRowMajor, qr, diag, columnNorms, gradient } = work;
  const { freeIndex, diagLocal, qtResiduals, rDiagonal, originalColumnNorms, pivot, stepLocal, sDiagonal, work1, work2, work3 } = work;
  const lowerBound = work.lowerBound;
  const upperBound = work.upperBound;
  const hasBounds = settings.hasBounds;

  for (let j = 0; j < n; j++) {
    x[j] = start[j];
    work.startCopy[j] = start[j];
  }

  // Everything the loop needs is created here, before it starts.
  const evaluateResiduals = (params: Float64Array, out: Float64Array): void => problem.residuals(params, out);
  const finiteDifferenceOptions: FiniteDifferenceOptions = {
    method: options.jacobianMethod ?? 'central',
    relativeStep: options.finiteDifferenceStep,
    lower: hasBounds ? lowerBound : undefined,
    upper: hasBounds ? upperBound : undefined,
    typicalParams: work.startCopy,
  };
  let nEvaluations = 0;
  let nJacobianEvaluations = 0;
  let finiteDifferenceEvaluations = 0;
  const evaluateJacobian = (): void => {
    nJacobianEvaluations++;
    if (problem.jacobian) {
      problem.jacobian(x, jacobianRowMajor);
    } else {
      finiteDifferenceEvaluations += finiteDifferenceJacobian(
        evaluateResiduals,
        x,
        f,
        jacobianRowMajor,
        finiteDifferenceOptions,
        work.finiteDifference,
      );
    }
  };
  const jacobianIsFinite = (): boolean => {
    for (let k = 0; k < m * n; k++) {
      if (!Number.isFinite(jacobianRowMajor[k])) return false;
    }
    return true;
  };

  problem.residuals(x, f);
  nEvaluations++;
  let residualNorm = euclideanNorm(f, m);
  let status: SolverStatus | null = null;
  let iterations = 0;
  let jacobianIsCurrent = false;
  if (!Number.isFinite(residualNorm)) status = 'non-finite';
  else if (residualNorm <= settings.zeroResidualTolerance) status = 'converged-zero-residual';

  let lambda = 0;
  let trustRadius = 0;
  let scaledParamNorm = 0;
  let lastTrialNonFinite = false;

  while (status === null) {
    if (iterations >= settings.maxIterations) {
      status = 'max-iterations';
      break;
    }
    iterations++;
    evaluateJacobian();
    jacobianIsCurrent = true;

    // Column norms and gradient g = Jᵀf over all parameters.
    for (let j = 0; j < n; j++) {
      columnNorms[j] = 0;
      gradient[j] = 0;
    }
    for (let i = 0; i < m; i++) {
      const row = i * n;
      const fi = f[i];
      for (let j = 0; j < n; j++) {
        const value = jacobianRowMajor[row + j];
        columnNorms[j] += value * value;
        gradient[j] += value * fi;
      }
    }
    let finiteJacobian = true;
    for (let j = 0; j < n; j++) {
      columnNorms[j] = Math.sqrt(columnNorms[j]);
      // a NaN or infinite entry makes its column's sum of squares NaN or infinite
      if (!Number.isFinite(columnNorms[j])) finiteJacobian = false;
    }
    if (!finiteJacobian) {
      status = 'non-finite';
      break;
    }

    // Free set: without bounds, every parameter. With bounds, drop those held by an active bound.
    let nFreeNow = 0;
    if (!hasBounds) {
      for (let j = 0; j < n; j++) freeIndex[nFreeNow++] = j;
    } else {
      for (let j = 0; j < n; j++) {
        const heldLow = x[j] <= lowerBound[j] && gradient[j] > 0;
        const heldHigh = x[j] >= upperBound[j] && gradient[j] < 0;
        if (!heldLow && !heldHigh) freeIndex[nFreeNow++] = j;
      }
      if (nFreeNow === 0) {
        status = 'stuck-at-bound';
        break;
      }
    }
    const k = nFreeNow;

    // Copy the free columns into column-major storage and factor J Π = Q R.
    for (let local = 0; local < k; local++) {
      const column = freeIndex[local];
      const offset = local * m;
      for (let i = 0; i < m; i++) qr[offset + i] = jacobianRowMajor[i * n + column];
    }
    qrFactorPivoted(qr, m, k, pivot, rDiagonal, originalColumnNorms, work1);

    if (iterations === 1) {
      for (let j = 0; j < n; j++) {
        diag[j] = columnNorms[j] === 0 ? 1 : columnNorms[j];
        work1[j] = diag[j] * x[j];
      }
      scaledParamNorm = euclideanNorm(work1, n);
      trustRadius = settings.initialStepBound * scaledParamNorm;
      if (trustRadius === 0) trustRadius = settings.initialStepBound;
    }

    applyQTranspose(qr, m, k, rDiagonal, f, qtResiduals, work.qtResidualsWork);

    // Scaled gradient test: cosine between f and each free column.
    let largestCosine = 0;
    if (residualNorm !== 0) {
      for (let j = 0; j < k; j++) {
        const columnNorm = originalColumnNorms[pivot[j]];
        if (columnNorm === 0) continue;
        let sum = 0;
        for (let i = 0; i <= j; i++) sum += qr[j * m + i] * (qtResiduals[i] / residualNorm);
        const cosine = Math.abs(sum / columnNorm);
        if (cosine > largestCosine) largestCosine = cosine;
      }
    }
    if (largestCosine <= settings.gradientTolerance || largestCosine <= MACHINE_EPSILON) {
      status = 'converged-gtol';
      break;
    }

    for (let j = 0; j < n; j++) diag[j] = Math.max(diag[j], columnNorms[j]);
    for (let local = 0; local < k; local++) diagLocal[local] = diag[freeIndex[local]];

    // Inner loop: shrink the trust region until a step is accepted or a test ends the run.
    while (true) {
      lambda = levenbergMarquardtParameter(
        k, qr, m, pivot, diagLocal, qtResiduals, trustRadius, lambda, stepLocal, sDiagonal, work1, work2,
      );

      for (let j = 0; j < n; j++) step[j] = 0;
      for (let local = 0; local < k; local++) step[freeIndex[local]] = -stepLocal[local];
      for (let j = 0; j < n; j++) xTrial[j] = x[j] + step[j];

      let clipped = false;
      if (hasBounds) {
        for (let j = 0; j < n; j++) {
          if (xTrial[j] < lowerBound[j]) {
            xTrial[j] = lowerBound[j];
            clipped = true;
          } else if (xTrial[j] > upperBound[j]) {
            xTrial[j] = upperBound[j];
            clipped = true;
          }
          step[j] = xTrial[j] - x[j];
        }
      }
      for (let j = 0; j < n; j++) work3[j] = diag[j] * step[j];
      const scaledStepNorm = euclideanNorm(work3, n);
      if (iterations === 1 && scaledStepNorm < trustRadius) trustRadius = scaledStepNorm;

      problem.residuals(xTrial, fTrial);
      nEvaluations++;
      let trialResidualNorm = euclideanNorm(fTrial, m);
      lastTrialNonFinite = !Number.isFinite(trialResidualNorm);
      if (lastTrialNonFinite) trialResidualNorm = Infinity;

      const normRatio = trialResidualNorm / residualNorm;
      const actualReduction = 0.1 * trialResidualNorm < residualNorm ? 1 - normRatio * normRatio : -1;

      let predictedReduction: number;
      let directionalDerivative: number;
      if (!clipped) {
        // Unbounded path (Moré): ‖J s‖ from R, plus the λ‖D s‖² term.
        for (let j = 0; j < k; j++) {
          work3[j] = 0;
        }
        for (let j = 0; j < k; j++) {
          const value = -stepLocal[pivot[j]];
          for (let i = 0; i <= j; i++) work3[i] += qr[j * m + i] * value;
        }
        const temp1 = euclideanNorm(work3, k) / residualNorm;
        const temp2 = (Math.sqrt(lambda) * scaledStepNorm) / residualNorm;
        predictedReduction = temp1 * temp1 + (temp2 * temp2) / 0.5;
        directionalDerivative = -(temp1 * temp1 + temp2 * temp2);
      } else {
        // Bounded path: the step was projected, so evaluate the linear model f + J s directly.
        const linearModel = work.linearModel;
        let crossTerm = 0;
        for (let i = 0; i < m; i++) {
          const row = i * n;
          let value = 0;
          for (let j = 0; j < n; j++) value += jacobianRowMajor[row + j] * step[j];
          linearModel[i] = value;
          crossTerm += value * f[i];
        }
        const modelNorm = euclideanNorm(linearModel, m) / residualNorm;
        predictedReduction = -(2 * (crossTerm / residualNorm / residualNorm) + modelNorm * modelNorm);
        directionalDerivative = crossTerm / residualNorm / residualNorm;
      }
      const ratio = predictedReduction > 0 ? actualReduction / predictedReduction : 0;

      // Update the trust radius and λ.
      if (ratio <= 0.25) {
        // shrink factor from a quadratic fitted along the step (Moré 1978)
        let temp =
          actualReduction >= 0 ? 0.5 : (0.5 * directionalDerivative) / (directionalDerivative + 0.5 * actualReduction);
        if (0.1 * trialResidualNorm >= residualNorm || !(temp >= 0.1)) temp = 0.1;
        if (temp > 0.5) temp = 0.5;
        trustRadius = temp * Math.min(trustRadius, scaledStepNorm / 0.1);
        lambda = lambda / temp;
      } else if (lambda === 0 || ratio >= 0.75) {
        trustRadius = scaledStepNorm / 0.5;
        lambda = 0.5 * lambda;
      }

      if (ratio >= 1e-4) {
        for (let j = 0; j < n; j++) {
          x[j] = xTrial[j];
          work1[j] = diag[j] * x[j];
        }
        for (let i = 0; i < m; i++) f[i] = fTrial[i];
        scaledParamNorm = euclideanNorm(work1, n);
        residualNorm = trialResidualNorm;
        jacobianIsCurrent = false;
      }

      // Termination tests.
      const ratioSmall = 0.5 * ratio <= 1;
      if (residualNorm <= settings.zeroResidualTolerance) status = 'converged-zero-residual';
      else if (
        Math.abs(actualReduction) <= settings.functionTolerance &&
        predictedReduction <= settings.functionTolerance &&
        ratioSmall
      ) {
        status = 'converged-ftol';
      } else if (trustRadius <= settings.stepTolerance * scaledParamNorm) {
        status = lastTrialNonFinite ? 'non-finite' : 'converged-xtol';
      } else if (nEvaluations >= settings.maxEvaluations) status = 'max-evaluations';
      else if (Math.abs(actualReduction) <= MACHINE_EPSILON && predictedReduction <= MACHINE_EPSILON && ratioSmall) {
        status = 'converged-ftol';
      } else if (trustRadius <= MACHINE_EPSILON * scaledParamNorm) {
        status = lastTrialNonFinite ? 'non-finite' : 'converged-xtol';
      }
      if (status !== null) break;
      if (ratio >= 1e-4) break;
    }
  }

  return finishResult(problem, settings, work, {
    status,
    residualNorm,
    iterations,
    nEvaluations,
    nJacobianEvaluations,
    finiteDifferenceEvaluations: () => finiteDifferenceEvaluations,
    jacobianIsCurrent,
    evaluateJacobian: () => {
      evaluateJacobian();
      return jacobianIsFinite();
    },
    jacobianIsFinite,
    trialsWentNonFinite: status === 'non-finite' && lastTrialNonFinite,
  });
}

interface RunSummary {
  status: SolverStatus;
  residualNorm: number;
  iterations: number;
  nEvaluations: number;
  nJacobianEvaluations: number;
  /** Read after the final Jacobian, which may add finite-difference evaluations. */
  finiteDifferenceEvaluations: () => number;
  jacobianIsCurrent: boolean;
  /** Evaluate J at the final point; false if any entry is not finite. */
  evaluateJacobian: () => boolean;
  jacobianIsFinite: () => boolean;
  /** The run stopped because trial steps kept giving non-finite residuals (the point itself is finite). */
  trialsWentNonFinite: boolean;
}

function finishResult(
  problem: LeastSquaresProblem,
  settings: ResolvedOptions,
  work: Workspace,
  run: RunSummary,
): SolverResult {
  const n = problem.nParams;
  const m = problem.nResiduals;
  const { x, f, lowerBound, upperBound } = work;
  const names = settings.names;
  let status = run.status;
  let nJacobianEvaluations = run.nJacobianEvaluations;

  const params = Float64Array.from(x);
  const residuals = Float64Array.from(f);
  const covariance = new Float64Array(n * n).fill(NaN);
  const stderr = new Float64Array(n).fill(NaN);
  const correlation = new Float64Array(n * n).fill(NaN);
  const atBound: BoundSide[] = [];
  for (let j = 0; j < n; j++) {
    atBound.push(x[j] <= lowerBound[j] ? 'lower' : x[j] >= upperBound[j] ? 'upper' : null);
  }

  const chiSquare = run.residualNorm * run.residualNorm;
  const degreesOfFreedom = m - n;
  const reducedChiSquare = degreesOfFreedom > 0 ? chiSquare / degreesOfFreedom : NaN;
  const aic = m * Math.log(chiSquare / m) + 2 * n;
  const bic = m * Math.log(chiSquare / m) + Math.log(m) * n;

  let uncertaintiesOk = false;
  const notes: string[] = [];
  let conditionNumber = NaN;
  let singularDetail = '';
  let jacobianOk = Number.isFinite(run.residualNorm);
  if (jacobianOk && run.jacobianIsCurrent) {
    jacobianOk = run.jacobianIsFinite();
  } else if (jacobianOk) {
    jacobianOk = run.evaluateJacobian();
    nJacobianEvaluations++;
  }
  if (status !== 'non-finite' && !jacobianOk) {
    notes.push('Jacobian is not finite at the end point');
  }

  if (jacobianOk) {
    const analysis = analyseUncertainty(work, n, m, run.residualNorm, atBound, settings);
    conditionNumber = analysis.conditionNumber;
    if (analysis.singularParams.length > 0) {
      const described = analysis.singularParams
        .map((j) => `${names[j]}${analysis.reasons[j]}${x[j] === work.startCopy[j] ? ' (still at its start value)' : ''}`)
        .join(', ');
      singularDetail = described;
      notes.push(`JᵀJ is singular: ${described}`);
      // A converged run, or one whose trial steps ran into non-finite residuals because an
      // undetermined parameter asked for a huge step, ends as 'singular'.
      if (SOLVER_STATUS[status].converged || (status === 'non-finite' && run.trialsWentNonFinite)) status = 'singular';
    } else if (degreesOfFreedom <= 0) {
      notes.push(`no degrees of freedom (${m} points, ${n} parameters)`);
    } else {
      const scale = reducedChiSquare;
      for (let a = 0; a < n; a++) {
        for (let b = 0; b < n; b++) {
          const value = analysis.unscaledCovariance[a * n + b];
          covariance[a * n + b] = Number.isNaN(value) ? NaN : value * scale;
        }
      }
      for (let a = 0; a < n; a++) stderr[a] = Math.sqrt(covariance[a * n + a]);
      for (let a = 0; a < n; a++) {
        for (let b = 0; b < n; b++) {
          correlation[a * n + b] = a === b && !Number.isNaN(stderr[a]) ? 1 : covariance[a * n + b] / (stderr[a] * stderr[b]);
        }
      }
      uncertaintiesOk = true;
      if (conditionNumber > settings.illConditionLimit) {
        uncertaintiesOk = false;
        const dependent = analysis.nearlyDependent.map((j) => names[j]).join(', ');
        const limit = settings.illConditionLimit.toExponential(0);
        notes.push(
          `JᵀJ is ill-conditioned (condition number of the scaled Jacobian ${conditionNumber.toExponential(1)} > ${limit}); nearly dependent: ${dependent}`,
        );
      }
    }
  }

  const bounded: string[] = [];
  for (let j = 0; j < n; j++) {
    if (atBound[j] !== null) {
      bounded.push(`${names[j]} at its ${atBound[j]} bound ${x[j]}`);
    }
  }
  if (bounded.length > 0) {
    uncertaintiesOk = false;
    const several = bounded.length > 1;
    notes.push(`${bounded.join(', ')}: no uncertainty for ${several ? 'these' : 'it'}; the others are computed with ${several ? 'them' : 'it'} held`);
    if (SOLVER_STATUS[status].converged && status !== 'singular') status = 'stuck-at-bound';
  }
  if (!SOLVER_STATUS[status].converged && status !== 'singular') {
    uncertaintiesOk = false;
    notes.push('the fit did not converge, so the uncertainties describe the last point only');
  }

  let message = SOLVER_STATUS[status].message;
  if (status === 'singular' || status === 'stuck-at-bound') {
    const detail = status === 'singular' ? singularDetail : bounded.join(', ');
    if (detail) message = `${message}: ${detail}`;
  } else if (status === 'non-finite') {
    const where = run.trialsWentNonFinite ? 'every step from' : 'at';
    message = `${message}: ${where} ${formatParams(x, names)}`;
  }

  return {
    params,
    covariance,
    stderr,
    correlation,
    residuals,
    chiSquare,
    reducedChiSquare,
    aic,
    bic,
    nPoints: m,
    nFree: n,
    nEvaluations: run.nEvaluations,
    nJacobianEvaluations,
    nFiniteDifferenceEvaluations: run.finiteDifferenceEvaluations(),
    iterations: run.iterations,
    status,
    message,
    converged: SOLVER_STATUS[status].converged,
    uncertaintiesOk,
    uncertaintyNote: uncertaintiesOk ? '' : notes.join('; '),
    atBound,
    conditionNumber,
  };
}

function formatParams(x: Float64Array, names: string[]): string {
  const parts: string[] = [];
  for (let j = 0; j < x.length; j++) parts.push(`${names[j]} = ${x[j]}`);
  return parts.join(', ');
}

interface UncertaintyAnalysis {
  /** (JᵀJ)⁻¹ over the parameters not on a bound; NaN rows for those on a bound. Row-major n × n. */
  unscaledCovariance: Float64Array;
  conditionNumber: number;
  singularParams: number[];
  reasons: string[];
  nearlyDependent: number[];
}

/**
 * Rank check and (JᵀJ)⁻¹ from the Jacobian in work.jacobianRowMajor, by pivoted QR of J with
 * unit-norm columns. Only parameters not on a bound take part.
 */
function analyseUncertainty(
  work: Workspace,
  n: number,
  m: number,
  residualNorm: number,
  atBound: BoundSide[],
  settings: ResolvedOptions,
): UncertaintyAnalysis {
  const { jacobianRowMajor, qr, freeIndex, columnNorms, rDiagonal, originalColumnNorms, pivot, work1, rInverse, x } = work;
  const unscaledCovariance = new Float64Array(n * n).fill(NaN);
  const reasons: string[] = new Array<string>(n).fill('');
  const singularParams: number[] = [];

  let k = 0;
  for (let j = 0; j < n; j++) {
    if (atBound[j] === null) freeIndex[k++] = j;
  }
  if (k === 0) {
    return { unscaledCovariance, conditionNumber: NaN, singularParams, reasons, nearlyDependent: [] };
  }
  // Column norms and "sensitivity": how much the residual vector moves for a 100 % change.
  let largestSensitivity = 0;
  for (let local = 0; local < k; local++) {
    const column = freeIndex[local];
    let sum = 0;
    for (let i = 0; i < m; i++) {
      const value = jacobianRowMajor[i * n + column];
      sum += value * value;
    }
    columnNorms[local] = Math.sqrt(sum);
    const size = x[column] !== 0 ? Math.abs(x[column]) : Math.abs(work.startCopy[column]);
    work1[local] = columnNorms[local] * size;
    if (work1[local] > largestSensitivity) largestSensitivity = work1[local];
  }
  const sensitivityFloor = SQRT_EPSILON * Math.max(residualNorm, largestSensitivity);
  for (let local = 0; local < k; local++) {
    const column = freeIndex[local];
    if (columnNorms[local] === 0) {
      singularParams.push(column);
      reasons[column] = ' has no effect on the residuals (zero Jacobian column)';
    } else if (work1[local] > 0 && work1[local] <= sensitivityFloor) {
      singularParams.push(column);
      reasons[column] = ` has no measurable effect on the residuals (a 100 % change moves them by ${work1[local].toExponential(1)})`;
    }
  }
  if (singularParams.length > 0) {
    return { unscaledCovariance, conditionNumber: Infinity, singularParams, reasons, nearlyDependent: [] };
  }

  for (let local = 0; local < k; local++) {
    const column = freeIndex[local];
    const scale = 1 / columnNorms[local];
    const offset = local * m;
    for (let i = 0; i < m; i++) qr[offset + i] = jacobianRowMajor[i * n + column] * scale;
  }
  qrFactorPivoted(qr, m, k, pivot, rDiagonal, originalColumnNorms, work.work2);

  const largestPivot = Math.abs(rDiagonal[0]);
  let rank = k;
  for (let j = 0; j < k; j++) {
    if (Math.abs(rDiagonal[j]) <= settings.rankTolerance * largestPivot) {
      rank = j;
      break;
    }
  }
  if (rank < k) {
    for (let j = rank; j < k; j++) {
      const column = freeIndex[pivot[j]];
      singularParams.push(column);
      reasons[column] = ' is a linear combination of the others';
    }
    return { unscaledCovariance, conditionNumber: Infinity, singularParams, reasons, nearlyDependent: [] };
  }

  // R⁻¹ (upper triangular, k × k, row-major in rInverse), by back substitution column by column.
  const r = (i: number, j: number): number => (i === j ? rDiagonal[j] : qr[j * m + i]);
  for (let i = 0; i < k * k; i++) rInverse[i] = 0;
  for (let column = 0; column < k; column++) {
    rInverse[column * k + column] = 1 / r(column, column);
    for (let i = column - 1; i >= 0; i--) {
      let sum = 0;
      for (let l = i + 1; l <= column; l++) sum += r(i, l) * rInverse[l * k + column];
      rInverse[i * k + column] = -sum / r(i, i);
    }
  }
  // Condition estimate ‖R‖_F ‖R⁻¹‖_F (within a factor k of the 2-norm condition number).
  let normR = 0;
  let normRInverse = 0;
  let widestColumn = 0;
  let widestNorm = -1;
  for (let j = 0; j < k; j++) {
    let columnSum = 0;
    for (let i = 0; i <= j; i++) {
      normR += r(i, j) * r(i, j);
      const value = rInverse[i * k + j];
      columnSum += value * value;
    }
    normRInverse += columnSum;
    if (columnSum > widestNorm) {
      widestNorm = columnSum;
      widestColumn = j;
    }
  }
  const conditionNumber = Math.sqrt(normR) * Math.sqrt(normRInverse);
  // Parameters taking part in the most nearly singular direction (largest column of R⁻¹).
  const nearlyDependent: number[] = [];
  let largestEntry = 0;
  for (let i = 0; i < k; i++) largestEntry = Math.max(largestEntry, Math.abs(rInverse[i * k + widestColumn]));
  for (let i = 0; i < k; i++) {
    if (Math.abs(rInverse[i * k + widestColumn]) >= 0.1 * largestEntry) nearlyDependent.push(freeIndex[pivot[i]]);
  }

  // (JᵀJ)⁻¹ = D⁻¹ Π R⁻¹ R⁻ᵀ Πᵀ D⁻¹, entries (a, b) of the pivoted order.
  for (let a = 0; a < k; a++) {
    const paramA = freeIndex[pivot[a]];
    const scaleA = 1 / columnNorms[pivot[a]];
    for (let b = 0; b < k; b++) {
      const paramB = freeIndex[pivot[b]];
      const scaleB = 1 / columnNorms[pivot[b]];
      let sum = 0;
      const start = Math.max(a, b);
      for (let l = start; l < k; l++) sum += rInverse[a * k + l] * rInverse[b * k + l];
      unscaledCovariance[paramA * n + paramB] = sum * scaleA * scaleB;
    }
  }
  return { unscaledCovariance, conditionNumber, singularParams, reasons, nearlyDependent };
}

/**
 * Euclidean norm of values[0 … count−1], safe against overflow and underflow: plain sum of squares
 * when it is in a comfortable range, otherwise rescaled by the largest magnitude. NaN in → NaN out.
 */
function euclideanNorm(values: Float64Array, count: number): number {
  let sum = 0;
  for (let i = 0; i < count; i++) sum += values[i] * values[i];
  if (sum > 1e-280 && sum < 1e280) return Math.sqrt(sum);
  if (Number.isNaN(sum)) return NaN;
  let largest = 0;
  for (let i = 0; i < count; i++) {
    const magnitude = Math.abs(values[i]);
    if (magnitude > largest) largest = magnitude;
  }
  if (largest === 0 || largest === Infinity) return largest;
  let scaled = 0;
  for (let i = 0; i < count; i++) {
    const ratio = values[i] / largest;
    scaled += ratio * ratio;
  }
  return largest * Math.sqrt(scaled);
}

/** Norm of a[offset … offset+count−1]. */
function segmentNorm(values: Float64Array, offset: number, count: number): number {
  let sum = 0;
  for (let i = 0; i < count; i++) sum += values[offset + i] * values[offset + i];
  if (sum > 1e-280 && sum < 1e280) return Math.sqrt(sum);
  let largest = 0;
  for (let i = 0; i < count; i++) largest = Math.max(largest, Math.abs(values[offset + i]));
  if (largest === 0 || !Number.isFinite(largest)) return largest;
  let scaled = 0;
  for (let i = 0; i < count; i++) {
    const ratio = values[offset + i] / largest;
    scaled += ratio * ratio;
  }
  return largest * Math.sqrt(scaled);
}

/**
 * Householder QR with column pivoting of the column-major m × n matrix a (m ≥ n): A Π = Q R.
 * On return the strict upper triangle of a holds R (without its diagonal, which is in rDiagonal), the
 * lower trapezoid holds the Householder vectors, pivot[j] is the original column in position j, and
 * originalColumnNorms holds the original column norms. work is scratch (length ≥ n).
 */
function qrFactorPivoted(
  a: Float64Array,
  m: number,
  n: number,
  pivot: Int32Array,
  rDiagonal: Float64Array,
  originalColumnNorms: Float64Array,
  work: Float64Array,
): void {
  for (let j = 0; j < n; j++) {
    originalColumnNorms[j] = segmentNorm(a, j * m, m);
    rDiagonal[j] = originalColumnNorms[j];
    work[j] = rDiagonal[j];
    pivot[j] = j;
  }
  for (let j = 0; j < n; j++) {
    // Bring the column of largest remaining norm to position j.
    let best = j;
    for (let k = j + 1; k < n; k++) {
      if (rDiagonal[k] > rDiagonal[best]) best = k;
    }
    if (best !== j) {
      const offsetJ = j * m;
      const offsetBest = best * m;
      for (let i = 0; i < m; i++) {
        const temp = a[offsetJ + i];
        a[offsetJ + i] = a[offsetBest + i];
        a[offsetBest + i] = temp;
      }
      rDiagonal[best] = rDiagonal[j];
      work[best] = work[j];
      const temp = pivot[j];
      pivot[j] = pivot[best];
      pivot[best] = temp;
    }
    // Householder reflection that zeroes a[j+1 … m−1, j].
    const offsetJ = j * m;
    let columnNorm = segmentNorm(a, offsetJ + j, m - j);
    if (columnNorm !== 0) {
      if (a[offsetJ + j] < 0) columnNorm = -columnNorm;
      for (let i = j; i < m; i++) a[offsetJ + i] /= columnNorm;
      a[offsetJ + j] += 1;
      for (let k = j + 1; k < n; k++) {
        const offsetK = k * m;
        let sum = 0;
        for (let i = j; i < m; i++) sum += a[offsetJ + i] * a[offsetK + i];
        const temp = sum / a[offsetJ + j];
        for (let i = j; i < m; i++) a[offsetK + i] -= temp * a[offsetJ + i];
        // Downdate the remaining norm of column k; recompute when cancellation threatens.
        if (rDiagonal[k] !== 0) {
          const ratio = a[offsetK + j] / rDiagonal[k];
          rDiagonal[k] *= Math.sqrt(Math.max(0, 1 - ratio * ratio));
          const relative = rDiagonal[k] / work[k];
          if (0.05 * relative * relative <= MACHINE_EPSILON) {
            rDiagonal[k] = segmentNorm(a, offsetK + j + 1, m - j - 1);
            work[k] = rDiagonal[k];
          }
        }
      }
    }
    rDiagonal[j] = -columnNorm;
  }
}

/**
 * qtResiduals = first n entries of Qᵀ f, from the Householder vectors left by qrFactorPivoted; then puts
 * the diagonal of R back into a so that its upper triangle is the whole R.
 */
function applyQTranspose(
  a: Float64Array,
  m: number,
  n: number,
  rDiagonal: Float64Array,
  f: Float64Array,
  qtResiduals: Float64Array,
  work: Float64Array,
): void {
  for (let i = 0; i < m; i++) work[i] = f[i];
  for (let j = 0; j < n; j++) {
    const offsetJ = j * m;
    const pivotValue = a[offsetJ + j];
    if (pivotValue !== 0) {
      let sum = 0;
      for (let i = j; i < m; i++) sum += a[offsetJ + i] * work[i];
      const temp = -sum / pivotValue;
      for (let i = j; i < m; i++) work[i] += a[offsetJ + i] * temp;
    }
    a[offsetJ + j] = rDiagonal[j];
    qtResiduals[j] = work[j];
  }
}

/**
 * Moré's λ for the trust-region subproblem. Given R (upper triangle of r, column-major with leading
 * dimension ldr), pivot Π, scaling diag, qtResiduals = Qᵀf and radius trustRadius, finds λ ≥ 0 such that
 * x = argmin ‖[R; √λ ΠᵀDΠ] z − [qtResiduals; 0]‖ (unpermuted) satisfies ‖D x‖ ≈ trustRadius (within 10 %) or
 * λ = 0 with ‖D x‖ ≤ 1.1·trustRadius. Returns λ; x holds the (negated) step. The strict lower triangle of
 * r and sDiagonal receive the factor S of the last solve.
 */
function levenbergMarquardtParameter(
  n: number,
  r: Float64Array,
  ldr: number,
  pivot: Int32Array,
  diag: Float64Array,
  qtResiduals: Float64Array,
  trustRadius: number,
  lambdaStart: number,
  x: Float64Array,
  sDiagonal: Float64Array,
  work1: Float64Array,
  work2: Float64Array,
): number {
  // Gauss–Newton direction (minimum-norm on the leading nonsingular block if R is singular).
  let nonsingular = n;
  for (let j = 0; j < n; j++) {
    work1[j] = qtResiduals[j];
    if (r[j + j * ldr] === 0 && nonsingular === n) nonsingular = j;
    if (nonsingular < n) work1[j] = 0;
  }
  for (let j = nonsingular - 1; j >= 0; j--) {
    work1[j] /= r[j + j * ldr];
    const temp = work1[j];
    for (let i = 0; i < j; i++) work1[i] -= r[i + j * ldr] * temp;
  }
  for (let j = 0; j < n; j++) x[pivot[j]] = work1[j];

  for (let j = 0; j < n; j++) work2[j] = diag[j] * x[j];
  let scaledStepNorm = euclideanNorm(work2, n);
  let radiusExcess = scaledStepNorm - trustRadius;
  if (radiusExcess <= 0.1 * trustRadius) return 0;

  // Lower bound l = −φ(0)/φ'(0), available when R has full rank.
  let lambdaLower = 0;
  if (nonsingular === n) {
    for (let j = 0; j < n; j++) {
      const l = pivot[j];
      work1[j] = diag[l] * (work2[l] / scaledStepNorm);
    }
    for (let j = 0; j < n; j++) {
      let sum = 0;
      for (let i = 0; i < j; i++) sum += r[i + j * ldr] * work1[i];
      work1[j] = (work1[j] - sum) / r[j + j * ldr];
    }
    const temp = euclideanNorm(work1, n);
    lambdaLower = radiusExcess / trustRadius / temp / temp;
  }

  // Upper bound u = ‖D⁻¹ Jᵀ f‖ / Δ.
  for (let j = 0; j < n; j++) {
    let sum = 0;
    for (let i = 0; i <= j; i++) sum += r[i + j * ldr] * qtResiduals[i];
    work1[j] = sum / diag[pivot[j]];
  }
  const scaledGradientNorm = euclideanNorm(work1, n);
  let lambdaUpper = scaledGradientNorm / trustRadius;
  if (lambdaUpper === 0) lambdaUpper = SMALLEST_NORMAL / Math.min(trustRadius, 0.1);

  let lambda = Math.min(Math.max(lambdaStart, lambdaLower), lambdaUpper);
  if (lambda === 0) lambda = scaledGradientNorm / scaledStepNorm;

  for (let iteration = 1; ; iteration++) {
    if (lambda === 0) lambda = Math.max(SMALLEST_NORMAL, 0.001 * lambdaUpper);
    const root = Math.sqrt(lambda);
    for (let j = 0; j < n; j++) work1[j] = root * diag[j];
    solveRegularized(n, r, ldr, pivot, work1, qtResiduals, x, sDiagonal, work2);
    for (let j = 0; j < n; j++) work2[j] = diag[j] * x[j];
    scaledStepNorm = euclideanNorm(work2, n);
    const previous = radiusExcess;
    radiusExcess = scaledStepNorm - trustRadius;
    const closeEnough = Math.abs(radiusExcess) <= 0.1 * trustRadius;
    const stalledBelow = lambdaLower === 0 && radiusExcess <= previous && previous < 0;
    if (closeEnough || stalledBelow || iteration === 10) {
      return lambda;
    }
    // Newton correction −φ/φ'.
    for (let j = 0; j < n; j++) {
      const l = pivot[j];
      work1[j] = diag[l] * (work2[l] / scaledStepNorm);
    }
    for (let j = 0; j < n; j++) {
      work1[j] /= sDiagonal[j];
      const temp = work1[j];
      for (let i = j + 1; i < n; i++) work1[i] -= r[i + j * ldr] * temp;
    }
    const temp = euclideanNorm(work1, n);
    const correction = radiusExcess / trustRadius / temp / temp;
    if (radiusExcess > 0) lambdaLower = Math.max(lambdaLower, lambda);
    if (radiusExcess < 0) lambdaUpper = Math.min(lambdaUpper, lambda);
    lambda = Math.max(lambdaLower, lambda + correction);
  }
}

/**
 * Solve min ‖[R; D_Π] z − [qtResiduals; 0]‖ for the diagonal D_Π = ΠᵀDΠ (d holds D in original order) by
 * Givens rotations that fold D into R, giving the lower-triangular factor S in the strict lower
 * triangle of r with its diagonal in sDiagonal. R itself (upper triangle, diagonal included) is kept.
 * x receives the solution in original order.
 */
function solveRegularized(
  n: number,
  r: Float64Array,
  ldr: number,
  pivot: Int32Array,
  d: Float64Array,
  qtResiduals: Float64Array,
  x: Float64Array,
  sDiagonal: Float64Array,
  work: Float64Array,
): void {
  for (let j = 0; j < n; j++) {
    for (let i = j; i < n; i++) r[i + j * ldr] = r[j + i * ldr];
    x[j] = r[j + j * ldr];
    work[j] = qtResiduals[j];
  }
  for (let j = 0; j < n; j++) {
    const dj = d[pivot[j]];
    if (dj !== 0) {
      for (let k = j; k < n; k++) sDiagonal[k] = 0;
      sDiagonal[j] = dj;
      let rotatedExtra = 0;
      for (let k = j; k < n; k++) {
        if (sDiagonal[k] === 0) continue;
        const rkk = r[k + k * ldr];
        let cosine: number;
        let sine: number;
        if (Math.abs(rkk) < Math.abs(sDiagonal[k])) {
          const cotangent = rkk / sDiagonal[k];
          sine = 0.5 / Math.sqrt(0.25 + 0.25 * cotangent * cotangent);
          cosine = sine * cotangent;
        } else {
          const tangent = sDiagonal[k] / rkk;
          cosine = 0.5 / Math.sqrt(0.25 + 0.25 * tangent * tangent);
          sine = cosine * tangent;
        }
        r[k + k * ldr] = cosine * rkk + sine * sDiagonal[k];
        const temp = cosine * work[k] + sine * rotatedExtra;
        rotatedExtra = -sine * work[k] + cosine * rotatedExtra;
        work[k] = temp;
        for (let i = k + 1; i < n; i++) {
          const rik = r[i + k * ldr];
          r[i + k * ldr] = cosine * rik + sine * sDiagonal[i];
          sDiagonal[i] = -sine * rik + cosine * sDiagonal[i];
        }
      }
    }
    sDiagonal[j] = r[j + j * ldr];
    r[j + j * ldr] = x[j];
  }
  let nonsingular = n;
  for (let j = 0; j < n; j++) {
    if (sDiagonal[j] === 0 && nonsingular === n) nonsingular = j;
    if (nonsingular < n) work[j] = 0;
  }
  for (let j = nonsingular - 1; j >= 0; j--) {
    let sum = 0;
    for (let i = j + 1; i < nonsingular; i++) sum += r[i + j * ldr] * work[i];
    work[j] = (work[j] - sum) / sDiagonal[j];
  }
  for (let j = 0; j < n; j++) x[pivot[j]] = work[j];
}
