/**
 * fitSpectrum on I(V) spectra simulated with the same models it fits (WKB trapezoid, Simmons):
 * recovery and coverage with the area tied to a tip radius, the honesty of a free-area fit, exact
 * recovery from noise-free data, the BDR quick estimate, Fowler–Nordheim detection and the AIC table.
 */
import { describe, expect, it } from 'vitest';
import { fitSpectrum, type AreaConstraint, type BarrierEstimate, type SpectrumFit } from '../../src/fit/spectrumFit.ts';
import { simmonsDissimilarCurrentDensity, simulateCurve, trapezoidCurrentDensity, type CurrentDensityModel, type Junction } from '../../src/physics/index.ts';
import { expectRelClose } from '../helpers.ts';

const FERMI_ENERGY_EV = 5.5;
const TIP_RADIUS_M = 10e-9;
/** A realistic STM junction: W-like tip 4.0 eV, sample 4.6 eV, 6 Å gap (≈ 1 nA at 1 V with a 10 nm tip). */
const JUNCTION: Junction = { tipWorkFunctionEV: 4.0, sampleWorkFunctionEV: 4.6, gapM: 0.6e-9, fermiEnergyEV: FERMI_ENERGY_EV };

interface SpectrumSpec {
  junction?: Junction;
  density?: CurrentDensityModel;
  area?: { areaM2: number } | { tipRadiusM: number };
  temperatureK?: number;
  maxBiasV?: number;
  points?: number;
  /** Seeded noise: 1 % relative plus a 2 pA floor; omitted → noise-free. */
  seed?: number;
}

function simulateSpectrum(spec: SpectrumSpec): { biasV: Float64Array; currentA: Float64Array; areaM2: number } {
  const { junction = JUNCTION, density = trapezoidCurrentDensity, area = { tipRadiusM: TIP_RADIUS_M }, temperatureK = 300, maxBiasV = 1, points = 512, seed } = spec;
  const simulation = simulateCurve({
    kind: 'iv',
    junction,
    currentDensity: density,
    area,
    temperatureK,
    biasV: 0,
    sweep: { from: -maxBiasV, to: maxBiasV, points },
    noise: seed === undefined ? undefined : { relative: 0.01, floorA: 2e-12, seed },
  });
  return {
    biasV: Float64Array.from(simulation.points, (p) => p.biasV),
    currentA: Float64Array.from(simulation.points, (p) => p.currentA),
    areaM2: simulation.areaM2,
  };
}

function fit(spectrum: { biasV: Float64Array; currentA: Float64Array }, area: AreaConstraint, temperatureK = 300): SpectrumFit {
  return fitSpectrum({ biasV: spectrum.biasV, currentA: spectrum.currentA, temperatureK, fermiEnergyEV: FERMI_ENERGY_EV, area });
}

const tipRadius: AreaConstraint = { mode: 'tip-radius', tipRadiusM: TIP_RADIUS_M };

function within3Sigma(value: number, truth: number, error: number): boolean {
  return Number.isFinite(error) && error > 0 && Math.abs(value - truth) <= 3 * error;
}

describe('fitSpectrum(WKB, area from the tip radius)', () => {
  it('fitSpectrum(50 noisy WKB spectra, ±1 V, 512 points, 300 K, 1 %) covers φ̄, Δφ and d within 3σ in ≥ 95 %', () => {
    const realisations = 50;
    const truth = { mean: 4.3, asymmetry: 0.6, width: 0.6e-9 };
    let meanInside = 0;
    let asymmetryInside = 0;
    let widthInside = 0;
    for (let seed = 1; seed <= realisations; seed++) {
      const wkb = fit(simulateSpectrum({ seed }), tipRadius).wkb;
      expect(wkb.converged, `seed ${seed}: ${wkb.status}`).toBe(true);
      if (within3Sigma(wkb.meanBarrierEV, truth.mean, wkb.meanBarrierErrorEV)) meanInside++;
      if (within3Sigma(wkb.asymmetryEV, truth.asymmetry, wkb.asymmetryErrorEV)) asymmetryInside++;
      if (within3Sigma(wkb.widthM, truth.width, wkb.widthErrorM)) widthInside++;
    }
    expect(meanInside, 'mean barrier').toBeGreaterThanOrEqual(0.95 * realisations);
    expect(asymmetryInside, 'asymmetry').toBeGreaterThanOrEqual(0.95 * realisations);
    expect(widthInside, 'width').toBeGreaterThanOrEqual(0.95 * realisations);
  });

  it('fitSpectrum(noise-free WKB spectrum) recovers φ1, φ2, d and the area to ≤ 1e-4', () => {
    const spectrum = simulateSpectrum({});
    for (const area of [tipRadius, { mode: 'fixed', areaM2: spectrum.areaM2 } as const]) {
      const wkb = fit(spectrum, area).wkb;
      expect(wkb.converged).toBe(true);
      expectRelClose(wkb.tipWorkFunctionEV, JUNCTION.tipWorkFunctionEV, 1e-4);
      expectRelClose(wkb.sampleWorkFunctionEV, JUNCTION.sampleWorkFunctionEV, 1e-4);
      expectRelClose(wkb.widthM, JUNCTION.gapM, 1e-4);
      expectRelClose(wkb.areaM2, spectrum.areaM2, 1e-4);
    }
  });

  it('fitSpectrum(tipWorkFunctionEV fixed at the truth) keeps φ1 and fits φ2 and d within 3σ', () => {
    const spectrum = simulateSpectrum({ seed: 77 });
    const wkb = fitSpectrum({ ...spectrum, temperatureK: 300, fermiEnergyEV: FERMI_ENERGY_EV, area: tipRadius, tipWorkFunctionEV: 4 }).wkb;
    expect(wkb.converged).toBe(true);
    expect(wkb.tipWorkFunctionEV).toBe(4);
    expect(wkb.tipWorkFunctionErrorEV).toBe(0);
    expect(within3Sigma(wkb.sampleWorkFunctionEV, 4.6, wkb.sampleWorkFunctionErrorEV)).toBe(true);
    expect(within3Sigma(wkb.widthM, 0.6e-9, wkb.widthErrorM)).toBe(true);
  });

  it('fitSpectrum(noisy) estimates the noise model: 1 % relative and a 2 pA floor', () => {
    const result = fit(simulateSpectrum({ seed: 5 }), tipRadius);
    expect(result.noise.relative).toBeGreaterThan(0.008);
    expect(result.noise.relative).toBeLessThan(0.012);
    // the floor comes from the smallest-|I| quarter (|V| < 0.25 V, |I| up to ≈ 0.25 nA), where the
    // 1 % relative part still adds ≈ 1–2 pA: within a factor 2 of the true 2 pA
    expect(result.noise.floorA).toBeGreaterThan(1e-12);
    expect(result.noise.floorA).toBeLessThan(4e-12);
    // weights are 1/σ with σ² = (σ_rel·Î)² + σ_floor²: at least 1/σ_floor nowhere above it
    for (const weight of result.weights) expect(weight).toBeLessThanOrEqual(1 / result.noise.floorA);
  });
});

describe('fitSpectrum(WKB, free area)', () => {
  it('fitSpectrum(lone noisy I(V), free area) does not claim a precise barrier: > 10 % error or stuck at a bound, yet fits the data', () => {
    // A lone I(V) pins the barrier poorly: φ̄, d and the area trade off along a shallow valley
    // (the conductance curvature fixes ≈ d²/φ̄, the amplitude only A·J), so a free-area fit must
    // report a large error on φ̄ or say that it ran onto a bound, while reproducing the data.
    for (let seed = 1; seed <= 10; seed++) {
      const wkb = fit(simulateSpectrum({ area: { areaM2: 2e-18 }, seed: 1000 + seed }), { mode: 'free' }).wkb;
      const honest = wkb.status === 'stuck-at-bound' || wkb.meanBarrierErrorEV / wkb.meanBarrierEV > 0.1;
      expect(honest, `seed ${seed}: ${wkb.status}, φ̄ = ${wkb.meanBarrierEV} ± ${wkb.meanBarrierErrorEV}`).toBe(true);
      if (wkb.status === 'stuck-at-bound') expect(wkb.uncertaintiesOk).toBe(false);
      expect(wkb.reducedChi2, `seed ${seed}`).toBeGreaterThan(0.6);
      expect(wkb.reducedChi2, `seed ${seed}`).toBeLessThan(1.5);
    }
  });

  it('fitSpectrum(free area) keeps φ̄ where the implied area is 0.01–1e4 nm², and the area there agrees within a decade', () => {
    // The range comes from the exact zero-bias conductance along the valley through the BDR start
    // (an approximation); at its ends the fitted area must be near the bounds, and the truth
    // (4.3 eV, area πR/κ ≈ 3 nm² for R = 10 nm, physics.md §9) must lie inside.
    for (let seed = 1; seed <= 6; seed++) {
      const result = fit(simulateSpectrum({ seed: 2000 + seed }), { mode: 'free' });
      const range = result.plausibleMeanBarrierRangeEV;
      expect(range, `seed ${seed}`).not.toBeNull();
      const [low, high] = range as [number, number];
      expect(low).toBeLessThan(4.3);
      expect(high).toBeGreaterThan(4.3);
      const wkb = result.wkb;
      expect(wkb.meanBarrierEV).toBeGreaterThanOrEqual(low * (1 - 1e-9));
      expect(wkb.meanBarrierEV).toBeLessThanOrEqual(high * (1 + 1e-9));
      expect(wkb.areaM2).toBeGreaterThan(1e-21);
      expect(wkb.areaM2).toBeLessThan(1e-13);
      expect(wkb.uncertaintyNote).toContain('kept within');
    }
    // With the area known the range is not used.
    expect(fit(simulateSpectrum({ seed: 2001 }), tipRadius).plausibleMeanBarrierRangeEV).toBeNull();
  });

  it('fitSpectrum(free area, ±0.3 V or the tip work function fixed) keeps the truth inside the range and φ2 away from zero', () => {
    // Short sweeps pin d/√φ̄ loosely at the BDR start; the range follows the Simmons and WKB valleys.
    for (let seed = 1; seed <= 6; seed++) {
      const spectrum = simulateSpectrum({ maxBiasV: 0.3, seed: 3000 + seed });
      const range = fit(spectrum, { mode: 'free' }).plausibleMeanBarrierRangeEV as [number, number];
      expect(range[0], `seed ${seed}`).toBeLessThan(4.3);
      expect(range[1], `seed ${seed}`).toBeGreaterThan(4.3);
      const fixedTip = fitSpectrum({ ...spectrum, temperatureK: 300, fermiEnergyEV: FERMI_ENERGY_EV, area: { mode: 'free' }, tipWorkFunctionEV: 4 }).wkb;
      expect(fixedTip.converged, `seed ${seed}`).toBe(true);
      expect(fixedTip.sampleWorkFunctionEV, `seed ${seed}`).toBeGreaterThan(1);
    }
  });

  it('fitSpectrum(lastModel) stops the chain: Simmons or BDR is best, later models are not run and not ranked', () => {
    const spectrum = simulateSpectrum({ seed: 4001 });
    const simmonsOnly = fitSpectrum({ ...spectrum, temperatureK: 300, fermiEnergyEV: FERMI_ENERGY_EV, area: tipRadius, lastModel: 'simmons' });
    expect(simmonsOnly.best.model).toBe('simmons');
    expect(simmonsOnly.wkb.status).toBe('not-run');
    expect(simmonsOnly.comparison.map((c) => c.model).sort()).toEqual(['bdr', 'simmons']);
    const full = fit(spectrum, tipRadius);
    // the Simmons step is the same whether or not WKB follows
    expect(simmonsOnly.simmons.chiSquare).toBe(full.simmons.chiSquare);
    const bdrOnly = fitSpectrum({ ...spectrum, temperatureK: 300, fermiEnergyEV: FERMI_ENERGY_EV, area: tipRadius, lastModel: 'bdr' });
    expect(bdrOnly.best.model).toBe('bdr');
    expect(bdrOnly.simmons.status).toBe('not-run');
    expect(bdrOnly.comparison.map((c) => c.model)).toEqual(['bdr']);
  });

  it('fitSpectrum(noise-free WKB spectrum, free area) still finds the exact barrier', () => {
    const spectrum = simulateSpectrum({});
    const wkb = fit(spectrum, { mode: 'free' }).wkb;
    expectRelClose(wkb.meanBarrierEV, 4.3, 1e-4);
    expectRelClose(wkb.asymmetryEV, 0.6, 1e-4);
    expectRelClose(wkb.widthM, 0.6e-9, 1e-4);
    expectRelClose(wkb.areaM2, spectrum.areaM2, 1e-4);
  });
});

describe('fitSpectrum(Simmons)', () => {
  // Simmons' intermediate-voltage formula with β = 1 on a symmetric junction, the model of the
  // Simmons fit (J. G. Simmons, J. Appl. Phys. 34, 1793 (1963); physics.md §6).
  const symmetric: Junction = { tipWorkFunctionEV: 4.2, sampleWorkFunctionEV: 4.2, gapM: 0.6e-9, fermiEnergyEV: FERMI_ENERGY_EV };
  const simmons: CurrentDensityModel = (junction, biasV) => simmonsDissimilarCurrentDensity(junction, biasV, { useBeta: false });

  it('fitSpectrum(noise-free Simmons spectrum) recovers φ̄ and d exactly and AIC ranks Simmons first', () => {
    const spectrum = simulateSpectrum({ junction: symmetric, density: simmons, temperatureK: 0 });
    for (const area of [tipRadius, { mode: 'fixed', areaM2: spectrum.areaM2 } as const]) {
      const result = fit(spectrum, area, 0);
      const estimate = result.simmons;
      expect(estimate.converged).toBe(true);
      expectRelClose(estimate.meanBarrierEV, 4.2, 1e-6);
      expectRelClose(estimate.widthM, 0.6e-9, 1e-6);
      expect(estimate.asymmetryEV).toBe(0);
      expect(result.comparison[0].model).toBe('simmons');
    }
  });

  it('fitSpectrum(noisy Simmons spectra) recovers φ̄ and d within 3σ', () => {
    for (let seed = 1; seed <= 5; seed++) {
      const estimate = fit(simulateSpectrum({ junction: symmetric, density: simmons, temperatureK: 0, seed }), tipRadius, 0).simmons;
      expect(estimate.converged).toBe(true);
      expect(within3Sigma(estimate.meanBarrierEV, 4.2, estimate.meanBarrierErrorEV), `seed ${seed}`).toBe(true);
      expect(within3Sigma(estimate.widthM, 0.6e-9, estimate.widthErrorM), `seed ${seed}`).toBe(true);
    }
  });
});

describe('fitSpectrum(BDR quick estimate)', () => {
  it('fitSpectrum(noise-free ±0.3 V, 15 Å, either asymmetry sign) gives the BDR sign of Δφ and φ̄ within 20 %', () => {
    // physics.md §7: the BDR linear term is the large-d limit, so a thick barrier and low bias suit it
    for (const [tip, sample] of [
      [3.6, 4.4],
      [4.4, 3.6],
    ]) {
      const junction: Junction = { tipWorkFunctionEV: tip, sampleWorkFunctionEV: sample, gapM: 1.5e-9, fermiEnergyEV: FERMI_ENERGY_EV };
      const bdr = fit(simulateSpectrum({ junction, maxBiasV: 0.3, points: 256 }), tipRadius).bdr;
      expect(bdr.status).toBe('closed-form');
      expect(Math.sign(bdr.asymmetryEV)).toBe(Math.sign(sample - tip));
      expectRelClose(bdr.meanBarrierEV, 4, 0.2);
      expectRelClose(bdr.widthM, 1.5e-9, 0.2);
      expect(bdr.uncertaintiesOk).toBe(false);
    }
  });

  it('fitSpectrum(noise-free 3.5/4.5 eV, 20 Å) BDR asymmetry is low by the WKB/BDR linear-term ratio', () => {
    const junction: Junction = { tipWorkFunctionEV: 3.5, sampleWorkFunctionEV: 4.5, gapM: 2e-9, fermiEnergyEV: FERMI_ENERGY_EV };
    const bdr = fit(simulateSpectrum({ junction, temperatureK: 0, maxBiasV: 0.2, points: 256 }), tipRadius, 0).bdr;
    // physics.md §7 (3.5, 4.5, 20 Å): linear term −0.10673 V⁻¹ (BDR) vs −0.09997 (WKB), so the
    // BDR inverse of WKB data reads Δφ ≈ 1 eV × 0.09997/0.10673; 3 % allows for the φ̄ it infers
    expectRelClose(bdr.asymmetryEV, 0.09997 / 0.10673, 0.03);
  });
});

describe('fitSpectrum(Fowler–Nordheim check)', () => {
  it('fitSpectrum(±6 V on a 4 eV barrier) reports the Fowler–Nordheim regime; ±1 V does not', () => {
    // 10 Å keeps the ±6 V current at a few nA; the ±1 V spectrum uses 6 Å so it stays above the floor
    const symmetric = { tipWorkFunctionEV: 4, sampleWorkFunctionEV: 4, fermiEnergyEV: FERMI_ENERGY_EV };
    const high = fit(simulateSpectrum({ junction: { ...symmetric, gapM: 1e-9 }, maxBiasV: 6, points: 256, seed: 5 }), tipRadius);
    expect(high.fowlerNordheim.reached).toBe(true);
    // physics.md §4/§8: the turning point enters the barrier once e|V| exceeds the collector's φ
    expectRelClose(high.fowlerNordheim.onsetBiasV, 4, 0.05);
    const low = fit(simulateSpectrum({ junction: { ...symmetric, gapM: 0.6e-9 }, maxBiasV: 1, points: 256, seed: 5 }), tipRadius);
    expect(low.fowlerNordheim.reached).toBe(false);
  });
});

describe('fitSpectrum(model comparison)', () => {
  function expectRanked(result: SpectrumFit): void {
    const { comparison } = result;
    expect(comparison.map((c) => c.model).sort()).toEqual(['bdr', 'simmons', 'wkb']);
    expect(comparison[0].deltaAic).toBe(0);
    for (let k = 0; k < comparison.length; k++) {
      const estimate = result[comparison[k].model] as BarrierEstimate;
      expect(comparison[k].aic).toBe(estimate.aic);
      expect(comparison[k].bic).toBe(estimate.bic);
      expect(comparison[k].deltaAic).toBeCloseTo(comparison[k].aic - comparison[0].aic, 9);
      if (k > 0) expect(comparison[k].aic).toBeGreaterThanOrEqual(comparison[k - 1].aic);
    }
  }

  it('fitSpectrum(WKB spectrum) lists all three models by AIC with WKB first and best = WKB', () => {
    const result = fit(simulateSpectrum({ seed: 3 }), tipRadius);
    expectRanked(result);
    expect(result.comparison[0].model).toBe('wkb');
    expect(result.best.model).toBe('wkb');
    // AIC = n ln(χ²/n) + 2p (solver.ts; the lmfit form, from memory)
    const wkb = result.wkb;
    expectRelClose(wkb.aic, wkb.nPoints * Math.log(wkb.chiSquare / wkb.nPoints) + 2 * wkb.nFree, 1e-12);
  });

  it('fitSpectrum(noisy Simmons spectrum) ranks the models consistently, the BDR parabola last', () => {
    // At 1 % noise over ±1 V a three-parameter WKB fit matches Simmons data within ΔAIC ≈ 1–3 (its φ
    // absorbs the ≈ 0.85 Simmons/WKB ratio of physics.md §6), so only the BDR place is fixed here.
    const symmetric: Junction = { tipWorkFunctionEV: 4.2, sampleWorkFunctionEV: 4.2, gapM: 0.6e-9, fermiEnergyEV: FERMI_ENERGY_EV };
    const density: CurrentDensityModel = (junction, biasV) => simmonsDissimilarCurrentDensity(junction, biasV, { useBeta: false });
    const result = fit(simulateSpectrum({ junction: symmetric, density, temperatureK: 0, seed: 9 }), tipRadius, 0);
    expectRanked(result);
    expect(result.comparison[2].model).toBe('bdr');
  });
});

describe('fitSpectrum(input checks)', () => {
  it('fitSpectrum(mismatched lengths or < 8 points) throws naming the function', () => {
    const spectrum = simulateSpectrum({ points: 16 });
    expect(() => fit({ biasV: spectrum.biasV, currentA: spectrum.currentA.slice(1) }, tipRadius)).toThrow(
      'fitSpectrum: currentA must have the length of biasV (16), got 15',
    );
    expect(() => fit({ biasV: spectrum.biasV.slice(0, 7), currentA: spectrum.currentA.slice(0, 7) }, tipRadius)).toThrow(
      'fitSpectrum: needs at least 8 points, got 7',
    );
  });
});
