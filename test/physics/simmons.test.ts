import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  simmonsCurrentDensity,
  simmonsCurrentDensityDerivatives,
  simmonsDissimilarBarrier,
  simmonsDissimilarCurrentDensity,
  simmonsHighVoltageCurrentDensity,
  simmonsLowVoltageCurrentDensity,
} from '../../src/physics/simmons.ts';
import { supplyWeightedCurrentDensity } from '../../src/physics/transferMatrix.ts';
import { WKB_DECAY_PER_M_PER_SQRT_EV } from '../../src/physics/constants.ts';
import type { Junction } from '../../src/physics/barrierProfile.ts';
import { angstromToM, aPerM2ToAPerCm2 } from '../../src/physics/units.ts';
import { expectRelClose } from '../helpers.ts';

const angstrom = angstromToM(1);

/** |actual − printed| ≤ half a unit in the last printed digit. */
function expectPrinted(actual: number, printed: number, lastDigit: number): void {
  expect(Math.abs(actual - printed), `${actual} printed as ${printed}`).toBeLessThanOrEqual(lastDigit / 2);
}

/** §5 WKB current of a rectangle φ over s (γ of physics.md §4), T = 0, E_F = 5.5 eV. */
function wkbRectangleCurrent(phi: number, gapM: number, biasV: number): number {
  const a0 = (2 / 3) * WKB_DECAY_PER_M_PER_SQRT_EV * gapM;
  const power = (u: number): number => Math.max(u, 0) ** 1.5;
  const transmission = (energy: number): number => {
    const u1 = 5.5 + phi - energy;
    const u2 = u1 - biasV;
    return Math.exp(-(a0 * (power(u1) - power(u2))) / (u1 - u2));
  };
  return supplyWeightedCurrentDensity(transmission, 5.5, biasV, 0).currentDensityAPerM2;
}

describe('simmonsLowVoltageCurrentDensity', () => {
  it('simmonsLowVoltageCurrentDensity equals the physics.md §6 conductance and practical constants', () => {
    // Simmons, J. Appl. Phys. 34, 1793 (1963), low-voltage form; check value recomputed in physics.md §6: φ = 4, s = 5 Å
    const conductancePerAngstrom2 = simmonsLowVoltageCurrentDensity({ barrierHeightEV: 4, widthM: 5 * angstrom, biasV: 1 }) * 1e-20;
    expectRelClose(conductancePerAngstrom2, 4.48391e-11, 1e-6);
    // Simmons 1963 low-voltage form in practical units (physics.md §6): 3.15881e10 (√φ/s) V e^{−1.024633 s √φ} A/cm²
    const decay = WKB_DECAY_PER_M_PER_SQRT_EV * angstrom;
    const practical = (phi: number, sAngstrom: number): number =>
      aPerM2ToAPerCm2(simmonsLowVoltageCurrentDensity({ barrierHeightEV: phi, widthM: sAngstrom * angstrom, biasV: 1 })) /
      ((Math.sqrt(phi) / sAngstrom) * Math.exp(-decay * sAngstrom * Math.sqrt(phi)));
    expectPrinted(practical(1, 1), 3.15881e10, 1e5);
    // physics.md §6: the decay constant 1.024633 Å⁻¹ eV⁻½ (the printed "1.025")
    const j5 = simmonsLowVoltageCurrentDensity({ barrierHeightEV: 1, widthM: 5 * angstrom, biasV: 1 });
    const j6 = simmonsLowVoltageCurrentDensity({ barrierHeightEV: 1, widthM: 6 * angstrom, biasV: 1 });
    expectRelClose(Math.log((j5 / j6) * (5 / 6)), 1.024633, 1e-6);
  });

  it('simmonsLowVoltageCurrentDensity / WKB reproduces the physics.md §6 ratios', () => {
    // physics.md §6: low-V/WKB (φ = 4, s = 10, E_F = 5.5) = 0.95349, 0.89120, 0.73176 at 1 mV, 0.5 V, 1 V
    for (const [bias, printed] of [
      [0.001, 0.95349],
      [0.5, 0.8912],
      [1, 0.73176],
    ]) {
      const ratio = simmonsLowVoltageCurrentDensity({ barrierHeightEV: 4, widthM: 10 * angstrom, biasV: bias }) / wkbRectangleCurrent(4, 10 * angstrom, bias);
      expectPrinted(ratio, printed, 1e-5);
    }
  });
});

describe('simmonsCurrentDensity', () => {
  it('simmonsCurrentDensity has the physics.md §6 practical prefactor and decay constant', () => {
    // Simmons 1963 general form in practical units (physics.md §6): J0·φ̄ → 6.16574e10·φ̄/(βΔs)² A/cm², A → 1.024633βΔs.
    // With φ̄ = 1 eV, Δs = 1 Å and a huge V the second term vanishes, leaving J0·e^{−A}.
    const j = simmonsCurrentDensity({ meanBarrierEV: 1, widthM: angstrom, biasV: 1e4 });
    const decay = WKB_DECAY_PER_M_PER_SQRT_EV * angstrom;
    expectPrinted(aPerM2ToAPerCm2(j) * Math.exp(decay), 6.16574e10, 1e5);
    // physics.md §6: A per Å and √eV is 1.024633 (the printed "1.025")
    expectPrinted(decay, 1.024633, 1e-6);
  });

  it('simmonsCurrentDensity(intermediate, φ̄ = φ − eV/2) / WKB reproduces the physics.md §6 ratios', () => {
    // physics.md §6: intermediate (β = 1, φ̄ = φ − eV/2)/WKB = 0.86044, 0.85700, 0.84629 at 1 mV, 0.5 V, 1 V
    for (const [bias, printed] of [
      [0.001, 0.86044],
      [0.5, 0.857],
      [1, 0.84629],
    ]) {
      const simmons = simmonsCurrentDensity({ meanBarrierEV: 4 - bias / 2, widthM: 10 * angstrom, biasV: bias });
      expectPrinted(simmons / wkbRectangleCurrent(4, 10 * angstrom, bias), printed, 1e-5);
    }
  });

  it('simmonsCurrentDensity tends to 1 − 2/(A√φ) times the low-voltage form as V → 0', () => {
    // Limit of Simmons' general form (derived: d/dφ[φe^{−A√φ}] = e^{−A√φ}(1 − A√φ/2)), J. Appl. Phys. 34, 1793 (1963)
    const a = WKB_DECAY_PER_M_PER_SQRT_EV * 10 * angstrom;
    const general = simmonsCurrentDensity({ meanBarrierEV: 4, widthM: 10 * angstrom, biasV: 1e-7 });
    const low = simmonsLowVoltageCurrentDensity({ barrierHeightEV: 4, widthM: 10 * angstrom, biasV: 1e-7 });
    expectRelClose(general / low, 1 - 2 / (a * Math.sqrt(4)), 1e-6);
  });

  it('simmonsCurrentDensity is odd in V', () => {
    // Sign convention of physics.md §0: J > 0 for V > 0; the reverse emitter gives −J(|V|)
    const forward = simmonsCurrentDensity({ meanBarrierEV: 3, widthM: 8 * angstrom, biasV: 0.7, beta: 0.98 });
    expect(forward).toBeGreaterThan(0);
    expect(simmonsCurrentDensity({ meanBarrierEV: 3, widthM: 8 * angstrom, biasV: -0.7, beta: 0.98 })).toBe(-forward);
    expect(simmonsCurrentDensity({ meanBarrierEV: 3, widthM: 8 * angstrom, biasV: 0 })).toBe(0);
    expect(() => simmonsCurrentDensity({ meanBarrierEV: 0, widthM: angstrom, biasV: 1 })).toThrow('simmonsCurrentDensity: meanBarrierEV must be > 0, got 0');
  });
});

describe('simmonsCurrentDensityDerivatives', () => {
  it('simmonsCurrentDensityDerivatives equals central differences of simmonsCurrentDensity', () => {
    // Analytic derivatives checked against central differences (numerical analysis, no outside reference)
    fc.assert(
      fc.property(
        fc.double({ min: 1, max: 8, noNaN: true }),
        fc.double({ min: 3, max: 20, noNaN: true }),
        fc.double({ min: -3, max: 3, noNaN: true }),
        fc.double({ min: 0.9, max: 1, noNaN: true }),
        (phi, widthAngstrom, bias, beta) => {
          fc.pre(Math.abs(bias) > 1e-3);
          const widthM = widthAngstrom * angstrom;
          const at = (p: number, w: number): number => simmonsCurrentDensity({ meanBarrierEV: p, widthM: w, biasV: bias, beta });
          const derivatives = simmonsCurrentDensityDerivatives({ meanBarrierEV: phi, widthM, biasV: bias, beta });
          const hPhi = 1e-5 * phi;
          const hWidth = 1e-5 * widthM;
          const numericPhi = (at(phi + hPhi, widthM) - at(phi - hPhi, widthM)) / (2 * hPhi);
          const numericWidth = (at(phi, widthM + hWidth) - at(phi, widthM - hWidth)) / (2 * hWidth);
          expect(derivatives.currentDensityAPerM2).toBe(at(phi, widthM));
          expectRelClose(derivatives.dCurrentDensityDMeanBarrier, numericPhi, 1e-5);
          expectRelClose(derivatives.dCurrentDensityDWidth, numericWidth, 1e-5);
        },
      ),
      { seed: 1963, numRuns: 200 },
    );
  });
});

describe('simmonsHighVoltageCurrentDensity', () => {
  it('simmonsHighVoltageCurrentDensity has the physics.md §6 practical constants', () => {
    // Simmons 1963 high-voltage leading term, β = 23/24 (physics.md §6): 3.35677e10 (F²/φ0) e^{−0.69434 φ0^{3/2}/F}, F in V/Å
    const phi0 = 4;
    const s = 10 * angstrom;
    const at = (bias: number): number => aPerM2ToAPerCm2(simmonsHighVoltageCurrentDensity({ barrierHeightEV: phi0, widthM: s, biasV: bias }));
    const fieldPerAngstrom = (bias: number): number => bias / 10;
    const [v1, v2] = [8, 12];
    const exponentConstant =
      Math.log((at(v2) / fieldPerAngstrom(v2) ** 2) / (at(v1) / fieldPerAngstrom(v1) ** 2)) /
      (phi0 ** 1.5 * (1 / fieldPerAngstrom(v1) - 1 / fieldPerAngstrom(v2)));
    expectPrinted(exponentConstant, 0.69434, 1e-5);
    const prefactor = ((at(v1) * phi0) / fieldPerAngstrom(v1) ** 2) * Math.exp((exponentConstant * phi0 ** 1.5) / fieldPerAngstrom(v1));
    expectPrinted(prefactor, 3.35677e10, 1e5);
    expect(simmonsHighVoltageCurrentDensity({ barrierHeightEV: phi0, widthM: s, biasV: -8 })).toBe(-simmonsHighVoltageCurrentDensity({ barrierHeightEV: phi0, widthM: s, biasV: 8 }));
  });
});

describe('simmonsDissimilarBarrier', () => {
  const junction: Junction = { tipWorkFunctionEV: 3.5, sampleWorkFunctionEV: 4.5, gapM: 10 * angstrom, fermiEnergyEV: 5.5 };

  it('simmonsDissimilarBarrier follows the 1963b rules for φ̄, Δs and β', () => {
    // Simmons, J. Appl. Phys. 34, 2581 (1963), physics.md §6: b > 0 ⇒ Δs = s, φ̄ = (a + b)/2 (a = 3.5, b = 4.5 − 1)
    const low = simmonsDissimilarBarrier(junction, 1);
    expect(low.emitter).toBe('tip');
    expectRelClose(low.meanBarrierEV, 3.5, 1e-15);
    expectRelClose(low.widthM, 10 * angstrom, 1e-15);
    // β of a linear profile with ends a, b (physics.md §6): 1 − (a − b)²/(96φ̄²), here a = b
    expect(low.beta).toBe(1);
    // Simmons 1963b, physics.md §6: b ≤ 0 ⇒ Δs = s·a/(a − b), φ̄ = a/2, and β → 23/24 for the triangle (a = 3.5, b = −1.5)
    const high = simmonsDissimilarBarrier(junction, 6);
    expectRelClose(high.widthM, 7 * angstrom, 1e-14);
    expectRelClose(high.meanBarrierEV, 1.75, 1e-15);
    expectRelClose(high.beta, 23 / 24, 1e-15);
    // §0: for V < 0 the sample emits (a = 4.5, b = 3.5 − 1)
    const reverse = simmonsDissimilarBarrier(junction, -1);
    expect(reverse.emitter).toBe('sample');
    expectRelClose(reverse.meanBarrierEV, 3.5, 1e-15);
  });

  it('simmonsDissimilarCurrentDensity reproduces the physics.md §6 polarity ratios (3.5/4.5 eV, 10 Å)', () => {
    const ratio = (bias: number, useBeta: boolean): number =>
      simmonsDissimilarCurrentDensity(junction, bias, { useBeta }) / -simmonsDissimilarCurrentDensity(junction, -bias, { useBeta });
    // Simmons 1963b with β, physics.md §6: J(low-φ negative)/J(low-φ positive) = 0.9943, 0.9314, 0.6945, 0.9556 at 0.1, 1, 3, 6 V
    for (const [bias, printed] of [
      [0.1, 0.9943],
      [1, 0.9314],
      [3, 0.6945],
      [6, 0.9556],
    ]) {
      expectPrinted(ratio(bias, true), printed, 1e-4);
    }
    // physics.md §6: with β = 1 the J(V) is polarity-symmetric (while b > 0)
    for (const bias of [0.1, 1, 3]) expectRelClose(ratio(bias, false), 1, 1e-12);
  });
});
