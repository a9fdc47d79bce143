/**
 * Fowler–Nordheim field emission: the elementary (triangular barrier) and Schottky–Nordheim
 * (image-rounded) forms, Forbes' approximations for the barrier functions v(f), t(f), the exact ones
 * through complete elliptic integrals, and the slope of a Fowler–Nordheim plot.
 * Fields F in V/m, work functions φ in eV, current densities in A/m².
 */
import { COULOMB_EV_M, ELECTRON_MASS_KG, ELEMENTARY_CHARGE_C, PLANCK_J_S } from './constants.ts';

/**
 * First Fowler–Nordheim constant a = e³/(8πh), in A·eV/V² (exact in the 2019 SI): ≈ 1.541433873e-6.
 * Source: R. G. Forbes & J. H. B. Deane, Proc. R. Soc. A 463, 2907 (2007) (from memory); physics.md §8.
 * @example FOWLER_NORDHEIM_A_A_EV_PER_V2 // ≈ 1.541433873e-6
 */
export const FOWLER_NORDHEIM_A_A_EV_PER_V2 = (ELEMENTARY_CHARGE_C * ELEMENTARY_CHARGE_C) / (8 * Math.PI * PLANCK_J_S);
/**
 * Second Fowler–Nordheim constant b = 8π√(2m_e)/(3eh), in eV^{−3/2}·V/m: ≈ 6.8308896e9
 * (6.8308896 eV^{−3/2} V/nm). Source: as {@link FOWLER_NORDHEIM_A_A_EV_PER_V2}; physics.md §8.
 * @example FOWLER_NORDHEIM_B_PER_EV_1_5_V_PER_M // ≈ 6.8308896e9
 */
export const FOWLER_NORDHEIM_B_PER_EV_1_5_V_PER_M =
  ((8 * Math.PI * Math.sqrt(2 * ELECTRON_MASS_KG)) / (3 * ELEMENTARY_CHARGE_C * PLANCK_J_S)) * ELEMENTARY_CHARGE_C ** 1.5;
/**
 * Schottky constant squared c_S² = e³/(4πε0), in eV²·m/V: ≈ 1.4399645e-9 (1.4399645 eV² V⁻¹ nm).
 * Source: R. G. Forbes, Appl. Phys. Lett. 89, 113122 (2006) (citation from memory); physics.md §8.
 * @example SCHOTTKY_CONSTANT_SQUARED_EV2_M_PER_V // ≈ 1.4399645e-9
 */
export const SCHOTTKY_CONSTANT_SQUARED_EV2_M_PER_V = COULOMB_EV_M;

/** Input of the Fowler–Nordheim current densities. */
export interface FieldEmissionInput {
  /** Work function φ of the emitter, eV (> 0). */
  workFunctionEV: number;
  /** Barrier field F at the surface, V/m (> 0). */
  fieldVPerM: number;
}

function checkFieldEmission(caller: string, { workFunctionEV, fieldVPerM }: FieldEmissionInput): void {
  if (!(workFunctionEV > 0 && Number.isFinite(workFunctionEV))) throw new Error(`${caller}: workFunctionEV must be > 0, got ${workFunctionEV}`);
  if (!(fieldVPerM > 0 && Number.isFinite(fieldVPerM))) throw new Error(`${caller}: fieldVPerM must be > 0, got ${fieldVPerM}`);
}

/**
 * Elementary Fowler–Nordheim current density (exactly triangular barrier, no image force):
 * J = (a/φ)·F²·exp(−b·φ^{3/2}/F), a and b the first and second FN constants.
 * φ in eV, F in V/m; returns A/m².
 * Source: R. H. Fowler & L. Nordheim, Proc. R. Soc. A 119, 173 (1928), in the modern form of
 * R. G. Forbes, Appl. Phys. Lett. 89, 113122 (2006) (citations from memory); physics.md §8.
 * @example fowlerNordheimElementary({ workFunctionEV: 4.5, fieldVPerM: 5e9 }) // ≈ 1.85704e7
 */
export function fowlerNordheimElementary(input: FieldEmissionInput): number {
  checkFieldEmission('fowlerNordheimElementary', input);
  const { workFunctionEV: phi, fieldVPerM: field } = input;
  return (FOWLER_NORDHEIM_A_A_EV_PER_V2 / phi) * field * field * Math.exp((-FOWLER_NORDHEIM_B_PER_EV_1_5_V_PER_M * phi ** 1.5) / field);
}

/**
 * Scaled barrier field f = c_S²·F/φ² (the field relative to the one that pulls the Schottky–Nordheim
 * barrier top down to the Fermi level). φ in eV, F in V/m; dimensionless.
 * Source: R. G. Forbes, Appl. Phys. Lett. 89, 113122 (2006) (citation from memory); physics.md §8.
 * @example scaledBarrierField({ workFunctionEV: 4.5, fieldVPerM: 5e9 }) // ≈ 0.35555
 */
export function scaledBarrierField(input: FieldEmissionInput): number {
  checkFieldEmission('scaledBarrierField', input);
  return (SCHOTTKY_CONSTANT_SQUARED_EV2_M_PER_V * input.fieldVPerM) / (input.workFunctionEV * input.workFunctionEV);
}

/** Schottky–Nordheim barrier functions at one scaled field f. */
export interface BarrierFunctions {
  /** v(f): the exponent correction. */
  v: number;
  /** t(f) = v − (4/3)·f·dv/df: the prefactor correction. */
  t: number;
  /** s(f) = v − f·dv/df: the slope correction of a Fowler–Nordheim plot. */
  s: number;
}

function checkScaledField(caller: string, f: number): void {
  if (!(f >= 0 && f <= 1)) throw new Error(`${caller}: scaledField must be in [0, 1], got ${f}`);
}

/**
 * Forbes' simple approximations to the Schottky–Nordheim barrier functions:
 * v ≈ 1 − f + (f/6)·ln f, t ≈ 1 + f/9 − (f/18)·ln f, s ≈ 1 − f/6 (v within 0.33 % of exact for
 * f = 0.1–0.8, physics.md §8). f dimensionless in [0, 1]; f = 0 gives 1, 1, 1.
 * Source: R. G. Forbes, Appl. Phys. Lett. 89, 113122 (2006) (citation from memory; formulas and
 * example confirmed in physics.md §8).
 * @example forbesBarrierFunctions(0.35555).v // ≈ 0.58317
 */
export function forbesBarrierFunctions(scaledField: number): BarrierFunctions {
  checkScaledField('forbesBarrierFunctions', scaledField);
  const f = scaledField;
  if (f === 0) return { v: 1, t: 1, s: 1 };
  const fLogF = f * Math.log(f);
  return { v: 1 - f + fLogF / 6, t: 1 + f / 9 - fLogF / 18, s: 1 - f / 6 };
}

/**
 * Complete elliptic integral of the first kind K(m) = ∫_0^{π/2} dθ/√(1 − m·sin²θ), parameter m
 * (scipy's convention, m = k²), by the arithmetic–geometric mean: K = π/(2·AGM(1, √(1 − m))).
 * m in [0, 1); Infinity at m = 1. Full double precision.
 * Source: M. Abramowitz & I. A. Stegun, Handbook of Mathematical Functions (1964), 17.6; tested
 * against scipy.special.ellipk.
 * @example ellipticK(0.5) // ≈ 1.8540746773013719
 */
export function ellipticK(m: number): number {
  if (!(m >= 0 && m <= 1)) throw new Error(`ellipticK: m must be in [0, 1], got ${m}`);
  if (m === 1) return Infinity;
  return agmIntegrals(m).k;
}

/**
 * Complete elliptic integral of the second kind E(m) = ∫_0^{π/2} √(1 − m·sin²θ) dθ, parameter m
 * (scipy's convention), from the same AGM sequence: E = K·[1 − Σ_n 2^{n−1}·c_n²], c_0² = m.
 * m in [0, 1]; E(1) = 1. Full double precision.
 * Source: M. Abramowitz & I. A. Stegun, Handbook of Mathematical Functions (1964), 17.6; tested
 * against scipy.special.ellipe.
 * @example ellipticE(0.5) // ≈ 1.3506438810476755
 */
export function ellipticE(m: number): number {
  if (!(m >= 0 && m <= 1)) throw new Error(`ellipticE: m must be in [0, 1], got ${m}`);
  if (m === 1) return 1;
  return agmIntegrals(m).e;
}

/** K(m) and E(m) from one AGM run (Abramowitz & Stegun 17.6.1–17.6.4). */
function agmIntegrals(m: number): { k: number; e: number } {
  let a = 1;
  let b = Math.sqrt(1 - m);
  let c = Math.sqrt(m);
  let weight = 0.5; // 2^{n−1} at n = 0
  let sum = weight * c * c;
  for (let n = 0; n < 40 && Math.abs(c) > 1e-17 * a; n++) {
    const nextA = (a + b) / 2;
    c = (a - b) / 2;
    b = Math.sqrt(a * b);
    a = nextA;
    weight *= 2;
    sum += weight * c * c;
  }
  const k = Math.PI / (2 * a);
  return { k, e: k * (1 - sum) };
}

/**
 * Exact Schottky–Nordheim barrier functions through complete elliptic integrals, y = √f,
 * m = (1 − y)/(1 + y):
 * v = √(1 + y)·[E(m) − y·K(m)], t = [(1 + y)·E(m) − y·K(m)]/√(1 + y), s = (v + 3t)/4
 * (from t = v − (4/3)f·dv/df and s = v − f·dv/df). f in [0, 1]; v(1) = 0.
 * Source: R. G. Forbes & J. H. B. Deane, Proc. R. Soc. A 463, 2907 (2007) (from memory; v as in
 * physics.md §8, t checked there against a central difference of v by scipy).
 * @example exactBarrierFunctions(0.35555).v // ≈ 0.58127
 */
export function exactBarrierFunctions(scaledField: number): BarrierFunctions {
  checkScaledField('exactBarrierFunctions', scaledField);
  if (scaledField === 0) return { v: 1, t: 1, s: 1 };
  const y = Math.sqrt(scaledField);
  const m = (1 - y) / (1 + y);
  const { k, e } = m === 0 ? { k: Math.PI / 2, e: Math.PI / 2 } : agmIntegrals(m);
  const root = Math.sqrt(1 + y);
  const v = root * (e - y * k);
  const t = ((1 + y) * e - y * k) / root;
  return { v, t, s: (v + 3 * t) / 4 };
}

/** Input of {@link fowlerNordheimSchottkyNordheim}. */
export interface SchottkyNordheimInput extends FieldEmissionInput {
  /** 'forbes' (the simple approximations, default) or 'exact' (elliptic integrals). */
  barrierFunctions?: 'forbes' | 'exact';
}

/**
 * Fowler–Nordheim current density for the Schottky–Nordheim (image-rounded) barrier:
 * J = a/(t(f)²·φ)·F²·exp(−v(f)·b·φ^{3/2}/F), f = c_S²·F/φ².
 * φ in eV, F in V/m (f must be ≤ 1: barrier top above the Fermi level); returns A/m².
 * Source: R. G. Forbes, Appl. Phys. Lett. 89, 113122 (2006) (citation from memory); physics.md §8.
 * @example fowlerNordheimSchottkyNordheim({ workFunctionEV: 4.5, fieldVPerM: 5e9 }) // ≈ 3.79396e9
 */
export function fowlerNordheimSchottkyNordheim(input: SchottkyNordheimInput): number {
  const caller = 'fowlerNordheimSchottkyNordheim';
  checkFieldEmission(caller, input);
  const { workFunctionEV: phi, fieldVPerM: field, barrierFunctions = 'forbes' } = input;
  const f = (SCHOTTKY_CONSTANT_SQUARED_EV2_M_PER_V * field) / (phi * phi);
  if (!(f <= 1)) throw new Error(`${caller}: scaled field c_S²F/φ² must be <= 1 (barrier above the Fermi level), got ${f}`);
  const { v, t } = barrierFunctions === 'exact' ? exactBarrierFunctions(f) : forbesBarrierFunctions(f);
  return (FOWLER_NORDHEIM_A_A_EV_PER_V2 / (t * t * phi)) * field * field * Math.exp((-v * FOWLER_NORDHEIM_B_PER_EV_1_5_V_PER_M * phi ** 1.5) / field);
}

/** Input of {@link fowlerNordheimPlotSlope}. */
export interface FowlerNordheimPlotInput {
  /** Work function φ, eV (> 0). */
  workFunctionEV: number;
  /** Field conversion length d in F = V/d (the gap for a planar junction), m (> 0). */
  gapM: number;
  /** Bias at which the slope is taken, volts (> 0); only the Schottky–Nordheim forms use it. */
  biasV: number;
  /** 'elementary' (s = 1), 'forbes' (s ≈ 1 − f/6, default) or 'exact'. */
  barrier?: 'elementary' | 'forbes' | 'exact';
}

/**
 * Slope of a Fowler–Nordheim plot, ln(I/V²) against 1/V, for F = V/d:
 * slope = −s(f)·b·φ^{3/2}·d, f = c_S²·(V/d)/φ² (s = 1 for the elementary barrier).
 * For a trapezoid use F = (eV + φ_emitter − φ_collector)/(ed) instead: contact potential curves the
 * plot. φ in eV, d in m, V in volts; returns volts.
 * Source: R. G. Forbes, Appl. Phys. Lett. 89, 113122 (2006) (citation from memory); physics.md §8.
 * @example fowlerNordheimPlotSlope({ workFunctionEV: 4.5, gapM: 1e-9, biasV: 5 }) // ≈ −0.94074·6.8308896·4.5^1.5 ≈ −61.34
 */
export function fowlerNordheimPlotSlope(input: FowlerNordheimPlotInput): number {
  const caller = 'fowlerNordheimPlotSlope';
  const { workFunctionEV: phi, gapM, biasV, barrier = 'forbes' } = input;
  if (!(phi > 0 && Number.isFinite(phi))) throw new Error(`${caller}: workFunctionEV must be > 0, got ${phi}`);
  if (!(gapM > 0 && Number.isFinite(gapM))) throw new Error(`${caller}: gapM must be > 0, got ${gapM}`);
  if (!(biasV > 0 && Number.isFinite(biasV))) throw new Error(`${caller}: biasV must be > 0, got ${biasV}`);
  let slopeFactor = 1;
  if (barrier !== 'elementary') {
    const f = (SCHOTTKY_CONSTANT_SQUARED_EV2_M_PER_V * (biasV / gapM)) / (phi * phi);
    slopeFactor = (barrier === 'exact' ? exactBarrierFunctions(f) : forbesBarrierFunctions(f)).s;
  }
  return -slopeFactor * FOWLER_NORDHEIM_B_PER_EV_1_5_V_PER_M * phi ** 1.5 * gapM;
}
