/**
 * Exact one-dimensional transmission through any sampled barrier, and the current density that
 * uses it. This is the reference the WKB path is compared against, not the fitting workhorse.
 *
 * Method. Between the samples the barrier is linear; it is cut into thin slices of constant potential
 * (the midpoint value), in which the Schrödinger equation ψ'' = −q·ψ, q = 2m_e(E − W)/ħ², is solved
 * exactly. Instead of multiplying transfer matrices from the left, which mixes growing and decaying
 * waves and loses the small one, the wave is carried from the right: a pure transmitted wave
 * ψ = e^{ik_R(x−d)} is integrated leftwards. Inside a forbidden region that solution grows as one
 * moves left, so it is the dominant one and the integration is stable. Each evanescent slice is
 * applied as e^{κh} × (a matrix with entries ≤ 1), with κh summed in a log scale, so gaps of several
 * nm and barriers of tens of eV neither overflow nor lose digits. At the left edge the wave is split
 * into incident and reflected parts, and T = (k_R/k_L)/|A_incident|² (flux ratio for different
 * band bottoms).
 */
import { BOLTZMANN_EV_PER_K, ELECTRON_MASS_KG, ELEMENTARY_CHARGE_C, HBAR_J_S, SUPPLY_CONSTANT_A_PER_M2_PER_EV2 } from './constants.ts';
import { checkJunction, trapezoidProfile, type Junction, type SampledProfile } from './barrierProfile.ts';

/** 2 m_e·(1 eV)/ħ²: squared wave number per eV of kinetic energy, 1/m² per eV (≈ 2.6247e19). */
const WAVE_NUMBER_SQUARED_PER_M2_PER_EV = (2 * ELECTRON_MASS_KG * ELEMENTARY_CHARGE_C) / (HBAR_J_S * HBAR_J_S);

// ---------------------------------------------------------------------------------------------
// A tiny complex helper, for the boundary conditions. The inner slice loop multiplies complex
// amplitudes by real coefficients and is written out on the real and imaginary parts for speed.
// ---------------------------------------------------------------------------------------------
interface Complex {
  re: number;
  im: number;
}
const complex = (re: number, im: number): Complex => ({ re, im });
const cSub = (a: Complex, b: Complex): Complex => complex(a.re - b.re, a.im - b.im);
const cMul = (a: Complex, b: Complex): Complex => complex(a.re * b.re - a.im * b.im, a.re * b.im + a.im * b.re);
const cScale = (a: Complex, s: number): Complex => complex(a.re * s, a.im * s);
const cAbsSquared = (a: Complex): number => a.re * a.re + a.im * a.im;
const I_UNIT = complex(0, 1);

/** The barrier cut into slices of constant potential, measured from the left band bottom. */
interface Slicing {
  /** Potential energy of each slice above the left (tip) band bottom, eV. */
  potentialsEV: Float64Array;
  /** Width of each slice, m. */
  widthsM: Float64Array;
  /** Right (sample) band bottom relative to the left one: −biasV, eV. */
  rightBandBottomEV: number;
}

/** Throw unless the profile is usable: ≥ 2 samples, equal lengths, x strictly increasing, all finite. */
function checkProfile(caller: string, profile: SampledProfile): void {
  const { positionsM, heightsEV, fermiEnergyEV, biasV } = profile;
  if (!(positionsM.length >= 2)) throw new Error(`${caller}: profile.positionsM must have >= 2 samples, got ${positionsM.length}`);
  if (heightsEV.length !== positionsM.length) {
    throw new Error(`${caller}: profile.heightsEV must have as many samples as positionsM (${positionsM.length}), got ${heightsEV.length}`);
  }
  if (!(fermiEnergyEV > 0 && Number.isFinite(fermiEnergyEV))) throw new Error(`${caller}: profile.fermiEnergyEV must be > 0, got ${fermiEnergyEV}`);
  if (!Number.isFinite(biasV)) throw new Error(`${caller}: profile.biasV must be finite, got ${biasV}`);
  for (let i = 0; i < positionsM.length; i++) {
    if (!Number.isFinite(positionsM[i]) || !Number.isFinite(heightsEV[i])) {
      throw new Error(`${caller}: profile samples must be finite, got x = ${positionsM[i]}, U = ${heightsEV[i]} at index ${i}`);
    }
    if (i > 0 && !(positionsM[i] > positionsM[i - 1])) {
      throw new Error(`${caller}: profile.positionsM must be strictly increasing, got ${positionsM[i - 1]} then ${positionsM[i]} at index ${i}`);
    }
  }
}

/** Cut every sample interval into `slicesPerInterval` equal slices valued at their midpoints. */
function sliceProfile(profile: SampledProfile, slicesPerInterval: number): Slicing {
  const { positionsM, heightsEV, fermiEnergyEV, biasV } = profile;
  const intervals = positionsM.length - 1;
  const count = intervals * slicesPerInterval;
  const potentialsEV = new Float64Array(count);
  const widthsM = new Float64Array(count);
  let slice = 0;
  for (let i = 0; i < intervals; i++) {
    const width = (positionsM[i + 1] - positionsM[i]) / slicesPerInterval;
    const u0 = heightsEV[i];
    const du = heightsEV[i + 1] - u0;
    for (let j = 0; j < slicesPerInterval; j++) {
      potentialsEV[slice] = fermiEnergyEV + u0 + (du * (j + 0.5)) / slicesPerInterval;
      widthsM[slice] = width;
      slice++;
    }
  }
  return { potentialsEV, widthsM, rightBandBottomEV: -biasV };
}

/**
 * Natural log of the transmission of a sliced barrier at energy E (eV above the left band bottom).
 * −Infinity when E is not above both band bottoms (no propagating state on one side).
 */
function slicedLogTransmission(slicing: Slicing, energyEV: number): number {
  const rightKineticEV = energyEV - slicing.rightBandBottomEV;
  if (!(energyEV > 0) || !(rightKineticEV > 0)) return -Infinity;
  const kLeft = Math.sqrt(WAVE_NUMBER_SQUARED_PER_M2_PER_EV * energyEV);
  const kRight = Math.sqrt(WAVE_NUMBER_SQUARED_PER_M2_PER_EV * rightKineticEV);
  // State (ψ, φ = ψ'/k_L) at the right edge for a unit transmitted wave: ψ = 1, ψ' = i·k_R.
  let psiRe = 1;
  let psiIm = 0;
  let phiRe = 0;
  let phiIm = kRight / kLeft;
  let logScale = 0;
  const { potentialsEV, widthsM } = slicing;
  for (let slice = potentialsEV.length - 1; slice >= 0; slice--) {
    const sliceWidth = widthsM[slice];
    const waveNumberSquared = WAVE_NUMBER_SQUARED_PER_M2_PER_EV * (energyEV - potentialsEV[slice]);
    const phaseSquared = waveNumberSquared * sliceWidth * sliceWidth;
    // Backward step over a slice of width h, q = waveNumberSquared = 2m_e(E − W)/ħ²:
    // ψ(x) = C·ψ(x+h) − S·ψ'(x+h), ψ'(x) = q·S·ψ(x+h) + C·ψ'(x+h), with C = cos(√q h),
    // S = sin(√q h)/√q (cosh and sinh/√−q when q < 0). φ = ψ'/k_L keeps both entries O(1).
    let cosine: number; // C
    let sineTerm: number; // S·k_L
    let derivativeTerm: number; // q·S/k_L
    if (Math.abs(phaseSquared) < 1e-4) {
      // Series to O((qh²)³): error below 1e-16 relative.
      const cosineSeries = 1 - phaseSquared / 2 + (phaseSquared * phaseSquared) / 24 - (phaseSquared * phaseSquared * phaseSquared) / 720;
      const sineOverWidth = 1 - phaseSquared / 6 + (phaseSquared * phaseSquared) / 120 - (phaseSquared * phaseSquared * phaseSquared) / 5040;
      if (waveNumberSquared < 0) {
        // Keep the evanescent convention (factor e^{κh} moved to the log scale) for continuity.
        const kappaH = Math.sqrt(-phaseSquared);
        const damp = Math.exp(-kappaH);
        cosine = cosineSeries * damp;
        sineTerm = sineOverWidth * sliceWidth * kLeft * damp;
        derivativeTerm = ((waveNumberSquared * sliceWidth) / kLeft) * sineOverWidth * damp;
        logScale += kappaH;
      } else {
        cosine = cosineSeries;
        sineTerm = sineOverWidth * sliceWidth * kLeft;
        derivativeTerm = ((waveNumberSquared * sliceWidth) / kLeft) * sineOverWidth;
      }
    } else if (waveNumberSquared > 0) {
      const k = Math.sqrt(waveNumberSquared);
      const phase = k * sliceWidth;
      const sine = Math.sin(phase);
      cosine = Math.cos(phase);
      sineTerm = (sine / k) * kLeft;
      derivativeTerm = (k * sine) / kLeft;
    } else {
      const kappa = Math.sqrt(-waveNumberSquared);
      const kappaH = kappa * sliceWidth;
      // cosh(κh) = e^{κh}(1 + e^{−2κh})/2, sinh(κh) = e^{κh}(1 − e^{−2κh})/2; e^{κh} → log scale.
      const e2 = Math.exp(-2 * kappaH);
      const coshScaled = (1 + e2) / 2;
      const sinhScaled = -Math.expm1(-2 * kappaH) / 2;
      cosine = coshScaled;
      sineTerm = (sinhScaled / kappa) * kLeft;
      derivativeTerm = (-kappa * sinhScaled) / kLeft;
      logScale += kappaH;
    }
    const newPsiRe = cosine * psiRe - sineTerm * phiRe;
    const newPsiIm = cosine * psiIm - sineTerm * phiIm;
    phiRe = derivativeTerm * psiRe + cosine * phiRe;
    phiIm = derivativeTerm * psiIm + cosine * phiIm;
    psiRe = newPsiRe;
    psiIm = newPsiIm;
    const size = Math.abs(psiRe) + Math.abs(psiIm) + Math.abs(phiRe) + Math.abs(phiIm);
    if (size > 1e100 || size < 1e-100) {
      const inv = 1 / size;
      psiRe *= inv;
      psiIm *= inv;
      phiRe *= inv;
      phiIm *= inv;
      logScale += Math.log(size);
    }
  }
  // Left electrode: ψ = A e^{ik_L x} + B e^{−ik_L x} ⇒ A = (ψ − i·ψ'/k_L)/2 = (ψ − i·φ)/2.
  const psi = complex(psiRe, psiIm);
  const phi = complex(phiRe, phiIm);
  const incident = cScale(cSub(psi, cMul(I_UNIT, phi)), 0.5);
  return Math.log(kRight / kLeft) - Math.log(cAbsSquared(incident)) - 2 * logScale;
}

/** Options of {@link transferMatrixTransmission}. */
export interface TransferMatrixOptions {
  /** Stop doubling when two successive extrapolated T differ by ≤ this (relative). Default 1e-8. */
  relativeTolerance?: number;
  /** Number of slices to start from (rounded up to a whole number per sample interval). Default 16. */
  initialSlices?: number;
  /** Give up doubling beyond this many slices (result flagged not converged). Default 262144. */
  maxSlices?: number;
  /** Use exactly this many slices per sample interval: one plain evaluation, no extrapolation or check. */
  fixedSlicesPerInterval?: number;
}

/** Result of {@link transferMatrixTransmission}. */
export interface TransferMatrixResult {
  /** Transmission probability (flux ratio), dimensionless; may underflow to 0 (see logTransmission). */
  transmission: number;
  /** Natural log of the transmission (finite even when transmission underflows). */
  logTransmission: number;
  /** Number of constant-potential slices in the returned value. */
  slices: number;
  /**
   * Estimated relative error of `transmission` from the slicing: the relative difference between the
   * last two Richardson-extrapolated values (a conservative bound: the extrapolation converges as
   * h⁴, so the true error is usually an order of magnitude smaller). NaN with fixed slicing.
   */
  estimatedRelativeError: number;
  /** True when the doubling met relativeTolerance (always false with fixed slicing). */
  converged: boolean;
}

/**
 * Exact 1D transmission probability through any sampled barrier at normal energy Ex.
 * Potential measured from the left (tip) band bottom: W(x) = fermiEnergyEV + U(x) inside the barrier,
 * 0 in the tip, −biasV in the sample. T = (k_R/k_L)·|t/A|², k_L = √(2m_e·Ex)/ħ, k_R = √(2m_e(Ex + eV))/ħ,
 * from the piecewise-constant transfer matrix (stable backward form, see the file comment).
 * Slicing: each sample interval is cut into m equal slices; the method is second order in the slice
 * width h, so ln T from m and 2m slices is Richardson-extrapolated (error O(h⁴)), and m doubles until
 * two successive extrapolated values agree within relativeTolerance. Energy in eV above the tip band bottom; returns 0 (log −Infinity) when Ex ≤ 0
 * or Ex ≤ −eV, where one electrode has no propagating state.
 * Source: piecewise-constant transfer matrix, e.g. Y. Ando & T. Itoh, J. Appl. Phys. 61, 1497 (1987)
 * (citation from memory); rectangle and trapezoid check values in physics.md §11.
 * @example transferMatrixTransmission(trapezoidProfile({ tipWorkFunctionEV: 4, sampleWorkFunctionEV: 4, gapM: 1e-9, fermiEnergyEV: 5 }, 1, 1), 5).transmission // ≈ 1.805634e-8
 */
export function transferMatrixTransmission(profile: SampledProfile, energyEV: number, options: TransferMatrixOptions = {}): TransferMatrixResult {
  const caller = 'transferMatrixTransmission';
  checkProfile(caller, profile);
  if (!Number.isFinite(energyEV)) throw new Error(`${caller}: energyEV must be finite, got ${energyEV}`);
  const intervals = profile.positionsM.length - 1;
  const { relativeTolerance = 1e-8, initialSlices = 16, maxSlices = 262144, fixedSlicesPerInterval } = options;
  if (!(relativeTolerance > 0)) throw new Error(`${caller}: relativeTolerance must be > 0, got ${relativeTolerance}`);
  if (!(initialSlices >= 1)) throw new Error(`${caller}: initialSlices must be >= 1, got ${initialSlices}`);
  if (!(maxSlices >= 1)) throw new Error(`${caller}: maxSlices must be >= 1, got ${maxSlices}`);
  if (energyEV <= 0 || energyEV + profile.biasV <= 0) {
    return { transmission: 0, logTransmission: -Infinity, slices: 0, estimatedRelativeError: 0, converged: true };
  }
  if (fixedSlicesPerInterval !== undefined) {
    if (!(Number.isInteger(fixedSlicesPerInterval) && fixedSlicesPerInterval >= 1)) {
      throw new Error(`${caller}: fixedSlicesPerInterval must be an integer >= 1, got ${fixedSlicesPerInterval}`);
    }
    const logT = slicedLogTransmission(sliceProfile(profile, fixedSlicesPerInterval), energyEV);
    return { transmission: Math.exp(logT), logTransmission: logT, slices: intervals * fixedSlicesPerInterval, estimatedRelativeError: Number.NaN, converged: false };
  }
  const found = convergeSlicing(profile, energyEV, relativeTolerance, initialSlices, maxSlices);
  return {
    transmission: Math.exp(found.logTransmission),
    logTransmission: found.logTransmission,
    slices: intervals * found.slicesPerInterval,
    estimatedRelativeError: found.estimatedRelativeError,
    converged: found.converged,
  };
}

interface ConvergedSlicing {
  slicesPerInterval: number;
  logTransmission: number;
  estimatedRelativeError: number;
  converged: boolean;
}

/**
 * Richardson step for a second-order method: from ln T at m and 2m slices per interval, the h⁴-accurate
 * estimate ln T(2m) + [ln T(2m) − ln T(m)]/3.
 */
const richardson = (coarse: number, fine: number): number => (coarse === fine ? fine : fine + (fine - coarse) / 3);

/**
 * Double the slices per interval, Richardson-extrapolating each pair, until two successive extrapolated
 * values differ by ≤ tolerance (relative) or the next doubling would pass maxSlices.
 */
function convergeSlicing(profile: SampledProfile, energyEV: number, tolerance: number, initialSlices: number, maxSlices: number): ConvergedSlicing {
  const intervals = profile.positionsM.length - 1;
  let perInterval = Math.max(1, Math.ceil(initialSlices / intervals));
  let plain = slicedLogTransmission(sliceProfile(profile, perInterval), energyEV);
  let extrapolated = Number.NaN;
  let lastChange = Number.NaN;
  for (;;) {
    const next = perInterval * 2;
    if (intervals * next > maxSlices) {
      const value = Number.isNaN(extrapolated) ? plain : extrapolated;
      return { slicesPerInterval: perInterval, logTransmission: value, estimatedRelativeError: lastChange, converged: false };
    }
    const finer = slicedLogTransmission(sliceProfile(profile, next), energyEV);
    const nextExtrapolated = richardson(plain, finer);
    perInterval = next;
    plain = finer;
    if (!Number.isNaN(extrapolated)) {
      lastChange = Math.abs(Math.expm1(nextExtrapolated - extrapolated));
      if (lastChange <= tolerance) {
        return { slicesPerInterval: perInterval, logTransmission: nextExtrapolated, estimatedRelativeError: lastChange, converged: true };
      }
    }
    extrapolated = nextExtrapolated;
  }
}

// ---------------------------------------------------------------------------------------------
// Current density
// ---------------------------------------------------------------------------------------------

/**
 * Supply function N(Ex), eV: net electrons per unit normal energy available to tunnel tip → sample.
 * N = k_BT·ln{[1 + e^{(E_F − Ex)/k_BT}] / [1 + e^{(E_F − eV − Ex)/k_BT}]}; at T = 0,
 * N = (E_F − Ex)₊ − (E_F − eV − Ex)₊. Energies in eV from the tip band bottom (physics.md §5).
 */
function supplyFromBandBottomEV(energyEV: number, fermiEnergyEV: number, biasV: number, temperatureK: number): number {
  const upper = fermiEnergyEV - energyEV;
  const lower = fermiEnergyEV - biasV - energyEV;
  if (temperatureK === 0) return Math.max(upper, 0) - Math.max(lower, 0);
  const kT = BOLTZMANN_EV_PER_K * temperatureK;
  return kT * (softplus(upper / kT) - softplus(lower / kT));
}

/** ln(1 + e^x) without overflow or loss of digits. */
function softplus(x: number): number {
  return x > 0 ? x + Math.log1p(Math.exp(-x)) : Math.log1p(Math.exp(x));
}

// Gauss–Kronrod 7/15 nodes and weights (R. Piessens et al., QUADPACK, Springer 1983, routine qk15).
const KRONROD_NODES = [
  0.991455371120812639206854697526329, 0.949107912342758524526189684047851, 0.864864423359769072789712788640926,
  0.741531185599394439863864773280788, 0.586087235467691130294144845693013, 0.405845151377397166906606412076961,
  0.207784955007898467600689403773245, 0,
];
const KRONROD_WEIGHTS = [
  0.02293532201052922496373200805897, 0.063092092629978553290700663189204, 0.104790010322250183839876322541518,
  0.140653259715525918745189590510238, 0.16900472663926790282658342659855, 0.190350578064785409913256402421014,
  0.204432940075298892414161999234649, 0.209482141084727828012999174891714,
];
// Gauss weights for the nodes KRONROD_NODES[1], [3], [5] and the centre.
const GAUSS_WEIGHTS = [0.129484966168869693270611432679082, 0.27970539148927666790146777142378, 0.381830050505118944950369775488975, 0.417959183673469387755102040816327];

interface Panel {
  lo: number;
  hi: number;
  integral: number;
  error: number;
}

function kronrodPanel(f: (x: number) => number, lo: number, hi: number): Panel {
  const centre = (lo + hi) / 2;
  const half = (hi - lo) / 2;
  const fc = f(centre);
  let kronrod = KRONROD_WEIGHTS[7] * fc;
  let gauss = GAUSS_WEIGHTS[3] * fc;
  for (let i = 0; i < 7; i++) {
    const dx = half * KRONROD_NODES[i];
    const pair = f(centre - dx) + f(centre + dx);
    kronrod += KRONROD_WEIGHTS[i] * pair;
    if (i % 2 === 1) gauss += GAUSS_WEIGHTS[(i - 1) / 2] * pair;
  }
  return { lo, hi, integral: kronrod * half, error: Math.abs((kronrod - gauss) * half) };
}

/** Options of {@link supplyWeightedCurrentDensity} and {@link exactCurrentDensity}. */
export interface CurrentIntegralOptions {
  /** Target relative error of the energy quadrature. Default 1e-7. */
  relativeTolerance?: number;
  /** Upper limit: this many k_BT above the upper Fermi level. Default 40. */
  thermalTailKT?: number;
  /** Give up refining after this many integrand evaluations. Default 20000. */
  maxEvaluations?: number;
}

/** Result of {@link supplyWeightedCurrentDensity}. */
export interface CurrentIntegralResult {
  /** Current density, A/m²; > 0 for V > 0 (electrons tip → sample). */
  currentDensityAPerM2: number;
  /** Estimated relative error of the energy quadrature (Kronrod − Gauss, summed over panels). */
  estimatedRelativeError: number;
  /** Number of transmission evaluations. */
  evaluations: number;
  /** True when the quadrature met its tolerance within maxEvaluations. */
  converged: boolean;
}

/**
 * Free-electron current density for any transmission D(Ex):
 * J = (4π m_e e/h³)·∫ D(Ex)·N(Ex) dEx, N = k_BT·ln{[1 + e^{(E_F − Ex)/k_BT}]/[1 + e^{(E_F − eV − Ex)/k_BT}]}
 * (T = 0: N = (E_F − Ex)₊ − (E_F − eV − Ex)₊), integrated from max(0, −eV)
 * (both electrodes need states) to 40 k_BT above the upper Fermi level, with breakpoints at both Fermi
 * levels (and ±8 k_BT around them when T > 0), by globally adaptive Gauss–Kronrod 7/15 quadrature.
 * D takes Ex in eV above the tip band bottom. V in volts, T in K; returns A/m².
 * Source: J. G. Simmons, J. Appl. Phys. 34, 1793 (1963), eq. (1); physics.md §5 (check values there).
 * @example supplyWeightedCurrentDensity(() => 1e-9, 5.5, 0.1, 0).currentDensityAPerM2 // ≈ 1.618311e14·1e-9·(0.1·5.4 + 0.1²/2) = 8.81979e4
 */
export function supplyWeightedCurrentDensity(
  transmissionAt: (energyEV: number) => number,
  fermiEnergyEV: number,
  biasV: number,
  temperatureK: number,
  options: CurrentIntegralOptions = {},
): CurrentIntegralResult {
  const caller = 'supplyWeightedCurrentDensity';
  if (!(fermiEnergyEV > 0 && Number.isFinite(fermiEnergyEV))) throw new Error(`${caller}: fermiEnergyEV must be > 0, got ${fermiEnergyEV}`);
  if (!Number.isFinite(biasV)) throw new Error(`${caller}: biasV must be finite, got ${biasV}`);
  if (!(temperatureK >= 0 && Number.isFinite(temperatureK))) throw new Error(`${caller}: temperatureK must be >= 0, got ${temperatureK}`);
  const { relativeTolerance = 1e-7, thermalTailKT = 40, maxEvaluations = 20000 } = options;
  if (!(relativeTolerance > 0)) throw new Error(`${caller}: relativeTolerance must be > 0, got ${relativeTolerance}`);
  if (!(thermalTailKT > 0)) throw new Error(`${caller}: thermalTailKT must be > 0, got ${thermalTailKT}`);
  if (biasV === 0) return { currentDensityAPerM2: 0, estimatedRelativeError: 0, evaluations: 0, converged: true };

  const kT = BOLTZMANN_EV_PER_K * temperatureK;
  const lowerFermi = Math.min(fermiEnergyEV, fermiEnergyEV - biasV);
  const upperFermi = Math.max(fermiEnergyEV, fermiEnergyEV - biasV);
  const lo = Math.max(0, -biasV);
  const hi = upperFermi + thermalTailKT * kT;
  const candidates = [lowerFermi, upperFermi];
  if (kT > 0) candidates.push(lowerFermi - 8 * kT, lowerFermi + 8 * kT, upperFermi - 8 * kT, upperFermi + 8 * kT);
  const minGap = 1e-12 * Math.max(1, hi);
  const breaks = [lo, hi, ...candidates.filter((x) => x > lo + minGap && x < hi - minGap)].sort((a, b) => a - b);
  const points: number[] = [breaks[0]];
  for (const x of breaks) if (x - points[points.length - 1] > minGap) points.push(x);

  let evaluations = 0;
  const integrand = (x: number): number => {
    evaluations++;
    const supply = supplyFromBandBottomEV(x, fermiEnergyEV, biasV, temperatureK);
    return supply === 0 ? 0 : transmissionAt(x) * supply;
  };
  const panels: Panel[] = [];
  for (let i = 0; i + 1 < points.length; i++) panels.push(kronrodPanel(integrand, points[i], points[i + 1]));
  let total = 0;
  let error = 0;
  let converged = false;
  for (;;) {
    total = 0;
    error = 0;
    let worst = 0;
    for (let i = 0; i < panels.length; i++) {
      total += panels[i].integral;
      error += panels[i].error;
      if (panels[i].error > panels[worst].error) worst = i;
    }
    // Absolute floor: rounding of the panel sums (the integrand is summed in doubles).
    if (error <= relativeTolerance * Math.abs(total) || error <= 1e-300) {
      converged = true;
      break;
    }
    if (evaluations + 30 > maxEvaluations) break;
    const { lo: a, hi: b } = panels[worst];
    const mid = (a + b) / 2;
    if (!(mid > a && mid < b)) break;
    panels.splice(worst, 1, kronrodPanel(integrand, a, mid), kronrodPanel(integrand, mid, b));
  }
  const currentDensityAPerM2 = SUPPLY_CONSTANT_A_PER_M2_PER_EV2 * total;
  const estimatedRelativeError = total === 0 ? 0 : error / Math.abs(total);
  return { currentDensityAPerM2, estimatedRelativeError, evaluations, converged };
}

/** Options of {@link exactCurrentDensity}. */
export interface ExactCurrentOptions extends CurrentIntegralOptions {
  /** Slicing tolerance of the transmission at the probe energies (see TransferMatrixOptions). Default 1e-8. */
  transmissionTolerance?: number;
  /** Cap on the slices of the transmission. Default 262144. */
  maxSlices?: number;
}

/** Result of {@link exactCurrentDensity}. */
export interface ExactCurrentResult {
  /** Current density, A/m²; > 0 for V > 0 (electrons tip → sample). */
  currentDensityAPerM2: number;
  /** Slices of the finer slicing of the Richardson pair used for every transmission evaluation. */
  slices: number;
  /** Estimated relative error: quadrature estimate plus the largest slicing estimate at the probe energies. */
  estimatedRelativeError: number;
  /** Number of transmission evaluations in the energy integral. */
  evaluations: number;
  /** True when both the slicing and the quadrature met their tolerances. */
  converged: boolean;
}

function isJunction(barrier: Junction | SampledProfile): barrier is Junction {
  return (barrier as Junction).gapM !== undefined;
}

/**
 * Current density with the exact transmission instead of WKB: the reference for the WKB deviation.
 * J = (4π m_e e/h³)·∫ D(Ex)·N(Ex) dEx with D from the transfer matrix ({@link transferMatrixTransmission})
 * and the supply function N of {@link supplyWeightedCurrentDensity}; limits and breakpoints as in {@link supplyWeightedCurrentDensity}.
 * The slicing is converged once, at probe energies (near the band-bottom end, both Fermi levels, the
 * upper limit), and the finest Richardson pair found is used for every quadrature node. A Junction is taken as the §0 trapezoid;
 * a SampledProfile must carry the same biasV. V in volts (sample bias), T in K; returns A/m².
 * Slow by design (a few ms per bias point).
 * Source: J. G. Simmons, J. Appl. Phys. 34, 1793 (1963), eq. (1) with the exact 1D transmission;
 * physics.md §5 and §11.
 * @example exactCurrentDensity({ tipWorkFunctionEV: 4, sampleWorkFunctionEV: 4, gapM: 1e-9, fermiEnergyEV: 5.5 }, 0.1, 0).currentDensityAPerM2 // ≈ 3.30094e4 (WKB: 8.366882e3)
 */
export function exactCurrentDensity(
  barrier: Junction | SampledProfile,
  biasV: number,
  temperatureK: number,
  options: ExactCurrentOptions = {},
): ExactCurrentResult {
  const caller = 'exactCurrentDensity';
  if (!Number.isFinite(biasV)) throw new Error(`${caller}: biasV must be finite, got ${biasV}`);
  if (!(temperatureK >= 0 && Number.isFinite(temperatureK))) throw new Error(`${caller}: temperatureK must be >= 0, got ${temperatureK}`);
  let profile: SampledProfile;
  if (isJunction(barrier)) {
    checkJunction(caller, barrier);
    profile = trapezoidProfile(barrier, biasV, 1);
  } else {
    checkProfile(caller, barrier);
    if (Math.abs(barrier.biasV - biasV) > 1e-12 * Math.max(1, Math.abs(biasV))) {
      throw new Error(`${caller}: biasV must equal profile.biasV (${barrier.biasV}), got ${biasV}`);
    }
    profile = barrier;
  }
  const { transmissionTolerance = 1e-8, maxSlices = 262144, ...integralOptions } = options;
  if (!(transmissionTolerance > 0)) throw new Error(`${caller}: transmissionTolerance must be > 0, got ${transmissionTolerance}`);
  if (biasV === 0) return { currentDensityAPerM2: 0, slices: 0, estimatedRelativeError: 0, evaluations: 0, converged: true };

  const fermi = profile.fermiEnergyEV;
  const kT = BOLTZMANN_EV_PER_K * temperatureK;
  const lo = Math.max(0, -biasV);
  const upperFermi = Math.max(fermi, fermi - biasV);
  const lowerFermi = Math.min(fermi, fermi - biasV);
  const hi = upperFermi + (integralOptions.thermalTailKT ?? 40) * kT;
  const probes = [lo + 0.01 * (upperFermi - lo), lowerFermi, upperFermi, hi].filter((x) => x > lo);
  let perInterval = 1;
  let slicingError = 0;
  let slicingConverged = true;
  for (const energy of probes) {
    const found = convergeSlicing(profile, energy, transmissionTolerance, 16, maxSlices);
    perInterval = Math.max(perInterval, found.slicesPerInterval);
    // A slicing that never reached two evaluations has no estimate: count it as unknown (NaN).
    slicingError = Number.isNaN(found.estimatedRelativeError) ? Number.NaN : Math.max(slicingError, found.estimatedRelativeError);
    slicingConverged = slicingConverged && found.converged;
  }
  // The probes ended on a Richardson pair (m/2, m); the integrand uses the same pair.
  const fine = sliceProfile(profile, perInterval);
  const coarse = sliceProfile(profile, Math.max(1, perInterval / 2));
  const transmissionAt = (energy: number): number => {
    const logFine = slicedLogTransmission(fine, energy);
    return perInterval === 1 ? Math.exp(logFine) : Math.exp(richardson(slicedLogTransmission(coarse, energy), logFine));
  };
  const integral = supplyWeightedCurrentDensity(transmissionAt, fermi, biasV, temperatureK, integralOptions);
  return {
    currentDensityAPerM2: integral.currentDensityAPerM2,
    slices: fine.potentialsEV.length,
    estimatedRelativeError: integral.estimatedRelativeError + slicingError,
    evaluations: integral.evaluations,
    converged: integral.converged && slicingConverged,
  };
}
