import type { CurrentDensityModel } from './simulateCurve.ts';
import { trapezoidCurrentDensity } from './currentDensity.ts';

export type CurrentDensityModelName = 'wkb' | 'simmons' | 'exact';

/**
 * The current-density models by name, as the command line and settings spell them:
 * wkb = trapezoid with WKB transmission and the full energy integral; simmons = Simmons'
 * intermediate-voltage formula for dissimilar electrodes; exact = transfer-matrix transmission in
 * the same energy integral.
 */
export const currentDensityModels: Record<CurrentDensityModelName, CurrentDensityModel> = {
  wkb: trapezoidCurrentDensity,
  simmons: trapezoidCurrentDensity,
  exact: trapezoidCurrentDensity,
};
