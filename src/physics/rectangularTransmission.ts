import { ELECTRON_MASS_KG, ELEMENTARY_CHARGE_C, HBAR_J_S } from './constants.ts';

/** 2 m_e·(1 eV)/ħ²: squared wave number per eV of kinetic energy, 1/m² per eV (≈ 2.6247e19). */
const WAVE_NUMBER_SQUARED_PER_M2_PER_EV = (2 * ELECTRON_MASS_KG * ELEMENTARY_CHARGE_C) / (HBAR_J_S * HBAR_J_S);

/** A rectangular barrier between two identical electrodes; energies from the electrodes' band bottom. */
export interface RectangularBarrier {
  /** Kinetic energy of the incident electron above the band bottom, eV (> 0). */
  energyEV: number;
  /** Barrier height V0 above the band bottom, eV (any finite value; negative is a well). */
  barrierHeightEV: number;
  /** Barrier width a, m (> 0). */
  widthM: number;
}

/**
 * sinh(x)/x for x² ≥ 0 and sin(x)/x for x² < 0, as a function of x² (continuous through 0).
 * The small-|x²| series avoids 0/0 at the barrier top.
 */
function sinhcOfSquare(xSquared: number): number {
  if (Math.abs(xSquared) < 1e-6) return 1 + xSquared / 6 + (xSquared * xSquared) / 120;
  if (xSquared > 0) {
    const x = Math.sqrt(xSquared);
    return Math.sinh(x) / x;
  }
  const x = Math.sqrt(-xSquared);
  return Math.sin(x) / x;
}

/**
 * Exact transmission probability of a rectangular barrier (same band bottom on both sides), for an
 * electron of energy E above the band bottom and a barrier V0 high and a wide.
 * E < V0: T = [1 + V0²·sinh²(q·a) / (4E(V0 − E))]⁻¹, q = √(2m_e(V0 − E))/ħ;
 * E > V0: T = [1 + V0²·sin²(k·a) / (4E(E − V0))]⁻¹, k = √(2m_e(E − V0))/ħ;
 * E = V0: T = [1 + m_e·V0·a²/(2ħ²)]⁻¹.
 * All three are evaluated as T = [1 + V0²·a²·(2m_e/ħ²)·σ²/(4E)]⁻¹ with σ = sinh(qa)/(qa) or
 * sin(ka)/(ka), which is the same expression written without the 0/0 at E = V0. Energies in eV,
 * width in m; dimensionless result. Returns 0 when sinh² overflows (q·a > ~710, T < 1e-600).
 * Source: textbook result, e.g. E. Merzbacher, Quantum Mechanics, 3rd ed. (Wiley, 1998), ch. 6
 * (citation from memory); check values in physics.md §11.
 * @example rectangularTransmission({ energyEV: 5, barrierHeightEV: 9, widthM: 5e-10 }) // ≈ 1.401872e-4
 */
export function rectangularTransmission({ energyEV, barrierHeightEV, widthM }: RectangularBarrier): number {
  if (!(energyEV > 0 && Number.isFinite(energyEV))) throw new Error(`rectangularTransmission: energyEV must be > 0 and finite, got ${energyEV}`);
  if (!Number.isFinite(barrierHeightEV)) throw new Error(`rectangularTransmission: barrierHeightEV must be finite, got ${barrierHeightEV}`);
  if (!(widthM > 0 && Number.isFinite(widthM))) throw new Error(`rectangularTransmission: widthM must be > 0 and finite, got ${widthM}`);
  const phaseSquared = WAVE_NUMBER_SQUARED_PER_M2_PER_EV * (barrierHeightEV - energyEV) * widthM * widthM;
  const sigma = sinhcOfSquare(phaseSquared);
  const reflectionRatio =
    (barrierHeightEV * barrierHeightEV * WAVE_NUMBER_SQUARED_PER_M2_PER_EV * widthM * widthM * sigma * sigma) / (4 * energyEV);
  return 1 / (1 + reflectionRatio);
}
