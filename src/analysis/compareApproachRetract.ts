import { FLAG_THRESHOLDS } from './flagThresholds.ts';
import { describeValue } from './validate.ts';

/**
 * A straight line fitted to ln I against z: ln(I/A) = interceptLn + slopePerNm · zNm, with standard
 * errors and (optionally) the slope–intercept covariance from the same fit.
 */
export interface FittedLogCurrentLine {
  /** d lnI/dz, 1/nm (negative for a tunnel junction: z grows as the tip retracts). */
  readonly slopePerNm: number;
  /** Standard error of the slope, 1/nm, > 0. */
  readonly slopeErrorPerNm: number;
  /** ln(I/A) at z = 0 nm. */
  readonly interceptLn?: number;
  /** Standard error of interceptLn (dimensionless), > 0. */
  readonly interceptErrorLn?: number;
  /** cov(slope, intercept), 1/nm; default 0 (which overstates the spread of ln I(z) when z̄ ≠ 0: fewer flags, not more). */
  readonly slopeInterceptCovariancePerNm?: number;
}

/** Input of {@link compareApproachRetract}. */
export interface ApproachRetractInput {
  readonly approach: FittedLogCurrentLine;
  readonly retract: FittedLogCurrentLine;
  /** A gap both sweeps cover, nm; when given (and both intercepts are), the currents there are compared too. */
  readonly commonZNm?: number;
}

/** Approach–retract disagreement found by {@link compareApproachRetract}. */
export interface HysteresisFinding {
  /** Retract minus approach slope, 1/nm. */
  readonly slopeDifferencePerNm: number;
  /** |slope difference| / √(σ_a² + σ_r²). */
  readonly slopeSigmas: number;
  /** I_retract/I_approach at commonZNm (NaN when not compared). */
  readonly currentRatio: number;
  /** |ln I_r − ln I_a| at commonZNm in combined standard errors (NaN when not compared). */
  readonly currentSigmas: number;
  /** commonZNm as given (NaN when not compared). */
  readonly commonZNm: number;
  /** Which comparison exceeded the limit. */
  readonly disagreesIn: 'slope' | 'current' | 'both';
}

function requireLine(label: string, line: FittedLogCurrentLine): void {
  const name = 'compareApproachRetract';
  if (line === null || typeof line !== 'object') throw new TypeError(`${name}: ${label} must be an object, got ${describeValue(line)}`);
  if (!Number.isFinite(line.slopePerNm)) throw new RangeError(`${name}: ${label}.slopePerNm must be finite, got ${line.slopePerNm}`);
  if (!(line.slopeErrorPerNm > 0) || !Number.isFinite(line.slopeErrorPerNm)) {
    throw new RangeError(`${name}: ${label}.slopeErrorPerNm must be a finite number > 0, got ${line.slopeErrorPerNm}`);
  }
}

function logCurrentAt(line: FittedLogCurrentLine, zNm: number): { value: number; variance: number } | null {
  if (line.interceptLn === undefined || line.interceptErrorLn === undefined) return null;
  const covariance = line.slopeInterceptCovariancePerNm ?? 0;
  const value = line.interceptLn + line.slopePerNm * zNm;
  const variance = line.interceptErrorLn ** 2 + zNm * zNm * line.slopeErrorPerNm ** 2 + 2 * zNm * covariance;
  return { value, variance: Math.max(variance, 0) };
}

/**
 * Compare the approach and retract sweeps of one curve: the junction changed (hysteresis) when the
 * ln I slopes, or the currents at a common gap, differ by more than k = FLAG_THRESHOLDS.hysteresisSigmas
 * (3.29) combined standard errors.
 * Slopes: Δ = s_r − s_a, z_s = |Δ|/√(σ_a² + σ_r²). Currents at z₀: ln I(z₀) = a + s z₀ with
 * var = σ_a² + z₀²σ_s² + 2z₀ cov(s, a) for each sweep, z_I = |ln I_r − ln I_a|/√(var_r + var_a).
 * The two sweeps are independent measurements, so their variances add. Slopes in 1/nm, z in nm.
 * Source: difference of two independent estimates in units of its standard error [cp].
 * @example compareApproachRetract({ approach: { slopePerNm: -20, slopeErrorPerNm: 0.2 }, retract: { slopePerNm: -18, slopeErrorPerNm: 0.2 } })?.slopeSigmas // ≈ 7.07
 */
export function compareApproachRetract(input: ApproachRetractInput): HysteresisFinding | null {
  const name = 'compareApproachRetract';
  if (input === null || typeof input !== 'object') throw new TypeError(`${name}: input must be an object, got ${describeValue(input)}`);
  requireLine('approach', input.approach);
  requireLine('retract', input.retract);
  const { approach, retract } = input;
  const slopeDifferencePerNm = retract.slopePerNm - approach.slopePerNm;
  const slopeSigmas = Math.abs(slopeDifferencePerNm) / Math.hypot(approach.slopeErrorPerNm, retract.slopeErrorPerNm);

  let currentRatio = NaN;
  let currentSigmas = NaN;
  let commonZNm = NaN;
  if (input.commonZNm !== undefined) {
    if (!Number.isFinite(input.commonZNm)) throw new RangeError(`${name}: commonZNm must be finite, got ${input.commonZNm}`);
    const atApproach = logCurrentAt(approach, input.commonZNm);
    const atRetract = logCurrentAt(retract, input.commonZNm);
    if (atApproach === null || atRetract === null) {
      throw new RangeError(`${name}: commonZNm needs interceptLn and interceptErrorLn on both lines, got ${atApproach === null ? 'approach' : 'retract'} without them`);
    }
    commonZNm = input.commonZNm;
    const difference = atRetract.value - atApproach.value;
    const spread = Math.sqrt(atApproach.variance + atRetract.variance);
    currentRatio = Math.exp(difference);
    currentSigmas = spread > 0 ? Math.abs(difference) / spread : difference === 0 ? 0 : Infinity;
  }
  const limit = FLAG_THRESHOLDS.hysteresisSigmas.value;
  const slopeDisagrees = slopeSigmas > limit;
  const currentDisagrees = currentSigmas > limit;
  if (!slopeDisagrees && !currentDisagrees) return null;
  return {
    slopeDifferencePerNm,
    slopeSigmas,
    currentRatio,
    currentSigmas,
    commonZNm,
    disagreesIn: slopeDisagrees && currentDisagrees ? 'both' : slopeDisagrees ? 'slope' : 'current',
  };
}
