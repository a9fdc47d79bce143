import { BOLTZMANN_EV_PER_K } from './constants.ts';
import { gaussLaguerre, gaussLegendre } from './quadrature.ts';

/**
 * Quadrature nodes for the tunnelling energy integral, with the supply function folded into the
 * weights, so that J = C · Σ weight_i · D(energy_i).
 *
 * Energies ε are in eV from the tip Fermi level (ε = Ex − E_F); V is the sample bias. The supply
 * function of free electrons with transverse momentum conserved is
 *   N(ε) = k_BT · { ln[1 + e^{−ε/k_BT}] − ln[1 + e^{−(ε + eV)/k_BT}] }
 * (J. G. Simmons, J. Appl. Phys. 34, 1793 (1963), eq. 1 with the Fermi–Dirac distributions), whose
 * T → 0 limit is N = max(−ε, 0) − max(−ε − eV, 0). It is negative for V < 0, so the sign of the
 * current follows the bias. Both electrodes need states: ε ≥ −E_F + max(0, −eV).
 *
 * Layout (each panel a Gauss–Legendre rule): below the lower Fermi level the integrand is the
 * transmission's exponential rise, so panels are a few e-folds of D wide and stop once D has fallen
 * by ~e^{−24}; each Fermi edge gets panels at 4 and 12 k_BT on both sides where N bends; the window between the Fermi
 * levels is cut into e-fold panels; above the upper level a Gauss–Laguerre rule in (ε − μ)/k_BT
 * takes the thermal tail. Accuracy ≈ 1e-6 relative against an adaptive reference (test/physics).
 */
export interface EnergyGrid {
  energiesEV: Float64Array;
  weightsEV2: Float64Array;
  count: number;
}

const PANEL_NODES = 6;
const TAIL_NODES = 6;
const EDGE_INNER_KT = 4;
const EDGE_OUTER_KT = 12;
const EFOLDS_PER_PANEL = 5;
const EFOLDS_KEPT = 24;
const MAX_NODES = 1024;
const gradedBreakpoints: number[] = [];
const KINK_GRADING_EV = [-0.16, -0.04, -0.01, -0.0025, 0, 0.0025, 0.01, 0.04, 0.16];

const legendre = gaussLegendre(PANEL_NODES);
// Deep panels lose a factor ~e^{−5} of weight each step down, so they need fewer nodes:
// 6, then 4, then 3 (error of each below 1e-6 of the total for an exponential integrand).
const deepRules = [legendre, gaussLegendre(4), gaussLegendre(3)];
const laguerre = gaussLaguerre(TAIL_NODES);

/** An empty grid; it grows when a layout needs more nodes than `capacity`. */
export function createEnergyGrid(capacity = MAX_NODES): EnergyGrid {
  return { energiesEV: new Float64Array(capacity), weightsEV2: new Float64Array(capacity), count: 0 };
}

function reserve(grid: EnergyGrid, extra: number): void {
  if (grid.count + extra <= grid.energiesEV.length) return;
  const capacity = Math.max(2 * grid.energiesEV.length, grid.count + extra);
  const energies = new Float64Array(capacity);
  const weights = new Float64Array(capacity);
  energies.set(grid.energiesEV.subarray(0, grid.count));
  weights.set(grid.weightsEV2.subarray(0, grid.count));
  grid.energiesEV = energies;
  grid.weightsEV2 = weights;
}

/** ln(1 + e^y) without overflow or loss. */
function softplus(y: number): number {
  if (y > 36) return y;
  if (y < -36) return Math.exp(y);
  return y > 0 ? y + Math.log1p(Math.exp(-y)) : Math.log1p(Math.exp(y));
}

/**
 * Supply function N(ε) in eV (see EnergyGrid). thermalEnergyEV = k_BT; 0 gives the T = 0 limit.
 * @example supplyFunctionEV(-1, 0.1, 0) // 0.1
 */
export function supplyFunctionEV(energyEV: number, biasV: number, thermalEnergyEV: number): number {
  if (thermalEnergyEV <= 0) return Math.max(-energyEV, 0) - Math.max(-energyEV - biasV, 0);
  return thermalEnergyEV * (softplus(-energyEV / thermalEnergyEV) - softplus(-(energyEV + biasV) / thermalEnergyEV));
}

function addPanel(grid: EnergyGrid, from: number, to: number, biasV: number, kT: number, rule = legendre): void {
  if (!(to > from)) return;
  const half = 0.5 * (to - from);
  const middle = 0.5 * (to + from);
  reserve(grid, rule.nodes.length);
  for (let i = 0; i < rule.nodes.length; i++) {
    const energy = middle + half * rule.nodes[i];
    const k = grid.count++;
    grid.energiesEV[k] = energy;
    grid.weightsEV2[k] = half * rule.weights[i] * supplyFunctionEV(energy, biasV, kT);
  }
}

/** Panels from `top` down to `bottom`, `widthEV` each, with fewer nodes as they go deeper; split at breaks. */
function addDeepPanels(grid: EnergyGrid, bottom: number, top: number, widthEV: number, biasV: number, kT: number, breaks?: readonly number[]): void {
  for (let p = 0; top - p * widthEV > bottom && p < 40; p++) {
    const to = top - p * widthEV;
    const from = Math.max(bottom, to - widthEV);
    const rule = deepRules[Math.min(p, deepRules.length - 1)];
    let split = Number.NaN;
    if (breaks) for (const b of breaks) if (b > from + 1e-9 && b < to - 1e-9) split = b;
    if (Number.isNaN(split)) addPanel(grid, from, to, biasV, kT, rule);
    else {
      addPanel(grid, from, split, biasV, kT, rule);
      addPanel(grid, split, to, biasV, kT, rule);
    }
  }
}

function addSplitPanels(grid: EnergyGrid, from: number, to: number, widthEV: number, biasV: number, kT: number, breaks?: readonly number[]): void {
  if (!(to > from)) return;
  if (breaks) {
    // Split at the first break strictly inside, recurse on both sides.
    for (const b of breaks) {
      if (b > from + 1e-9 && b < to - 1e-9) {
        addSplitPanels(grid, from, b, widthEV, biasV, kT, breaks);
        addSplitPanels(grid, b, to, widthEV, biasV, kT, breaks);
        return;
      }
    }
  }
  const panels = Math.min(40, Math.max(1, Math.ceil((to - from) / widthEV)));
  const step = (to - from) / panels;
  for (let p = 0; p < panels; p++) addPanel(grid, from + p * step, from + (p + 1) * step, biasV, kT);
}

/**
 * Fill `grid` for one bias point. decayRatePerEV is |∂γ/∂ε| of the transmission exponent near the
 * upper Fermi level (sets the panel width); slowestDecayRatePerEV its smallest value over the range
 * (sets where the deep panels may stop).
 * @example buildEnergyGrid(grid, { biasV: 0.1, temperatureK: 300, fermiEnergyEV: 5.5, decayRatePerEV: 2.56, slowestDecayRatePerEV: 1.66 })
 */
export function buildEnergyGrid(
  grid: EnergyGrid,
  options: {
    biasV: number;
    temperatureK: number;
    fermiEnergyEV: number;
    decayRatePerEV: number;
    slowestDecayRatePerEV: number;
    /** Energies where the transmission has a kink (a classical turning point reaching a barrier end). */
    breakpointsEV?: readonly number[];
  },
): EnergyGrid {
  const { biasV, temperatureK, fermiEnergyEV } = options;
  // A kink of D (turning point reaching a barrier end) is a u^{3/2} singularity: grade the panels
  // geometrically towards it so Gauss–Legendre keeps its accuracy.
  const rangeBottom = -fermiEnergyEV + Math.max(0, -biasV);
  const rangeTop = Math.max(0, -biasV) + EDGE_OUTER_KT * BOLTZMANN_EV_PER_K * Math.max(temperatureK, 0);
  const breakpointsEV = gradedBreakpoints;
  breakpointsEV.length = 0;
  for (const b of options.breakpointsEV ?? []) {
    if (b < rangeBottom - 0.2 || b > rangeTop + 0.2) continue;
    for (const offset of KINK_GRADING_EV) breakpointsEV.push(b + offset);
  }
  const kT = BOLTZMANN_EV_PER_K * Math.max(temperatureK, 0);
  const rate = Math.max(options.decayRatePerEV, 0.2);
  const slowest = Math.max(Math.min(options.slowestDecayRatePerEV, rate), 0.05);
  const panelWidth = EFOLDS_PER_PANEL / rate;
  const lower = Math.min(0, -biasV);
  const upper = Math.max(0, -biasV);
  const bottom = -fermiEnergyEV + Math.max(0, -biasV);
  grid.count = 0;
  if (biasV === 0) return grid;
  const edge = kT > 0 ? EDGE_OUTER_KT * kT : 0;
  const deepTop = Math.max(bottom, lower - edge);
  const deepBottom = Math.max(bottom, deepTop - EFOLDS_KEPT / slowest);
  addDeepPanels(grid, deepBottom, deepTop, panelWidth, biasV, kT, breakpointsEV);
  if (kT === 0) {
    addSplitPanels(grid, Math.max(bottom, lower), upper, panelWidth, biasV, kT, breakpointsEV);
    return grid;
  }
  // Each Fermi edge gets panels at 4 and 12 k_BT on both sides, where N bends; between the
  // levels the window is cut into e-fold panels at those marks and at the kinks of D.
  const inner = EDGE_INNER_KT * kT;
  const marks = [lower - inner, lower, lower + inner, lower + edge, upper - edge, upper - inner, upper, upper + inner, ...breakpointsEV];
  addSplitPanels(grid, Math.max(bottom, lower - edge), Math.max(bottom, upper + edge), panelWidth, biasV, kT, marks);
  // Thermal tail above the upper Fermi level: ∫_0^∞ e^{−t} [N e^{t}] D k_BT dt.
  const tailStart = Math.max(bottom, upper + edge);
  reserve(grid, TAIL_NODES);
  for (let i = 0; i < TAIL_NODES; i++) {
    const t = laguerre.nodes[i];
    const energy = tailStart + kT * t;
    const k = grid.count++;
    grid.energiesEV[k] = energy;
    grid.weightsEV2[k] = kT * laguerre.weights[i] * Math.exp(t) * supplyFunctionEV(energy, biasV, kT);
  }
  return grid;
}
