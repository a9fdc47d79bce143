/**
 * Simmons' closed-form current densities for a barrier of mean height φ̄ over a forbidden width Δs:
 * the general (intermediate-voltage) form with its analytic derivatives for the fitter, the
 * low-voltage and high-voltage limits, and the dissimilar-electrode rules for φ̄ and Δs.
 * Sign convention (physics.md §0): V is the sample bias; J > 0 for V > 0 (electrons tip → sample).
 */
import { ELECTRON_MASS_KG, ELEMENTARY_CHARGE_C, PLANCK_J_S, WKB_DECAY_PER_M_PER_SQRT_EV } from './constants.ts';
import { checkJunction, type Junction } from './barrierProfile.ts';

/** e²/(2πh): Simmons' J0 times (βΔs)² per eV of barrier, A/eV (≈ 6.16574e-6; 6.16574e10 A/cm² at 1 Å). */
const SIMMONS_J0_A_PER_EV = (ELEMENTARY_CHARGE_C * ELEMENTARY_CHARGE_C) / (2 * Math.PI * PLANCK_J_S);

/** Input of {@link simmonsCurrentDensity} and {@link simmonsCurrentDensityDerivatives}. */
export interface SimmonsBarrier {
  /** Mean barrier height φ̄ above the emitter's Fermi level over the forbidden width, eV (> 0). */
  meanBarrierEV: number;
  /** Forbidden width Δs, m (> 0). */
  widthM: number;
  /** Sample bias V, volts; for V < 0 the sample emits and J = −J(|V|) with φ̄ above the sample's Fermi level. */
  biasV: number;
  /** Simmons' correction factor β (≈ 1; 23/24 for a triangle). Default 1. */
  beta?: number;
}

function checkSimmonsBarrier(caller: string, { meanBarrierEV, widthM, biasV, beta = 1 }: SimmonsBarrier): void {
  if (!(meanBarrierEV > 0 && Number.isFinite(meanBarrierEV))) throw new Error(`${caller}: meanBarrierEV must be > 0, got ${meanBarrierEV}`);
  if (!(widthM > 0 && Number.isFinite(widthM))) throw new Error(`${caller}: widthM must be > 0, got ${widthM}`);
  if (!Number.isFinite(biasV)) throw new Error(`${caller}: biasV must be finite, got ${biasV}`);
  if (!(beta > 0 && beta <= 1)) throw new Error(`${caller}: beta must be in (0, 1], got ${beta}`);
}

/**
 * Simmons' general current density through a barrier of mean height φ̄ and forbidden width Δs:
 * J = J0·[φ̄·e^{−A√φ̄} − (φ̄ + eV)·e^{−A√(φ̄ + eV)}], J0 = e/(2πh(βΔs)²), A = 4πβΔs√(2m_e)/h.
 * In practical units J0·φ̄ = 6.16574e10·φ̄/(βΔs)² A/cm² and A = 1.024633·βΔs (Δs in Å, φ̄ in eV);
 * the printed 6.2e10 and 1.025 are rounded. φ̄ in eV, Δs in m, V in volts; returns A/m², odd in V.
 * Source: J. G. Simmons, J. Appl. Phys. 34, 1793 (1963); physics.md §6.
 * @example simmonsCurrentDensity({ meanBarrierEV: 3.95, widthM: 1e-9, biasV: 0.1 }) // ≈ 7.19805e3
 */
export function simmonsCurrentDensity(barrier: SimmonsBarrier): number {
  checkSimmonsBarrier('simmonsCurrentDensity', barrier);
  return simmonsParts(barrier).currentDensityAPerM2;
}

/** Result of {@link simmonsCurrentDensityDerivatives}. */
export interface SimmonsDerivatives {
  /** J, A/m². */
  currentDensityAPerM2: number;
  /** ∂J/∂φ̄ at fixed Δs, β, V: A/m² per eV. */
  dCurrentDensityDMeanBarrier: number;
  /** ∂J/∂Δs at fixed φ̄, β, V: A/m² per m. */
  dCurrentDensityDWidth: number;
}

function simmonsParts({ meanBarrierEV, widthM, biasV, beta = 1 }: SimmonsBarrier): SimmonsDerivatives {
  const derivatives = new Float64Array(2);
  const current = simmonsCurrentDensityInto(meanBarrierEV, widthM, biasV, beta, derivatives);
  return { currentDensityAPerM2: current, dCurrentDensityDMeanBarrier: derivatives[0], dCurrentDensityDWidth: derivatives[1] };
}

/**
 * Allocation-free form of {@link simmonsCurrentDensityDerivatives} for fits that sweep it over
 * hundreds of biases: returns J (A/m²) and writes ∂J/∂φ̄ (A/m² per eV) and ∂J/∂Δs (A/m² per m) to
 * derivatives[0] and derivatives[1]. Arguments are not checked (φ̄ > 0, Δs > 0 are the caller's).
 * Source: as simmonsCurrentDensityDerivatives (J. G. Simmons, J. Appl. Phys. 34, 1793 (1963)).
 * @example simmonsCurrentDensityInto(4, 1e-9, 0.1, 1, out) // ≈ 6.37879e3, out[1] ≈ −1.37193e14
 */
export function simmonsCurrentDensityInto(meanBarrierEV: number, widthM: number, biasV: number, beta: number, derivatives: Float64Array): number {
  const phi = meanBarrierEV;
  const sign = biasV < 0 ? -1 : 1;
  const eV = Math.abs(biasV);
  const effectiveWidth = beta * widthM;
  const prefactor = SIMMONS_J0_A_PER_EV / (effectiveWidth * effectiveWidth);
  const a = WKB_DECAY_PER_M_PER_SQRT_EV * effectiveWidth;
  const rootLow = Math.sqrt(phi);
  const rootHigh = Math.sqrt(phi + eV);
  const expLow = Math.exp(-a * rootLow);
  const expHigh = Math.exp(-a * rootHigh);
  const bracket = phi * expLow - (phi + eV) * expHigh;
  const current = prefactor * bracket;
  // d/du [u·e^{−a√u}] = e^{−a√u}(1 − a√u/2);  d/da [u·e^{−a√u}] = −u^{3/2}·e^{−a√u};  da/dΔs = a/Δs.
  const dBracketDPhi = expLow * (1 - (a * rootLow) / 2) - expHigh * (1 - (a * rootHigh) / 2);
  const dBracketDA = -phi * rootLow * expLow + (phi + eV) * rootHigh * expHigh;
  const dCurrentDWidth = (-2 * current) / widthM + prefactor * dBracketDA * (a / widthM);
  derivatives[0] = sign * prefactor * dBracketDPhi;
  derivatives[1] = sign * dCurrentDWidth;
  return sign * current;
}

/**
 * Simmons' current density with its analytic partial derivatives with respect to the mean barrier
 * and the width (for an analytic fit Jacobian):
 * ∂J/∂φ̄ = J0·[e^{−A√φ̄}(1 − A√φ̄/2) − e^{−A√(φ̄+eV)}(1 − A√(φ̄+eV)/2)],
 * ∂J/∂Δs = −2J/Δs + J0·(A/Δs)·[(φ̄ + eV)^{3/2}e^{−A√(φ̄+eV)} − φ̄^{3/2}e^{−A√φ̄}],
 * with J0, A as in {@link simmonsCurrentDensity}. Units: A/m² per eV and A/m² per m.
 * Source: derivatives of J. G. Simmons, J. Appl. Phys. 34, 1793 (1963); physics.md §6.
 * @example simmonsCurrentDensityDerivatives({ meanBarrierEV: 4, widthM: 1e-9, biasV: 0.1 }).dCurrentDensityDWidth // ≈ −1.37193e14 (J = 6.37879e3 A/m²)
 */
export function simmonsCurrentDensityDerivatives(barrier: SimmonsBarrier): SimmonsDerivatives {
  checkSimmonsBarrier('simmonsCurrentDensityDerivatives', barrier);
  return simmonsParts(barrier);
}

/** Input of the low- and high-voltage forms. */
export interface SimmonsRectangle {
  /** Barrier height φ (low voltage) or φ0 (high voltage) above the Fermi level, eV (> 0). */
  barrierHeightEV: number;
  /** Barrier width s, m (> 0). */
  widthM: number;
  /** Sample bias V, volts. */
  biasV: number;
}

function checkRectangle(caller: string, { barrierHeightEV, widthM, biasV }: SimmonsRectangle): void {
  if (!(barrierHeightEV > 0 && Number.isFinite(barrierHeightEV))) throw new Error(`${caller}: barrierHeightEV must be > 0, got ${barrierHeightEV}`);
  if (!(widthM > 0 && Number.isFinite(widthM))) throw new Error(`${caller}: widthM must be > 0, got ${widthM}`);
  if (!Number.isFinite(biasV)) throw new Error(`${caller}: biasV must be finite, got ${biasV}`);
}

/**
 * Simmons' low-voltage (ohmic) current density of a rectangular barrier:
 * J = (e²·√(2m_e·φ)/(h²·s))·V·e^{−A√φ}, A = 2√(2m_e)·s/ħ,
 * in practical units 3.15881e10·(√φ/s)·V·e^{−1.024633·s√φ} A/cm² (s in Å, φ in eV): the printed
 * 3.16e10 and 1.025 are right. φ in eV, s in m, V in volts; returns A/m².
 * Source: J. G. Simmons, J. Appl. Phys. 34, 1793 (1963), low-voltage limit; physics.md §6.
 * @example simmonsLowVoltageCurrentDensity({ barrierHeightEV: 4, widthM: 5e-10, biasV: 1 }) // ≈ 4.48391e9 (G/area 4.48391e-11 S/Å²)
 */
export function simmonsLowVoltageCurrentDensity(input: SimmonsRectangle): number {
  checkRectangle('simmonsLowVoltageCurrentDensity', input);
  const { barrierHeightEV: phi, widthM: s, biasV } = input;
  const momentum = Math.sqrt(2 * ELECTRON_MASS_KG * phi * ELEMENTARY_CHARGE_C);
  const prefactor = (ELEMENTARY_CHARGE_C * ELEMENTARY_CHARGE_C * momentum) / (PLANCK_J_S * PLANCK_J_S * s);
  return prefactor * biasV * Math.exp(-WKB_DECAY_PER_M_PER_SQRT_EV * s * Math.sqrt(phi));
}

/** Input of {@link simmonsHighVoltageCurrentDensity}. */
export interface SimmonsHighVoltage extends SimmonsRectangle {
  /** β for the triangular barrier. Default 23/24. */
  beta?: number;
}

/**
 * Leading term of Simmons' high-voltage (eV > φ0, triangular barrier, Fowler–Nordheim-like) current:
 * J = e³F²/(4πhβ²φ0)·exp[−4πβ√m_e·φ0^{3/2}/(h·e·F)], F = V/s, φ0 in joules inside the formula;
 * in practical units 3.35677e10·(F²/φ0)·e^{−0.69434·φ0^{3/2}/F} A/cm² (F in V/Å, φ0 in eV) with
 * β = 23/24; the printed 3.38e10 and 0.689 (from memory) are not reproduced, so the symbolic form is
 * used. φ0 in eV, s in m, V in volts; returns A/m², odd in V.
 * Source: J. G. Simmons, J. Appl. Phys. 34, 1793 (1963), high-voltage range; physics.md §6.
 * @example simmonsHighVoltageCurrentDensity({ barrierHeightEV: 4, widthM: 1e-9, biasV: 10 }) // ≈ 3.24705e11 (= 3.35677e14·(1²/4)·e^{−0.69434·8})
 */
export function simmonsHighVoltageCurrentDensity(input: SimmonsHighVoltage): number {
  const caller = 'simmonsHighVoltageCurrentDensity';
  checkRectangle(caller, input);
  const { barrierHeightEV: phi0, widthM: s, biasV, beta = 23 / 24 } = input;
  if (!(beta > 0 && beta <= 1)) throw new Error(`${caller}: beta must be in (0, 1], got ${beta}`);
  if (biasV === 0) return 0;
  const field = Math.abs(biasV) / s; // V/m
  const e = ELEMENTARY_CHARGE_C;
  const phiJ = phi0 * e;
  const prefactor = (e * e * e * field * field) / (4 * Math.PI * PLANCK_J_S * beta * beta * phiJ);
  const exponent = (4 * Math.PI * beta * Math.sqrt(ELECTRON_MASS_KG) * phiJ ** 1.5) / (PLANCK_J_S * e * field);
  return Math.sign(biasV) * prefactor * Math.exp(-exponent);
}

/** Result of {@link simmonsDissimilarBarrier}. */
export interface SimmonsDissimilarBarrier {
  /** Mean barrier φ̄ above the emitter Fermi level over the forbidden width, eV. */
  meanBarrierEV: number;
  /** Forbidden width Δs, m. */
  widthM: number;
  /** β of the linear forbidden part: 1 − (a − b₊)²/(96φ̄²) (23/24 for a triangle). */
  beta: number;
  /** Which electrode emits: the tip for V ≥ 0, the sample for V < 0. */
  emitter: 'tip' | 'sample';
}

/**
 * Mean barrier and forbidden width for dissimilar electrodes (trapezoid, no image force). With
 * a = φ_emitter and b = φ_collector − e|V|: b > 0 ⇒ Δs = s, φ̄ = (a + b)/2;
 * b ≤ 0 ⇒ Δs = s·a/(a − b), φ̄ = a/2 (triangle). β of the forbidden part, with ends a and b₊ = max(b, 0):
 * β = 1 − (a − b₊)²/(96φ̄²) (the general β = 1 − ∫(φ − φ̄)²dx/(8φ̄²Δs) is from memory).
 * Emitter: the tip for V ≥ 0, the sample for V < 0 (physics.md §0). Junction energies in eV, gap in m,
 * V in volts.
 * Source: J. G. Simmons, J. Appl. Phys. 34, 2581 (1963); β from J. Appl. Phys. 34, 1793 (1963);
 * physics.md §6.
 * @example simmonsDissimilarBarrier({ tipWorkFunctionEV: 3.5, sampleWorkFunctionEV: 4.5, gapM: 1e-9, fermiEnergyEV: 5.5 }, 6).widthM // 7e-10
 */
export function simmonsDissimilarBarrier(junction: Junction, biasV: number): SimmonsDissimilarBarrier {
  const caller = 'simmonsDissimilarBarrier';
  checkJunction(caller, junction);
  if (!Number.isFinite(biasV)) throw new Error(`${caller}: biasV must be finite, got ${biasV}`);
  const tipEmits = biasV >= 0;
  const a = tipEmits ? junction.tipWorkFunctionEV : junction.sampleWorkFunctionEV;
  const b = (tipEmits ? junction.sampleWorkFunctionEV : junction.tipWorkFunctionEV) - Math.abs(biasV);
  const triangle = b <= 0;
  const meanBarrierEV = triangle ? a / 2 : (a + b) / 2;
  const widthM = triangle ? (junction.gapM * a) / (a - b) : junction.gapM;
  const drop = a - Math.max(b, 0);
  const beta = 1 - (drop * drop) / (96 * meanBarrierEV * meanBarrierEV);
  return { meanBarrierEV, widthM, beta, emitter: tipEmits ? 'tip' : 'sample' };
}

/**
 * Simmons' current density for dissimilar electrodes: {@link simmonsCurrentDensity} with φ̄, Δs (and β
 * when useBeta) from {@link simmonsDissimilarBarrier}. With β = 1 it is polarity-symmetric while
 * b > 0; β gives the asymmetry. Junction energies in eV, gap in m, V in volts; returns A/m².
 * Source: J. G. Simmons, J. Appl. Phys. 34, 2581 (1963); physics.md §6.
 * @example simmonsDissimilarCurrentDensity({ tipWorkFunctionEV: 3.5, sampleWorkFunctionEV: 4.5, gapM: 1e-9, fermiEnergyEV: 5.5 }, 1, { useBeta: true }) / simmonsDissimilarCurrentDensity({ tipWorkFunctionEV: 3.5, sampleWorkFunctionEV: 4.5, gapM: 1e-9, fermiEnergyEV: 5.5 }, -1, { useBeta: true }) // ≈ −0.9314
 */
export function simmonsDissimilarCurrentDensity(junction: Junction, biasV: number, options: { useBeta?: boolean } = {}): number {
  const barrier = simmonsDissimilarBarrier(junction, biasV);
  const beta = options.useBeta ? barrier.beta : 1;
  return simmonsCurrentDensity({ meanBarrierEV: barrier.meanBarrierEV, widthM: barrier.widthM, biasV, beta });
}
