import { trapezoidCurrentDensityWithGradient, type Junction } from '../physics/index.ts';
import type { ApproachCurveFit } from './approachCurveFit.ts';
import { createSolver, type LeastSquaresProblem, type SolverOptions } from './solver.ts';
import { describeSolverResult, type BarrierEstimate, type SpectrumFit } from './spectrumFit.ts';

/**
 * Joint fit of an approach curve I(z) and a spectrum I(V) taken at the same site, with shared
 * barrier parameters: φ1, φ2, the spectrum's gap d, one area A, and the approach curve's gap at its
 * closest fitted point s_c (gap_i = s_c + z_i − z_c). Both models are the WKB trapezoid with the
 * full energy integral (physics/currentDensity.ts). Residuals: the spectrum's (I − model)/σ_I as in
 * fitSpectrum, and the approach curve's (ln I − ln model)/σ_lnI from its own noise estimate, both in
 * absolute units so they add; the covariance is then scaled by the joint reduced χ² (solver.ts).
 * Why: the I(z) slope pins the barrier height that a lone I(V) leaves loose (φ, d and A trade off
 * along a shallow valley), while the I(V) shape pins the asymmetry and the width.
 */
export interface JointFitInput {
  approach: { zM: Float64Array; currentA: Float64Array; biasV: number; fit: ApproachCurveFit };
  spectrum: { biasV: Float64Array; currentA: Float64Array; fit: SpectrumFit };
  temperatureK: number;
  fermiEnergyEV: number;
}

export interface UncertaintyNarrowing {
  quantity: 'tipWorkFunctionEV' | 'sampleWorkFunctionEV' | 'meanBarrierEV' | 'asymmetryEV' | 'widthM' | 'areaM2';
  /** Error bars of the lone I(V) fit and of the joint fit, in the quantity's unit. */
  separate: number;
  joint: number;
  /**
   * How many times narrower the joint error bar is, on relative errors (σ/|value| of each fit, so
   * two fits at different values compare fairly; for the asymmetry, which may be near zero, on
   * absolute errors). NaN when the lone fit has no finite error or the two values differ by more
   * than 3 combined σ (they do not describe the same optimum; see `note`).
   */
  factor: number;
  note: string;
}

export interface JointFit {
  estimate: BarrierEstimate;
  /** Gap of the approach curve at its closest fitted point, m, and its error. */
  approachGapM: number;
  approachGapErrorM: number;
  narrowing: UncertaintyNarrowing[];
}

const OPTIONS: SolverOptions = { maxIterations: 200, functionTolerance: 1e-12, stepTolerance: 1e-10, gradientTolerance: 1e-12 };

/**
 * Fit both curves together (see the file comment). The start comes from the separate fits: the
 * barrier height from the I(z) apparent barrier, the asymmetry and width/√φ̄ from the I(V) fit.
 * @example jointFit({ approach, spectrum, temperatureK: 300, fermiEnergyEV: 5.5 }).narrowing
 */
export function jointFit(input: JointFitInput): JointFit {
  const { approach, spectrum, temperatureK, fermiEnergyEV } = input;
  const izFit = approach.fit;
  // Approach-curve points used by its own fit, with their ln-current σ.
  const used: number[] = [];
  for (let i = 0; i < izFit.zM.length; i++) if (izFit.exclusion[i] === 0) used.push(i);
  const zUsed = Float64Array.from(used, (i) => izFit.zM[i]);
  // ln I with the floor bias removed, as in the lone fit (+½(σ_floor/Î)², approachCurveFit.ts).
  const lnUsed = Float64Array.from(used, (i) => izFit.lnCurrent[i] + 0.5 * (izFit.noiseFloorA / Math.exp(izFit.fittedLnCurrent[i])) ** 2);
  const lnWeights = Float64Array.from(used, (i) => {
    const predicted = Math.exp(izFit.fittedLnCurrent[i]);
    return 1 / Math.sqrt(izFit.relativeNoise ** 2 + (izFit.noiseFloorA / predicted) ** 2);
  });
  const closestZ = zUsed.reduce((a, b) => Math.min(a, b), Infinity);
  const nIv = spectrum.biasV.length;
  const nIz = used.length;
  const n = nIv + nIz;
  const ivWeights = spectrum.fit.weights;
  const sign = approach.biasV < 0 ? -1 : 1;

  const start = startingPoint(input, closestZ);
  const q0 = [Math.log(start.tip), Math.log(start.sample), Math.log(start.width), Math.log(start.area), Math.log(start.approachGap)];
  const lower = [Math.log(0.01), Math.log(0.01), Math.log(2e-11), Math.log(1e-26), Math.log(2e-11)];
  const upper = [Math.log(15), Math.log(15), Math.log(1e-8), Math.log(1e-10), Math.log(1e-8)];
  for (let k = 0; k < 5; k++) q0[k] = Math.min(upper[k] - 1e-9, Math.max(lower[k] + 1e-9, q0[k]));

  const model = new Float64Array(n);
  const gradient = new Float64Array(n * 5);
  const point = new Float64Array(3);
  const cachedAt = new Float64Array(5).fill(Number.NaN);
  const evaluate = (q: Float64Array) => {
    let same = true;
    for (let k = 0; k < 5; k++) if (cachedAt[k] !== q[k]) same = false;
    if (same) return;
    cachedAt.set(q);
    const tip = Math.exp(q[0]);
    const sample = Math.exp(q[1]);
    const width = Math.exp(q[2]);
    const area = Math.exp(q[3]);
    const approachGap = Math.exp(q[4]);
    const junction: Junction = { tipWorkFunctionEV: tip, sampleWorkFunctionEV: sample, gapM: width, fermiEnergyEV };
    for (let i = 0; i < nIv; i++) {
      const density = trapezoidCurrentDensityWithGradient(junction, spectrum.biasV[i], temperatureK, point);
      model[i] = area * density;
      const row = i * 5;
      gradient[row] = area * point[0] * tip;
      gradient[row + 1] = area * point[1] * sample;
      gradient[row + 2] = area * point[2] * width;
      gradient[row + 3] = model[i];
      gradient[row + 4] = 0;
    }
    for (let k = 0; k < nIz; k++) {
      const gap = approachGap + zUsed[k] - closestZ;
      const density = sign * trapezoidCurrentDensityWithGradient({ ...junction, gapM: gap }, approach.biasV, temperatureK, point);
      const i = nIv + k;
      // Model of ln|I|; derivatives of ln J.
      model[i] = Math.log(area * density);
      const row = i * 5;
      gradient[row] = ((sign * point[0]) / density) * tip;
      gradient[row + 1] = ((sign * point[1]) / density) * sample;
      gradient[row + 2] = 0;
      gradient[row + 3] = 1;
      gradient[row + 4] = ((sign * point[2]) / density) * approachGap;
    }
  };
  const problem: LeastSquaresProblem = {
    nParams: 5,
    nResiduals: n,
    residuals(q, out) {
      evaluate(q);
      for (let i = 0; i < nIv; i++) out[i] = (spectrum.currentA[i] - model[i]) * ivWeights[i];
      for (let k = 0; k < nIz; k++) out[nIv + k] = (lnUsed[k] - model[nIv + k]) * lnWeights[k];
    },
    jacobian(q, out) {
      evaluate(q);
      for (let i = 0; i < n; i++) {
        const w = i < nIv ? ivWeights[i] : lnWeights[i - nIv];
        for (let k = 0; k < 5; k++) out[i * 5 + k] = -w * gradient[i * 5 + k];
      }
    },
  };
  const names = ['ln tipWorkFunctionEV', 'ln sampleWorkFunctionEV', 'ln widthM', 'ln areaM2', 'ln approachGapM'];
  const result = createSolver(5, n).solve(problem, q0, { ...OPTIONS, lower, upper, parameterNames: names });
  evaluate(result.params);
  const value = (k: number) => Math.exp(result.params[k]);
  const logCov = (a: number, b: number) => result.covariance[a * 5 + b];
  const tip = value(0);
  const sample = value(1);
  const varTip = tip * tip * logCov(0, 0);
  const varSample = sample * sample * logCov(1, 1);
  const covTipSample = tip * sample * logCov(0, 1);
  const fitted = model.slice(0, nIv);
  const estimate: BarrierEstimate = {
    ...describeSolverResult('wkb', result, fitted, names),
    message: `joint I(z) + I(V) fit: ${result.message}`,
    tipWorkFunctionEV: tip,
    tipWorkFunctionErrorEV: Math.sqrt(varTip),
    sampleWorkFunctionEV: sample,
    sampleWorkFunctionErrorEV: Math.sqrt(varSample),
    meanBarrierEV: (tip + sample) / 2,
    meanBarrierErrorEV: Math.sqrt(Math.max(0, varTip + varSample + 2 * covTipSample)) / 2,
    asymmetryEV: sample - tip,
    asymmetryErrorEV: Math.sqrt(Math.max(0, varTip + varSample - 2 * covTipSample)),
    widthM: value(2),
    widthErrorM: value(2) * Math.sqrt(logCov(2, 2)),
    areaM2: value(3),
    areaErrorM2: value(3) * Math.sqrt(logCov(3, 3)),
  };
  // The joint fit is WKB: compare with the lone WKB fit (unless the chain stopped before it).
  const separate = spectrum.fit.wkb.status === 'not-run' ? spectrum.fit.best : spectrum.fit.wkb;
  const pairs: [UncertaintyNarrowing['quantity'], number, number, number, number][] = [
    ['tipWorkFunctionEV', separate.tipWorkFunctionEV, separate.tipWorkFunctionErrorEV, estimate.tipWorkFunctionEV, estimate.tipWorkFunctionErrorEV],
    ['sampleWorkFunctionEV', separate.sampleWorkFunctionEV, separate.sampleWorkFunctionErrorEV, estimate.sampleWorkFunctionEV, estimate.sampleWorkFunctionErrorEV],
    ['meanBarrierEV', separate.meanBarrierEV, separate.meanBarrierErrorEV, estimate.meanBarrierEV, estimate.meanBarrierErrorEV],
    ['asymmetryEV', separate.asymmetryEV, separate.asymmetryErrorEV, estimate.asymmetryEV, estimate.asymmetryErrorEV],
    ['widthM', separate.widthM, separate.widthErrorM, estimate.widthM, estimate.widthErrorM],
    ['areaM2', separate.areaM2, separate.areaErrorM2, estimate.areaM2, estimate.areaErrorM2],
  ];
  return {
    estimate,
    approachGapM: value(4),
    approachGapErrorM: value(4) * Math.sqrt(logCov(4, 4)),
    narrowing: pairs.map(([quantity, lone, loneError, joint, jointError]) => narrowingOf(quantity, lone, loneError, joint, jointError, separate.uncertaintiesOk, separate.model === 'bdr')),
  };
}

function narrowingOf(
  quantity: UncertaintyNarrowing['quantity'],
  lone: number,
  loneError: number,
  joint: number,
  jointError: number,
  loneTrusted: boolean,
  loneIsClosedForm: boolean,
): UncertaintyNarrowing {
  const base = { quantity, separate: loneError, joint: jointError };
  if (!(Number.isFinite(loneError) && loneError > 0)) {
    const why = loneIsClosedForm ? 'the lone I(V) estimate is the closed-form BDR one, which has no error bar' : 'the lone I(V) fit gives no finite error bar (a parameter on a bound)';
    return { ...base, factor: Number.NaN, note: why };
  }
  if (Math.abs(lone - joint) > 3 * Math.hypot(loneError, jointError)) {
    return { ...base, factor: Number.NaN, note: 'the lone I(V) and joint optima differ by more than 3 combined σ: the lone error bar describes another point of the valley' };
  }
  const relative = quantity !== 'asymmetryEV';
  const factor = relative ? loneError / Math.abs(lone) / (jointError / Math.abs(joint)) : loneError / jointError;
  return { ...base, factor, note: loneTrusted ? '' : 'the lone I(V) error bar is itself an underestimate (see its uncertainty note), so the true narrowing is larger' };
}

/** Start: φ̄ from the I(z) apparent barrier, Δφ and d/√φ̄ from the I(V) fit, A and s_c by matching amplitudes. */
function startingPoint(input: JointFitInput, closestZ: number) {
  const { approach, spectrum, temperatureK, fermiEnergyEV } = input;
  const iv = spectrum.fit.best;
  const mean = Number.isFinite(approach.fit.apparentBarrierEV) ? Math.min(10, Math.max(0.5, approach.fit.apparentBarrierEV)) : iv.meanBarrierEV;
  const asymmetry = Number.isFinite(iv.asymmetryEV) ? Math.max(-mean, Math.min(mean, iv.asymmetryEV)) : 0;
  const tip = Math.max(0.05, mean - asymmetry / 2);
  const sample = Math.max(0.05, mean + asymmetry / 2);
  const width = Number.isFinite(iv.widthM) && Number.isFinite(iv.meanBarrierEV) ? (iv.widthM / Math.sqrt(iv.meanBarrierEV)) * Math.sqrt(mean) : 8e-10;
  const junction: Junction = { tipWorkFunctionEV: tip, sampleWorkFunctionEV: sample, gapM: width, fermiEnergyEV };
  const gradient = new Float64Array(3);
  // Area: weighted least-squares amplitude of the spectrum at this shape.
  let numerator = 0;
  let denominator = 0;
  for (let i = 0; i < spectrum.biasV.length; i++) {
    const shape = trapezoidCurrentDensityWithGradient(junction, spectrum.biasV[i], temperatureK, gradient);
    const w2 = spectrum.fit.weights[i] ** 2;
    numerator += w2 * spectrum.currentA[i] * shape;
    denominator += w2 * shape * shape;
  }
  const area = numerator > 0 ? numerator / denominator : 1e-18;
  // Approach gap: bisection in ln s for A·J(s) = the fitted current at the closest point.
  const target = Math.exp(approach.fit.interceptLnA + approach.fit.slopePerM * closestZ);
  let low = 2e-11;
  let high = 1e-8;
  for (let k = 0; k < 60; k++) {
    const middle = Math.sqrt(low * high);
    const current = area * Math.abs(trapezoidCurrentDensityWithGradient({ ...junction, gapM: middle }, approach.biasV, temperatureK, gradient));
    if (current > target) low = middle;
    else high = middle;
  }
  return { tip, sample, width, area, approachGap: Math.sqrt(low * high) };
}
