import { describe, expect, it } from 'vitest';
import { gaussian, mulberry32 } from '../../src/physics/index.ts';

describe('mulberry32 and gaussian', () => {
  it('mulberry32(seed) repeats its sequence for the same seed and differs for another', () => {
    const first = mulberry32(42);
    const second = mulberry32(42);
    const other = mulberry32(43);
    const a = Array.from({ length: 5 }, () => first());
    const b = Array.from({ length: 5 }, () => second());
    const c = Array.from({ length: 5 }, () => other());
    expect(a).toEqual(b);
    expect(a).not.toEqual(c);
  });

  it('mulberry32 gives uniform numbers in [0, 1)', () => {
    const rng = mulberry32(7);
    const bins = new Array(10).fill(0);
    const count = 100_000;
    let outside = 0;
    for (let i = 0; i < count; i++) {
      const u = rng();
      if (!(u >= 0 && u < 1)) outside++;
      else bins[Math.floor(u * 10)]++;
    }
    expect(outside).toBe(0);
    // each bin holds 10 % ± 0.3 % (over 3 binomial standard deviations of 0.095 %; common practice, no source)
    for (const bin of bins) expect(Math.abs(bin / count - 0.1)).toBeLessThan(0.003);
  });

  it('gaussian(rng) has mean 0 and variance 1', () => {
    const rng = mulberry32(2024);
    const count = 50_000;
    let sum = 0;
    let sumSquares = 0;
    for (let i = 0; i < count; i++) {
      const z = gaussian(rng);
      sum += z;
      sumSquares += z * z;
    }
    const mean = sum / count;
    const variance = sumSquares / count - mean * mean;
    // standard errors: mean 1/√n = 0.0045, variance √(2/n) = 0.0063; bounds are 4 of them
    expect(Math.abs(mean)).toBeLessThan(0.018);
    expect(Math.abs(variance - 1)).toBeLessThan(0.025);
  });

  it('mulberry32 throws on a non-integer seed', () => {
    expect(() => mulberry32(1.5)).toThrow('mulberry32: seed must be an integer, got 1.5');
  });
});
