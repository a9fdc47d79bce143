import { nmToM } from './units.ts';

/**
 * Geometry of a planar tunnel junction: electrode 1 is the tip, electrode 2 the sample, V the sample
 * bias. Energies in eV, measured from the Fermi level of electrode 1 unless the name says otherwise.
 * With V > 0 the sample's Fermi level sits eV below the tip's, and electrons flow tip → sample.
 */
export interface Junction {
  /** Work function of the tip (electrode 1), eV. */
  tipWorkFunctionEV: number;
  /** Work function of the sample (electrode 2), eV. */
  sampleWorkFunctionEV: number;
  /** Electrode separation d, m. */
  gapM: number;
  /** Fermi energy above the conduction-band bottom, eV (same for both electrodes). */
  fermiEnergyEV: number;
}

/**
 * A barrier given as samples: height above the tip Fermi level U(x) in eV at positions x in m,
 * x from 0 (tip surface) to d (sample surface), strictly increasing. Between samples the barrier
 * is linear. The right electrode's band bottom sits at −(fermiEnergyEV + biasV) relative to the
 * tip Fermi level.
 */
export interface SampledProfile {
  positionsM: Float64Array;
  heightsEV: Float64Array;
  fermiEnergyEV: number;
  biasV: number;
}

/**
 * Trapezoidal barrier height above the tip Fermi level at position x:
 * U(x) = φ1 + (φ2 − φ1 − eV)·x/d, 0 ≤ x ≤ d (energies in eV, V in volts).
 * Source: J. G. Simmons, J. Appl. Phys. 34, 2581 (1963), dissimilar electrodes; bias tilts the
 * barrier linearly (no image force).
 * @example trapezoidHeightEV({ tipWorkFunctionEV: 4, sampleWorkFunctionEV: 4, gapM: 1e-9, fermiEnergyEV: 5.5 }, 1, 0.5e-9) // 3.5
 */
export function trapezoidHeightEV(junction: Junction, biasV: number, positionM: number): number {
  const { tipWorkFunctionEV: phi1, sampleWorkFunctionEV: phi2, gapM } = junction;
  return phi1 + ((phi2 - phi1 - biasV) * positionM) / gapM;
}

/**
 * The trapezoid sampled at `slices + 1` equally spaced points, for the quadrature and
 * transfer-matrix paths that take any profile.
 * @example trapezoidProfile(junction, 0.1, 100).heightsEV.length // 101
 */
export function trapezoidProfile(junction: Junction, biasV: number, slices: number): SampledProfile {
  if (!(slices >= 1)) throw new Error(`trapezoidProfile: slices must be >= 1, got ${slices}`);
  const positionsM = new Float64Array(slices + 1);
  const heightsEV = new Float64Array(slices + 1);
  for (let i = 0; i <= slices; i++) {
    positionsM[i] = (junction.gapM * i) / slices;
    heightsEV[i] = trapezoidHeightEV(junction, biasV, positionsM[i]);
  }
  return { positionsM, heightsEV, fermiEnergyEV: junction.fermiEnergyEV, biasV };
}

/** Validate a junction: work functions in (0, 20] eV, gap in (0, 100] nm, Fermi energy in (0, 50] eV. */
export function checkJunction(caller: string, junction: Junction): void {
  const { tipWorkFunctionEV, sampleWorkFunctionEV, gapM, fermiEnergyEV } = junction;
  if (!(tipWorkFunctionEV > 0 && tipWorkFunctionEV <= 20)) throw new Error(`${caller}: tipWorkFunctionEV must be in (0, 20], got ${tipWorkFunctionEV}`);
  if (!(sampleWorkFunctionEV > 0 && sampleWorkFunctionEV <= 20)) throw new Error(`${caller}: sampleWorkFunctionEV must be in (0, 20], got ${sampleWorkFunctionEV}`);
  if (!(gapM > 0 && gapM <= nmToM(100))) throw new Error(`${caller}: gapM must be in (0, 1e-7], got ${gapM}`);
  if (!(fermiEnergyEV > 0 && fermiEnergyEV <= 50)) throw new Error(`${caller}: fermiEnergyEV must be in (0, 50], got ${fermiEnergyEV}`);
}
