/**
 * Physical constants in SI.
 * e, h and k_B are exact by definition in the 2019 SI (BIPM, The International System of Units,
 * 9th edition, 2019). The electron mass and vacuum permittivity are CODATA 2022 recommended values
 * (Mohr, Newell, Taylor, Tiesinga, CODATA 2022).
 */

/** Elementary charge, C (exact, SI 2019). */
export const ELEMENTARY_CHARGE_C = 1.602176634e-19;
/** Planck constant, J s (exact, SI 2019). */
export const PLANCK_J_S = 6.62607015e-34;
/** Reduced Planck constant ħ = h / 2π, J s. */
export const HBAR_J_S = PLANCK_J_S / (2 * Math.PI);
/** Boltzmann constant, J/K (exact, SI 2019). */
export const BOLTZMANN_J_PER_K = 1.380649e-23;
/** Boltzmann constant in eV/K: k_B / e ≈ 8.617333262e-5. */
export const BOLTZMANN_EV_PER_K = BOLTZMANN_J_PER_K / ELEMENTARY_CHARGE_C;
/** Electron mass, kg (CODATA 2022: 9.1093837139(28)e-31). */
export const ELECTRON_MASS_KG = 9.1093837139e-31;
/** Vacuum electric permittivity, F/m (CODATA 2022). */
export const VACUUM_PERMITTIVITY_F_PER_M = 8.8541878188e-12;

/** Conductance quantum G0 = 2e²/h, S ≈ 7.748091729864e-5. */
export const CONDUCTANCE_QUANTUM_S = (2 * ELEMENTARY_CHARGE_C * ELEMENTARY_CHARGE_C) / PLANCK_J_S;

/**
 * WKB decay prefactor 2√(2 m_e)/ħ in 1/(m·√J). Multiply by √(energy in J) and length in m.
 * In practical units it is the "1.025" of Simmons: 1.02463344 Å⁻¹ eV⁻½.
 */
export const WKB_DECAY_PER_M_PER_SQRT_J = (2 * Math.sqrt(2 * ELECTRON_MASS_KG)) / HBAR_J_S;
/** 2√(2 m_e)/ħ in 1/(m·√eV): 1.02463344e10. κ = ½·this·√φ. */
export const WKB_DECAY_PER_M_PER_SQRT_EV = WKB_DECAY_PER_M_PER_SQRT_J * Math.sqrt(ELEMENTARY_CHARGE_C);
/** ħ²/(8 m_e) in eV·m²: the apparent-barrier-height prefactor, 0.95249553 eV Å² = 9.5249553e-21 eV m². */
export const APPARENT_BARRIER_PREFACTOR_EV_M2 = (HBAR_J_S * HBAR_J_S) / (8 * ELECTRON_MASS_KG) / ELEMENTARY_CHARGE_C;
/**
 * Free-electron supply constant 4π m_e e / h³ with energies in eV: J = this × ∫ D N dE (eV²) gives A/m².
 * ≈ 1.618311e14 A m⁻² eV⁻² (Simmons 1963, eq. 1; the Richardson constant divided by k_B²).
 */
export const SUPPLY_CONSTANT_A_PER_M2_PER_EV2 =
  ((4 * Math.PI * ELECTRON_MASS_KG * ELEMENTARY_CHARGE_C) / PLANCK_J_S ** 3) * ELEMENTARY_CHARGE_C ** 2;
/** e²/(4π ε0) in eV·m: 14.399645 eV Å = 1.4399645e-9 eV m (image-potential strength). */
export const COULOMB_EV_M = ELEMENTARY_CHARGE_C / (4 * Math.PI * VACUUM_PERMITTIVITY_F_PER_M);
