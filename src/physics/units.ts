/**
 * The one place where practical units meet SI. Inside physics/ everything is SI except energies,
 * which stay in eV (so eV·V arithmetic is plain addition); lengths are metres, currents amperes.
 * Conversions divide or multiply by exactly representable powers of ten (1e9, 1e10, 1e18), so a
 * value in nm goes to m and back unchanged.
 */

export const nmToM = (nm: number): number => nm / 1e9;
export const mToNm = (m: number): number => m * 1e9;
export const angstromToM = (a: number): number => a / 1e10;
export const mToAngstrom = (m: number): number => m * 1e10;
export const nm2ToM2 = (nm2: number): number => nm2 / 1e18;
export const m2ToNm2 = (m2: number): number => m2 * 1e18;
export const nAToA = (nA: number): number => nA / 1e9;
export const aToNA = (a: number): number => a * 1e9;
/** 1 A/cm² = 1e4 A/m². */
export const aPerCm2ToAPerM2 = (j: number): number => j * 1e4;
export const aPerM2ToAPerCm2 = (j: number): number => j / 1e4;
