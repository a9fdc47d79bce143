/**
 * Brinkman–Dynes–Rowell (BDR): the parabolic conductance of an asymmetric trapezoidal barrier, its
 * coefficients, and the closed-form inverse that turns a fitted parabola into initial guesses
 * (φ̄, Δφ, d, φ1, φ2) for a full I(V) fit.
 * Sign convention (physics.md §0): electrode 1 is the tip, 2 the sample, V the sample bias, and
 * Δφ = φ2 − φ1 = φ_sample − φ_tip. Then G(V) is lower for V > 0 when Δφ > 0: more conductance with
 * the low-φ electrode positive.
 */
import { ELECTRON_MASS_KG, ELEMENTARY_CHARGE_C, HBAR_J_S, PLANCK_J_S } from './constants.ts';
import { simmonsLowVoltageCurrentDensity } from './simmons.ts';

/** 4√(2m_e)/(3ħ) in eV^{−1/2}/m: A0 per metre of gap (0.6830890 eV^{−1/2} Å^{−1}). */
const BDR_A0_PER_M_PER_SQRT_EV = ((4 * Math.sqrt(2 * ELECTRON_MASS_KG)) / (3 * HBAR_J_S)) * Math.sqrt(ELEMENTARY_CHARGE_C);

/** P = e²·√(2m_e·1 eV)/h²: Simmons' low-voltage G/area = P·√φ̄[eV]/d[m]·e^{−…}, in S/√eV (S/m² × m). */
const LOW_VOLTAGE_PREFACTOR_S_PER_SQRT_EV =
  (ELEMENTARY_CHARGE_C * ELEMENTARY_CHARGE_C * Math.sqrt(2 * ELECTRON_MASS_KG * ELEMENTARY_CHARGE_C)) / (PLANCK_J_S * PLANCK_J_S);

/** A trapezoidal barrier described by its mean, asymmetry and width. */
export interface BdrBarrier {
  /** Mean barrier φ̄ = (φ1 + φ2)/2, eV (> 0). */
  meanBarrierEV: number;
  /** Asymmetry Δφ = φ2 − φ1 = φ_sample − φ_tip, eV. */
  asymmetryEV: number;
  /** Barrier width d, m (> 0). */
  widthM: number;
}

/** Coefficients of G(V)/G(0) = 1 + linearPerV·V + quadraticPerV2·V². */
export interface BdrCoefficients {
  /** A0 = 4√(2m_e)·d/(3ħ), eV^{−1/2}. */
  a0PerSqrtEV: number;
  /** −A0·Δφ/(16φ̄^{3/2}), 1/V. */
  linearPerV: number;
  /** (9/128)·A0²/φ̄, 1/V². */
  quadraticPerV2: number;
  /** Bias of the conductance minimum, eV_min = 4Δφ/(9A0√φ̄), volts. */
  minimumBiasV: number;
}

function checkBarrier(caller: string, { meanBarrierEV, asymmetryEV, widthM }: BdrBarrier): void {
  if (!(meanBarrierEV > 0 && Number.isFinite(meanBarrierEV))) throw new Error(`${caller}: meanBarrierEV must be > 0, got ${meanBarrierEV}`);
  if (!Number.isFinite(asymmetryEV)) throw new Error(`${caller}: asymmetryEV must be finite, got ${asymmetryEV}`);
  if (!(widthM > 0 && Number.isFinite(widthM))) throw new Error(`${caller}: widthM must be > 0, got ${widthM}`);
}

/**
 * BDR coefficients of the normalised conductance
 * G(V)/G(0) = 1 − [A0·Δφ/(16φ̄^{3/2})]·eV + (9/128)·(A0²/φ̄)·(eV)², A0 = 4√(2m_e)·d/(3ħ) = 0.683089·d[Å],
 * and the minimum at eV_min = 4Δφ/(9A0√φ̄). φ̄, Δφ in eV, d in m; coefficients in 1/V and 1/V².
 * Valid for d ≳ 10 Å and Δφ/φ̄ < 1 (from memory); the linear term is the large-d limit.
 * Source: W. F. Brinkman, R. C. Dynes & J. M. Rowell, J. Appl. Phys. 41, 1915 (1970) (citation from
 * memory); physics.md §7.
 * @example bdrCoefficients({ meanBarrierEV: 4, asymmetryEV: 1, widthM: 1e-9 }).quadraticPerV2 // ≈ 0.82021
 */
export function bdrCoefficients(barrier: BdrBarrier): BdrCoefficients {
  checkBarrier('bdrCoefficients', barrier);
  const { meanBarrierEV: phi, asymmetryEV: delta, widthM } = barrier;
  const a0 = BDR_A0_PER_M_PER_SQRT_EV * widthM;
  return {
    a0PerSqrtEV: a0,
    linearPerV: -(a0 * delta) / (16 * phi ** 1.5),
    quadraticPerV2: ((9 / 128) * a0 * a0) / phi,
    minimumBiasV: (4 * delta) / (9 * a0 * Math.sqrt(phi)),
  };
}

/**
 * BDR normalised conductance G(V)/G(0) = 1 + linearPerV·V + quadraticPerV2·V², coefficients from
 * {@link bdrCoefficients}. V = sample bias in volts; dimensionless.
 * Source: W. F. Brinkman, R. C. Dynes & J. M. Rowell, J. Appl. Phys. 41, 1915 (1970) (citation from
 * memory); physics.md §7.
 * @example bdrNormalizedConductance({ meanBarrierEV: 4, asymmetryEV: 1, widthM: 1e-9 }, 0.5) // ≈ 1 − 0.02668 + 0.20505 = 1.17837
 */
export function bdrNormalizedConductance(barrier: BdrBarrier, biasV: number): number {
  if (!Number.isFinite(biasV)) throw new Error(`bdrNormalizedConductance: biasV must be finite, got ${biasV}`);
  const { linearPerV, quadraticPerV2 } = bdrCoefficients(barrier);
  return 1 + linearPerV * biasV + quadraticPerV2 * biasV * biasV;
}

/**
 * BDR zero-bias conductance per area, Simmons' low-voltage form at the mean barrier:
 * G(0)/area = (e²·√(2m_e·φ̄)/(h²·d))·e^{−2√(2m_e)·d·√φ̄/ħ} = 3.16e10·(√φ̄/d[Å])·e^{−1.025·d√φ̄} S/cm².
 * φ̄ in eV, d in m; returns S/m².
 * Source: W. F. Brinkman, R. C. Dynes & J. M. Rowell, J. Appl. Phys. 41, 1915 (1970) (citation from
 * memory); J. G. Simmons, J. Appl. Phys. 34, 1793 (1963); physics.md §6–7.
 * @example bdrZeroBiasConductancePerArea({ meanBarrierEV: 4, asymmetryEV: 0, widthM: 5e-10 }) // ≈ 4.48391e9 S/m²
 */
export function bdrZeroBiasConductancePerArea(barrier: BdrBarrier): number {
  checkBarrier('bdrZeroBiasConductancePerArea', barrier);
  return simmonsLowVoltageCurrentDensity({ barrierHeightEV: barrier.meanBarrierEV, widthM: barrier.widthM, biasV: 1 });
}

/** The third datum that closes the inverse: two parabola coefficients fix only two of φ̄, Δφ, d. */
export type BdrKnown = { widthM: number } | { meanBarrierEV: number } | { zeroBiasConductanceSPerM2: number };

/** Input of {@link bdrInverse}. */
export interface BdrInverseInput {
  /** Fitted linear coefficient c1 of G(V)/G(0) = 1 + c1·V + c2·V², 1/V. */
  linearPerV: number;
  /** Fitted quadratic coefficient c2 (> 0), 1/V². */
  quadraticPerV2: number;
  /** One of: the width d (m), the mean barrier φ̄ (eV), or G(0) per area (S/m², needs a known area). */
  known: BdrKnown;
}

/** Result of {@link bdrInverse}: the barrier, and the electrode work functions it implies. */
export interface BdrInverseResult extends BdrBarrier {
  /** φ1 = φ̄ − Δφ/2, eV. */
  tipWorkFunctionEV: number;
  /** φ2 = φ̄ + Δφ/2, eV. */
  sampleWorkFunctionEV: number;
}

/**
 * Closed-form inverse of BDR, for initial guesses of an I(V) fit. With c1, c2 the fitted linear and
 * quadratic coefficients of G(V)/G(0) and α = 4√(2m_e)/(3ħ) (A0 = α·d):
 * c2 fixes A0²/φ̄ = 128·c2/9, and c1 then gives Δφ = −16·c1·φ̄^{3/2}/A0. The third datum closes it:
 * d known: A0 = α·d, φ̄ = 9A0²/(128·c2);
 * φ̄ known: A0 = √(128·c2·φ̄/9), d = A0/α;
 * G(0)/area known (Simmons low-voltage G0 = P·(√φ̄/d)·e^{−(3/2)α·d·√φ̄}, P = e²√(2m_e)/h²): with
 * √φ̄ = α·d/√R, R = 128·c2/9, G0 = (P·α/√R)·e^{−(3/2)α²d²/√R}, so d = √[√R·ln(P·α/(√R·G0))/((3/2)α²)].
 * Then φ1 = φ̄ − Δφ/2, φ2 = φ̄ + Δφ/2 (§0: Δφ = φ_sample − φ_tip). c in 1/V, 1/V²; d in m; energies eV.
 * Source: inversion of W. F. Brinkman, R. C. Dynes & J. M. Rowell, J. Appl. Phys. 41, 1915 (1970)
 * (citation from memory); physics.md §7.
 * @example bdrInverse({ linearPerV: -0.053366, quadraticPerV2: 0.82021, known: { widthM: 1e-9 } }).meanBarrierEV // ≈ 4.00002
 */
export function bdrInverse({ linearPerV, quadraticPerV2, known }: BdrInverseInput): BdrInverseResult {
  const caller = 'bdrInverse';
  if (!Number.isFinite(linearPerV)) throw new Error(`${caller}: linearPerV must be finite, got ${linearPerV}`);
  if (!(quadraticPerV2 > 0 && Number.isFinite(quadraticPerV2))) throw new Error(`${caller}: quadraticPerV2 must be > 0, got ${quadraticPerV2}`);
  const ratio = (128 * quadraticPerV2) / 9; // A0²/φ̄, 1/eV²
  let a0: number;
  let meanBarrierEV: number;
  if ('widthM' in known) {
    if (!(known.widthM > 0 && Number.isFinite(known.widthM))) throw new Error(`${caller}: known.widthM must be > 0, got ${known.widthM}`);
    a0 = BDR_A0_PER_M_PER_SQRT_EV * known.widthM;
    meanBarrierEV = (a0 * a0) / ratio;
  } else if ('meanBarrierEV' in known) {
    if (!(known.meanBarrierEV > 0 && Number.isFinite(known.meanBarrierEV))) {
      throw new Error(`${caller}: known.meanBarrierEV must be > 0, got ${known.meanBarrierEV}`);
    }
    meanBarrierEV = known.meanBarrierEV;
    a0 = Math.sqrt(ratio * meanBarrierEV);
  } else {
    const g0 = known.zeroBiasConductanceSPerM2;
    if (!(g0 > 0 && Number.isFinite(g0))) throw new Error(`${caller}: known.zeroBiasConductanceSPerM2 must be > 0, got ${g0}`);
    const prefactor = LOW_VOLTAGE_PREFACTOR_S_PER_SQRT_EV;
    const alpha = BDR_A0_PER_M_PER_SQRT_EV;
    const rootRatio = Math.sqrt(ratio);
    const logArgument = (prefactor * alpha) / (rootRatio * g0);
    if (!(logArgument > 1)) throw new Error(`${caller}: known.zeroBiasConductanceSPerM2 too large for these coefficients (no positive width), got ${g0}`);
    const widthM = Math.sqrt((rootRatio * Math.log(logArgument)) / (1.5 * alpha * alpha));
    a0 = alpha * widthM;
    meanBarrierEV = (a0 * a0) / ratio;
  }
  const widthM = a0 / BDR_A0_PER_M_PER_SQRT_EV;
  const asymmetryEV = (-16 * linearPerV * meanBarrierEV ** 1.5) / a0;
  return {
    meanBarrierEV,
    asymmetryEV,
    widthM,
    tipWorkFunctionEV: meanBarrierEV - asymmetryEV / 2,
    sampleWorkFunctionEV: meanBarrierEV + asymmetryEV / 2,
  };
}
