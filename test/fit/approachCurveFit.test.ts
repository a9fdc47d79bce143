/**
 * fitApproachCurve on synthetic approach curves I(z) = I0·e^{slope·z}: exact check values from
 * physics.md §2–§3, parameter recovery and coverage of the reported error bars over seeded noisy
 * realisations, and the exclusion rules (saturation, noise floor), input order and the local profile.
 */
import { describe, expect, it } from 'vitest';
import { ExclusionReason, fitApproachCurve, type ApproachCurveFit } from '../../src/fit/approachCurveFit.ts';
import { gaussian, mulberry32 } from '../../src/fit/index.ts';
import { expectRelClose } from '../helpers.ts';

const ANGSTROM_M = 1e-10;
// physics.md §1: ħ²/(8m_e) = 0.95249553 eV Å² (CODATA 2022, recomputed there with scipy.constants)
const APPARENT_BARRIER_PREFACTOR_EV_A2 = 0.95249553;

/** |d lnI/dz| in 1/m for an apparent barrier φ (eV), from φ_ap = 0.95249553 eV Å²·slope² (physics.md §2). */
function slopeMagnitudePerM(barrierEV: number): number {
  return Math.sqrt(barrierEV / APPARENT_BARRIER_PREFACTOR_EV_A2) / ANGSTROM_M;
}

interface CurveSpec {
  /** Apparent barrier of the exponential, eV. */
  barrierEV: number;
  points: number;
  fromM: number;
  toM: number;
  /** Noise-free current at z = 0, A. */
  currentAtZeroA: number;
  relative?: number;
  floorA?: number;
  seed?: number;
}

/** I = I0·e^{−|slope|z} on an even z grid, with seeded noise I·(1 + σ_rel g₁) + σ_floor g₂. */
function exponentialCurve(spec: CurveSpec): { zM: Float64Array; currentA: Float64Array; trueCurrentA: Float64Array } {
  const { points, fromM, toM, currentAtZeroA, relative = 0, floorA = 0 } = spec;
  const slope = -slopeMagnitudePerM(spec.barrierEV);
  const random = spec.seed === undefined ? null : mulberry32(spec.seed);
  const zM = new Float64Array(points);
  const currentA = new Float64Array(points);
  const trueCurrentA = new Float64Array(points);
  for (let i = 0; i < points; i++) {
    zM[i] = fromM + ((toM - fromM) * i) / (points - 1);
    trueCurrentA[i] = currentAtZeroA * Math.exp(slope * zM[i]);
    currentA[i] = random === null ? trueCurrentA[i] : trueCurrentA[i] * (1 + relative * gaussian(random)) + floorA * gaussian(random);
  }
  return { zM, currentA, trueCurrentA };
}

function pull(fit: ApproachCurveFit, barrierEV: number): number {
  return (fit.apparentBarrierEV - barrierEV) / fit.apparentBarrierErrorEV;
}

describe('fitApproachCurve: check values of physics.md §2 and §3', () => {
  it('fitApproachCurve(exact exponential, slope −2 Å⁻¹) gives φ_ap = 3.8100 eV and κ = 1 Å⁻¹', () => {
    const zM = Float64Array.from({ length: 64 }, (_, i) => (i * 3 * ANGSTROM_M) / 63);
    const currentA = Float64Array.from(zM, (z) => 1e-9 * Math.exp(-2e10 * z));
    const fit = fitApproachCurve({ zM, currentA, biasV: 0.1 });
    expect(fit.status).toBe('ok');
    expect(fit.pointsUsed).toBe(64);
    // physics.md §2: slope −2.0 Å⁻¹ → 3.8100 eV
    expectRelClose(fit.apparentBarrierEV, 3.81, 1e-4);
    expectRelClose(fit.slopePerM, -2e10, 1e-12);
    // physics.md §2: κ = −slope/2
    expectRelClose(fit.decayConstantPerM, 1e10, 1e-12);
    expect(fit.apparentBarrierErrorEV).toBeLessThan(1e-9);
  });

  it('fitApproachCurve(one decade per Å) gives φ_ap = 5.0500 eV', () => {
    const zM = Float64Array.from({ length: 32 }, (_, i) => (i * 2 * ANGSTROM_M) / 31);
    const currentA = Float64Array.from(zM, (z) => 2e-9 * 10 ** (-z / ANGSTROM_M));
    // physics.md §2: 1 decade/Å → 5.0500 eV
    expectRelClose(fitApproachCurve({ zM, currentA, biasV: 0.1 }).apparentBarrierEV, 5.05, 1e-4);
  });

  it('fitApproachCurve(φ_ap = 4 eV) decays by ×7.7622 per Å (κ = 1.02463 Å⁻¹)', () => {
    const curve = exponentialCurve({ barrierEV: 4, points: 64, fromM: 0, toM: 4 * ANGSTROM_M, currentAtZeroA: 5e-9 });
    const fit = fitApproachCurve({ zM: curve.zM, currentA: curve.currentA, biasV: 0.1 });
    // 1e-7: the prefactor 0.95249553 above has 8 digits
    expectRelClose(fit.apparentBarrierEV, 4, 1e-7);
    // physics.md §2: φ = 4 eV → κ = 1.02463 Å⁻¹, ×7.7622 per Å
    expectRelClose(fit.decayConstantPerM * ANGSTROM_M, 1.02463, 1e-5);
    expectRelClose(Math.exp(2 * fit.decayConstantPerM * ANGSTROM_M), 7.7622, 1e-4);
  });

  const contactCases = [
    // physics.md §3 (φ_ap = 4 eV): 1 nA at 0.1 V → 4.3700 Å
    { barrierEV: 4, currentA: 1e-9, biasV: 0.1, gapA: 4.37 },
    // physics.md §3: 6.1800 Å if φ_ap = 2
    { barrierEV: 2, currentA: 1e-9, biasV: 0.1, gapA: 6.18 },
    // physics.md §3 (φ_ap = 4 eV): 100 pA at 1 V → 6.6172 Å
    { barrierEV: 4, currentA: 1e-10, biasV: 1, gapA: 6.6172 },
    // physics.md §3 (φ_ap = 4 eV): 1 nA at 1 V → 5.4936 Å
    { barrierEV: 4, currentA: 1e-9, biasV: 1, gapA: 5.4936 },
  ];
  for (const { barrierEV, currentA, biasV, gapA } of contactCases) {
    it(`fitApproachCurve(I = ${currentA * 1e9} nA at z = 0, ${biasV} V, φ_ap = ${barrierEV} eV) puts contact ${gapA} Å away`, () => {
      const curve = exponentialCurve({ barrierEV, points: 64, fromM: 0, toM: 3 * ANGSTROM_M, currentAtZeroA: currentA });
      const fit = fitApproachCurve({ zM: curve.zM, currentA: curve.currentA, biasV });
      expectRelClose(fit.referenceCurrentA, currentA, 1e-12);
      // physics.md §3 (check value in the case list above)
      expectRelClose(fit.gapToContactM / ANGSTROM_M, gapA, 1e-4);
      // the contact is on the near side of z = 0, where G = G0
      expectRelClose(fit.contactPositionM, -fit.gapToContactM, 1e-9);
    });
  }

  it('fitApproachCurve(setpointCurrentA) reports the gap at the setpoint, not at the largest current', () => {
    // 5 nA at z = 0, so 1 nA is reached at z = ln 5/(2κ) > 0
    const curve = exponentialCurve({ barrierEV: 4, points: 64, fromM: 0, toM: 3 * ANGSTROM_M, currentAtZeroA: 5e-9 });
    const fit = fitApproachCurve({ zM: curve.zM, currentA: curve.currentA, biasV: 0.1, setpointCurrentA: 1e-9 });
    expectRelClose(fit.referenceCurrentA, 1e-9, 1e-12);
    // physics.md §3: 1 nA at 0.1 V with φ_ap = 4 eV → 4.3700 Å
    expectRelClose(fit.gapToContactM / ANGSTROM_M, 4.37, 1e-4);
  });

  it('fitApproachCurve(noisy) propagates σ_z = (z − z_c)·σ_φ/(2φ)', () => {
    const curve = exponentialCurve({ barrierEV: 4, points: 128, fromM: 0, toM: 3 * ANGSTROM_M, currentAtZeroA: 1e-9, relative: 0.03, floorA: 1e-12, seed: 11 });
    const fit = fitApproachCurve({ zM: curve.zM, currentA: curve.currentA, biasV: 0.1 });
    expect(fit.apparentBarrierErrorEV).toBeGreaterThan(0);
    // physics.md §3: σ_z = (z − z_c)σ_φ/(2φ)
    expectRelClose(fit.gapToContactErrorM, (fit.gapToContactM * fit.apparentBarrierErrorEV) / (2 * fit.apparentBarrierEV), 1e-12);
    // physics.md §2: σ_φ/φ = 2σ_slope/|slope|
    expectRelClose(fit.apparentBarrierErrorEV / fit.apparentBarrierEV, (2 * fit.slopeErrorPerM) / Math.abs(fit.slopePerM), 1e-12);
  });
});

describe('fitApproachCurve: recovery and coverage over seeded noisy curves', () => {
  it('fitApproachCurve(200 noisy exponentials, 2–3 % noise, small floor) covers the true φ in ≥ 99 % of 3σ intervals, pulls ~ N(0, 1)', () => {
    // 5 nA → 11 pA over 3 Å with a 1 pA floor: the curve stays above 10× the floor, where ln I
    // is unbiased (nearer the floor E[ln(I + ε)] ≈ ln I − σ²/(2I²) steepens the fitted slope).
    const barrierEV = 4;
    const realisations = 200;
    const pulls: number[] = [];
    for (let k = 0; k < realisations; k++) {
      const curve = exponentialCurve({
        barrierEV,
        points: 256,
        fromM: 0,
        toM: 3 * ANGSTROM_M,
        currentAtZeroA: 5e-9,
        relative: [0.02, 0.025, 0.03][k % 3],
        floorA: 1e-12,
        seed: 1000 + k,
      });
      const fit = fitApproachCurve({ zM: curve.zM, currentA: curve.currentA, biasV: 0.1 });
      expect(fit.status).toBe('ok');
      pulls.push(pull(fit, barrierEV));
    }
    const inside = pulls.filter((p) => Math.abs(p) <= 3).length;
    const mean = pulls.reduce((a, b) => a + b, 0) / realisations;
    const sd = Math.sqrt(pulls.reduce((a, p) => a + (p - mean) ** 2, 0) / (realisations - 1));
    // Coverage of a 3σ interval is 99.73 % for a normal pull [textbook]; ≥ 99 % allows for sampling.
    expect(inside, `${inside}/${realisations} inside 3σ`).toBeGreaterThanOrEqual(0.99 * realisations);
    expect(Math.abs(mean), `mean pull ${mean}`).toBeLessThanOrEqual(0.3);
    expect(sd, `pull SD ${sd}`).toBeGreaterThanOrEqual(0.7);
    expect(sd, `pull SD ${sd}`).toBeLessThanOrEqual(1.4);
  });

  it('fitApproachCurve(white noise) reports r2 ≈ 1, reduced χ² ≈ 1 and Durbin–Watson ≈ 2', () => {
    const curve = exponentialCurve({ barrierEV: 4, points: 256, fromM: 0, toM: 3 * ANGSTROM_M, currentAtZeroA: 5e-9, relative: 0.02, floorA: 1e-12, seed: 5 });
    const fit = fitApproachCurve({ zM: curve.zM, currentA: curve.currentA, biasV: 0.1 });
    expect(fit.r2).toBeGreaterThan(0.99);
    expect(fit.reducedChi2).toBeGreaterThan(0.5);
    expect(fit.reducedChi2).toBeLessThan(1.5);
    // Durbin–Watson ≈ 2 for uncorrelated residuals (Durbin & Watson, Biometrika 37, 409 (1950)) [from memory]
    expect(fit.durbinWatson).toBeGreaterThan(1.6);
    expect(fit.durbinWatson).toBeLessThan(2.4);
  });

  it('fitApproachCurve(curved ln I, φ falling 4 → 2 eV) shows correlated residuals (Durbin–Watson < 1)', () => {
    const points = 128;
    const step = (4 * ANGSTROM_M) / (points - 1);
    const random = mulberry32(3);
    const zM = new Float64Array(points);
    const currentA = new Float64Array(points);
    let lnCurrent = Math.log(1e-9);
    for (let i = 0; i < points; i++) {
      const barrierEV = 4 - (2 * i) / (points - 1);
      if (i > 0) lnCurrent -= slopeMagnitudePerM(barrierEV) * step;
      zM[i] = i * step;
      currentA[i] = Math.exp(lnCurrent) * (1 + 0.02 * gaussian(random));
    }
    const fit = fitApproachCurve({ zM, currentA, biasV: 0.1, noise: { floorA: 0 }, localWindowPoints: 16 });
    expect(fit.durbinWatson).toBeLessThan(1);
    // the local profile follows the falling barrier: ≈ 4 eV near the start, ≈ 2 eV at the far end
    const profile = fit.localProfile.barrierEV;
    expect(profile[0]).toBeGreaterThan(3.5);
    expect(profile[profile.length - 1]).toBeLessThan(2.5);
  });
});

describe('fitApproachCurve: exclusions', () => {
  it('fitApproachCurve(curve clipped at 10 nA on its closest 6 points) excludes exactly those 6 as saturation and still recovers φ', () => {
    // 64 points over 4 Å: a step of 0.0635 Å, ×0.878 per step at 4 eV, so the clip level (10 nA,
    // placed halfway between points 5 and 6) is ±6.5 % from both neighbours, beyond the 2 % noise.
    const barrierEV = 4;
    const step = (4 * ANGSTROM_M) / 63;
    const clipA = 1e-8;
    const currentAtZeroA = clipA * Math.exp(slopeMagnitudePerM(barrierEV) * 5.5 * step);
    const curve = exponentialCurve({ barrierEV, points: 64, fromM: 0, toM: 4 * ANGSTROM_M, currentAtZeroA, relative: 0.02, floorA: 1e-12, seed: 21 });
    const clipped = Float64Array.from(curve.currentA, (current) => Math.min(current, clipA));
    const clippedIndices = [...clipped.keys()].filter((i) => clipped[i] === clipA);
    // the construction: the preamp limit cuts exactly the 6 closest points
    expect(clippedIndices).toEqual([0, 1, 2, 3, 4, 5]);
    for (const fit of [
      fitApproachCurve({ zM: curve.zM, currentA: clipped, biasV: 0.1 }),
      fitApproachCurve({ zM: curve.zM, currentA: clipped, biasV: 0.1, saturationLimitA: clipA }),
    ]) {
      expect(fit.saturationCount).toBe(6);
      const saturated = [...fit.exclusion.keys()].filter((i) => fit.exclusion[i] === ExclusionReason.saturation);
      expect(saturated).toEqual([0, 1, 2, 3, 4, 5]);
      expect(Math.abs(pull(fit, barrierEV))).toBeLessThanOrEqual(3);
      expectRelClose(fit.apparentBarrierEV, barrierEV, 0.05);
    }
  });

  it('fitApproachCurve(curve decaying into a 5 pA floor) leaves out the floor points and recovers φ within 3σ', () => {
    const barrierEV = 4;
    const floorA = 5e-12;
    const curve = exponentialCurve({ barrierEV, points: 256, fromM: 0, toM: 8 * ANGSTROM_M, currentAtZeroA: 2e-9, relative: 0.02, floorA, seed: 31 });
    for (const noise of [undefined, { floorA }]) {
      const fit = fitApproachCurve({ zM: curve.zM, currentA: curve.currentA, biasV: 0.1, noise });
      expect(fit.status).toBe('ok');
      expect(fit.noiseFloorCount).toBeGreaterThan(100);
      for (let i = 0; i < curve.zM.length; i++) {
        // lost in the floor: excluded with the noise-floor code; well above it: used
        if (curve.trueCurrentA[i] < floorA) expect(fit.exclusion[i], `point ${i}`).toBe(ExclusionReason.noiseFloor);
        if (curve.trueCurrentA[i] > 10 * floorA) expect(fit.exclusion[i], `point ${i}`).toBe(ExclusionReason.used);
      }
      expect(fit.noiseFloorCount).toBe(fit.exclusion.filter((code) => code === ExclusionReason.noiseFloor).length);
      expect(fit.noiseFloorA / floorA).toBeGreaterThan(0.7);
      expect(fit.noiseFloorA / floorA).toBeLessThan(1.3);
      expect(Math.abs(pull(fit, barrierEV))).toBeLessThanOrEqual(3);
    }
  });

  it('fitApproachCurve(manual window) leaves out points outside it with the window code', () => {
    const curve = exponentialCurve({ barrierEV: 4, points: 64, fromM: 0, toM: 4 * ANGSTROM_M, currentAtZeroA: 5e-9 });
    const windowM = { fromM: 1 * ANGSTROM_M, toM: 3 * ANGSTROM_M };
    const fit = fitApproachCurve({ zM: curve.zM, currentA: curve.currentA, biasV: 0.1, windowM });
    for (let i = 0; i < 64; i++) {
      const inside = curve.zM[i] >= windowM.fromM && curve.zM[i] <= windowM.toM;
      expect(fit.exclusion[i]).toBe(inside ? ExclusionReason.used : ExclusionReason.window);
    }
    expectRelClose(fit.apparentBarrierEV, 4, 1e-7);
  });
});

describe('fitApproachCurve: input order, sign and failures', () => {
  const curve = exponentialCurve({ barrierEV: 4, points: 256, fromM: 0, toM: 4 * ANGSTROM_M, currentAtZeroA: 5e-9, relative: 0.025, floorA: 2e-12, seed: 41 });
  const ascending = fitApproachCurve({ zM: curve.zM, currentA: curve.currentA, biasV: 0.1 });

  function expectSameFit(fit: ApproachCurveFit, zM: Float64Array): void {
    expectRelClose(fit.apparentBarrierEV, ascending.apparentBarrierEV, 1e-12);
    expectRelClose(fit.apparentBarrierErrorEV, ascending.apparentBarrierErrorEV, 1e-9);
    expectRelClose(fit.gapToContactM, ascending.gapToContactM, 1e-12);
    expect(Array.from(fit.exclusion)).toEqual(Array.from(ascending.exclusion));
    for (let k = 0; k < zM.length; k++) {
      expect(fit.zM[k]).toBe(zM[fit.order[k]]);
      if (k > 0) expect(fit.zM[k]).toBeGreaterThan(fit.zM[k - 1]);
    }
  }

  it('fitApproachCurve(reversed z, retract order) gives the ascending-order fit', () => {
    const zM = Float64Array.from(curve.zM).reverse();
    const currentA = Float64Array.from(curve.currentA).reverse();
    expectSameFit(fitApproachCurve({ zM, currentA, biasV: 0.1 }), zM);
  });

  it('fitApproachCurve(shuffled, non-monotonic z) gives the ascending-order fit', () => {
    const random = mulberry32(7);
    const permutation = [...curve.zM.keys()];
    for (let i = permutation.length - 1; i > 0; i--) {
      const j = Math.floor(random() * (i + 1));
      [permutation[i], permutation[j]] = [permutation[j], permutation[i]];
    }
    const zM = Float64Array.from(permutation, (i) => curve.zM[i]);
    const currentA = Float64Array.from(permutation, (i) => curve.currentA[i]);
    expectSameFit(fitApproachCurve({ zM, currentA, biasV: 0.1 }), zM);
  });

  it('fitApproachCurve(negative bias, negative currents) gives the positive-bias fit', () => {
    const negative = Float64Array.from(curve.currentA, (current) => -current);
    const fit = fitApproachCurve({ zM: curve.zM, currentA: negative, biasV: -0.1 });
    expectRelClose(fit.apparentBarrierEV, ascending.apparentBarrierEV, 1e-12);
    expectRelClose(fit.gapToContactM, ascending.gapToContactM, 1e-12);
  });

  it('fitApproachCurve(current rising with z) reports no-decay; three points report too-few-points', () => {
    const rising = Float64Array.from(curve.currentA).reverse();
    expect(fitApproachCurve({ zM: curve.zM, currentA: rising, biasV: 0.1 }).status).toBe('no-decay');
    const few = fitApproachCurve({ zM: curve.zM.slice(0, 3), currentA: curve.currentA.slice(0, 3), biasV: 0.1 });
    expect(few.status).toBe('too-few-points');
    expect(Number.isNaN(few.apparentBarrierEV)).toBe(true);
  });

  it('fitApproachCurve(currentA shorter than zM) throws naming the function and both lengths', () => {
    expect(() => fitApproachCurve({ zM: curve.zM, currentA: curve.currentA.slice(1), biasV: 0.1 })).toThrow(
      'fitApproachCurve: currentA must have the length of zM (256), got 255',
    );
  });
});

describe('fitApproachCurve: local φ_ap(z) profile', () => {
  it('computes the local profile only when a window is asked for', () => {
    const curve = exponentialCurve({ barrierEV: 4, points: 64, fromM: 0, toM: 3 * ANGSTROM_M, currentAtZeroA: 1e-9 });
    expect(fitApproachCurve({ zM: curve.zM, currentA: curve.currentA, biasV: 0.1 }).localProfile.barrierEV.length).toBe(0);
  });

  it('localProfile of an exact exponential is flat at φ', () => {
    const curve = exponentialCurve({ barrierEV: 4, points: 128, fromM: 0, toM: 3 * ANGSTROM_M, currentAtZeroA: 1e-9 });
    const fit = fitApproachCurve({ zM: curve.zM, currentA: curve.currentA, biasV: 0.1, localWindowPoints: 16 });
    const { zM, barrierEV } = fit.localProfile;
    // window of 16 points ⇒ 128 − 16 + 1 centres
    expect(barrierEV.length).toBe(113);
    for (let c = 0; c < barrierEV.length; c++) {
      expectRelClose(barrierEV[c], 4, 1e-6);
      if (c > 0) expect(zM[c]).toBeGreaterThan(zM[c - 1]);
    }
  });
});
