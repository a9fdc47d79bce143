/**
 * Seeded pseudo-random numbers, so simulated curves and tests repeat exactly.
 * mulberry32: a 32-bit generator by Tommy Ettinger (public domain, 2017) [from memory].
 * @example const rng = mulberry32(1); rng() // a number in [0, 1)
 */
export function mulberry32(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/**
 * A standard normal deviate from a uniform generator, Box–Muller transform
 * (G. E. P. Box and M. E. Muller, Ann. Math. Statist. 29, 610 (1958)).
 * @example gaussian(mulberry32(1)) // a draw from N(0, 1)
 */
export function gaussian(uniform: () => number): number {
  let u = uniform();
  while (u <= Number.MIN_VALUE) u = uniform();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * uniform());
}
