import { describe, expect, it } from 'vitest';
import { InterpolatedTrapezoidSpectrum, TrapezoidSpectrum, mulberry32, type Junction } from '../../src/physics/index.ts';

// The interpolated sweep must give the exact sums' values (TrapezoidSpectrum, itself checked against
// physics.md's tables in currentDensity.test.ts) to the accuracy it states, ~1e-6 relative, for
// closed barriers, any sweep and temperature; where it cannot, it must fall back to the exact sums.

function largestRelativeErrors(biasesV: Float64Array, temperatureK: number, junction: Junction) {
  const n = biasesV.length;
  const exact = new TrapezoidSpectrum(biasesV, temperatureK);
  const interpolated = new InterpolatedTrapezoidSpectrum(biasesV, temperatureK);
  const exactCurrent = new Float64Array(n);
  const exactGradient = new Float64Array(3 * n);
  const current = new Float64Array(n);
  const gradient = new Float64Array(3 * n);
  const currentOnly = new Float64Array(n);
  exact.evaluate(junction, exactCurrent, exactGradient);
  interpolated.evaluate(junction, current, gradient);
  interpolated.evaluate(junction, currentOnly, null);
  let currentError = 0;
  let gradientError = 0;
  for (let i = 0; i < n; i++) {
    if (exactCurrent[i] === 0) {
      expect(current[i]).toBe(0);
      continue;
    }
    currentError = Math.max(currentError, Math.abs(current[i] / exactCurrent[i] - 1), Math.abs(currentOnly[i] / exactCurrent[i] - 1));
    // Gradient components relative to the largest of the three at that bias (∂J/∂φ1 crosses zero nowhere, but keep it fair).
    const scale = Math.max(Math.abs(exactGradient[3 * i]), Math.abs(exactGradient[3 * i + 1]), Math.abs(exactGradient[3 * i + 2]) * 1e-10);
    for (let p = 0; p < 3; p++) {
      const unit = p === 2 ? 1e-10 : 1; // ∂J/∂d per Å, to compare with the per-eV components
      gradientError = Math.max(gradientError, (Math.abs(gradient[3 * i + p] - exactGradient[3 * i + p]) * unit) / scale);
    }
  }
  return { currentError, gradientError, statistics: interpolated.statistics };
}

const sweep = (from: number, to: number, points: number) => Float64Array.from({ length: points }, (_, i) => from + ((to - from) * i) / (points - 1));

describe('InterpolatedTrapezoidSpectrum', () => {
  it('agrees with the exact sums to 3e-6 (J) and 1e-5 (gradient) over random barriers, sweeps and temperatures', () => {
    const random = mulberry32(7);
    let interpolatedRuns = 0;
    for (let trial = 0; trial < 60; trial++) {
      const mean = 1.5 + 8 * random();
      const asymmetry = (random() - 0.5) * 0.6 * mean;
      const junction: Junction = { tipWorkFunctionEV: mean - asymmetry / 2, sampleWorkFunctionEV: mean + asymmetry / 2, gapM: (2 + 18 * random()) * 1e-10, fermiEnergyEV: 3 + 6 * random() };
      const from = -1.2 * random();
      const to = 0.2 + random();
      const temperatureK = [0, 4.2, 77, 300][trial % 4];
      const { currentError, gradientError, statistics } = largestRelativeErrors(sweep(from, to, 200 + trial * 7), temperatureK, junction);
      // 3e-6: the exact sums themselves switch between the Sommerfeld and the full Fermi path inside
      // some sweeps (a step of ~1e-6, their stated accuracy); the interpolant passes smoothly through it.
      expect(currentError).toBeLessThan(3e-6);
      expect(gradientError).toBeLessThan(1e-5);
      if (statistics.fallbacks === 0) interpolatedRuns++;
    }
    // Closed barriers over these sweeps: nearly every case is interpolated, not a fallback.
    expect(interpolatedRuns).toBeGreaterThanOrEqual(54);
  });

  it('gives J = 0 at V = 0, handles one-sided and unordered sweeps', () => {
    const junction: Junction = { tipWorkFunctionEV: 4, sampleWorkFunctionEV: 4.6, gapM: 6e-10, fermiEnergyEV: 5.5 };
    for (const biases of [sweep(-1, 1, 401), sweep(0, 2, 300), sweep(-0.8, -0.05, 100), sweep(1, -0.3, 257).reverse()]) {
      const { currentError, gradientError, statistics } = largestRelativeErrors(biases, 300, junction);
      expect(currentError).toBeLessThan(1e-6);
      expect(gradientError).toBeLessThan(1e-5);
      expect(statistics.fallbacks).toBe(0);
    }
  });

  it('falls back to the exact sums in the Fowler–Nordheim regime and on short sweeps', () => {
    // 0.8 eV barrier over ±2 V: a turning point enters the barrier inside the sweep.
    const low: Junction = { tipWorkFunctionEV: 0.8, sampleWorkFunctionEV: 0.9, gapM: 3e-10, fermiEnergyEV: 5.5 };
    const fn = largestRelativeErrors(sweep(-2, 2, 300), 300, low);
    expect(fn.statistics.fallbacks).toBe(2);
    expect(fn.currentError).toBe(0);
    const short = largestRelativeErrors(sweep(-1, 1, 24), 300, { ...low, tipWorkFunctionEV: 4, sampleWorkFunctionEV: 4 });
    expect(short.currentError).toBe(0);
    expect(short.statistics.fallbacks).toBe(0);
  });
});
