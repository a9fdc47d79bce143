import type { Junction } from './barrierProfile.ts';
import { CONDUCTANCE_QUANTUM_S } from './constants.ts';
import { gaussian, mulberry32 } from './random.ts';
import { paraboloidTipAreaM2 } from './tipArea.ts';

/** J(V) of a junction at a temperature, A/m². */
export type CurrentDensityModel = (junction: Junction, biasV: number, temperatureK: number) => number;

export interface SimulationInput {
  kind: 'iv' | 'iz';
  /** The tip/sample junction; for `iz` its gap is replaced by each sweep value. */
  junction: Junction;
  /** Current density model (WKB trapezoid, Simmons, exact transfer matrix). */
  currentDensity: CurrentDensityModel;
  /** Effective area in m², or a tip radius in m from which A_eff = πR/κ (κ at the mean work function). */
  area: { areaM2: number } | { tipRadiusM: number };
  temperatureK: number;
  /** Bias of a single `iv` point, or the fixed bias of an `iz` sweep, V. */
  biasV: number;
  /** Sweep: bias in V for `iv`, gap in m for `iz`; omitted → one point. */
  sweep?: { from: number; to: number; points: number };
  /** Noise: relative (multiplicative) σ and an additive floor σ in A, drawn from a seeded generator. */
  noise?: { relative: number; floorA: number; seed: number };
}

export interface SimulatedPoint {
  biasV: number;
  gapM: number;
  currentA: number;
  /** Noise-free current density, A/m². */
  currentDensityAPerM2: number;
  /** I/V of the (noisy) current, S. */
  conductanceS: number;
}

export interface SimulationResult {
  kind: 'iv' | 'iz';
  areaM2: number;
  points: SimulatedPoint[];
}

/**
 * The effective area used by a simulation, m². A tip radius maps through the paraboloid formula
 * A_eff = πR/κ with κ at the mean of the two work functions (physics.md §9).
 * @example simulationAreaM2({ tipRadiusM: 1e-8 }, junction) // 3.066e-18 for φ̄ = 4 eV
 */
export function simulationAreaM2(area: SimulationInput['area'], junction: Junction): number {
  if ('areaM2' in area) return area.areaM2;
  const meanBarrierEV = 0.5 * (junction.tipWorkFunctionEV + junction.sampleWorkFunctionEV);
  return paraboloidTipAreaM2(area.tipRadiusM, meanBarrierEV);
}

/**
 * Simulate an I(V) spectrum or an I(z) approach curve: I = A_eff·J(V, s) with optional seeded noise
 * I_noisy = I·(1 + σ_rel·g₁) + σ_floor·g₂, g ~ N(0, 1). Sweeps are evenly spaced from `from` to `to`.
 * The current is kept below the point-contact conductance G0·|V| (a real junction cannot pass more).
 * @example simulateCurve({ kind: 'iz', junction, currentDensity: trapezoidCurrentDensity, area: { areaM2: 1e-18 }, temperatureK: 300, biasV: 0.1, sweep: { from: 4e-10, to: 1e-9, points: 64 } })
 */
export function simulateCurve(input: SimulationInput): SimulationResult {
  const { kind, junction, currentDensity, temperatureK, biasV, sweep, noise } = input;
  const areaM2 = simulationAreaM2(input.area, junction);
  const count = sweep ? sweep.points : 1;
  const uniform = noise ? mulberry32(noise.seed) : null;
  const points: SimulatedPoint[] = [];
  for (let i = 0; i < count; i++) {
    const sweepValue = sweep ? (count === 1 ? sweep.from : sweep.from + ((sweep.to - sweep.from) * i) / (count - 1)) : 0;
    const pointBiasV = kind === 'iv' && sweep ? sweepValue : biasV;
    const gapM = kind === 'iz' && sweep ? sweepValue : junction.gapM;
    const densityAPerM2 = pointBiasV === 0 ? 0 : currentDensity({ ...junction, gapM }, pointBiasV, temperatureK);
    let currentA = densityAPerM2 * areaM2;
    const contactA = CONDUCTANCE_QUANTUM_S * Math.abs(pointBiasV);
    if (Math.abs(currentA) > contactA) currentA = Math.sign(currentA) * contactA;
    if (uniform && noise) currentA = currentA * (1 + noise.relative * gaussian(uniform)) + noise.floorA * gaussian(uniform);
    points.push({
      biasV: pointBiasV,
      gapM,
      currentA,
      currentDensityAPerM2: densityAPerM2,
      conductanceS: pointBiasV === 0 ? Number.NaN : currentA / pointBiasV,
    });
  }
  return { kind, areaM2, points };
}
