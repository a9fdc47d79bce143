import { expect } from 'vitest';

/** Relative difference |a − b| / |b| (absolute when b = 0). */
export function relativeDifference(actual: number, expected: number): number {
  return expected === 0 ? Math.abs(actual) : Math.abs(actual - expected) / Math.abs(expected);
}

/** Assert |actual − expected| ≤ tolerance·|expected|, with both numbers in the failure message. */
export function expectRelClose(actual: number, expected: number, tolerance: number): void {
  const rel = relativeDifference(actual, expected);
  expect(rel, `expected ${actual} ≈ ${expected} within ${tolerance} relative (off by ${rel.toExponential(3)})`).toBeLessThanOrEqual(tolerance);
}

/** Log relative error in digits, clipped to [0, cap] (McCullough 1998, as used for NIST StRD). */
export function logRelativeError(actual: number, expected: number, cap = 11): number {
  if (!Number.isFinite(actual)) return 0;
  if (actual === expected) return cap;
  const rel = expected === 0 ? Math.abs(actual) : Math.abs(actual - expected) / Math.abs(expected);
  return Math.max(0, Math.min(cap, -Math.log10(rel)));
}
