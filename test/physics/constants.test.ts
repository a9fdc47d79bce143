import { describe, expect, it } from 'vitest';
import {
  APPARENT_BARRIER_PREFACTOR_EV_M2,
  BOLTZMANN_EV_PER_K,
  BOLTZMANN_J_PER_K,
  COULOMB_EV_M,
  CONDUCTANCE_QUANTUM_S,
  ELECTRON_MASS_KG,
  ELEMENTARY_CHARGE_C,
  PLANCK_J_S,
  SUPPLY_CONSTANT_A_PER_M2_PER_EV2,
  VACUUM_PERMITTIVITY_F_PER_M,
  WKB_DECAY_PER_M_PER_SQRT_EV,
} from '../../src/physics/index.ts';
import { expectRelClose } from '../helpers.ts';

describe('constants', () => {
  it('defining constants equal the exact 2019 SI values', () => {
    // SI Brochure, 9th edition (BIPM 2019): e, h, k_B exact by definition
    expect(ELEMENTARY_CHARGE_C).toBe(1.602176634e-19);
    expect(PLANCK_J_S).toBe(6.62607015e-34);
    expect(BOLTZMANN_J_PER_K).toBe(1.380649e-23);
  });

  it('electron mass and permittivity are the CODATA 2022 values', () => {
    // CODATA 2022 recommended values: m_e = 9.1093837139(28)e-31 kg, ε0 = 8.8541878188(14)e-12 F/m
    expect(ELECTRON_MASS_KG).toBe(9.1093837139e-31);
    expect(VACUUM_PERMITTIVITY_F_PER_M).toBe(8.8541878188e-12);
  });

  it('derived constants match the values recomputed from CODATA (physics.md §1)', () => {
    // CODATA 2022 (via scipy.constants), physics.md §1: G0 = 2e²/h = 7.748091729864e-5 S
    expectRelClose(CONDUCTANCE_QUANTUM_S, 7.748091729864e-5, 1e-12);
    // CODATA 2022 (via scipy.constants), physics.md §1: k_B/e = 8.617333262e-5 eV/K
    expectRelClose(BOLTZMANN_EV_PER_K, 8.617333262e-5, 1e-9);
    // physics.md §1: ħ²/8m_e = 0.95249553 eV Å² (the "≈ 0.952 eV Å²" of the apparent-barrier formula)
    expectRelClose(APPARENT_BARRIER_PREFACTOR_EV_M2 * 1e20, 0.95249553, 1e-7);
    // physics.md §1: 2√(2m_e)/ħ = 1.02463344 Å⁻¹ eV⁻½ (Simmons' printed 1.025)
    expectRelClose(WKB_DECAY_PER_M_PER_SQRT_EV * 1e-10, 1.02463344, 1e-8);
    // physics.md §1: 4π m_e e/h³ in eV units = 1.618311e14 A m⁻² eV⁻²
    expectRelClose(SUPPLY_CONSTANT_A_PER_M2_PER_EV2, 1.618311e14, 1e-6);
    // physics.md §1: e²/(4πε0) = 14.399645 eV Å
    expectRelClose(COULOMB_EV_M * 1e10, 14.399645, 1e-7);
  });

  it('the supply constant times k_B² is the Richardson constant', () => {
    // physics.md §1 (sanity check): 4π m_e e k_B²/h³ = 120.1732 A cm⁻² K⁻²
    expectRelClose(SUPPLY_CONSTANT_A_PER_M2_PER_EV2 * BOLTZMANN_EV_PER_K ** 2 * 1e-4, 120.1732, 1e-6);
  });
});
