import { describe, it } from 'vitest';
import { decayConstantPerM, paraboloidTipAreaM2, sphericalTipAreaM2 } from '../../src/physics/index.ts';
import { expectRelClose } from '../helpers.ts';

const angstrom = 1e-10;

describe('tip area', () => {
  it('decayConstantPerM gives κ = 0.51231672 √φ Å⁻¹', () => {
    // physics.md §1: κ = 0.51231672·√φ Å⁻¹ (CODATA 2022 m_e), φ = 4 eV → 1.02463344 Å⁻¹
    expectRelClose(decayConstantPerM(4) * angstrom, 1.02463344, 1e-8);
  });

  it('paraboloidTipAreaM2 equals πR/κ at the physics.md §9 check points', () => {
    // physics.md §9 (exact paraboloid integral, recomputed with numpy): φ = 4 eV, R = 100 / 20 / 300 Å
    expectRelClose(paraboloidTipAreaM2(100 * angstrom, 4) / angstrom ** 2, 306.6065, 1e-6);
    expectRelClose(paraboloidTipAreaM2(20 * angstrom, 4) / angstrom ** 2, 61.3213, 1e-5);
    expectRelClose(paraboloidTipAreaM2(300 * angstrom, 4) / angstrom ** 2, 919.8195, 1e-6);
    // physics.md §9: φ = 1 eV, R = 100 Å → 613.2130 Å²
    expectRelClose(paraboloidTipAreaM2(100 * angstrom, 1) / angstrom ** 2, 613.213, 1e-6);
  });

  it('sphericalTipAreaM2 has the 1 − 1/(2κR) correction', () => {
    // physics.md §9: sphere R = 100 Å, φ = 4 eV → 305.1103 Å²; R = 20 Å → 59.8251 Å²
    expectRelClose(sphericalTipAreaM2(100 * angstrom, 4) / angstrom ** 2, 305.1103, 1e-6);
    expectRelClose(sphericalTipAreaM2(20 * angstrom, 4) / angstrom ** 2, 59.8251, 1e-5);
  });
});
