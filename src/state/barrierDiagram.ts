/**
 * The barrier diagram of a fitted curve: energy against position across the gap, every energy in
 * eV from the tip Fermi level. The tip (x < 0) is filled up to 0, the sample (x > d) up to −eV (V is
 * the sample bias, README sign convention); the trapezoid joins φ1 above the tip to φ2 − eV above
 * the sample; the image-rounded barrier comes from the physics core; electrons tunnel in the window
 * between the two Fermi levels, softened by a few k_BT. Also the WKB-versus-exact current check for
 * the same junction. Pure: the state computes these numbers, components only draw them.
 */
import type { CurveResult } from '../analysis/index.ts';
import type { AnalysisSettings } from '../fit/index.ts';
import {
  BOLTZMANN_EV_PER_K,
  exactCurrentDensity,
  imageRoundedProfile,
  sampledCurrentDensity,
  trapezoidCurrentDensity,
  trapezoidHeightEV,
  type Junction,
} from '../physics/index.ts';

/** The junction a result describes, and where each number came from. */
export interface DiagramJunction {
  junction: Junction;
  /** Bias at which the curve was measured (I(z)) or a representative one (I(V)), V. */
  biasV: number;
  /** Bias range worth offering for this curve, V. */
  biasRangeV: [number, number];
  /** One sentence on the assumptions behind the numbers. */
  note: string;
}

/**
 * The junction of a fitted curve. I(V): φ1, φ2 and the width as fitted. I(z): the slope only fixes
 * the mean barrier, so φ̄ = φ_ap with the width = the gap to contact; φ1 is the tip work function
 * setting when given (φ2 = 2φ_ap − φ1, keeping the mean), otherwise φ1 = φ2 = φ_ap.
 * Returns null for a curve without the numbers (failed fit).
 * @example diagramJunction(result, settings)?.junction.gapM // 5.8e-10
 */
export function diagramJunction(result: CurveResult, settings: AnalysisSettings, biasRangeV?: [number, number]): DiagramJunction | null {
  const fermiEnergyEV = settings.fermiEnergyEV;
  if (result.kind === 'iv') {
    const { phi1EV, phi2EV, widthNm } = result;
    if (phi1EV === null || phi2EV === null || widthNm === null || !(phi1EV > 0 && phi2EV > 0 && widthNm > 0)) return null;
    const range = biasRangeV ?? [-1, 1];
    return {
      junction: { tipWorkFunctionEV: phi1EV, sampleWorkFunctionEV: phi2EV, gapM: widthNm * 1e-9, fermiEnergyEV },
      biasV: range[1],
      biasRangeV: range,
      note: `${result.model.toUpperCase()} fit: φ1, φ2 and d as fitted${settings.tipWorkFunctionEV !== null ? ' (φ1 held at the tip work function setting)' : ''}.`,
    };
  }
  const barrier = result.apparentBarrierEV;
  const gap = result.gapToContactNm;
  if (barrier === null || gap === null || !(barrier > 0 && gap > 0)) return null;
  const biasV = result.conditions.biasV ?? settings.defaultBiasV;
  const tip = settings.tipWorkFunctionEV;
  const phi1 = tip !== null && 2 * barrier - tip > 0.05 ? tip : barrier;
  const phi2 = 2 * barrier - phi1;
  const limit = Math.max(1, Math.abs(biasV) * 2);
  return {
    junction: { tipWorkFunctionEV: phi1, sampleWorkFunctionEV: phi2, gapM: Math.min(gap, 10) * 1e-9, fermiEnergyEV },
    biasV,
    biasRangeV: biasRangeV ?? [-limit, limit],
    note:
      tip !== null && phi1 === tip
        ? 'I(z) fit: mean barrier = φ_ap, width = gap to contact; φ1 from the tip work function setting, φ2 keeps the mean.'
        : 'I(z) fit: a symmetric barrier of height φ_ap, width = gap to contact (the slope fixes only the mean barrier).',
  };
}

/** A polyline in (position nm, energy eV). */
export interface EnergyLine {
  xNm: number[];
  energyEV: number[];
}

/** What the diagram draws (positions in nm, energies in eV above the tip Fermi level). */
export interface BarrierDiagramData {
  gapNm: number;
  biasV: number;
  temperatureK: number;
  tipFermiEV: number;
  sampleFermiEV: number;
  /** Vacuum levels: φ1 above the tip, φ2 − eV above the sample. */
  tipVacuumEV: number;
  sampleVacuumEV: number;
  trapezoid: EnergyLine;
  /** The image-rounded barrier, when asked for and computable. */
  imageRounded: EnergyLine | null;
  /** The energies carrying current: between the Fermi levels, widened by 3 k_BT each side. */
  window: { lowEV: number; highEV: number; thermalEV: number };
  /** Energy range worth showing. */
  energyRangeEV: [number, number];
}

/**
 * The diagram of a junction at one bias (see the file comment). The image-rounded barrier uses
 * imageRoundedProfile (physics core, 200 slices); it is left out (null) when `imagePotential` is off.
 * @example barrierDiagram(junction, 0.5, 300, false).trapezoid.energyEV // [φ1, φ2 − 0.5]
 */
export function barrierDiagram(junction: Junction, biasV: number, temperatureK: number, imagePotential: boolean): BarrierDiagramData {
  const gapNm = junction.gapM * 1e9;
  const tipVacuumEV = trapezoidHeightEV(junction, biasV, 0);
  const sampleVacuumEV = trapezoidHeightEV(junction, biasV, junction.gapM);
  let imageRounded: EnergyLine | null = null;
  if (imagePotential) {
    try {
      const profile = imageRoundedProfile(junction, biasV, { slices: 200 });
      imageRounded = { xNm: Array.from(profile.positionsM, (x) => x * 1e9), energyEV: Array.from(profile.heightsEV) };
    } catch {
      imageRounded = null;
    }
  }
  const thermalEV = 3 * BOLTZMANN_EV_PER_K * temperatureK;
  const sampleFermiEV = -biasV;
  const lowEV = Math.min(0, sampleFermiEV);
  const highEV = Math.max(0, sampleFermiEV);
  const top = Math.max(tipVacuumEV, sampleVacuumEV, highEV) + 0.6;
  const bottom = lowEV - Math.max(1.2, 0.25 * (top - lowEV));
  return {
    gapNm,
    biasV,
    temperatureK,
    tipFermiEV: 0,
    sampleFermiEV,
    tipVacuumEV,
    sampleVacuumEV,
    trapezoid: { xNm: [0, gapNm], energyEV: [tipVacuumEV, sampleVacuumEV] },
    imageRounded,
    window: { lowEV, highEV, thermalEV },
    energyRangeEV: [bottom, top],
  };
}

/** WKB against exact transmission for one junction and bias. */
export interface WkbDeviation {
  biasV: number;
  /** The barrier both currents go through: the fitted trapezoid, or it rounded by the image force. */
  barrier: 'trapezoid' | 'image-rounded';
  /** WKB current density (what the fit uses), A/m². */
  wkbAPerM2: number;
  /** Transfer-matrix (exact 1D transmission) current density through the same barrier, A/m². */
  exactAPerM2: number;
  /** exact / WKB. */
  ratio: number;
  /** Set when a calculation failed (the message of the core's error). */
  error: string | null;
}

/**
 * How far the WKB current of these parameters is from the exact (transfer-matrix) current through
 * the same barrier: the trapezoid, or with the image potential on, the image-rounded barrier (WKB
 * by sampledCurrentDensity, exact by exactCurrentDensity on the same profile).
 * A few to tens of ms per call (the exact path is slow by design): run it in a worker.
 * @example wkbDeviation({ tipWorkFunctionEV: 4, sampleWorkFunctionEV: 4, gapM: 1e-9, fermiEnergyEV: 5.5 }, 0.1, 0, false).ratio // ≈ 3.945
 */
export function wkbDeviation(junction: Junction, biasV: number, temperatureK: number, imagePotential: boolean): WkbDeviation {
  const out: WkbDeviation = { biasV, barrier: imagePotential ? 'image-rounded' : 'trapezoid', wkbAPerM2: Number.NaN, exactAPerM2: Number.NaN, ratio: Number.NaN, error: null };
  try {
    if (imagePotential) {
      const profile = imageRoundedProfile(junction, biasV);
      out.wkbAPerM2 = sampledCurrentDensity(profile, temperatureK);
      out.exactAPerM2 = exactCurrentDensity(profile, biasV, temperatureK).currentDensityAPerM2;
    } else {
      out.wkbAPerM2 = trapezoidCurrentDensity(junction, biasV, temperatureK);
      out.exactAPerM2 = exactCurrentDensity(junction, biasV, temperatureK).currentDensityAPerM2;
    }
    out.ratio = out.exactAPerM2 / out.wkbAPerM2;
  } catch (error) {
    out.error = (error as Error).message;
  }
  return out;
}
