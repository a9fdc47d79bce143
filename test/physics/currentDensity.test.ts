import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  BOLTZMANN_EV_PER_K,
  SUPPLY_CONSTANT_A_PER_M2_PER_EV2,
  createPreparedTrapezoidPoint,
  prepareTrapezoidPoint,
  preparedTrapezoidCurrentDensity,
  TrapezoidSpectrum,
  sampledCurrentDensity,
  trapezoidCurrentDensity,
  trapezoidCurrentDensityWithGradient,
  trapezoidProfile,
  wkbExponent,
  type Junction,
} from '../../src/physics/index.ts';
import { expectRelClose } from '../helpers.ts';

const angstrom = 1e-10;
const junction = (phi1: number, phi2: number, dA: number, fermi = 5.5): Junction => ({
  tipWorkFunctionEV: phi1,
  sampleWorkFunctionEV: phi2,
  gapM: dA * angstrom,
  fermiEnergyEV: fermi,
});

/**
 * Brute-force reference: composite Simpson over the whole energy range on a 0.2 meV-or-finer mesh,
 * straight from the definitions (no panels, no expansions). Slow; used only here.
 */
function bruteForceCurrentDensity(j: Junction, biasV: number, temperatureK: number): number {
  const kT = BOLTZMANN_EV_PER_K * temperatureK;
  const lower = -j.fermiEnergyEV + Math.max(0, -biasV);
  const upper = Math.max(0, -biasV) + (kT > 0 ? 45 * kT : 0);
  const n = 2 * Math.ceil((upper - lower) / Math.min(2e-4, kT > 0 ? kT / 20 : 2e-4) / 2);
  const h = (upper - lower) / n;
  const softplus = (y: number) => (y > 0 ? y + Math.log1p(Math.exp(-y)) : Math.log1p(Math.exp(y)));
  const supply = (e: number) =>
    kT > 0 ? kT * (softplus(-e / kT) - softplus(-(e + biasV) / kT)) : Math.max(-e, 0) - Math.max(-e - biasV, 0);
  let sum = 0;
  for (let i = 0; i <= n; i++) {
    const e = lower + i * h;
    const f = supply(e) * Math.exp(-wkbExponent(j.tipWorkFunctionEV - e, j.sampleWorkFunctionEV - biasV - e, j.gapM));
    sum += f * (i === 0 || i === n ? 1 : i % 2 ? 4 : 2);
  }
  return (SUPPLY_CONSTANT_A_PER_M2_PER_EV2 * sum * h) / 3;
}

describe('trapezoidCurrentDensity', () => {
  it('matches the physics.md §5 check values at T = 0 (symmetric 4 eV, 10 Å)', () => {
    // physics.md §5, recomputed with scipy quad: J(0.1 V) = 8.366882e3, J(1 V) = 1.087262e5 A/m²
    expectRelClose(trapezoidCurrentDensity(junction(4, 4, 10), 0.1, 0), 8.366882e3, 1e-5);
    expectRelClose(trapezoidCurrentDensity(junction(4, 4, 10), 1, 0), 1.087262e5, 1e-5);
    // physics.md §5: E_F = 3 / 11 eV → 8.351057e3 / 8.367091e3 A/m² at 0.1 V
    expectRelClose(trapezoidCurrentDensity(junction(4, 4, 10, 3), 0.1, 0), 8.351057e3, 1e-5);
    expectRelClose(trapezoidCurrentDensity(junction(4, 4, 10, 11), 0.1, 0), 8.367091e3, 1e-5);
  });

  it('has the physics.md §5 sign and asymmetry for the 3.5/4.5 eV trapezoid', () => {
    // physics.md §5: J(±0.1 V) = 8.4453e3 / −8.4850e3; J(±1 V) = 1.0737e5 / −1.1296e5 A/m² (5 digits given)
    expectRelClose(trapezoidCurrentDensity(junction(3.5, 4.5, 10), 0.1, 0), 8.4453e3, 1e-4);
    expectRelClose(trapezoidCurrentDensity(junction(3.5, 4.5, 10), -0.1, 0), -8.485e3, 1e-4);
    expectRelClose(trapezoidCurrentDensity(junction(3.5, 4.5, 10), 1, 0), 1.0737e5, 1e-4);
    expectRelClose(trapezoidCurrentDensity(junction(3.5, 4.5, 10), -1, 0), -1.1296e5, 1e-4);
  });

  it('gives the physics.md §5 thermal enhancement J(T)/J(0) at 0.1 V', () => {
    const ratio = (dA: number, t: number) => trapezoidCurrentDensity(junction(4, 4, dA), 0.1, t) / trapezoidCurrentDensity(junction(4, 4, dA), 0.1, 0);
    // physics.md §5 (full Fermi–Dirac integral, scipy): 1.006923 (10 Å), 1.001656 (5 Å), 1.028825 (20 Å) at 300 K; 1.000454 (10 Å, 77 K)
    expectRelClose(ratio(10, 300), 1.006923, 2e-6);
    expectRelClose(ratio(5, 300), 1.001656, 2e-6);
    expectRelClose(ratio(20, 300), 1.028825, 5e-6);
    expectRelClose(ratio(10, 77), 1.000454, 2e-6);
  });

  it('temperature smearing vanishes as T → 0', () => {
    const j0 = trapezoidCurrentDensity(junction(4, 4, 10), 0.1, 0);
    const excess = [40, 10, 1, 0.1].map((t) => trapezoidCurrentDensity(junction(4, 4, 10), 0.1, t) / j0 - 1);
    // Simmons 1964 thermal factor πck_BT/sin(πck_BT) − 1 ≈ (πck_BT)²/6 → 0 quadratically (physics.md §5)
    for (let i = 1; i < excess.length; i++) expect(Math.abs(excess[i])).toBeLessThan(Math.abs(excess[i - 1]));
    expect(Math.abs(excess[3])).toBeLessThan(1e-7);
  });

  it('agrees with a brute-force Simpson integral across gaps, biases and temperatures', () => {
    for (const [phi1, phi2, dA] of [[4, 4, 10], [3.5, 4.5, 7], [4.5, 3.2, 15], [2, 2, 5]] as const) {
      for (const bias of [0.01, 0.3, -0.7, 2.5]) {
        for (const t of [0, 4.2, 300]) {
          const j = junction(phi1, phi2, dA);
          expectRelClose(trapezoidCurrentDensity(j, bias, t), bruteForceCurrentDensity(j, bias, t), 2e-5);
        }
      }
    }
  });

  it('follows the Fowler–Nordheim slope at high field', () => {
    const j = junction(4.5, 4.5, 10);
    const lnJ = (v: number) => Math.log(trapezoidCurrentDensity(j, v, 0) / (v * v));
    const slope = (lnJ(10) - lnJ(8)) / (1 / 10 - 1 / 8);
    // Fowler & Nordheim, Proc. R. Soc. A 119, 173 (1928); b = 6.8308896 eV^-3/2 V/nm (physics.md §8):
    // triangular barrier, ln(J/V²) vs 1/V slope −b φ^{3/2} d = −65.207 V for φ = 4.5 eV, d = 1 nm
    expectRelClose(slope, -6.8308896 * 4.5 ** 1.5, 0.03);
  });

  it('analytic gradient matches central differences (Sommerfeld and full paths)', () => {
    const gradient = new Float64Array(3);
    for (const [bias, t] of [[0.2, 300], [0.2, 0], [-1.5, 77], [6, 300]] as const) {
      const j = junction(3.8, 4.4, 9);
      trapezoidCurrentDensityWithGradient(j, bias, t, gradient);
      const h = 1e-5;
      const dPhi1 = (trapezoidCurrentDensity({ ...j, tipWorkFunctionEV: 3.8 + h }, bias, t) - trapezoidCurrentDensity({ ...j, tipWorkFunctionEV: 3.8 - h }, bias, t)) / (2 * h);
      const dPhi2 = (trapezoidCurrentDensity({ ...j, sampleWorkFunctionEV: 4.4 + h }, bias, t) - trapezoidCurrentDensity({ ...j, sampleWorkFunctionEV: 4.4 - h }, bias, t)) / (2 * h);
      const hd = 1e-15;
      const dGap = (trapezoidCurrentDensity({ ...j, gapM: j.gapM + hd }, bias, t) - trapezoidCurrentDensity({ ...j, gapM: j.gapM - hd }, bias, t)) / (2 * hd);
      expectRelClose(gradient[0], dPhi1, 1e-4);
      expectRelClose(gradient[1], dPhi2, 1e-4);
      expectRelClose(gradient[2], dGap, 1e-4);
    }
  });

  it('a prepared layout reused for nearby parameters gives the same current', () => {
    const point = createPreparedTrapezoidPoint();
    prepareTrapezoidPoint(point, junction(4, 4, 10), 0.5, 300);
    const moved = junction(4.04, 3.97, 10.8);
    expectRelClose(preparedTrapezoidCurrentDensity(point, moved, 0.5, null), bruteForceCurrentDensity(moved, 0.5, 300), 2e-5);
  });

  it('TrapezoidSpectrum evaluates a whole sweep like the point function, gradient included', () => {
    const biases = Float64Array.from({ length: 41 }, (_, i) => -2 + i * 0.1 + 1e-3);
    const spectrum = new TrapezoidSpectrum(biases, 300);
    const current = new Float64Array(41);
    const gradient = new Float64Array(41 * 3);
    const point = new Float64Array(3);
    for (const j of [junction(4, 4.5, 8), junction(4.03, 4.46, 8.3), junction(2.5, 5, 12)]) {
      spectrum.evaluate(j, current, gradient);
      for (let i = 0; i < 41; i++) {
        const expected = trapezoidCurrentDensityWithGradient(j, biases[i], 300, point);
        expectRelClose(current[i], expected, 2e-5);
        for (let k = 0; k < 3; k++) expectRelClose(gradient[3 * i + k], point[k], 1e-3);
      }
    }
  });

  it('sampledCurrentDensity of a sampled trapezoid equals trapezoidCurrentDensity', () => {
    const j = junction(3.5, 4.5, 10);
    expectRelClose(sampledCurrentDensity(trapezoidProfile(j, 0.4, 16), 300), trapezoidCurrentDensity(j, 0.4, 300), 2e-5);
  });
});

describe('trapezoidCurrentDensity properties', () => {
  const barrier = fc.double({ min: 1, max: 8, noNaN: true });
  const gapA = fc.double({ min: 3, max: 25, noNaN: true });
  const bias = fc.double({ min: 0.005, max: 3, noNaN: true });
  const temperature = fc.constantFrom(0, 4.2, 77, 300);

  it('current falls as the gap grows', () => {
    fc.assert(
      fc.property(barrier, barrier, gapA, bias, temperature, (p1, p2, d, v, t) => {
        expect(trapezoidCurrentDensity(junction(p1, p2, d + 0.5), v, t)).toBeLessThan(trapezoidCurrentDensity(junction(p1, p2, d), v, t));
      }),
      { numRuns: 200, seed: 7 },
    );
  });

  it('current rises with |bias| at either polarity', () => {
    fc.assert(
      fc.property(barrier, barrier, gapA, bias, temperature, (p1, p2, d, v, t) => {
        const j = junction(p1, p2, d);
        expect(trapezoidCurrentDensity(j, v * 1.1, t)).toBeGreaterThan(trapezoidCurrentDensity(j, v, t));
        expect(trapezoidCurrentDensity(j, -v * 1.1, t)).toBeLessThan(trapezoidCurrentDensity(j, -v, t));
      }),
      { numRuns: 200, seed: 11 },
    );
  });

  it('current is odd in bias for a symmetric barrier', () => {
    fc.assert(
      fc.property(barrier, gapA, bias, temperature, (p, d, v, t) => {
        const j = junction(p, p, d);
        expectRelClose(-trapezoidCurrentDensity(j, -v, t), trapezoidCurrentDensity(j, v, t), 1e-9);
      }),
      { numRuns: 200, seed: 13 },
    );
  });
});
