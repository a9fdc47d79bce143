import type { CurrentDensityModel } from './simulateCurve.ts';
import { trapezoidCurrentDensity } from './currentDensity.ts';
import { simmonsDissimilarCurrentDensity } from './simmons.ts';
import { exactCurrentDensity } from './transferMatrix.ts';

export type CurrentDensityModelName = 'wkb' | 'simmons' | 'exact';

/**
 * The current-density models by name, as the command line and settings spell them (A/m²):
 * - wkb: the bias-tilted trapezoid, WKB transmission, full energy integral (currentDensity.ts);
 * - simmons: Simmons' intermediate-voltage formula with the dissimilar-electrode φ̄, Δs and β
 *   (J. G. Simmons, J. Appl. Phys. 34, 1793 and 2581 (1963));
 * - exact: the same energy integral with the transfer-matrix transmission (transferMatrix.ts).
 */
export const currentDensityModels: Record<CurrentDensityModelName, CurrentDensityModel> = {
  wkb: trapezoidCurrentDensity,
  simmons: (junction, biasV) => simmonsDissimilarCurrentDensity(junction, biasV, { useBeta: true }),
  exact: (junction, biasV, temperatureK) => exactCurrentDensity(junction, biasV, temperatureK).currentDensityAPerM2,
};
