import { WKB_DECAY_PER_M_PER_SQRT_EV } from './constants.ts';

/**
 * Decay constant κ = √(2 m φ)/ħ of the wavefunction in a barrier of height φ, 1/m.
 * κ = ½ · 1.02463344 Å⁻¹ eV⁻½ · √φ; the current falls as e^{−2κs}.
 * Source: textbook WKB (e.g. C. J. Chen, Introduction to Scanning Tunneling Microscopy, 2nd ed. (2008), §1.1 [from memory]); physics.md §1.
 * @example decayConstantPerM(4) // 1.02463344e10
 */
export function decayConstantPerM(barrierHeightEV: number): number {
  if (!(barrierHeightEV > 0)) throw new Error(`decayConstantPerM: barrierHeightEV must be > 0, got ${barrierHeightEV}`);
  return 0.5 * WKB_DECAY_PER_M_PER_SQRT_EV * Math.sqrt(barrierHeightEV);
}

/**
 * Effective tunnelling area of a paraboloidal tip of apex radius R over a flat sample:
 * with s(ρ) = z0 + ρ²/(2R) and J ∝ e^{−2κs}, I = J(z0)·πR/κ, so A_eff = πR/κ (m²).
 * Source: physics.md §9 (exact integral of the local planar current over the paraboloid).
 * @example paraboloidTipAreaM2(1e-8, 4) // 3.066065e-18 (306.6065 Å²)
 */
export function paraboloidTipAreaM2(tipRadiusM: number, barrierHeightEV: number): number {
  if (!(tipRadiusM > 0)) throw new Error(`paraboloidTipAreaM2: tipRadiusM must be > 0, got ${tipRadiusM}`);
  return (Math.PI * tipRadiusM) / decayConstantPerM(barrierHeightEV);
}

/**
 * Effective area of a spherical tip of radius R: (πR/κ)(1 − 1/(2κR)) (m²).
 * Source: physics.md §9.
 * @example sphericalTipAreaM2(1e-8, 4) // 3.051103e-18
 */
export function sphericalTipAreaM2(tipRadiusM: number, barrierHeightEV: number): number {
  const kappa = decayConstantPerM(barrierHeightEV);
  return ((Math.PI * tipRadiusM) / kappa) * (1 - 1 / (2 * kappa * tipRadiusM));
}
