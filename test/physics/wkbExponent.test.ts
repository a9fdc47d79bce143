import { describe, expect, it } from 'vitest';
import { linearBarrierShape, linearBarrierShapeGradient, sampledWkbExponent, wkbExponent } from '../../src/physics/index.ts';
import { expectRelClose } from '../helpers.ts';

const angstrom = 1e-10;

describe('wkbExponent', () => {
  // physics.md §4: (u1, u2, d[Å]) → γ, checked to 1e-8 against numerical quadrature
  const cases: [number, number, number, number][] = [
    [4, 4, 10, 20.49266889],
    [4, 3, 10, 19.15277334],
    [3.5, 4.5, 10, 20.47928799],
    [4, 0, 10, 13.66177926],
    [4, -4, 10, 6.83088963],
    [-1, 4, 10, 10.92942341],
    [4.5, 3.5, 5, 10.23964400],
  ];
  for (const [u1, u2, d, gamma] of cases) {
    it(`wkbExponent(${u1}, ${u2}, ${d} Å) equals the quadrature value ${gamma}`, () => {
      // physics.md §4 check table (WKB integral of a linear barrier, independent numpy/scipy quadrature)
      expectRelClose(wkbExponent(u1, u2, d * angstrom), gamma, 1e-8);
    });
  }

  it('wkbExponent is zero when the whole segment is classically allowed', () => {
    expect(wkbExponent(-1, -2, 10 * angstrom)).toBe(0);
  });

  it('wkbExponent is continuous through u1 = u2 (no cancellation)', () => {
    // rectangle limit: γ = 1.024633 d √u (physics.md §4)
    expectRelClose(wkbExponent(4 + 1e-13, 4, 10 * angstrom), 20.49266889, 1e-8);
  });

  it('linearBarrierShapeGradient matches central differences in every regime', () => {
    const out = new Float64Array(2);
    for (const [u1, u2] of [[4, 3], [3, 4], [4, 4], [4, -1], [-1, 4], [2, 0.001]] as const) {
      const g = linearBarrierShapeGradient(u1, u2, out);
      expect(g).toBeCloseTo(linearBarrierShape(u1, u2), 14);
      const h = 1e-6;
      const d1 = (linearBarrierShape(u1 + h, u2) - linearBarrierShape(u1 - h, u2)) / (2 * h);
      const d2 = (linearBarrierShape(u1, u2 + h) - linearBarrierShape(u1, u2 - h)) / (2 * h);
      expectRelClose(out[0], d1, 1e-6);
      expectRelClose(out[1], d2, 1e-6);
    }
  });

  it('sampledWkbExponent of a sampled trapezoid equals the closed form', () => {
    const positions = new Float64Array(33);
    const heights = new Float64Array(33);
    for (let i = 0; i <= 32; i++) {
      positions[i] = (10 * angstrom * i) / 32;
      heights[i] = 4 - i / 32;
    }
    // physics.md §4: (4, 3, 10 Å) → 19.15277334
    expectRelClose(sampledWkbExponent(positions, heights, 0), 19.15277334, 1e-9);
  });
});
