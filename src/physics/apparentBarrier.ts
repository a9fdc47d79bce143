import { APPARENT_BARRIER_PREFACTOR_EV_M2, CONDUCTANCE_QUANTUM_S, WKB_DECAY_PER_M_PER_SQRT_EV } from './constants.ts';

/**
 * Apparent barrier height from the slope of ln I against z: φ_ap = (ħ²/8m)(d lnI/dz)².
 * = 0.95249553 eV Å² · (d lnI/dz)². Slope in 1/m (either sign); returns eV.
 * Source: G. Binnig, H. Rohrer, Ch. Gerber, E. Weibel, Appl. Phys. Lett. 40, 178 (1982) [from memory];
 * physics.md §2.
 * @example apparentBarrierFromSlopeEV(-2e10) // 3.8099821
 */
export function apparentBarrierFromSlopeEV(logCurrentSlopePerM: number): number {
  return APPARENT_BARRIER_PREFACTOR_EV_M2 * logCurrentSlopePerM * logCurrentSlopePerM;
}

/**
 * Uncertainty of φ_ap from the slope's: σ_φ = φ_ap · 2σ_slope/|slope| (first-order propagation).
 * Source: physics.md §2.
 * @example apparentBarrierErrorEV(-2e10, 1e8) // 0.038099821
 */
export function apparentBarrierErrorEV(logCurrentSlopePerM: number, slopeErrorPerM: number): number {
  return apparentBarrierFromSlopeEV(logCurrentSlopePerM) * ((2 * slopeErrorPerM) / Math.abs(logCurrentSlopePerM));
}

/**
 * The slope d lnI/dz (1/m, negative: z grows as the tip retracts) that a barrier φ gives: −2κ.
 * @example logCurrentSlopeForBarrierPerM(4) // −2.04926689e10
 */
export function logCurrentSlopeForBarrierPerM(barrierHeightEV: number): number {
  return -WKB_DECAY_PER_M_PER_SQRT_EV * Math.sqrt(barrierHeightEV);
}

/**
 * Planar-WKB estimate of φ_ap at gap s for a barrier φ, including the 1/s prefactor of J:
 * φ_ap ≈ 0.9525 (1.0246√φ + 1/s)² (eV, s in m). Shows how far φ_ap sits above φ at small gaps.
 * Source: physics.md §2 (planar WKB J ∝ (1/s) e^{−2κs}).
 * @example prefactorApparentBarrierEV(4, 1e-9) // ≈ 4.400 (the full integral gives 4.4166 eV, physics.md §2)
 */
export function prefactorApparentBarrierEV(barrierHeightEV: number, gapM: number): number {
  const slope = WKB_DECAY_PER_M_PER_SQRT_EV * Math.sqrt(barrierHeightEV) + 1 / gapM;
  return APPARENT_BARRIER_PREFACTOR_EV_M2 * slope * slope;
}

/**
 * Invert prefactorApparentBarrierEV: the barrier φ whose planar-WKB slope at gap s is the measured one,
 * √φ = (|d lnI/dz| − 1/s)/1.0246. Returns eV (0 when the slope is below 1/s).
 * Source: physics.md §2.
 * @example prefactorCorrectedBarrierEV(-2.24927e10, 1e-9) // ≈ 4.400 (a 2.24927 Å⁻¹ slope at 10 Å)
 */
export function prefactorCorrectedBarrierEV(logCurrentSlopePerM: number, gapM: number): number {
  const root = (Math.abs(logCurrentSlopePerM) - 1 / gapM) / WKB_DECAY_PER_M_PER_SQRT_EV;
  return root > 0 ? root * root : 0;
}

/**
 * Distance from point contact by extrapolating G = G0·e^{−2κ(z − z_c)} to the conductance quantum:
 * z − z_c = ln(G0/G)/(2κ), κ from the apparent barrier; σ_z = (z − z_c)·σ_φ/(2φ). Returns metres.
 * Source: physics.md §3; G0 = 2e²/h.
 * @example gapToContactM({ currentA: 1e-9, biasV: 0.1, apparentBarrierEV: 4 }) // 4.3700e-10
 */
export function gapToContactM(input: { currentA: number; biasV: number; apparentBarrierEV: number; apparentBarrierErrorEV?: number }): {
  gapM: number;
  gapErrorM: number;
} {
  const { currentA, biasV, apparentBarrierEV } = input;
  if (!(apparentBarrierEV > 0)) throw new Error(`gapToContactM: apparentBarrierEV must be > 0, got ${apparentBarrierEV}`);
  if (!(biasV !== 0 && Number.isFinite(biasV))) throw new Error(`gapToContactM: biasV must be non-zero, got ${biasV}`);
  const conductanceS = Math.abs(currentA / biasV);
  if (!(conductanceS > 0)) throw new Error(`gapToContactM: currentA must be non-zero, got ${currentA}`);
  const twoKappa = WKB_DECAY_PER_M_PER_SQRT_EV * Math.sqrt(apparentBarrierEV);
  const gapM = Math.log(CONDUCTANCE_QUANTUM_S / conductanceS) / twoKappa;
  const gapErrorM = Math.abs(gapM) * ((input.apparentBarrierErrorEV ?? 0) / (2 * apparentBarrierEV));
  return { gapM, gapErrorM };
}
