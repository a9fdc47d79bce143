import { describe, expect, it } from 'vitest';
import { imagePotentialEV, imageRoundedProfile, simmonsImageApproxHeightEV, simmonsImageBarrier } from '../../src/physics/imagePotential.ts';
import { transferMatrixTransmission } from '../../src/physics/transferMatrix.ts';
import { trapezoidProfile, type Junction } from '../../src/physics/barrierProfile.ts';
import { COULOMB_EV_M } from '../../src/physics/constants.ts';
import { angstromToM, mToAngstrom } from '../../src/physics/units.ts';
import { expectRelClose } from '../helpers.ts';

const gap = angstromToM(10);
const square: Junction = { tipWorkFunctionEV: 4, sampleWorkFunctionEV: 4, gapM: gap, fermiEnergyEV: 5.5 };

/** |actual − printed| ≤ half a unit in the last printed digit. */
function expectPrinted(actual: number, printed: number, lastDigit: number): void {
  expect(Math.abs(actual - printed), `${actual} printed as ${printed}`).toBeLessThanOrEqual(lastDigit / 2);
}

/** Simmons' image series summed term by term, with the tail Σ_{n>N} x²/(n(n²s² − x²)/s) ≈ x²/(2N²s³). */
function directImageSeriesEV(x: number, s: number, terms: number): number {
  let sum = 1 / (2 * x);
  for (let n = 1; n <= terms; n++) sum += (n * s) / (n * s * n * s - x * x) - 1 / (n * s);
  sum += (x * x) / (2 * terms * terms * s * s * s);
  return -(COULOMB_EV_M / 2) * sum;
}

describe('imagePotentialEV', () => {
  it('imagePotentialEV(mid-gap) equals −e² ln2/(4πε0 K s)', () => {
    // physics.md §6 (exact two-surface sum, Mayer et al., Jordan J. Phys. 12, 63 (2019)): −0.99811 eV at s = 10 Å, K = 1
    expectPrinted(imagePotentialEV(gap / 2, gap, 1), -0.99811, 1e-5);
    // Closed form of the mid-gap sum (physics.md §6): −(e²/4πε0)·ln2/(K s), here with K = 2
    expectRelClose(imagePotentialEV(gap / 2, gap, 2), -(COULOMB_EV_M * Math.LN2) / (2 * gap), 1e-13);
  });

  it('imagePotentialEV equals the image series summed term by term', () => {
    // Simmons, J. Appl. Phys. 34, 1793 (1963): image series, summed directly to 2e5 terms plus the tail
    for (const fraction of [0.01, 0.1, 0.25, 0.5, 0.8, 0.97]) {
      const x = fraction * gap;
      expectRelClose(imagePotentialEV(x, gap), directImageSeriesEV(x, gap, 200000), 1e-10);
    }
  });

  it('imagePotentialEV is symmetric and tends to the one-surface image near a wall', () => {
    // Symmetry of two identical planes, no source needed
    expectRelClose(imagePotentialEV(0.2 * gap, gap), imagePotentialEV(0.8 * gap, gap), 1e-13);
    // Classical one-surface image −e²/(16πε0 x) (textbook, e.g. physics.md §2 image force)
    const x = 1e-5 * gap;
    expectRelClose(imagePotentialEV(x, gap), -COULOMB_EV_M / (4 * x), 1e-4);
    expect(imagePotentialEV(0, gap)).toBe(-Infinity);
    expect(() => imagePotentialEV(2 * gap, gap)).toThrow('imagePotentialEV: positionM must be in [0, gapM');
    expect(() => imagePotentialEV(gap / 2, gap, 0.5)).toThrow('imagePotentialEV: dielectricConstant must be >= 1');
  });
});

describe('imageRoundedProfile', () => {
  it('imageRoundedProfile(mid-gap) is the trapezoid lowered by 0.99811 eV', () => {
    const profile = imageRoundedProfile(square, 0, { slices: 200 });
    // physics.md §6: exact mid-gap image term −0.99811 eV at s = 10 Å, K = 1 (here φ = 4 eV, V = 0)
    expect(profile.positionsM[100]).toBeCloseTo(gap / 2, 22);
    expectPrinted(profile.heightsEV[100] - 4, -0.99811, 1e-5);
  });

  it('imageRoundedProfile clamps at the band bottom and joins both electrodes', () => {
    const bias = 1;
    const profile = imageRoundedProfile(square, bias, { slices: 100 });
    const n = profile.positionsM.length - 1;
    // Clamping rule of imageRoundedProfile (common practice, no source): band bottom −E_F at the tip, −E_F − eV at the sample
    expect(profile.heightsEV[0]).toBe(-5.5);
    expect(profile.heightsEV[n]).toBe(-6.5);
    expect(profile.positionsM[0]).toBe(0);
    expect(profile.positionsM[n]).toBe(gap);
    for (let i = 0; i <= n; i++) {
      const x = profile.positionsM[i];
      if (i > 0) expect(x).toBeGreaterThan(profile.positionsM[i - 1]);
      expect(profile.heightsEV[i]).toBeGreaterThanOrEqual(-5.5 - (bias * x) / gap - 1e-12);
    }
    // The band-bottom crossings are samples: the kink lies a fraction of an Å inside each surface
    expect(profile.heightsEV[1]).toBeCloseTo(-5.5 - (bias * profile.positionsM[1]) / gap, 9);
    expect(mToAngstrom(profile.positionsM[1])).toBeGreaterThan(0.2);
    expect(mToAngstrom(profile.positionsM[1])).toBeLessThan(0.6);
  });

  it('imageRoundedProfile raises the transmission by orders of magnitude and converges with sampling', () => {
    // physics.md §2: the image potential lowers the barrier a lot (WKB exponent 12.76 instead of 20.49 at 10 Å)
    const rounded = transferMatrixTransmission(imageRoundedProfile(square, 0.1), 5.5);
    const plain = transferMatrixTransmission(trapezoidProfile(square, 0.1, 1), 5.5);
    expect(rounded.converged).toBe(true);
    expect(rounded.transmission / plain.transmission).toBeGreaterThan(100);
    // Sampling convergence of imageRoundedProfile (self-consistency): 400 vs 1600 intervals within 3e-4
    const fine = transferMatrixTransmission(imageRoundedProfile(square, 0.1, { slices: 1600 }), 5.5);
    expectRelClose(rounded.transmission, fine.transmission, 3e-4);
  });
});

describe('simmonsImageBarrier', () => {
  const input = { barrierHeightEV: 4, gapM: gap, biasV: 1, dielectricConstant: 1 };

  it('simmonsImageBarrier(printed λ) reproduces the physics.md §6 test numbers', () => {
    const result = simmonsImageBarrier({ ...input, lambdaConvention: 'printed' });
    // Simmons, J. Appl. Phys. 34, 1793 (1963), image-force formulas (from memory); physics.md §6: φ0 = 4, s = 10 Å, V = 1, K = 1
    expectPrinted(result.lambdaEV, 0.49905, 1e-5);
    expectPrinted(mToAngstrom(result.nearTurningPointM), 1.4972, 1e-4);
    expectPrinted(mToAngstrom(result.farTurningPointM), 7.6699, 1e-4);
    expectPrinted(result.meanBarrierEV, 0.8191, 1e-4);
    expectRelClose(result.widthM, result.farTurningPointM - result.nearTurningPointM, 1e-15);
  });

  it('simmonsImageBarrier(halved λ) reproduces the physics.md §6 test numbers', () => {
    const result = simmonsImageBarrier({ ...input, lambdaConvention: 'halved' });
    // Simmons 1963 with λ halved (Mayer, Mousa, Hagmann & Forbes, Jordan J. Phys. 12, 63 (2019)); physics.md §6
    expectPrinted(result.lambdaEV, 0.24953, 1e-5);
    expectPrinted(mToAngstrom(result.nearTurningPointM), 0.7486, 1e-4);
    expectPrinted(mToAngstrom(result.farTurningPointM), 8.6613, 1e-4);
    expectPrinted(result.meanBarrierEV, 1.9405, 1e-4);
  });

  it('simmonsImageApproxHeightEV(printed) doubles the image term; halved is 1.150× the exact mid-gap value', () => {
    const atMid = (lambdaConvention: 'printed' | 'halved'): number =>
      simmonsImageApproxHeightEV({ barrierHeightEV: 4, gapM: gap, biasV: 0, lambdaConvention }, gap / 2) - 4;
    // physics.md §6: the printed form gives −2.29565 eV mid-gap (s = 10 Å, K = 1)
    expectPrinted(atMid('printed'), -2.29565, 1e-5);
    // physics.md §6: halving λ leaves 1.150 of the exact mid-gap sum
    expectPrinted(atMid('halved') / imagePotentialEV(gap / 2, gap), 1.15, 1e-3);
  });

  it('simmonsImageBarrier uses the high-voltage s2 for eV ≥ φ0 and rejects a collapsed barrier', () => {
    // Simmons 1963 (from memory, physics.md §6): s2 = s(φ0 − 5.6λ)/(eV) for eV ≥ φ0
    const high = simmonsImageBarrier({ ...input, biasV: 5, lambdaConvention: 'halved' });
    expectRelClose(high.farTurningPointM, (gap * (4 - 5.6 * high.lambdaEV)) / 5, 1e-14);
    expect(() => simmonsImageBarrier({ ...input, barrierHeightEV: 0.5, gapM: angstromToM(3), lambdaConvention: 'printed' })).toThrow(
      'simmonsImageBarrier: barrier collapsed',
    );
    expect(() => simmonsImageBarrier({ ...input, lambdaConvention: 'twice' as 'printed' })).toThrow("lambdaConvention must be 'printed' or 'halved'");
  });
});
