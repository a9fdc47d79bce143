/**
 * Robust least squares by iteratively reweighted least squares (IRLS) around the Levenberg–Marquardt
 * solver. With z_i = (f_i / c)² for residual f_i and loss scale c (residual units), the fit minimises
 * Σ c² ρ(z_i) for
 *   linear   ρ(z) = z                         weight w = ρ'(z) = 1
 *   soft-l1  ρ(z) = 2 (√(1 + z) − 1)          weight w = 1 / √(1 + z)
 *   cauchy   ρ(z) = ln(1 + z)                  weight w = 1 / (1 + z)
 * The gradient of Σ c² ρ(z_i) is 2 Σ ρ'(z_i) f_i ∇f_i, the same as that of the weighted sum of
 * squares Σ w_i f_i² with w_i = ρ'(z_i) held fixed; so solving weighted problems and updating the
 * weights from the new residuals until the parameters settle reaches a stationary point of the robust
 * cost. Each weighted solve starts from the previous parameters and reuses one solver workspace.
 *
 * Scale: unless lossScale is given, c = tuning × σ̂ with σ̂ = 1.4826 · median |f_i| (the normalised
 * median absolute residual, consistent for Gaussian noise), re-estimated from the residuals of each
 * round; tuning = 1.345 for soft-l1 (Huber's 95 %-efficiency constant, which soft-l1 resembles) and
 * 2.385 for cauchy (Holland & Welsch's 95 %-efficiency constant).
 *
 * Sources: P. W. Holland and R. E. Welsch, "Robust regression using iteratively reweighted
 * least-squares", Commun. Statist. Theory Methods A6, 813–827 (1977) (IRLS, the Cauchy weight and its
 * tuning constant; from memory); B. Triggs, P. McLauchlan, R. Hartley, A. Fitzgibbon, "Bundle
 * adjustment — a modern synthesis", Vision Algorithms: Theory and Practice, LNCS 1883 (2000) (the
 * soft-L1 / pseudo-Huber and Cauchy cost forms, written in z = f² as above; from memory).
 *
 * Uncertainties of a robust fit come from the last weighted solve, s_w² (JᵀWJ)⁻¹ with
 * s_w² = Σ w f² / (n − p): an approximation that treats the final weights as known.
 */
import {
  createSolver,
  SOLVER_STATUS,
  type LeastSquaresProblem,
  type LevenbergMarquardtSolver,
  type SolverOptions,
  type SolverResult,
} from './solver.ts';

/** Loss applied to each residual; 'linear' is ordinary least squares. */
export type RobustLoss = 'linear' | 'soft-l1' | 'cauchy';

const ROBUST_LOSSES: readonly RobustLoss[] = ['linear', 'soft-l1', 'cauchy'];

/**
 * Default loss scale as a multiple of the robust noise estimate σ̂, per loss: soft-l1 1.345
 * (Huber's 95 %-efficiency constant), cauchy 2.385 (Holland & Welsch 1977); both from memory.
 * @example ROBUST_TUNING.cauchy // 2.385
 */
export const ROBUST_TUNING: Readonly<Record<RobustLoss, number>> = {
  linear: 1,
  'soft-l1': 1.345,
  cauchy: 2.385,
};

/**
 * The loss ρ(z) for z = (residual / scale)² ≥ 0 (dimensionless). Formulas in the module comment.
 * Source: Triggs et al. (2000), from memory.
 * @example robustCost('cauchy', 1) // ln 2 ≈ 0.6931
 */
export function robustCost(loss: RobustLoss, z: number): number {
  if (loss === 'soft-l1') return 2 * (Math.sqrt(1 + z) - 1);
  if (loss === 'cauchy') return Math.log1p(z);
  return z;
}

/**
 * The IRLS weight w = ρ'(z) for z = (residual / scale)² ≥ 0 (dimensionless, 0 < w ≤ 1).
 * soft-l1: 1/√(1+z); cauchy: 1/(1+z); linear: 1. Source: Holland & Welsch (1977), from memory.
 * @example robustWeight('soft-l1', 3) // 0.5
 */
export function robustWeight(loss: RobustLoss, z: number): number {
  if (loss === 'soft-l1') return 1 / Math.sqrt(1 + z);
  if (loss === 'cauchy') return 1 / (1 + z);
  return 1;
}

/**
 * Robust noise estimate σ̂ = 1.4826 · median |r_i| (residual units); falls back to the root mean
 * square when more than half of the residuals are zero, and to 1 when all are.
 * Source: F. R. Hampel, J. Amer. Statist. Assoc. 69, 383 (1974), the normalised MAD (from memory).
 * @example medianAbsoluteScale(Float64Array.of(1, -1, 2, -2, 100)) // 1.4826 · 2 = 2.9652
 */
export function medianAbsoluteScale(residuals: ArrayLike<number>): number {
  const magnitudes = Array.from(residuals, (value) => Math.abs(value)).sort((a, b) => a - b);
  const count = magnitudes.length;
  if (count === 0) throw new RangeError('medianAbsoluteScale: residuals must not be empty, got 0 entries');
  const middle = count >> 1;
  const median = count % 2 ? magnitudes[middle] : 0.5 * (magnitudes[middle - 1] + magnitudes[middle]);
  if (median > 0) return 1.4826 * median;
  let sum = 0;
  for (const value of magnitudes) sum += value * value;
  const rms = Math.sqrt(sum / count);
  return rms > 0 ? rms : 1;
}

/** Options for {@link robustLevenbergMarquardt}: solver options plus the loss. */
export interface RobustOptions extends SolverOptions {
  loss: RobustLoss;
  /** Loss scale c in residual units; default tuning × 1.4826 · median |f|, re-estimated each round. */
  lossScale?: number;
  /** Maximum reweighting rounds; default 100. */
  maxReweightIterations?: number;
  /** Stop when every parameter moves by ≤ this × (|p| + stderr) in a round; default 1e-10. */
  reweightTolerance?: number;
  /** Reuse this workspace (must match the problem's size) instead of allocating one. */
  solver?: LevenbergMarquardtSolver;
}

/** A robust fit: the solver result of the last weighted solve plus the robust quantities. */
export interface RobustResult extends SolverResult {
  loss: RobustLoss;
  /** Loss scale c used in the last round (residual units). */
  lossScale: number;
  /** Final IRLS weights w_i (0 … 1), one per residual. */
  robustWeights: Float64Array;
  /** Σ c² ρ((f_i/c)²) at the result, with the unweighted residuals f. */
  robustCost: number;
  /** Number of reweighting rounds done (0 for 'linear'). */
  reweightIterations: number;
  /** Unweighted residuals f(params), before the robust weights. */
  rawResiduals: Float64Array;
}

/**
 * Fit with a robust loss by IRLS (see the module comment for ρ, w and the default scale). For loss
 * 'linear' this is exactly one call of the solver. Not settling within maxReweightIterations is
 * reported as status 'max-iterations' (not converged).
 * Source: Holland & Welsch (1977); Triggs et al. (2000); both from memory.
 * @example
 * const fit = robustLevenbergMarquardt(lineProblem, [0, 0], { loss: 'cauchy' });
 * fit.robustWeights // near 0 for gross outliers, near 1 for the rest
 */
export function robustLevenbergMarquardt(
  problem: LeastSquaresProblem,
  start: ArrayLike<number>,
  options: RobustOptions,
): RobustResult {
  const { loss, lossScale, maxReweightIterations = 100, reweightTolerance = 1e-10, solver: given, ...solverOptions } = options;
  if (!ROBUST_LOSSES.includes(loss)) {
    throw new RangeError(`robustLevenbergMarquardt: loss must be one of ${ROBUST_LOSSES.join(', ')}, got ${String(loss)}`);
  }
  if (lossScale !== undefined && !(lossScale > 0 && Number.isFinite(lossScale))) {
    throw new RangeError(`robustLevenbergMarquardt: lossScale must be a finite number > 0, got ${lossScale}`);
  }
  if (!Number.isInteger(maxReweightIterations) || maxReweightIterations < 1) {
    throw new RangeError(`robustLevenbergMarquardt: maxReweightIterations must be an integer ≥ 1, got ${maxReweightIterations}`);
  }
  if (!(reweightTolerance > 0)) {
    throw new RangeError(`robustLevenbergMarquardt: reweightTolerance must be > 0, got ${reweightTolerance}`);
  }
  const n = problem.nParams;
  const m = problem.nResiduals;
  const solver = given ?? createSolver(n, m);

  const rawResiduals = new Float64Array(m);
  const sqrtWeights = new Float64Array(m).fill(1);
  const weights = new Float64Array(m).fill(1);
  const weighted: LeastSquaresProblem = {
    nParams: n,
    nResiduals: m,
    residuals(params, out) {
      problem.residuals(params, out);
      for (let i = 0; i < m; i++) out[i] *= sqrtWeights[i];
    },
    jacobian: problem.jacobian
      ? (params, outRowMajor) => {
          problem.jacobian!(params, outRowMajor);
          for (let i = 0; i < m; i++) {
            const factor = sqrtWeights[i];
            for (let j = 0; j < n; j++) outRowMajor[i * n + j] *= factor;
          }
        }
      : undefined,
  };

  let result = solver.solve(problem, start, solverOptions);
  for (let i = 0; i < m; i++) rawResiduals[i] = result.residuals[i];
  const tuning = ROBUST_TUNING[loss];
  let scale = lossScale ?? tuning * medianAbsoluteScale(rawResiduals);
  let rounds = 0;
  let settled = loss === 'linear';
  let nEvaluations = result.nEvaluations;
  let nJacobianEvaluations = result.nJacobianEvaluations;
  let nFiniteDifferenceEvaluations = result.nFiniteDifferenceEvaluations;
  let iterations = result.iterations;

  while (!settled && rounds < maxReweightIterations && Number.isFinite(result.chiSquare)) {
    rounds++;
    if (lossScale === undefined) scale = tuning * medianAbsoluteScale(rawResiduals);
    for (let i = 0; i < m; i++) {
      const ratio = rawResiduals[i] / scale;
      weights[i] = robustWeight(loss, ratio * ratio);
      sqrtWeights[i] = Math.sqrt(weights[i]);
    }
    const previous = result.params;
    result = solver.solve(weighted, previous, solverOptions);
    nEvaluations += result.nEvaluations;
    nJacobianEvaluations += result.nJacobianEvaluations;
    nFiniteDifferenceEvaluations += result.nFiniteDifferenceEvaluations;
    iterations += result.iterations;
    problem.residuals(result.params, rawResiduals);
    nEvaluations++;
    settled = true;
    for (let j = 0; j < n; j++) {
      const uncertainty = Number.isFinite(result.stderr[j]) ? result.stderr[j] : 0;
      const allowed = reweightTolerance * (Math.abs(result.params[j]) + uncertainty);
      if (!(Math.abs(result.params[j] - previous[j]) <= allowed)) settled = false;
    }
  }

  let cost = 0;
  for (let i = 0; i < m; i++) {
    const ratio = rawResiduals[i] / scale;
    cost += scale * scale * robustCost(loss, ratio * ratio);
  }
  const final: RobustResult = {
    ...result,
    nEvaluations,
    nJacobianEvaluations,
    nFiniteDifferenceEvaluations,
    iterations,
    loss,
    lossScale: scale,
    robustWeights: Float64Array.from(weights),
    robustCost: cost,
    reweightIterations: rounds,
    rawResiduals: Float64Array.from(rawResiduals),
  };
  if (!settled && final.converged) {
    final.status = 'max-iterations';
    final.converged = false;
    final.message = `${SOLVER_STATUS['max-iterations'].message}: robust reweighting did not settle in ${maxReweightIterations} rounds (maxReweightIterations)`;
    final.uncertaintiesOk = false;
    final.uncertaintyNote = 'the robust fit did not settle, so the uncertainties describe the last round only';
  }
  return final;
}
