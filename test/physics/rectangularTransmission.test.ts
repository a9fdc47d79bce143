import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { rectangularTransmission } from '../../src/physics/rectangularTransmission.ts';
import { ELECTRON_MASS_KG, ELEMENTARY_CHARGE_C, HBAR_J_S, WKB_DECAY_PER_M_PER_SQRT_EV } from '../../src/physics/constants.ts';
import { angstromToM } from '../../src/physics/units.ts';
import { expectRelClose } from '../helpers.ts';

const t = (energyEV: number, barrierHeightEV: number, widthAngstrom: number): number =>
  rectangularTransmission({ energyEV, barrierHeightEV, widthM: angstromToM(widthAngstrom) });

describe('rectangularTransmission', () => {
  it('rectangularTransmission(E < V0) equals the physics.md §11 check values', () => {
    // Textbook rectangular barrier (physics.md §11): E = 5 eV, V0 = 9 eV, a = 3 / 5 / 10 Å, recomputed with numpy
    expectRelClose(t(5, 9, 3), 8.412005e-3, 1e-6);
    expectRelClose(t(5, 9, 5), 1.401872e-4, 1e-6);
    expectRelClose(t(5, 9, 10), 4.975216e-9, 1e-6);
    // Textbook rectangular barrier (physics.md §11): (E, V0, a) = (1, 2, 5) and (0.5, 10, 2)
    expectRelClose(t(1, 2, 5), 2.35471198e-2, 1e-6);
    expectRelClose(t(0.5, 10, 2), 1.37615476e-3, 1e-6);
  });

  it('rectangularTransmission(E > V0) and (E = V0) equal the physics.md §11 check values', () => {
    // Textbook above-barrier case, sinh → sin (physics.md §11): (E, V0, a) = (3, 2, 5)
    expectRelClose(t(3, 2, 5), 9.08997661e-1, 1e-6);
    // Textbook E = V0 case, T = [1 + m_e V0 a²/(2ħ²)]⁻¹ (physics.md §11): (2, 2, 5)
    expectRelClose(t(2, 2, 5), 2.33598178e-1, 1e-6);
  });

  it('rectangularTransmission(E = V0) equals the E = V0 closed form and is continuous there', () => {
    const a = angstromToM(5);
    const v0J = 2 * ELEMENTARY_CHARGE_C;
    // Textbook E = V0 limit (physics.md §11): T = [1 + m_e V0 a²/(2ħ²)]⁻¹
    const atTop = 1 / (1 + (ELECTRON_MASS_KG * v0J * a * a) / (2 * HBAR_J_S * HBAR_J_S));
    expectRelClose(t(2, 2, 5), atTop, 1e-12);
    // Continuity of the closed form through E = V0 (the sinh and sin branches meet): derived, no source needed
    expectRelClose(t(2 - 1e-9, 2, 5), atTop, 1e-8);
    expectRelClose(t(2 + 1e-9, 2, 5), atTop, 1e-8);
  });

  it('rectangularTransmission tends to 16E(V0 − E)/V0² · e^{−2qa} for thick barriers', () => {
    // physics.md §11: T / e^{−2qa} → 16E(V0 − E)/V0² = 3.9506 for E = 5, V0 = 9
    const widthAngstrom = 40;
    const wkb = Math.exp(-WKB_DECAY_PER_M_PER_SQRT_EV * angstromToM(widthAngstrom) * Math.sqrt(4));
    expectRelClose(t(5, 9, widthAngstrom) / wkb, 3.9506, 1e-4);
    // physics.md §11: the WKB values e^{−2qa} at 3 / 10 Å
    expectRelClose(Math.exp(-WKB_DECAY_PER_M_PER_SQRT_EV * angstromToM(3) * 2), 2.138179e-3, 1e-6);
    expectRelClose(Math.exp(-WKB_DECAY_PER_M_PER_SQRT_EV * angstromToM(10) * 2), 1.259352e-9, 1e-6);
  });

  it('rectangularTransmission stays in [0, 1] and falls with width below the barrier', () => {
    // Probability and monotonic decay for E < V0: property of the closed form, no outside reference
    fc.assert(
      fc.property(
        fc.double({ min: 0.01, max: 20, noNaN: true }),
        fc.double({ min: -5, max: 20, noNaN: true }),
        fc.double({ min: 0.1, max: 50, noNaN: true }),
        (energy, height, width) => {
          const value = t(energy, height, width);
          expect(value).toBeGreaterThanOrEqual(0);
          expect(value).toBeLessThanOrEqual(1);
          if (height > energy) expect(t(energy, height, width * 1.5)).toBeLessThanOrEqual(value);
        },
      ),
      { seed: 20240611, numRuns: 300 },
    );
  });

  it('rectangularTransmission rejects a non-positive energy or width', () => {
    expect(() => t(0, 4, 5)).toThrow('rectangularTransmission: energyEV must be > 0 and finite, got 0');
    expect(() => t(1, 4, -5)).toThrow('rectangularTransmission: widthM must be > 0');
    expect(() => rectangularTransmission({ energyEV: 1, barrierHeightEV: Number.NaN, widthM: 1e-10 })).toThrow('barrierHeightEV must be finite');
  });
});
