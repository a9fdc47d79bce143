/**
 * Image-force rounding of the tunnel barrier: the exact classical sum over the images in two parallel
 * metal surfaces, and Simmons' 1963 approximation to it (with the printed and the corrected strength).
 */
import { COULOMB_EV_M } from './constants.ts';
import { checkJunction, trapezoidHeightEV, type Junction, type SampledProfile } from './barrierProfile.ts';

/** Euler–Mascheroni constant γ. */
const EULER_GAMMA = 0.5772156649015329;

/**
 * Digamma function ψ(z) for z ≥ 1 (recurrence up to z ≥ 12, then the asymptotic series; error < 1e-15).
 * Source: M. Abramowitz & I. A. Stegun, Handbook of Mathematical Functions (1964), 6.3.5 and 6.3.18.
 */
function digamma(z: number): number {
  let shift = 0;
  let x = z;
  while (x < 12) {
    shift += 1 / x;
    x += 1;
  }
  const inv2 = 1 / (x * x);
  const series = inv2 * (1 / 12 - inv2 * (1 / 120 - inv2 * (1 / 252 - inv2 * (1 / 240 - inv2 / 132))));
  return Math.log(x) - 0.5 / x - series - shift;
}

function checkDielectric(caller: string, dielectricConstant: number): void {
  if (!(dielectricConstant >= 1 && Number.isFinite(dielectricConstant))) {
    throw new Error(`${caller}: dielectricConstant must be >= 1 and finite, got ${dielectricConstant}`);
  }
}

/**
 * Exact classical image potential energy of an electron between two grounded parallel metal planes
 * s apart, at distance x from the first (infinite sum over all images), eV:
 * U_im(x) = −(e²/(8πε0K))·{1/(2x) + Σ_{n≥1} [n·s/((n·s)² − x²) − 1/(n·s)]},
 * summed in closed form with the digamma function ψ (a = x/s):
 * U_im = −(e²/(4πε0K))·{1/(4x) + 1/(4(s − x)) − [ψ(1 + a) + ψ(2 − a) + 2γ]/(4s)}.
 * Mid-gap: U_im(s/2) = −e²·ln2/(4πε0·K·s). Near a wall it tends to the one-surface −e²/(16πε0Kx).
 * Position and gap in m, K relative permittivity of the gap (1 for vacuum); −Infinity at the walls.
 * Source: J. G. Simmons, J. Appl. Phys. 34, 1793 (1963), image series (eq. 30, equation number from
 * memory); the factor corrected by Mayer, Mousa, Hagmann & Forbes, Jordan J. Phys. 12, 63 (2019);
 * physics.md §2 and §6.
 * @example imagePotentialEV(5e-10, 1e-9, 1) // ≈ −0.99811
 */
export function imagePotentialEV(positionM: number, gapM: number, dielectricConstant = 1): number {
  const caller = 'imagePotentialEV';
  if (!(gapM > 0 && Number.isFinite(gapM))) throw new Error(`${caller}: gapM must be > 0, got ${gapM}`);
  if (!(positionM >= 0 && positionM <= gapM)) throw new Error(`${caller}: positionM must be in [0, gapM = ${gapM}], got ${positionM}`);
  checkDielectric(caller, dielectricConstant);
  if (positionM === 0 || positionM === gapM) return -Infinity;
  const a = positionM / gapM;
  const bracket = 1 / (4 * positionM) + 1 / (4 * (gapM - positionM)) - (digamma(1 + a) + digamma(2 - a) + 2 * EULER_GAMMA) / (4 * gapM);
  return -(COULOMB_EV_M / dielectricConstant) * bracket;
}

/** Options of {@link imageRoundedProfile}. */
export interface ImageProfileOptions {
  /** Relative permittivity K of the gap. Default 1 (vacuum). */
  dielectricConstant?: number;
  /** Number of intervals (samples − 1), ≥ 4. Default 400. */
  slices?: number;
}

/**
 * Where the image-rounded barrier meets the band bottom: the roots of
 * g(x) = E_F + φ1 + (φ2 − φ1)·x/d + U_im(x) (height above the tilted band bottom; the bias cancels).
 * g is concave (U_im is), so there are two roots or none; null when the barrier never rises above
 * the band bottom.
 */
function bandBottomCrossings(junction: Junction, dielectricConstant: number): [number, number] | null {
  const { gapM, fermiEnergyEV, tipWorkFunctionEV: phi1, sampleWorkFunctionEV: phi2 } = junction;
  const aboveBandBottom = (x: number): number =>
    x <= 0 || x >= gapM ? -Infinity : fermiEnergyEV + phi1 + ((phi2 - phi1) * x) / gapM + imagePotentialEV(x, gapM, dielectricConstant);
  let peak = gapM / 2;
  for (let i = 1; i < 64; i++) {
    const x = (gapM * i) / 64;
    if (aboveBandBottom(x) > aboveBandBottom(peak)) peak = x;
  }
  if (!(aboveBandBottom(peak) > 0)) return null;
  const root = (outside: number, inside: number): number => {
    let a = outside;
    let b = inside;
    for (let k = 0; k < 200 && Math.abs(b - a) > 1e-15 * gapM; k++) {
      const mid = (a + b) / 2;
      if (aboveBandBottom(mid) > 0) b = mid;
      else a = mid;
    }
    return (a + b) / 2;
  };
  return [root(0, peak), root(gapM, peak)];
}

/**
 * The §0 trapezoid plus the exact two-surface image potential, as a sampled profile (heights above
 * the tip Fermi level, eV): U(x) = φ1 + (φ2 − φ1 − eV)·x/d + U_im(x), U_im from {@link imagePotentialEV}.
 * Clamping: where the classical image term would pull the barrier below the local band bottom (the
 * straight line from −E_F at the tip to −E_F − eV at the sample; within ~0.3–0.5 Å of each surface
 * for metals), the height is set to that band bottom. The profile then joins both electrodes
 * continuously and the 1/x divergence never enters a transmission (common practice, no source).
 * Sampling: the two points where the barrier meets the band bottom are found by bisection and are
 * samples themselves (so the kink is exact and each clamped stretch is one straight interval);
 * between them n − 2 intervals follow x = x_a + (x_b − x_a)·(1 − cos θ)/2, θ uniform, dense near the
 * surfaces where U_im is steep. If the barrier never rises above the band bottom, the whole profile is
 * the band bottom. The sampling error falls as 1/n²: for φ = 4 eV, E_F = 5.5 eV, 10 Å, the exact
 * transmission at E_F is within 7e-4 of the n → ∞ limit at n = 200 and within 2e-4 at the default 400.
 * Junction energies in eV and gap in m, biasV = sample bias in volts.
 * Source: image sum as in {@link imagePotentialEV}; J. G. Simmons, J. Appl. Phys. 34, 1793 (1963);
 * Mayer, Mousa, Hagmann & Forbes, Jordan J. Phys. 12, 63 (2019); physics.md §2 and §6.
 * @example imageRoundedProfile({ tipWorkFunctionEV: 4, sampleWorkFunctionEV: 4, gapM: 1e-9, fermiEnergyEV: 5.5 }, 0, { slices: 200 }).heightsEV[100] // ≈ 3.00189 (mid-gap)
 */
export function imageRoundedProfile(junction: Junction, biasV: number, options: ImageProfileOptions = {}): SampledProfile {
  const caller = 'imageRoundedProfile';
  checkJunction(caller, junction);
  if (!Number.isFinite(biasV)) throw new Error(`${caller}: biasV must be finite, got ${biasV}`);
  const { dielectricConstant = 1, slices = 400 } = options;
  checkDielectric(caller, dielectricConstant);
  if (!(Number.isInteger(slices) && slices >= 4)) throw new Error(`${caller}: slices must be an integer >= 4, got ${slices}`);
  const { gapM, fermiEnergyEV } = junction;
  const bandBottomEV = (x: number): number => -fermiEnergyEV - (biasV * x) / gapM;
  const positionsM = new Float64Array(slices + 1);
  const heightsEV = new Float64Array(slices + 1);
  const crossings = bandBottomCrossings(junction, dielectricConstant);
  if (crossings === null) {
    for (let i = 0; i <= slices; i++) {
      positionsM[i] = i === slices ? gapM : (gapM * i) / slices;
      heightsEV[i] = bandBottomEV(positionsM[i]);
    }
    return { positionsM, heightsEV, fermiEnergyEV, biasV };
  }
  const [left, right] = crossings;
  const inner = slices - 2;
  positionsM[0] = 0;
  heightsEV[0] = bandBottomEV(0);
  for (let i = 0; i <= inner; i++) {
    const x = i === 0 ? left : i === inner ? right : left + ((right - left) * (1 - Math.cos((Math.PI * i) / inner))) / 2;
    const raw = trapezoidHeightEV(junction, biasV, x) + imagePotentialEV(x, gapM, dielectricConstant);
    positionsM[i + 1] = x;
    heightsEV[i + 1] = Math.max(raw, bandBottomEV(x));
  }
  positionsM[slices] = gapM;
  heightsEV[slices] = bandBottomEV(gapM);
  return { positionsM, heightsEV, fermiEnergyEV, biasV };
}

/** Which strength of Simmons' image term to use. */
export type SimmonsImageLambda = 'printed' | 'halved';

/** Input of {@link simmonsImageBarrier} and {@link simmonsImageApproxHeightEV}. */
export interface SimmonsImageInput {
  /** Barrier height φ0 above the Fermi level without image force (same electrodes), eV. */
  barrierHeightEV: number;
  /** Electrode separation s, m. */
  gapM: number;
  /** Bias V, volts; the barrier is symmetric, so only |V| matters. */
  biasV: number;
  /** Relative permittivity K. Default 1. */
  dielectricConstant?: number;
  /**
   * 'printed': λ = e²·ln2/(8πKε0·s) as printed in 1963, which doubles the image term;
   * 'halved': λ/2, which matches the exact mid-gap sum to within 15 % (Mayer et al. 2019).
   */
  lambdaConvention: SimmonsImageLambda;
}

/** Result of {@link simmonsImageBarrier}: turning points and mean barrier for Simmons' J(V). */
export interface SimmonsImageBarrier {
  /** λ, eV. */
  lambdaEV: number;
  /** Turning point s1 near the emitter, m. */
  nearTurningPointM: number;
  /** Turning point s2 near the collector, m. */
  farTurningPointM: number;
  /** Mean barrier φ_I above the emitter Fermi level over [s1, s2], eV. */
  meanBarrierEV: number;
  /** Forbidden width Δs = s2 − s1, m. */
  widthM: number;
}

function simmonsLambdaEV(caller: string, input: SimmonsImageInput): number {
  const { barrierHeightEV, gapM, biasV, dielectricConstant = 1, lambdaConvention } = input;
  if (!(barrierHeightEV > 0 && Number.isFinite(barrierHeightEV))) throw new Error(`${caller}: barrierHeightEV must be > 0, got ${barrierHeightEV}`);
  if (!(gapM > 0 && Number.isFinite(gapM))) throw new Error(`${caller}: gapM must be > 0, got ${gapM}`);
  if (!Number.isFinite(biasV)) throw new Error(`${caller}: biasV must be finite, got ${biasV}`);
  checkDielectric(caller, dielectricConstant);
  if (lambdaConvention !== 'printed' && lambdaConvention !== 'halved') {
    throw new Error(`${caller}: lambdaConvention must be 'printed' or 'halved', got ${String(lambdaConvention)}`);
  }
  // e²·ln2/(8πKε0·s) = (e²/(4πε0))·ln2/(2Ks)
  const printed = (COULOMB_EV_M * Math.LN2) / (2 * dielectricConstant * gapM);
  return lambdaConvention === 'printed' ? printed : printed / 2;
}

/**
 * Simmons' approximate image-rounded barrier height above the emitter Fermi level, eV:
 * φ(x) = φ0 − eV·x/s − 1.15·λ·s²/(x(s − x)), λ = e²·ln2/(8πKε0·s) ('printed') or half of it ('halved').
 * Position and gap in m, φ0 in eV, V in volts (|V| used).
 * Source: J. G. Simmons, J. Appl. Phys. 34, 1793 (1963), image-force section (from memory; matches
 * physics.md §6); the factor-2 error: Mayer, Mousa, Hagmann & Forbes, Jordan J. Phys. 12, 63 (2019).
 * @example simmonsImageApproxHeightEV({ barrierHeightEV: 4, gapM: 1e-9, biasV: 0, lambdaConvention: 'printed' }, 5e-10) // ≈ 1.70435 (= 4 − 2.29565)
 */
export function simmonsImageApproxHeightEV(input: SimmonsImageInput, positionM: number): number {
  const caller = 'simmonsImageApproxHeightEV';
  const lambda = simmonsLambdaEV(caller, input);
  const { barrierHeightEV, gapM, biasV } = input;
  if (!(positionM > 0 && positionM < gapM)) throw new Error(`${caller}: positionM must be in (0, gapM = ${gapM}), got ${positionM}`);
  return barrierHeightEV - (Math.abs(biasV) * positionM) / gapM - (1.15 * lambda * gapM * gapM) / (positionM * (gapM - positionM));
}

/**
 * Simmons' turning points and mean barrier for the image-rounded barrier (same electrodes):
 * s1 = 1.2·λ·s/φ0;
 * s2 = s·[1 − 9.2·λ/(3φ0 + 4λ − 2eV)] + s1 for eV < φ0, else s2 = s·(φ0 − 5.6·λ)/(eV);
 * φ_I = φ0 − eV·(s1 + s2)/(2s) − [1.15·λ·s/(s2 − s1)]·ln[s2·(s − s1)/(s1·(s − s2))];
 * use φ_I as the mean barrier and Δs = s2 − s1 as the width in {@link simmonsCurrentDensity}.
 * λ as in {@link simmonsImageApproxHeightEV}. φ0 in eV, s in m, V in volts (|V| used); lengths out in m.
 * Throws when the barrier has collapsed (s2 ≤ s1).
 * Source: J. G. Simmons, J. Appl. Phys. 34, 1793 (1963) (formulas from memory; they match independent
 * public code and physics.md §6); Mayer, Mousa, Hagmann & Forbes, Jordan J. Phys. 12, 63 (2019).
 * @example simmonsImageBarrier({ barrierHeightEV: 4, gapM: 1e-9, biasV: 1, lambdaConvention: 'halved' }).meanBarrierEV // ≈ 1.9405
 */
export function simmonsImageBarrier(input: SimmonsImageInput): SimmonsImageBarrier {
  const caller = 'simmonsImageBarrier';
  const lambda = simmonsLambdaEV(caller, input);
  const { barrierHeightEV: phi0, gapM: s } = input;
  const eV = Math.abs(input.biasV);
  const s1 = (1.2 * lambda * s) / phi0;
  const s2 = eV < phi0 ? s * (1 - (9.2 * lambda) / (3 * phi0 + 4 * lambda - 2 * eV)) + s1 : (s * (phi0 - 5.6 * lambda)) / eV;
  if (!(s2 > s1 && s2 < s)) {
    throw new Error(`${caller}: barrier collapsed (turning points s1 = ${s1}, s2 = ${s2} m in a ${s} m gap) for barrierHeightEV ${phi0}, biasV ${input.biasV}`);
  }
  const meanBarrierEV =
    phi0 - (eV * (s1 + s2)) / (2 * s) - ((1.15 * lambda * s) / (s2 - s1)) * Math.log((s2 * (s - s1)) / (s1 * (s - s2)));
  return { lambdaEV: lambda, nearTurningPointM: s1, farTurningPointM: s2, meanBarrierEV, widthM: s2 - s1 };
}
