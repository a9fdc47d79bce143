import { BOLTZMANN_EV_PER_K, SUPPLY_CONSTANT_A_PER_M2_PER_EV2, WKB_DECAY_PER_M_PER_SQRT_EV } from './constants.ts';
import { buildEnergyGrid, createEnergyGrid, type EnergyGrid } from './energyGrid.ts';
import type { Junction, SampledProfile } from './barrierProfile.ts';
import { linearBarrierShape, linearBarrierShapeGradient, sampledWkbExponent } from './wkbExponent.ts';

/**
 * Planar tunnelling current density through the bias-tilted trapezoid, WKB transmission, at
 * temperature T:
 *   J(V) = (4π m e / h³) ∫ D(Ex) N(Ex) dEx,   D = exp(−γ),
 *   γ = A0 (u1₊^{3/2} − u2₊^{3/2})/(u1 − u2), u1 = φ1 − ε, u2 = φ2 − eV − ε, ε = Ex − E_F.
 * Sign: V is the sample bias; V > 0 sends electrons tip → sample and gives J > 0.
 * Source: J. G. Simmons, J. Appl. Phys. 34, 1793 (1963), eq. 1 (free-electron supply, transverse
 * momentum conserved) with the WKB exponent of a linear barrier; check values physics.md §5.
 * Units: biasV in V, temperatureK in K; returns A/m².
 * @example trapezoidCurrentDensity({ tipWorkFunctionEV: 4, sampleWorkFunctionEV: 4, gapM: 1e-9, fermiEnergyEV: 5.5 }, 0.1, 0) // ≈ 8.366882e3
 */
export function trapezoidCurrentDensity(junction: Junction, biasV: number, temperatureK: number): number {
  return trapezoidCurrentDensityWithGradient(junction, biasV, temperatureK, null);
}

const sharedGrid = createEnergyGrid();
const sharedPoint = createPreparedTrapezoidPoint(1024);
const breakpoints = [0, 0];
const shapeGradient = new Float64Array(2);

/**
 * (Module-private: the returned breakpoints are a shared array, overwritten by the next call.)
 * Decay rates of the transmission with energy for the grid layout: |∂γ/∂ε| at the upper Fermi level
 * and at the bottom of the integration range (eV⁻¹).
 */
function trapezoidDecayRates(
  junction: Junction,
  biasV: number,
): { decayRatePerEV: number; slowestDecayRatePerEV: number; breakpointsEV: readonly number[] } {
  const a0 = (2 / 3) * WKB_DECAY_PER_M_PER_SQRT_EV * junction.gapM;
  const top = Math.max(0, -biasV);
  const bottom = -junction.fermiEnergyEV + Math.max(0, -biasV);
  const phi1 = junction.tipWorkFunctionEV;
  const phi2 = junction.sampleWorkFunctionEV - biasV;
  // Heights at the upper Fermi level and at the bottom of the range.
  linearBarrierShapeGradient(phi1 - top, phi2 - top, shapeGradient);
  const decayRatePerEV = a0 * (shapeGradient[0] + shapeGradient[1]);
  linearBarrierShapeGradient(phi1 - bottom, phi2 - bottom, shapeGradient);
  const slowestDecayRatePerEV = a0 * (shapeGradient[0] + shapeGradient[1]);
  // The transmission kinks where the energy reaches the top of either barrier end.
  breakpoints[0] = phi1;
  breakpoints[1] = phi2;
  return { decayRatePerEV, slowestDecayRatePerEV, breakpointsEV: breakpoints };
}

/**
 * trapezoidCurrentDensity plus its gradient, for analytic Jacobians: gradient[0] = ∂J/∂φ1 (A/m² per eV),
 * gradient[1] = ∂J/∂φ2 (A/m² per eV), gradient[2] = ∂J/∂d (A/m² per m), from
 * ∂J/∂p = C ∫ (−∂γ/∂p) D N dEx with ∂γ/∂φ1 = A0 ∂G/∂u1, ∂γ/∂φ2 = A0 ∂G/∂u2, ∂γ/∂d = γ/d.
 *
 * Temperature enters one of two ways, chosen per bias point:
 * - Sommerfeld path (the usual STM case, π·c·k_BT ≪ 1 with c = |∂γ/∂ε|): writing the integral as
 *   ∫[f_tip(E) − f_sample(E)] P(E) dE with P(E) = ∫^E D dε and expanding each Fermi function,
 *   J(T) = J(0) + C Σ_μ ±[(π²/6)(k_BT)² D(μ) + (7π⁴/360)(k_BT)⁴ D''(μ)], μ = the two Fermi levels
 *   (N. W. Ashcroft and N. D. Mermin, Solid State Physics (1976), eq. 2.70). The neglected term is
 *   of order (31/15120)(π c k_BT)⁶ relative; the path is used only where that is below 1e-6, the
 *   barrier is closed within ±10 k_BT of both Fermi levels and the band bottom is far away.
 * - Full path: the energy grid with the Fermi functions in the weights (energyGrid.ts).
 */
export function trapezoidCurrentDensityWithGradient(
  junction: Junction,
  biasV: number,
  temperatureK: number,
  gradient: Float64Array | null,
): number {
  prepareTrapezoidPoint(sharedPoint, junction, biasV, temperatureK);
  return preparedTrapezoidCurrentDensity(sharedPoint, junction, biasV, gradient);
}

/**
 * The energy layout of one bias point, reusable while the barrier parameters move a little (the
 * layout depends on them only through the panel widths and the path choice). See
 * TrapezoidSpectrum for the reuse rule.
 */
export interface PreparedTrapezoidPoint {
  grid: EnergyGrid;
  /** True: the grid is the T = 0 layout plus the Sommerfeld terms; false: Fermi functions in the weights. */
  sommerfeld: boolean;
  thermalEnergyEV: number;
  /** Decay rate |∂γ/∂ε| at the upper Fermi level when the layout was built, 1/eV. */
  builtDecayRatePerEV: number;
  builtTipWorkFunctionEV: number;
  builtSampleWorkFunctionEV: number;
}

/** A point with an empty layout (capacity grows as needed). */
export function createPreparedTrapezoidPoint(capacity = 128): PreparedTrapezoidPoint {
  return {
    grid: createEnergyGrid(capacity),
    sommerfeld: false,
    thermalEnergyEV: 0,
    builtDecayRatePerEV: Number.NaN,
    builtTipWorkFunctionEV: Number.NaN,
    builtSampleWorkFunctionEV: Number.NaN,
  };
}

/** Choose the temperature path for this point and build its energy layout. */
export function prepareTrapezoidPoint(point: PreparedTrapezoidPoint, junction: Junction, biasV: number, temperatureK: number): void {
  const kT = BOLTZMANN_EV_PER_K * Math.max(temperatureK, 0);
  const rates = trapezoidDecayRates(junction, biasV);
  point.thermalEnergyEV = kT;
  point.sommerfeld = kT === 0 || sommerfeldApplies(junction, biasV, kT, rates.decayRatePerEV);
  point.builtDecayRatePerEV = rates.decayRatePerEV;
  point.builtTipWorkFunctionEV = junction.tipWorkFunctionEV;
  point.builtSampleWorkFunctionEV = junction.sampleWorkFunctionEV;
  buildEnergyGrid(point.grid, {
    biasV,
    temperatureK: point.sommerfeld ? 0 : temperatureK,
    fermiEnergyEV: junction.fermiEnergyEV,
    decayRatePerEV: rates.decayRatePerEV,
    slowestDecayRatePerEV: rates.slowestDecayRatePerEV,
    breakpointsEV: rates.breakpointsEV,
  });
}

/**
 * Whether a prepared layout still suits this junction: same temperature path, decay rate within
 * 15 %, and work functions within 0.05 eV (kinks of D move with them).
 */
export function preparedPointStillValid(point: PreparedTrapezoidPoint, junction: Junction, biasV: number): boolean {
  if (Math.abs(junction.tipWorkFunctionEV - point.builtTipWorkFunctionEV) > 0.05) return false;
  if (Math.abs(junction.sampleWorkFunctionEV - point.builtSampleWorkFunctionEV) > 0.05) return false;
  const rate = trapezoidDecayRates(junction, biasV).decayRatePerEV;
  if (!(rate > point.builtDecayRatePerEV / 1.15 && rate < point.builtDecayRatePerEV * 1.15)) return false;
  const kT = point.thermalEnergyEV;
  return kT === 0 || point.sommerfeld === sommerfeldApplies(junction, biasV, kT, rate);
}

/** J (A/m²) and its gradient from a prepared layout (see trapezoidCurrentDensityWithGradient). */
export function preparedTrapezoidCurrentDensity(point: PreparedTrapezoidPoint, junction: Junction, biasV: number, gradient: Float64Array | null): number {
  const base = integrateTrapezoid(junction, biasV, point.grid, gradient);
  const kT = point.thermalEnergyEV;
  if (!point.sommerfeld || kT === 0 || biasV === 0) return base;
  if (gradient !== null) {
    correctionGradient[0] = 0;
    correctionGradient[1] = 0;
    correctionGradient[2] = 0;
  }
  const correction =
    sommerfeldTerm(junction, biasV, 0, kT, gradient === null ? null : correctionGradient, 1) +
    sommerfeldTerm(junction, biasV, -biasV, kT, gradient === null ? null : correctionGradient, -1);
  if (gradient !== null) {
    gradient[0] += correctionGradient[0];
    gradient[1] += correctionGradient[1];
    gradient[2] += correctionGradient[2];
  }
  return base + correction;
}

const correctionGradient = new Float64Array(3);
const SOMMERFELD_STEP_EV = 0.02;
const SOMMERFELD_SECOND = (Math.PI * Math.PI) / 6;
const SOMMERFELD_FOURTH = (7 * Math.PI ** 4) / 360;

function sommerfeldApplies(junction: Junction, biasV: number, kT: number, decayRatePerEV: number): boolean {
  const x = Math.PI * decayRatePerEV * kT;
  if ((31 / 15120) * x ** 6 > 1e-6) return false;
  const guard = 10 * kT + SOMMERFELD_STEP_EV;
  const phi1 = junction.tipWorkFunctionEV;
  const phi2 = junction.sampleWorkFunctionEV - biasV;
  // The barrier must stay closed up to `guard` above the upper Fermi level.
  if (Math.min(phi1, phi2) - Math.max(0, -biasV) - guard <= 0) return false;
  const bottom = -junction.fermiEnergyEV + Math.max(0, -biasV);
  return Math.min(0, -biasV) - bottom > 40 * kT;
}

/**
 * C·sign·[(π²/6)(kT)² D(μ) + (7π⁴/360)(kT)⁴ D''(μ)], D'' by a central difference of step 0.02 eV;
 * adds its parameter gradient into `gradient` when given.
 */
function sommerfeldTerm(junction: Junction, biasV: number, level: number, kT: number, gradient: Float64Array | null, sign: number): number {
  const a0 = (2 / 3) * WKB_DECAY_PER_M_PER_SQRT_EV * junction.gapM;
  const phi1 = junction.tipWorkFunctionEV;
  const phi2 = junction.sampleWorkFunctionEV - biasV;
  const h = SOMMERFELD_STEP_EV;
  const second = SOMMERFELD_SECOND * kT * kT;
  const fourth = (SOMMERFELD_FOURTH * kT ** 4) / (h * h);
  let total = 0;
  for (let k = 0; k < 3; k++) {
    const e = level + (k - 1) * h;
    // Weights on D(μ − h), D(μ), D(μ + h).
    const weight = k === 1 ? second - 2 * fourth : fourth;
    const shape = linearBarrierShapeGradient(phi1 - e, phi2 - e, shapeGradient);
    const term = sign * SUPPLY_CONSTANT_A_PER_M2_PER_EV2 * weight * Math.exp(-a0 * shape);
    total += term;
    if (gradient !== null) {
      gradient[0] -= term * a0 * shapeGradient[0];
      gradient[1] -= term * a0 * shapeGradient[1];
      gradient[2] -= (term * a0 * shape) / junction.gapM;
    }
  }
  return total;
}

/** C Σ w_i D(ε_i) over a prepared grid, with the parameter gradient when asked. */
function integrateTrapezoid(junction: Junction, biasV: number, layout: EnergyGrid, gradient: Float64Array | null): number {
  const a0 = (2 / 3) * WKB_DECAY_PER_M_PER_SQRT_EV * junction.gapM;
  const phi1 = junction.tipWorkFunctionEV;
  const phi2 = junction.sampleWorkFunctionEV - biasV;
  const energies = layout.energiesEV;
  const weights = layout.weightsEV2;
  let sum = 0;
  if (gradient === null) {
    for (let i = 0; i < layout.count; i++) {
      const e = energies[i];
      sum += weights[i] * Math.exp(-a0 * linearBarrierShape(phi1 - e, phi2 - e));
    }
    return SUPPLY_CONSTANT_A_PER_M2_PER_EV2 * sum;
  }
  let sumPhi1 = 0;
  let sumPhi2 = 0;
  let sumGap = 0;
  for (let i = 0; i < layout.count; i++) {
    const e = energies[i];
    const shape = linearBarrierShapeGradient(phi1 - e, phi2 - e, shapeGradient);
    const term = weights[i] * Math.exp(-a0 * shape);
    sum += term;
    sumPhi1 += term * shapeGradient[0];
    sumPhi2 += term * shapeGradient[1];
    sumGap += term * shape;
  }
  const c = SUPPLY_CONSTANT_A_PER_M2_PER_EV2;
  gradient[0] = -c * a0 * sumPhi1;
  gradient[1] = -c * a0 * sumPhi2;
  gradient[2] = (-c * a0 * sumGap) / junction.gapM;
  return c * sum;
}

/**
 * Current density through any sampled barrier (e.g. image-rounded), WKB transmission with the
 * piecewise-linear exponent, same energy integral as trapezoidCurrentDensity.
 * Units: returns A/m².
 * @example sampledCurrentDensity(trapezoidProfile(junction, 0.1, 64), 0) // ≈ trapezoidCurrentDensity(junction, 0.1, 0)
 */
export function sampledCurrentDensity(profile: SampledProfile, temperatureK: number): number {
  const { positionsM, heightsEV, biasV, fermiEnergyEV } = profile;
  const top = Math.max(0, -biasV);
  const bottom = -fermiEnergyEV + top;
  const step = 1e-3;
  const rateAt = (e: number) =>
    (sampledWkbExponent(positionsM, heightsEV, e - step) - sampledWkbExponent(positionsM, heightsEV, e + step)) / (2 * step);
  const grid = buildEnergyGrid(sharedGrid, {
    biasV,
    temperatureK,
    fermiEnergyEV,
    decayRatePerEV: rateAt(top),
    slowestDecayRatePerEV: rateAt(bottom + step),
  });
  let sum = 0;
  for (let i = 0; i < grid.count; i++) {
    sum += grid.weightsEV2[i] * Math.exp(-sampledWkbExponent(positionsM, heightsEV, grid.energiesEV[i]));
  }
  return SUPPLY_CONSTANT_A_PER_M2_PER_EV2 * sum;
}
