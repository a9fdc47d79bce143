import { MAD_TO_SIGMA } from '../fit/index.ts';
import { medianAbsoluteDeviation } from 'simple-statistics';
import { FLAG_THRESHOLDS } from './flagThresholds.ts';
import { requireFiniteArray, requirePositive, describeValue } from './validate.ts';

/** Options of {@link detectNoiseFloor}. */
export interface NoiseFloorOptions {
  /** Standard deviation of the additive current noise in A (the preamp floor), when known. */
  readonly noiseFloorA?: number;
}

/** Points at the noise floor found by {@link detectNoiseFloor}. */
export interface NoiseFloorFinding {
  /** Indices of the points with |I| below the threshold, ascending. */
  readonly pointIndices: number[];
  /** The additive noise σ used, in A (given or estimated). */
  readonly noiseFloorA: number;
  /** The cut: noiseFloorMultiple × noiseFloorA, in A. */
  readonly thresholdA: number;
  /** True when noiseFloorA was estimated from the low-current tail. */
  readonly estimated: boolean;
}


/**
 * Find the points of an I(z) sweep that sit in the additive noise floor, where ln|I| no longer
 * follows the exponential: |I_i| < m·σ_floor, m = FLAG_THRESHOLDS.noiseFloorMultiple (3).
 * σ_floor is noiseFloorA when given; otherwise it is estimated from the low-current tail (the end
 * with the smaller |I|; the last max(8, n/8) points) as σ̂ = 1.4826·MAD(ΔI)/√2, ΔI the differences
 * of neighbouring currents, so the slow exponential trend cancels and one outlier cannot inflate it.
 * Currents in A. Meant for I(z); in I(V) small |I| near zero bias is not a floor problem.
 * Source: MAD scale estimate, F. R. Hampel, J. Am. Stat. Assoc. 69, 383 (1974) [from memory]; the
 * 3σ cut and the difference estimator are Burrow's heuristic [cp].
 * @example detectNoiseFloor([1e-9, 4e-10, 1.6e-10, 3e-12, -2e-12], { noiseFloorA: 2e-12 }) // pointIndices [3, 4]
 */
export function detectNoiseFloor(currentA: ArrayLike<number>, options: NoiseFloorOptions = {}): NoiseFloorFinding | null {
  const name = 'detectNoiseFloor';
  const current = requireFiniteArray(name, 'currentA', currentA, 1);
  if (options === null || typeof options !== 'object') throw new TypeError(`${name}: options must be an object, got ${describeValue(options)}`);
  const n = current.length;
  let noiseFloorA: number;
  let estimated: boolean;
  if (options.noiseFloorA !== undefined) {
    requirePositive(name, 'noiseFloorA', options.noiseFloorA);
    noiseFloorA = options.noiseFloorA;
    estimated = false;
  } else {
    if (n < 8) throw new RangeError(`${name}: currentA must hold at least 8 values to estimate the floor (or pass noiseFloorA), got ${n}`);
    const tailLength = Math.min(n, Math.max(8, Math.ceil(n * FLAG_THRESHOLDS.noiseFloorTailFraction.value)));
    const lowAtEnd = Math.abs(current[n - 1]) + Math.abs(current[n - 2]) <= Math.abs(current[0]) + Math.abs(current[1]);
    const tail = lowAtEnd ? current.slice(n - tailLength) : current.slice(0, tailLength);
    const differences: number[] = [];
    for (let i = 1; i < tail.length; i++) differences.push(tail[i] - tail[i - 1]);
    noiseFloorA = (MAD_TO_SIGMA * medianAbsoluteDeviation(differences)) / Math.SQRT2;
    estimated = true;
  }
  const thresholdA = FLAG_THRESHOLDS.noiseFloorMultiple.value * noiseFloorA;
  const pointIndices: number[] = [];
  for (let i = 0; i < n; i++) if (Math.abs(current[i]) < thresholdA) pointIndices.push(i);
  if (pointIndices.length === 0) return null;
  return { pointIndices, noiseFloorA, thresholdA, estimated };
}
