import { describe, expect, it } from 'vitest';
import { createFiniteDifferenceWork, finiteDifferenceJacobian, type JacobianMethod } from '../../src/fit/index.ts';

/** r(p) = [exp(p0)·sin(p1), p0²·p1, cos(p0 p1)] and its exact Jacobian, row-major 3 × 2. */
function residuals(p: Float64Array, out: Float64Array): void {
  out[0] = Math.exp(p[0]) * Math.sin(p[1]);
  out[1] = p[0] * p[0] * p[1];
  out[2] = Math.cos(p[0] * p[1]);
}
function exactJacobian(p: Float64Array): number[] {
  return [
    Math.exp(p[0]) * Math.sin(p[1]),
    Math.exp(p[0]) * Math.cos(p[1]),
    2 * p[0] * p[1],
    p[0] * p[0],
    -p[1] * Math.sin(p[0] * p[1]),
    -p[0] * Math.sin(p[0] * p[1]),
  ];
}

function worstError(method: JacobianMethod, p: Float64Array, options: { lower?: number[]; upper?: number[] } = {}): number {
  const base = new Float64Array(3);
  residuals(p, base);
  const out = new Float64Array(6);
  finiteDifferenceJacobian(residuals, p, base, out, { method, ...options }, createFiniteDifferenceWork(2, 3));
  const exact = exactJacobian(p);
  let worst = 0;
  for (let k = 0; k < 6; k++) worst = Math.max(worst, Math.abs(out[k] - exact[k]));
  return worst;
}

describe('finiteDifferenceJacobian', () => {
  it('gets more digits from forward to central to Richardson stencils', () => {
    const p = Float64Array.of(0.7, 1.3);
    // truncation + rounding error estimates: forward ~ √ε ≈ 1e-8, central ~ ε^(2/3) ≈ 4e-11, Richardson smaller still
    // (Press et al., Numerical Recipes §5.7, from memory); bounds allow a factor of about 30
    expect(worstError('forward', p)).toBeLessThan(3e-7);
    expect(worstError('central', p)).toBeLessThan(1e-9);
    expect(worstError('richardson', p)).toBeLessThan(1e-10);
  });

  it('stays inside the box, switching to a one-sided stencil at a bound', () => {
    const p = Float64Array.of(0.7, 1.3);
    const seen: number[][] = [];
    const recording = (q: Float64Array, out: Float64Array) => {
      seen.push(Array.from(q));
      residuals(q, out);
    };
    for (const method of ['forward', 'central', 'richardson'] as const) {
      seen.length = 0;
      const base = new Float64Array(3);
      residuals(p, base);
      const out = new Float64Array(6);
      const used = finiteDifferenceJacobian(recording, p, base, out, { method, lower: [0.7, 0], upper: [10, 1.3] }, createFiniteDifferenceWork(2, 3));
      expect(used).toBe(seen.length);
      for (const q of seen) {
        expect(q[0] >= 0.7 && q[1] <= 1.3, `${method} ${q}`).toBe(true);
      }
      const exact = exactJacobian(p);
      for (let k = 0; k < 6; k++) expect(Math.abs(out[k] - exact[k]), `${method} entry ${k}`).toBeLessThan(method === 'forward' ? 3e-7 : 1e-8);
    }
  });

  it('steps by an absolute amount when a parameter is zero', () => {
    expect(worstError('central', Float64Array.of(0, 0.5))).toBeLessThan(1e-9);
  });

  it('throws when the work or output is the wrong size', () => {
    const p = Float64Array.of(0.7, 1.3);
    const base = new Float64Array(3);
    expect(() => finiteDifferenceJacobian(residuals, p, base, new Float64Array(6), {}, createFiniteDifferenceWork(2, 4))).toThrow(
      'finiteDifferenceJacobian: work must be sized 2 params × 3 residuals, got 2 × 4',
    );
    expect(() => finiteDifferenceJacobian(residuals, p, base, new Float64Array(5), {}, createFiniteDifferenceWork(2, 3))).toThrow(
      'finiteDifferenceJacobian: outRowMajor must hold ≥ 6 entries, got 5',
    );
    expect(() => createFiniteDifferenceWork(0, 3)).toThrow('createFiniteDifferenceWork: nParams must be an integer ≥ 1, got 0');
  });
});
