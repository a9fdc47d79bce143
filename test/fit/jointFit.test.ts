/**
 * jointFit on an approach curve and a spectrum simulated from the same junction: coverage of the
 * shared barrier parameters and the narrowing of the barrier error against a lone free-area I(V).
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { fitApproachCurve } from '../../src/fit/approachCurveFit.ts';
import { jointFit, type JointFit } from '../../src/fit/jointFit.ts';
import { fitSpectrum, type SpectrumFit } from '../../src/fit/spectrumFit.ts';
import { simulateCurve, trapezoidCurrentDensity, type Junction } from '../../src/physics/index.ts';
import { expectRelClose } from '../helpers.ts';

const FERMI_ENERGY_EV = 5.5;
const TEMPERATURE_K = 300;
const JUNCTION: Junction = { tipWorkFunctionEV: 4.0, sampleWorkFunctionEV: 4.6, gapM: 0.6e-9, fermiEnergyEV: FERMI_ENERGY_EV };
/** One tunnelling area for both curves, m² (2 nm²). */
const AREA_M2 = 2e-18;
const APPROACH_BIAS_V = 0.1;

interface JointCase {
  joint: JointFit;
  spectrumFit: SpectrumFit;
}

/**
 * I(z) at 0.1 V over gaps 0.6 → 1.2 nm (256 points, 2 % noise, z = gap − 0.6 nm) and I(V) over
 * ±1 V at 0.6 nm (512 points, 1 % noise), both with a 2 pA floor, then the lone fits and the joint fit.
 */
function jointCase(seed: number): JointCase {
  const approach = simulateCurve({
    kind: 'iz',
    junction: JUNCTION,
    currentDensity: trapezoidCurrentDensity,
    area: { areaM2: AREA_M2 },
    temperatureK: TEMPERATURE_K,
    biasV: APPROACH_BIAS_V,
    sweep: { from: 0.6e-9, to: 1.2e-9, points: 256 },
    noise: { relative: 0.02, floorA: 2e-12, seed },
  });
  const spectrum = simulateCurve({
    kind: 'iv',
    junction: JUNCTION,
    currentDensity: trapezoidCurrentDensity,
    area: { areaM2: AREA_M2 },
    temperatureK: TEMPERATURE_K,
    biasV: 0,
    sweep: { from: -1, to: 1, points: 512 },
    noise: { relative: 0.01, floorA: 2e-12, seed: seed + 1000 },
  });
  const zM = Float64Array.from(approach.points, (p) => p.gapM - 0.6e-9);
  const approachCurrentA = Float64Array.from(approach.points, (p) => p.currentA);
  const biasV = Float64Array.from(spectrum.points, (p) => p.biasV);
  const spectrumCurrentA = Float64Array.from(spectrum.points, (p) => p.currentA);
  const approachFit = fitApproachCurve({ zM, currentA: approachCurrentA, biasV: APPROACH_BIAS_V });
  const spectrumFit = fitSpectrum({ biasV, currentA: spectrumCurrentA, temperatureK: TEMPERATURE_K, fermiEnergyEV: FERMI_ENERGY_EV, area: { mode: 'free' } });
  const joint = jointFit({
    approach: { zM, currentA: approachCurrentA, biasV: APPROACH_BIAS_V, fit: approachFit },
    spectrum: { biasV, currentA: spectrumCurrentA, fit: spectrumFit },
    temperatureK: TEMPERATURE_K,
    fermiEnergyEV: FERMI_ENERGY_EV,
  });
  return { joint, spectrumFit };
}

function within3Sigma(value: number, truth: number, error: number): boolean {
  return Number.isFinite(error) && error > 0 && Math.abs(value - truth) <= 3 * error;
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const middle = sorted.length >> 1;
  return sorted.length % 2 ? sorted[middle] : (sorted[middle - 1] + sorted[middle]) / 2;
}

describe('jointFit(I(z) + I(V) of one junction)', () => {
  const seeds = Array.from({ length: 20 }, (_, k) => k + 1);
  let cases: JointCase[] = [];
  beforeAll(() => {
    cases = seeds.map(jointCase);
  });

  it('jointFit(20 seeded pairs) converges and covers φ1, φ2, d and the approach gap within 3σ in ≥ 90 %', () => {
    const inside = { tip: 0, sample: 0, width: 0, approachGap: 0 };
    for (const { joint } of cases) {
      const estimate = joint.estimate;
      expect(estimate.converged, estimate.message).toBe(true);
      expect(estimate.uncertaintiesOk).toBe(true);
      if (within3Sigma(estimate.tipWorkFunctionEV, JUNCTION.tipWorkFunctionEV, estimate.tipWorkFunctionErrorEV)) inside.tip++;
      if (within3Sigma(estimate.sampleWorkFunctionEV, JUNCTION.sampleWorkFunctionEV, estimate.sampleWorkFunctionErrorEV)) inside.sample++;
      if (within3Sigma(estimate.widthM, JUNCTION.gapM, estimate.widthErrorM)) inside.width++;
      // the closest approach point sits at the spectrum's gap, 0.6 nm
      if (within3Sigma(joint.approachGapM, 0.6e-9, joint.approachGapErrorM)) inside.approachGap++;
    }
    const needed = 0.9 * cases.length;
    expect(inside.tip, 'φ1').toBeGreaterThanOrEqual(needed);
    expect(inside.sample, 'φ2').toBeGreaterThanOrEqual(needed);
    expect(inside.width, 'd').toBeGreaterThanOrEqual(needed);
    expect(inside.approachGap, 'approach gap').toBeGreaterThanOrEqual(needed);
  });

  it('jointFit narrows the mean-barrier error against the lone free-area I(V) fit', () => {
    const factors: number[] = [];
    for (const { joint, spectrumFit } of cases) {
      const lone = spectrumFit.best;
      const narrowing = joint.narrowing.find((n) => n.quantity === 'meanBarrierEV');
      expect(narrowing).toBeDefined();
      if (narrowing === undefined) continue;
      // the table compares the separate fit's error with the joint one
      expect(narrowing.separate).toBe(lone.meanBarrierErrorEV);
      expect(narrowing.joint).toBe(joint.estimate.meanBarrierErrorEV);
      if (!Number.isFinite(narrowing.factor)) {
        // no comparison: the lone fit ran onto a bound (no finite error), or its optimum lies more
        // than 3 combined σ away (its error bar describes another point of the χ² valley)
        const far = Math.abs(lone.meanBarrierEV - joint.estimate.meanBarrierEV) > 3 * Math.hypot(lone.meanBarrierErrorEV, joint.estimate.meanBarrierErrorEV);
        expect(lone.status === 'stuck-at-bound' || far).toBe(true);
        expect(narrowing.note).not.toBe('');
        continue;
      }
      // the factor compares relative errors
      expectRelClose(narrowing.factor, narrowing.separate / lone.meanBarrierEV / (narrowing.joint / joint.estimate.meanBarrierEV), 1e-12);
      factors.push(narrowing.factor);
      // Relative errors, so that a lone fit that settled at a low φ̄ (where absolute errors shrink
      // with φ̄) is compared on the same footing: the joint error bar is always the narrower one.
      const estimate = joint.estimate;
      expect(estimate.meanBarrierErrorEV / estimate.meanBarrierEV).toBeLessThan(lone.meanBarrierErrorEV / lone.meanBarrierEV);
    }
    expect(factors.length).toBeGreaterThanOrEqual(3);
    expect(median(factors)).toBeGreaterThan(1);
  });

  it('jointFit reports the fitted spectrum current and a reduced χ² of order 1', () => {
    for (const { joint, spectrumFit } of cases.slice(0, 5)) {
      expect(joint.estimate.fittedCurrentA.length).toBe(spectrumFit.weights.length);
      expect(joint.estimate.reducedChi2).toBeGreaterThan(0.5);
      expect(joint.estimate.reducedChi2).toBeLessThan(1.5);
      expect(joint.estimate.nFree).toBe(5);
    }
  });
});
