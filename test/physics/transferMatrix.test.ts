import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { exactCurrentDensity, supplyWeightedCurrentDensity, transferMatrixTransmission } from '../../src/physics/transferMatrix.ts';
import { rectangularTransmission } from '../../src/physics/rectangularTransmission.ts';
import { trapezoidProfile, type Junction, type SampledProfile } from '../../src/physics/barrierProfile.ts';
import { ELECTRON_MASS_KG, ELEMENTARY_CHARGE_C, HBAR_J_S, SUPPLY_CONSTANT_A_PER_M2_PER_EV2, WKB_DECAY_PER_M_PER_SQRT_EV } from '../../src/physics/constants.ts';
import { angstromToM } from '../../src/physics/units.ts';
import { expectRelClose } from '../helpers.ts';

/** Constant barrier V0 (eV above the band bottom) over [0, a]; the same band bottom on both sides. */
function rectangleProfile(energyEV: number, barrierHeightEV: number, widthAngstrom: number): SampledProfile {
  // Fermi energy put at E, so heights above the tip Fermi level are V0 − E.
  return {
    positionsM: new Float64Array([0, angstromToM(widthAngstrom)]),
    heightsEV: new Float64Array([barrierHeightEV - energyEV, barrierHeightEV - energyEV]),
    fermiEnergyEV: energyEV,
    biasV: 0,
  };
}

const junction = (tip: number, sample: number, gapAngstrom: number, fermiEnergyEV = 5.5): Junction => ({
  tipWorkFunctionEV: tip,
  sampleWorkFunctionEV: sample,
  gapM: angstromToM(gapAngstrom),
  fermiEnergyEV,
});

/** WKB transmission e^{−γ} of the §0 trapezoid, γ of the linear barrier in physics.md §4. */
function wkbTransmission(j: Junction, biasV: number): (energyEV: number) => number {
  const a0 = (2 / 3) * WKB_DECAY_PER_M_PER_SQRT_EV * j.gapM;
  const power = (u: number): number => Math.max(u, 0) ** 1.5;
  return (energyEV) => {
    const u1 = j.fermiEnergyEV + j.tipWorkFunctionEV - energyEV;
    const u2 = j.fermiEnergyEV + j.sampleWorkFunctionEV - biasV - energyEV;
    const gamma = Math.abs(u1 - u2) < 1e-12 ? 1.5 * a0 * Math.sqrt(Math.max(u1, 0)) : (a0 * (power(u1) - power(u2))) / (u1 - u2);
    return Math.exp(-gamma);
  };
}
const wkbCurrent = (j: Junction, biasV: number, temperatureK: number): number =>
  supplyWeightedCurrentDensity(wkbTransmission(j, biasV), j.fermiEnergyEV, biasV, temperatureK).currentDensityAPerM2;

describe('transferMatrixTransmission', () => {
  it('transferMatrixTransmission(rectangle) equals the closed form at the physics.md §11 check points', () => {
    const cases: Array<[number, number, number, number]> = [
      // (E, V0, a[Å], physics.md §11 value)
      [5, 9, 3, 8.412005e-3],
      [5, 9, 5, 1.401872e-4],
      [5, 9, 10, 4.975216e-9],
      [1, 2, 5, 2.35471198e-2],
      [0.5, 10, 2, 1.37615476e-3],
      [3, 2, 5, 9.08997661e-1],
      [2, 2, 5, 2.33598178e-1],
    ];
    for (const [energy, height, width, printed] of cases) {
      const result = transferMatrixTransmission(rectangleProfile(energy, height, width), energy);
      const closed = rectangularTransmission({ energyEV: energy, barrierHeightEV: height, widthM: angstromToM(width) });
      // physics.md §11: a piecewise-constant transfer matrix matches the textbook closed form to 1e-8
      expectRelClose(result.transmission, closed, 1e-8);
      // physics.md §11 check value, recomputed there with numpy
      expectRelClose(result.transmission, printed, 1e-6);
      expect(result.converged).toBe(true);
    }
  });

  it('transferMatrixTransmission(trapezoid 4 → 3 eV, 10 Å, V = 1) equals the physics.md §11 value', () => {
    const profile = trapezoidProfile(junction(4, 4, 10, 5), 1, 1);
    const result = transferMatrixTransmission(profile, 5);
    // physics.md §11: TMM 1.805634e-8 for E = E_F = 5 eV, right band bottom −1 eV (200–4000 slices)
    expectRelClose(result.transmission, 1.805634e-8, 1e-4);
    expect(result.converged).toBe(true);
    expect(result.estimatedRelativeError).toBeLessThan(1e-8);
    // physics.md §11: WKB gives 4.809016e-9 here (γ of §4 with u1 = 4, u2 = 3), ×3.75 below the exact value
    expectRelClose(wkbTransmission(junction(4, 4, 10, 5), 1)(5), 4.809016e-9, 1e-6);
    expectRelClose(result.transmission / 4.809016e-9, 3.75, 2e-3);
  });

  it('transferMatrixTransmission reports an error estimate that bounds the true slicing error', () => {
    // Self-consistency (no outside reference): compare with a very fine plain slicing of the same profile
    for (const [tip, sample, gap, bias, energy] of [
      [4, 4, 10, 1, 5],
      [3.5, 4.5, 10, -0.5, 5.5],
      [4, 4, 20, 3, 5.5],
      [10, 10, 20, 2, 5.5],
    ]) {
      const profile = trapezoidProfile(junction(tip, sample, gap, 5.5), bias, 1);
      const result = transferMatrixTransmission(profile, energy);
      const fine = transferMatrixTransmission(profile, energy, { fixedSlicesPerInterval: 1 << 17 });
      const trueError = Math.abs(result.transmission / fine.transmission - 1);
      expect(trueError).toBeLessThanOrEqual(Math.max(result.estimatedRelativeError, 1e-9));
      expect(result.slices).toBeGreaterThan(0);
    }
  });

  it('transferMatrixTransmission uses the flux ratio k_R/k_L for different band bottoms', () => {
    const energy = 5;
    const kLeft = Math.sqrt(energy);
    const kRight = Math.sqrt(energy + 1);
    // Textbook potential step 0 → −1 eV: T = 4 k_L k_R/(k_L + k_R)² (here: "barrier" at the tip band bottom)
    const step: SampledProfile = { positionsM: new Float64Array([0, 5e-10]), heightsEV: new Float64Array([-5.5, -5.5]), fermiEnergyEV: 5.5, biasV: 1 };
    expectRelClose(transferMatrixTransmission(step, energy).transmission, (4 * kLeft * kRight) / (kLeft + kRight) ** 2, 1e-12);
    // Textbook asymmetric rectangle, T = 4k1k3q²/[q²(k1 + k3)² + (k1² + q²)(k3² + q²)sinh²(qa)] (from memory;
    // value checked against a numpy solve of the matching conditions): E = 5, V0 = 9 eV, right band bottom −1 eV, 5 Å
    const asymmetric: SampledProfile = { positionsM: new Float64Array([0, 5e-10]), heightsEV: new Float64Array([4, 4]), fermiEnergyEV: 5, biasV: 1 };
    expectRelClose(transferMatrixTransmission(asymmetric, 5).transmission, 1.3821088675972814e-4, 1e-10);
    // The same formula, numpy solve: E = 2, V0 = 6 eV, right band bottom −3 eV, 4 Å
    const deeper: SampledProfile = { positionsM: new Float64Array([0, 4e-10]), heightsEV: new Float64Array([4, 4]), fermiEnergyEV: 2, biasV: 3 };
    expectRelClose(transferMatrixTransmission(deeper, 2).transmission, 1.0318391292450794e-3, 1e-10);
  });

  it('transferMatrixTransmission is stable for 10–15 eV barriers over 2–10 nm', () => {
    const waveNumberSquaredPerEV = (2 * ELECTRON_MASS_KG * ELEMENTARY_CHARGE_C) / (HBAR_J_S * HBAR_J_S);
    for (const [energy, height, width] of [
      [5, 15, 20],
      [5, 20, 50],
      [1, 11, 20],
    ]) {
      const result = transferMatrixTransmission(rectangleProfile(energy, height, width), energy);
      const closed = rectangularTransmission({ energyEV: energy, barrierHeightEV: height, widthM: angstromToM(width) });
      // Textbook closed form (physics.md §11), down to T ≈ 1e-86
      expectRelClose(result.transmission, closed, 1e-10);
    }
    // 15 eV over 100 nm: T ≈ e^{−4570} underflows, its logarithm does not. Thick-barrier limit of the
    // closed form (physics.md §11): ln T → ln[16E(V0 − E)/V0²] − 2qa
    const huge = transferMatrixTransmission(rectangleProfile(5, 20, 1000), 5);
    const q = Math.sqrt(waveNumberSquaredPerEV * 15);
    expect(huge.transmission).toBe(0);
    expectRelClose(huge.logTransmission, Math.log((16 * 5 * 15) / 400) - 2 * q * angstromToM(1000), 1e-12);
  });

  it('transferMatrixTransmission is the same from either side (reciprocity)', () => {
    // Time-reversal symmetry of 1D scattering: T(left → right, E) = T(right → left, E + eV); textbook
    fc.assert(
      fc.property(
        fc.double({ min: 2, max: 6, noNaN: true }),
        fc.double({ min: 2, max: 6, noNaN: true }),
        fc.double({ min: 4, max: 15, noNaN: true }),
        fc.double({ min: -2, max: 2, noNaN: true }),
        fc.double({ min: 3, max: 8, noNaN: true }),
        (tip, sample, gap, bias, energy) => {
          fc.pre(energy + bias > 0.05);
          const forward = trapezoidProfile(junction(tip, sample, gap, 5.5), bias, 4);
          // Mirror: x → d − x, heights re-referenced to the sample Fermi level, bias reversed.
          const count = forward.positionsM.length;
          const positionsM = new Float64Array(count);
          const heightsEV = new Float64Array(count);
          for (let i = 0; i < count; i++) {
            positionsM[i] = forward.positionsM[count - 1] - forward.positionsM[count - 1 - i];
            heightsEV[i] = forward.heightsEV[count - 1 - i] + bias;
          }
          const mirrored: SampledProfile = { positionsM, heightsEV, fermiEnergyEV: 5.5, biasV: -bias };
          const a = transferMatrixTransmission(forward, energy).transmission;
          const b = transferMatrixTransmission(mirrored, energy + bias).transmission;
          expectRelClose(b, a, 1e-7);
        },
      ),
      { seed: 7, numRuns: 40 },
    );
  });

  it('transferMatrixTransmission returns 0 where one electrode has no state, and rejects bad profiles', () => {
    const profile = trapezoidProfile(junction(4, 4, 10), 1, 1);
    expect(transferMatrixTransmission(profile, 0).transmission).toBe(0);
    expect(transferMatrixTransmission(trapezoidProfile(junction(4, 4, 10), -1, 1), 0.5).transmission).toBe(0);
    const bad: SampledProfile = { positionsM: new Float64Array([0, 0]), heightsEV: new Float64Array([1, 1]), fermiEnergyEV: 5, biasV: 0 };
    expect(() => transferMatrixTransmission(bad, 1)).toThrow('transferMatrixTransmission: profile.positionsM must be strictly increasing');
    expect(() => transferMatrixTransmission(profile, Number.NaN)).toThrow('transferMatrixTransmission: energyEV must be finite, got NaN');
  });
});

describe('supplyWeightedCurrentDensity', () => {
  it('supplyWeightedCurrentDensity(WKB) reproduces the physics.md §5 current densities', () => {
    const square = junction(4, 4, 10);
    // physics.md §5: φ1 = φ2 = 4, d = 10 Å, E_F = 5.5, T = 0 (WKB, D = e^{−γ})
    expectRelClose(wkbCurrent(square, 0.1, 0), 8.366882e3, 1e-4);
    expectRelClose(wkbCurrent(square, 1, 0), 1.087262e5, 1e-4);
    // physics.md §5: E_F = 3 / 11 eV at 0.1 V
    expectRelClose(wkbCurrent(junction(4, 4, 10, 3), 0.1, 0), 8.351057e3, 1e-4);
    expectRelClose(wkbCurrent(junction(4, 4, 10, 11), 0.1, 0), 8.367091e3, 1e-4);
    // physics.md §5: trapezoid 3.5/4.5 eV, 10 Å, T = 0 at ±0.1 V and ±1 V
    const trapezoid = junction(3.5, 4.5, 10);
    expectRelClose(wkbCurrent(trapezoid, 0.1, 0), 8.4453e3, 1e-4);
    expectRelClose(wkbCurrent(trapezoid, -0.1, 0), -8.485e3, 1e-4);
    expectRelClose(wkbCurrent(trapezoid, 1, 0), 1.0737e5, 1e-4);
    expectRelClose(wkbCurrent(trapezoid, -1, 0), -1.1296e5, 1e-4);
  });

  it('supplyWeightedCurrentDensity(WKB) reproduces the physics.md §5 temperature factors', () => {
    const ratio = (gapAngstrom: number, temperatureK: number): number =>
      wkbCurrent(junction(4, 4, gapAngstrom), 0.1, temperatureK) / wkbCurrent(junction(4, 4, gapAngstrom), 0.1, 0);
    // physics.md §5: J(300 K)/J(0) at 0.1 V for 10 / 5 / 20 Å, and 77 K at 10 Å
    expectRelClose(ratio(10, 300), 1.006923, 1e-4);
    expectRelClose(ratio(5, 300), 1.001656, 1e-4);
    expectRelClose(ratio(20, 300), 1.028825, 1e-4);
    expectRelClose(ratio(10, 77), 1.000454, 1e-4);
  });

  it('supplyWeightedCurrentDensity(WKB) reproduces the physics.md §6 polarity ratios of 3.5/4.5 eV', () => {
    const trapezoid = junction(3.5, 4.5, 10);
    const printed: Array<[number, number]> = [
      [0.1, 0.9953],
      [1, 0.9505],
      [3, 0.7691],
      [6, 0.9491],
      [10, 2.1961],
    ];
    for (const [bias, value] of printed) {
      // physics.md §6: J(low-φ negative)/J(low-φ positive), 10 Å, the §5 integral (4 digits printed)
      expect(Math.abs(wkbCurrent(trapezoid, bias, 0) / -wkbCurrent(trapezoid, -bias, 0) - value)).toBeLessThanOrEqual(0.5e-4);
    }
  });

  it('supplyWeightedCurrentDensity(D = const) integrates the supply function exactly', () => {
    // Free-electron supply (Simmons 1963, physics.md §5): ∫N dEx = eV·E_F − (eV)²/2 for 0 < eV < E_F, at any T
    // (the Sommerfeld terms of the two Fermi levels cancel)
    const expected = SUPPLY_CONSTANT_A_PER_M2_PER_EV2 * 1e-9 * (0.3 * 5.5 - 0.045);
    expectRelClose(supplyWeightedCurrentDensity(() => 1e-9, 5.5, 0.3, 0).currentDensityAPerM2, expected, 1e-12);
    expectRelClose(supplyWeightedCurrentDensity(() => 1e-9, 5.5, 0.3, 300).currentDensityAPerM2, expected, 1e-7);
    expectRelClose(supplyWeightedCurrentDensity(() => 1e-9, 5.5, -0.3, 300).currentDensityAPerM2, -expected, 1e-7);
    expect(supplyWeightedCurrentDensity(() => 1, 5.5, 0, 300).currentDensityAPerM2).toBe(0);
  });
});

/** Brute-force reference: composite 4-point Gauss–Legendre on equal sub-panels, converged transmission at each node. */
function bruteForceCurrent(j: Junction, biasV: number, panelsPerSegment: number): number {
  const profile = trapezoidProfile(j, biasV, 1);
  const nodes = [-0.8611363115940526, -0.3399810435848563, 0.3399810435848563, 0.8611363115940526];
  const weights = [0.3478548451374538, 0.6521451548625461, 0.6521451548625461, 0.3478548451374538];
  const fermi = j.fermiEnergyEV;
  const edges = [Math.max(0, -biasV), Math.min(fermi, fermi - biasV), Math.max(fermi, fermi - biasV)].filter((x, i, all) => i === 0 || x > all[i - 1]);
  let sum = 0;
  for (let s = 0; s + 1 < edges.length; s++) {
    const width = (edges[s + 1] - edges[s]) / panelsPerSegment;
    for (let p = 0; p < panelsPerSegment; p++) {
      const centre = edges[s] + (p + 0.5) * width;
      for (let k = 0; k < 4; k++) {
        const energy = centre + 0.5 * width * nodes[k];
        const supply = Math.max(fermi - energy, 0) - Math.max(fermi - biasV - energy, 0);
        sum += 0.5 * width * weights[k] * supply * transferMatrixTransmission(profile, energy, { relativeTolerance: 1e-10 }).transmission;
      }
    }
  }
  return SUPPLY_CONSTANT_A_PER_M2_PER_EV2 * sum;
}

describe('exactCurrentDensity', () => {
  it('exactCurrentDensity agrees with a brute-force quadrature of the exact transmission', () => {
    // Self-consistency (no outside reference): independent fixed-grid quadrature, physics.md §5 integral at T = 0
    for (const [tip, sample, gap, bias] of [
      [4, 4, 10, 0.1],
      [3.5, 4.5, 10, -1],
    ]) {
      const j = junction(tip, sample, gap);
      const result = exactCurrentDensity(j, bias, 0);
      expect(result.converged).toBe(true);
      expect(result.estimatedRelativeError).toBeLessThan(1e-6);
      expectRelClose(result.currentDensityAPerM2, bruteForceCurrent(j, bias, 24), 1e-6);
    }
  });

  it('exactCurrentDensity exceeds WKB by the ~4× abrupt-edge prefactor only', () => {
    // physics.md §11: abrupt edges cost WKB a ~4× prefactor (×3.75 for the 4 → 3 eV trapezoid at E_F)
    const square = junction(4, 4, 10);
    const ratio = exactCurrentDensity(square, 0.1, 0).currentDensityAPerM2 / wkbCurrent(square, 0.1, 0);
    expect(ratio).toBeGreaterThan(3);
    expect(ratio).toBeLessThan(5);
    // physics.md §11: "it belongs in the fitted area, never in φ" — the ratio barely moves with the gap
    const ratioAt = (gapAngstrom: number): number =>
      exactCurrentDensity(junction(4, 4, gapAngstrom), 0.1, 0).currentDensityAPerM2 / wkbCurrent(junction(4, 4, gapAngstrom), 0.1, 0);
    expect(Math.abs(Math.log(ratioAt(12) / ratioAt(8)))).toBeLessThan(0.1);
  });

  it('exactCurrentDensity is odd in V for identical electrodes and matches an explicit profile', () => {
    // Symmetry of identical electrodes (physics.md §6: polarity-symmetric), no further source
    const square = junction(4, 4, 10);
    const forward = exactCurrentDensity(square, 0.5, 300).currentDensityAPerM2;
    expectRelClose(-exactCurrentDensity(square, -0.5, 300).currentDensityAPerM2, forward, 1e-6);
    // A Junction is the §0 trapezoid: the same as its sampled profile
    expectRelClose(exactCurrentDensity(trapezoidProfile(square, 0.5, 10), 0.5, 300).currentDensityAPerM2, forward, 1e-6);
    expect(exactCurrentDensity(square, 0, 300).currentDensityAPerM2).toBe(0);
  });

  it('exactCurrentDensity rejects a profile built for another bias', () => {
    const profile = trapezoidProfile(junction(4, 4, 10), 0.5, 10);
    expect(() => exactCurrentDensity(profile, 0.4, 0)).toThrow('exactCurrentDensity: biasV must equal profile.biasV (0.5), got 0.4');
  });
});
