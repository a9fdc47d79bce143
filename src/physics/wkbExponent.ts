import { WKB_DECAY_PER_M_PER_SQRT_EV } from './constants.ts';

/**
 * WKB exponent γ of a linear barrier segment, D ≈ exp(−γ).
 * γ = (2/ħ)∫√(2m(U − E))dx over the forbidden part of the segment, which for heights u1 at the
 * start and u2 at the end (eV above the electron's energy) is
 *   γ = A0 (u1₊^{3/2} − u2₊^{3/2}) / (u1 − u2),  A0 = 4√(2m) w / (3ħ) = 0.683089·w[Å],
 * with u₊ = max(u, 0); u1 = u2 gives γ = 1.024633·w[Å]·√u1. A classical turning point inside the
 * segment (Fowler–Nordheim regime) is covered by the u₊ clipping.
 * Source: the WKB integral of a linear potential (e.g. J. G. Simmons, J. Appl. Phys. 34, 1793 (1963);
 * R. H. Fowler and L. Nordheim, Proc. R. Soc. A 119, 173 (1928)); check values in physics.md §4.
 * Units: heights in eV, widthM in m.
 * @example wkbExponent(4, 4, 1e-9) // 20.49266889
 */
export function wkbExponent(startHeightEV: number, endHeightEV: number, widthM: number): number {
  return (2 / 3) * WKB_DECAY_PER_M_PER_SQRT_EV * widthM * linearBarrierShape(startHeightEV, endHeightEV);
}

/**
 * G(u1, u2) = (u1₊^{3/2} − u2₊^{3/2})/(u1 − u2), the shape factor of wkbExponent (eV^{1/2}).
 * Written without cancellation: for u1, u2 > 0 with a = √u1, b = √u2, G = (a² + ab + b²)/(a + b).
 * @example linearBarrierShape(4, 4) // 3
 */
export function linearBarrierShape(u1: number, u2: number): number {
  if (u1 > 0 && u2 > 0) {
    const a = Math.sqrt(u1);
    const b = Math.sqrt(u2);
    return (u1 + a * b + u2) / (a + b);
  }
  if (u1 > 0) return (u1 * Math.sqrt(u1)) / (u1 - u2);
  if (u2 > 0) return (u2 * Math.sqrt(u2)) / (u2 - u1);
  return 0;
}

/**
 * Partial derivatives of linearBarrierShape, written to out[0] = ∂G/∂u1 and out[1] = ∂G/∂u2
 * (eV^{-1/2}). For u1, u2 > 0: ∂G/∂u1 = (a + 2b)/(2(a + b)²), ∂G/∂u2 = (b + 2a)/(2(a + b)²).
 * Returns G. Used for analytic Jacobians of the barrier parameters.
 * @example linearBarrierShapeGradient(4, 4, out) // 3, out = [0.1875, 0.1875]
 */
export function linearBarrierShapeGradient(u1: number, u2: number, out: Float64Array): number {
  if (u1 > 0 && u2 > 0) {
    const a = Math.sqrt(u1);
    const b = Math.sqrt(u2);
    const sum = a + b;
    const inv = 1 / (2 * sum * sum);
    out[0] = (a + 2 * b) * inv;
    out[1] = (b + 2 * a) * inv;
    return (u1 + a * b + u2) / sum;
  }
  if (u1 > 0) {
    const a = Math.sqrt(u1);
    const span = u1 - u2;
    out[0] = (a * (0.5 * u1 - 1.5 * u2)) / (span * span);
    out[1] = (u1 * a) / (span * span);
    return (u1 * a) / span;
  }
  if (u2 > 0) {
    const b = Math.sqrt(u2);
    const span = u2 - u1;
    out[1] = (b * (0.5 * u2 - 1.5 * u1)) / (span * span);
    out[0] = (u2 * b) / (span * span);
    return (u2 * b) / span;
  }
  out[0] = 0;
  out[1] = 0;
  return 0;
}

/**
 * WKB exponent of any sampled barrier, as the sum of exact linear-segment exponents (piecewise-linear
 * quadrature of the WKB integral; converges as the sampling is refined).
 * Units: positions in m, heights in eV above the energy `energyEV` is measured from (same origin).
 * @example sampledWkbExponent(new Float64Array([0, 1e-9]), new Float64Array([4, 4]), 0) // 20.49266889
 */
export function sampledWkbExponent(positionsM: Float64Array, heightsEV: Float64Array, energyEV: number): number {
  let shapeTimesWidth = 0;
  for (let i = 1; i < positionsM.length; i++) {
    shapeTimesWidth += (positionsM[i] - positionsM[i - 1]) * linearBarrierShape(heightsEV[i - 1] - energyEV, heightsEV[i] - energyEV);
  }
  return (2 / 3) * WKB_DECAY_PER_M_PER_SQRT_EV * shapeTimesWidth;
}
