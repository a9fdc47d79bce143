/** Public surface of the physics core: pure functions, SI inside (energies in eV), no DOM, no I/O. */
export * from './constants.ts';
export * from './units.ts';
export * from './barrierProfile.ts';
export * from './wkbExponent.ts';
export * from './quadrature.ts';
export * from './energyGrid.ts';
export * from './currentDensity.ts';
export * from './tipArea.ts';
export * from './apparentBarrier.ts';
export * from './random.ts';
export * from './simulateCurve.ts';
export * from './currentDensityModels.ts';
