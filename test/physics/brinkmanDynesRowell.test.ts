import { describe, expect, it } from 'vitest';
import {
  bdrCoefficients,
  bdrInverse,
  bdrNormalizedConductance,
  bdrZeroBiasConductancePerArea,
  type BdrBarrier,
} from '../../src/physics/brinkmanDynesRowell.ts';
import { angstromToM } from '../../src/physics/units.ts';
import { expectRelClose } from '../helpers.ts';

/** |actual − printed| ≤ half a unit in the last printed digit. */
function expectPrinted(actual: number, printed: number, lastDigit: number): void {
  expect(Math.abs(actual - printed), `${actual} printed as ${printed}`).toBeLessThanOrEqual(lastDigit / 2);
}

/** Barrier from the two work functions (φ1 = tip, φ2 = sample; physics.md §0: Δφ = φ2 − φ1). */
const barrier = (tip: number, sample: number, widthAngstrom: number): BdrBarrier => ({
  meanBarrierEV: (tip + sample) / 2,
  asymmetryEV: sample - tip,
  widthM: angstromToM(widthAngstrom),
});

describe('bdrCoefficients', () => {
  it('bdrCoefficients(3.5, 4.5 eV, 10 Å) equals the physics.md §7 check values', () => {
    const c = bdrCoefficients(barrier(3.5, 4.5, 10));
    // Brinkman, Dynes & Rowell, J. Appl. Phys. 41, 1915 (1970) (citation from memory); check values recomputed in physics.md §7
    expectPrinted(c.a0PerSqrtEV, 6.8309, 1e-4);
    expectPrinted(c.linearPerV, -0.05337, 1e-5);
    expectPrinted(c.quadraticPerV2, 0.82021, 1e-5);
    expectPrinted(c.minimumBiasV, 0.03253, 1e-5);
    // physics.md §1: BDR A0 per Å = 4√(2m_e)/(3ħ) = 0.6830890 eV⁻½ Å⁻¹
    expectRelClose(c.a0PerSqrtEV / 10, 0.683089, 1e-6);
  });

  it('bdrCoefficients reproduces the physics.md §7 cases at 20 Å and (3.0, 5.0 eV, 15 Å)', () => {
    // BDR 1970; physics.md §7: 20 Å → linear −0.10673 V⁻¹, quadratic 3.28086 V⁻²
    const wide = bdrCoefficients(barrier(3.5, 4.5, 20));
    expectPrinted(wide.linearPerV, -0.10673, 1e-5);
    expectPrinted(wide.quadraticPerV2, 3.28086, 1e-5);
    // BDR 1970; physics.md §7: (3.0, 5.0 eV, 15 Å) → −0.16010 V⁻¹, 1.84548 V⁻²
    const strong = bdrCoefficients(barrier(3, 5, 15));
    expectPrinted(strong.linearPerV, -0.1601, 1e-5);
    expectPrinted(strong.quadraticPerV2, 1.84548, 1e-5);
  });

  it('bdrCoefficients puts the minimum at 4Δφ/(9A0√φ̄) = Δφ/(1.53695·d√φ̄)', () => {
    // physics.md §7: eV_min = Δφ/(1.53695·d[Å]·√φ̄)
    const c = bdrCoefficients(barrier(3, 5, 15));
    expectRelClose(c.minimumBiasV, 2 / (1.53695 * 15 * 2), 1e-5);
    // The minimum of the parabola, −c1/(2c2) (algebra, no source needed)
    expectRelClose(c.minimumBiasV, -c.linearPerV / (2 * c.quadraticPerV2), 1e-13);
  });
});

describe('bdrNormalizedConductance', () => {
  it('bdrNormalizedConductance is higher with the low-φ electrode positive', () => {
    // physics.md §7 (BDR 1970): higher G with the low-φ electrode positive. Tip φ1 = 3.5 eV is the low one;
    // V is the sample bias, so V < 0 makes the tip positive (physics.md §0).
    const b = barrier(3.5, 4.5, 10);
    expect(bdrNormalizedConductance(b, -0.3)).toBeGreaterThan(bdrNormalizedConductance(b, 0.3));
    expect(bdrNormalizedConductance(b, 0)).toBe(1);
    const c = bdrCoefficients(b);
    expectRelClose(bdrNormalizedConductance(b, 0.5), 1 + 0.5 * c.linearPerV + 0.25 * c.quadraticPerV2, 1e-15);
  });

  it('bdrZeroBiasConductancePerArea equals Simmons’ low-voltage conductance', () => {
    // physics.md §6: Simmons low-voltage G/area at φ = 4 eV, s = 5 Å is 4.48391e-11 S/Å²
    expectRelClose(bdrZeroBiasConductancePerArea(barrier(4, 4, 5)) * 1e-20, 4.48391e-11, 1e-6);
  });
});

describe('bdrInverse', () => {
  const cases: Array<[number, number, number]> = [
    // physics.md §7 cases: (φ1, φ2, d[Å])
    [3.5, 4.5, 10],
    [3.5, 4.5, 20],
    [3, 5, 15],
  ];

  it('bdrInverse recovers φ̄, Δφ, d, φ1, φ2 from exact coefficients, whichever third datum is known', () => {
    // Closed-form inversion of BDR 1970 (algebra): round trip to rounding error
    for (const [tip, sample, width] of cases) {
      const b = barrier(tip, sample, width);
      const { linearPerV, quadraticPerV2 } = bdrCoefficients(b);
      const knowns = [{ widthM: b.widthM }, { meanBarrierEV: b.meanBarrierEV }, { zeroBiasConductanceSPerM2: bdrZeroBiasConductancePerArea(b) }];
      for (const known of knowns) {
        const result = bdrInverse({ linearPerV, quadraticPerV2, known });
        expectRelClose(result.meanBarrierEV, b.meanBarrierEV, 1e-10);
        expectRelClose(result.asymmetryEV, b.asymmetryEV, 1e-10);
        expectRelClose(result.widthM, b.widthM, 1e-10);
        expectRelClose(result.tipWorkFunctionEV, tip, 1e-10);
        expectRelClose(result.sampleWorkFunctionEV, sample, 1e-10);
      }
    }
  });

  it('bdrInverse turns the printed physics.md §7 coefficients into φ1 ≈ 3.5, φ2 ≈ 4.5 eV', () => {
    // physics.md §7: linear −0.05337 V⁻¹, quadratic 0.82021 V⁻² at 10 Å (5 digits printed ⇒ ~1e-4 in φ)
    const result = bdrInverse({ linearPerV: -0.05337, quadraticPerV2: 0.82021, known: { widthM: angstromToM(10) } });
    expectRelClose(result.meanBarrierEV, 4, 1e-4);
    expectRelClose(result.tipWorkFunctionEV, 3.5, 1e-3);
    expectRelClose(result.sampleWorkFunctionEV, 4.5, 1e-3);
  });

  it('bdrInverse rejects a non-positive curvature or an impossible conductance', () => {
    expect(() => bdrInverse({ linearPerV: 0, quadraticPerV2: -1, known: { widthM: 1e-9 } })).toThrow('bdrInverse: quadraticPerV2 must be > 0, got -1');
    expect(() => bdrInverse({ linearPerV: 0, quadraticPerV2: 0.8, known: { zeroBiasConductanceSPerM2: 1e30 } })).toThrow('too large');
  });
});
