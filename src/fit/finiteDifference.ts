/**
 * Finite-difference Jacobians of a residual vector, for problems that do not supply derivatives.
 * Three stencils, all allocation-free once a work object exists:
 *   forward     J_ij ≈ (r_i(p + h e_j) − r_i(p)) / h                                   error O(h),  1 call per column
 *   central     J_ij ≈ (r_i(p + h e_j) − r_i(p − h e_j)) / (2h)                        error O(h²), 2 calls per column
 *   richardson  J_ij ≈ (8(r(p+h) − r(p−h)) − (r(p+2h) − r(p−2h))) / (12h)              error O(h⁴), 4 calls per column
 * The last is Richardson extrapolation of two central differences (steps h and 2h), the classic
 * five-point stencil. Near a box bound the stencil turns one-sided (second-order three-point form
 * (−3 r(p) + 4 r(p+s) − r(p+2s)) / (2s), s = ±h) so the model is never evaluated outside the box.
 * Step choice: h_j = relativeStep · |p_j| (or · |typical_j|, or · 1, when p_j is zero). The default
 * relativeStep balances truncation against rounding: ε^(1/2) for forward and ε^(1/3) for central
 * differences (ε = 2.2e-16). For Richardson it is 1e-4, a little below the ε^(1/5) ≈ 7e-4 optimum:
 * that guards models whose features are narrow compared with a parameter's size (a peak position
 * of 451 with width 1.5 in NIST Eckerle4 lost three digits of its standard deviations at ε^(1/5)),
 * while rounding still costs only ε/h ≈ 2e-12. Source: W. H. Press et al., Numerical Recipes, 3rd ed. (2007), §5.7 (from memory);
 * J. E. Dennis and R. B. Schnabel, Numerical Methods for Unconstrained Optimization and Nonlinear
 * Equations (1983), §5.4 (from memory).
 */

/** Which finite-difference stencil to use; see the module comment for formulas and costs. */
export type JacobianMethod = 'forward' | 'central' | 'richardson';

/** A residual function: writes r(p) into `out` (length nResiduals); must not keep references. */
export type ResidualFunction = (params: Float64Array, out: Float64Array) => void;

/**
 * Scratch space for {@link finiteDifferenceJacobian}, allocated once and reused across calls: one
 * trial vector of exactly nParams entries and four vectors of exactly nResiduals entries (they are
 * handed to the residual function, which may rely on their length).
 * @example const work = createFiniteDifferenceWork(4, 512) // for a 4-parameter, 512-residual problem
 */
export interface FiniteDifferenceWork {
  readonly trialParams: Float64Array;
  readonly plus: Float64Array;
  readonly minus: Float64Array;
  readonly plusTwice: Float64Array;
  readonly minusTwice: Float64Array;
}

/**
 * Allocate scratch space for finite-difference Jacobians of a problem with `nParams` parameters and
 * `nResiduals` residuals. Sizes are counts (dimensionless). Source: none needed (a buffer pool).
 * @example createFiniteDifferenceWork(2, 14).plus.length // 14
 */
export function createFiniteDifferenceWork(nParams: number, nResiduals: number): FiniteDifferenceWork {
  if (!Number.isInteger(nParams) || nParams < 1) {
    throw new RangeError(`createFiniteDifferenceWork: nParams must be an integer ≥ 1, got ${nParams}`);
  }
  if (!Number.isInteger(nResiduals) || nResiduals < 1) {
    throw new RangeError(`createFiniteDifferenceWork: nResiduals must be an integer ≥ 1, got ${nResiduals}`);
  }
  return {
    trialParams: new Float64Array(nParams),
    plus: new Float64Array(nResiduals),
    minus: new Float64Array(nResiduals),
    plusTwice: new Float64Array(nResiduals),
    minusTwice: new Float64Array(nResiduals),
  };
}

/** Options for {@link finiteDifferenceJacobian}. Bounds and typical values are in parameter units. */
export interface FiniteDifferenceOptions {
  /** Stencil; default 'central'. */
  method?: JacobianMethod;
  /** Relative step; default DEFAULT_RELATIVE_STEP[method]. */
  relativeStep?: number;
  /** Lower box bounds (−Infinity where absent); stencils stay inside. */
  lower?: ArrayLike<number>;
  /** Upper box bounds (+Infinity where absent). */
  upper?: ArrayLike<number>;
  /** Size of each parameter to scale the step when the parameter itself is zero; default 1. */
  typicalParams?: ArrayLike<number>;
}

const MACHINE_EPSILON = 2.220446049250313e-16;

/**
 * Default relative step for each stencil: forward ε^(1/2) ≈ 1.5e-8, central ε^(1/3) ≈ 6.1e-6,
 * richardson 1e-4 (see the module comment for why). Dimensionless.
 * Source: Press et al. (2007) §5.7 for the first two (from memory).
 * @example DEFAULT_RELATIVE_STEP.central // 6.0554544523933395e-6
 */
export const DEFAULT_RELATIVE_STEP: Readonly<Record<JacobianMethod, number>> = {
  forward: Math.sqrt(MACHINE_EPSILON),
  central: Math.cbrt(MACHINE_EPSILON),
  richardson: 1e-4,
};

/**
 * Fill `outRowMajor` (nResiduals × nParams, row-major: entry (i, j) at i·nParams + j) with the
 * finite-difference Jacobian ∂r_i/∂p_j at `params`, given the residuals already computed there.
 * Units: residual units per parameter unit. Returns the number of residual evaluations it used.
 * Formulas and step rule: see the module comment. Source: Press et al. (2007) §5.7 (from memory).
 * @example
 * // r(p) = [p0², 3·p0] at p0 = 2 → J = [4, 3]
 * const J = new Float64Array(2);
 * finiteDifferenceJacobian((p, out) => { out[0] = p[0] ** 2; out[1] = 3 * p[0]; },
 *   Float64Array.of(2), Float64Array.of(4, 6), J, { method: 'central' }, createFiniteDifferenceWork(1, 2));
 * // J ≈ [4, 3] to about 10 digits
 */
export function finiteDifferenceJacobian(
  residuals: ResidualFunction,
  params: Float64Array,
  residualsAtParams: Float64Array,
  outRowMajor: Float64Array,
  options: FiniteDifferenceOptions,
  work: FiniteDifferenceWork,
): number {
  const nParams = params.length;
  const nResiduals = residualsAtParams.length;
  if (work.trialParams.length !== nParams || work.plus.length !== nResiduals) {
    throw new RangeError(
      `finiteDifferenceJacobian: work must be sized ${nParams} params × ${nResiduals} residuals, got ${work.trialParams.length} × ${work.plus.length}`,
    );
  }
  if (outRowMajor.length < nParams * nResiduals) {
    throw new RangeError(
      `finiteDifferenceJacobian: outRowMajor must hold ≥ ${nParams * nResiduals} entries, got ${outRowMajor.length}`,
    );
  }
  const method = options.method ?? 'central';
  const relativeStep = options.relativeStep ?? DEFAULT_RELATIVE_STEP[method];
  if (!(relativeStep > 0)) {
    throw new RangeError(`finiteDifferenceJacobian: relativeStep must be > 0, got ${relativeStep}`);
  }
  const plus = work.plus;
  const minus = work.minus;
  const plusTwice = work.plusTwice;
  const minusTwice = work.minusTwice;
  let evaluations = 0;
  const trial = work.trialParams;
  for (let j = 0; j < nParams; j++) trial[j] = params[j];

  for (let j = 0; j < nParams; j++) {
    const value = params[j];
    const lower = options.lower ? options.lower[j] : -Infinity;
    const upper = options.upper ? options.upper[j] : Infinity;
    const typical = options.typicalParams ? Math.abs(options.typicalParams[j]) : 0;
    const size = value !== 0 ? Math.abs(value) : typical > 0 ? typical : 1;
    let step = relativeStep * size;
    const roomUp = upper - value;
    const roomDown = value - lower;

    if (method === 'forward') {
      let signedStep = step <= roomUp ? step : roomDown >= step ? -step : roomUp >= roomDown ? roomUp : -roomDown;
      signedStep = value + signedStep - value; // exactly representable step
      trial[j] = value + signedStep;
      residuals(trial, plus);
      evaluations++;
      for (let i = 0; i < nResiduals; i++) {
        outRowMajor[i * nParams + j] = (plus[i] - residualsAtParams[i]) / signedStep;
      }
      trial[j] = value;
      continue;
    }

    const reach = method === 'richardson' ? 2 * step : step;
    if (reach <= roomUp && reach <= roomDown) {
      step = value + step - value;
      trial[j] = value + step;
      residuals(trial, plus);
      trial[j] = value - step;
      residuals(trial, minus);
      evaluations += 2;
      if (method === 'central') {
        for (let i = 0; i < nResiduals; i++) {
          outRowMajor[i * nParams + j] = (plus[i] - minus[i]) / (2 * step);
        }
      } else {
        trial[j] = value + 2 * step;
        residuals(trial, plusTwice);
        trial[j] = value - 2 * step;
        residuals(trial, minusTwice);
        evaluations += 2;
        for (let i = 0; i < nResiduals; i++) {
          outRowMajor[i * nParams + j] =
            (8 * (plus[i] - minus[i]) - (plusTwice[i] - minusTwice[i])) / (12 * step);
        }
      }
      trial[j] = value;
      continue;
    }

    // one-sided second-order stencil toward the side with more room, shrunk to fit inside the box
    const towardUpper = roomUp >= roomDown;
    const room = towardUpper ? roomUp : roomDown;
    if (2 * step > room) step = room / 2;
    let signedStep = towardUpper ? step : -step;
    signedStep = value + signedStep - value;
    trial[j] = value + signedStep;
    residuals(trial, plus);
    trial[j] = value + 2 * signedStep;
    residuals(trial, plusTwice);
    evaluations += 2;
    for (let i = 0; i < nResiduals; i++) {
      outRowMajor[i * nParams + j] =
        (-3 * residualsAtParams[i] + 4 * plus[i] - plusTwice[i]) / (2 * signedStep);
    }
    trial[j] = value;
  }
  return evaluations;
}
