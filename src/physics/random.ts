/**
 * Seeded random numbers for synthetic curves and tests. The core never calls Math.random: anything
 * random takes one of these generators as an argument, so a seed reproduces a run exactly.
 */

/** A source of uniform numbers in [0, 1), as returned by {@link mulberry32}. */
export type UniformRandom = () => number;

/**
 * Seeded 32-bit pseudo-random generator "mulberry32": uniform numbers in [0, 1).
 * State s (uint32) advances by s += 0x6d2b79f5; the output mixes s with two xor-shift-multiply rounds
 * and divides the 32-bit result by 2^32. Period 2^32; fine for test data and Monte Carlo, not for
 * cryptography. Dimensionless.
 * Source: Tommy Ettinger's mulberry32 (public-domain snippet, 2017; from memory).
 * @example const rng = mulberry32(42); rng() // a number in [0, 1), the same on every run for seed 42
 */
export function mulberry32(seed: number): UniformRandom {
  if (!Number.isInteger(seed)) {
    throw new RangeError(`mulberry32: seed must be an integer, got ${seed}`);
  }
  let state = seed >>> 0;
  return function next(): number {
    state = (state + 0x6d2b79f5) >>> 0;
    let mixed = state;
    mixed = Math.imul(mixed ^ (mixed >>> 15), mixed | 1);
    mixed ^= mixed + Math.imul(mixed ^ (mixed >>> 7), mixed | 61);
    return ((mixed ^ (mixed >>> 14)) >>> 0) / 4294967296;
  };
}

/**
 * One standard normal deviate (mean 0, standard deviation 1) from a uniform generator, by the
 * Box–Muller transform: z = sqrt(-2 ln u1) · cos(2π u2), with u1 in (0, 1] so the logarithm is finite.
 * Uses two uniform draws per call. Dimensionless; scale by σ for noise in any unit.
 * Source: G. E. P. Box and M. E. Muller, Ann. Math. Statist. 29, 610 (1958).
 * @example gaussian(mulberry32(1)) // a standard normal number, the same on every run
 */
export function gaussian(rng: UniformRandom): number {
  const u1 = 1 - rng();
  const u2 = rng();
  return Math.sqrt(-2 * Math.log(u1)) * Math.cos(2 * Math.PI * u2);
}
