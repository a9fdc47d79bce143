import { FLAG_THRESHOLDS } from './flagThresholds.ts';
import { requireFiniteArray, requirePositive, describeValue } from './validate.ts';

/** Options of {@link detectSaturation}. */
export interface SaturationOptions {
  /** The preamplifier's clip level |I| in A, when known; every point at or above it is clipped. */
  readonly knownLimitA?: number;
  /** Relative tolerance for "equal" readings; default FLAG_THRESHOLDS.saturationRelativeTolerance. */
  readonly relativeTolerance?: number;
}

/** A preamplifier clip found by {@link detectSaturation}. */
export interface SaturationFinding {
  /** Indices of the clipped points, ascending. */
  readonly pointIndices: number[];
  /** The clip level: the largest |I| among the clipped points, in A. */
  readonly levelA: number;
  /** Which end(s) of the sweep are clipped. */
  readonly end: 'start' | 'end' | 'both';
  /** True when the clip was found from knownLimitA, false when inferred from repeated extremes. */
  readonly atKnownLimit: boolean;
}

/** The run of points from one end whose |I| equals that end's |I| within the tolerance, and is its polarity's extreme. */
function clippedRunFromEnd(current: readonly number[], fromStart: boolean, tolerance: number): number[] {
  const n = current.length;
  const endIndex = fromStart ? 0 : n - 1;
  const endValue = current[endIndex];
  const endMagnitude = Math.abs(endValue);
  if (endMagnitude === 0) return [];
  let polarityMaximum = 0;
  for (const value of current) {
    if (Math.sign(value) === Math.sign(endValue)) polarityMaximum = Math.max(polarityMaximum, Math.abs(value));
  }
  if (endMagnitude < polarityMaximum * (1 - tolerance)) return [];
  const run: number[] = [];
  for (let step = 0; step < n; step++) {
    const i = fromStart ? step : n - 1 - step;
    const value = current[i];
    if (Math.sign(value) !== Math.sign(endValue) || Math.abs(Math.abs(value) - endMagnitude) > tolerance * endMagnitude) break;
    run.push(i);
  }
  return run;
}

/**
 * Find preamplifier saturation: currents pinned at the rail at the high-current end of a sweep.
 * Rule: with knownLimitA, every point with |I| ≥ knownLimitA·(1 − tol) is clipped. Otherwise, from each
 * end of the sweep, the run of consecutive points whose |I| equals the end point's within
 * tol·|I_end| (same sign) is clipped if it holds ≥ FLAG_THRESHOLDS.saturationMinimumRun points and
 * |I_end| is the largest |I| of its polarity within tol (each polarity of an I(V) sweep has its own
 * rail). tol = FLAG_THRESHOLDS.saturationRelativeTolerance (5e-5) unless given. Currents in A.
 * Source: a clipped amplifier repeats its rail value [cp]; the tolerance covers converter steps.
 * @example detectSaturation([1e-8, 1e-8, 1e-8, 6e-9, 3e-9]) // { pointIndices: [0, 1, 2], levelA: 1e-8, end: 'start', atKnownLimit: false }
 */
export function detectSaturation(currentA: ArrayLike<number>, options: SaturationOptions = {}): SaturationFinding | null {
  const name = 'detectSaturation';
  const current = requireFiniteArray(name, 'currentA', currentA, 1);
  if (options === null || typeof options !== 'object') throw new TypeError(`${name}: options must be an object, got ${describeValue(options)}`);
  const tolerance = options.relativeTolerance ?? FLAG_THRESHOLDS.saturationRelativeTolerance.value;
  if (!(tolerance >= 0 && tolerance < 1)) throw new RangeError(`${name}: relativeTolerance must be within [0, 1), got ${tolerance}`);
  const n = current.length;

  if (options.knownLimitA !== undefined) {
    requirePositive(name, 'knownLimitA', options.knownLimitA);
    const pointIndices: number[] = [];
    let levelA = 0;
    for (let i = 0; i < n; i++) {
      const magnitude = Math.abs(current[i]);
      if (magnitude >= options.knownLimitA * (1 - tolerance)) {
        pointIndices.push(i);
        levelA = Math.max(levelA, magnitude);
      }
    }
    if (pointIndices.length === 0) return null;
    return { pointIndices, levelA, end: endOf(pointIndices, n), atKnownLimit: true };
  }

  const minimumRun = FLAG_THRESHOLDS.saturationMinimumRun.value;
  const startRun = clippedRunFromEnd(current, true, tolerance);
  const endRun = clippedRunFromEnd(current, false, tolerance);
  const clipped = new Set<number>();
  if (startRun.length >= minimumRun) for (const i of startRun) clipped.add(i);
  if (endRun.length >= minimumRun) for (const i of endRun) clipped.add(i);
  if (clipped.size === 0) return null;
  const pointIndices = [...clipped].sort((a, b) => a - b);
  let levelA = 0;
  for (const i of pointIndices) levelA = Math.max(levelA, Math.abs(current[i]));
  return { pointIndices, levelA, end: endOf(pointIndices, n), atKnownLimit: false };
}

/** Which end the indices touch ('both' if both); indices touching neither end go to the nearer half. */
function endOf(indices: readonly number[], n: number): 'start' | 'end' | 'both' {
  const touchesStart = indices[0] === 0;
  const touchesEnd = indices[indices.length - 1] === n - 1;
  if (touchesStart && !touchesEnd) return 'start';
  if (touchesEnd && !touchesStart) return 'end';
  if (touchesStart && touchesEnd) return 'both';
  return meanIndexSide(indices, n);
}

function meanIndexSide(indices: readonly number[], n: number): 'start' | 'end' {
  let sum = 0;
  for (const i of indices) sum += i;
  return sum / indices.length < (n - 1) / 2 ? 'start' : 'end';
}
