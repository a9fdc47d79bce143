import type { Junction } from './barrierProfile.ts';
import {
  createPreparedTrapezoidPoint,
  prepareTrapezoidPoint,
  preparedPointStillValid,
  preparedTrapezoidCurrentDensity,
  type PreparedTrapezoidPoint,
} from './currentDensity.ts';

/**
 * The WKB-trapezoid current density over a fixed set of biases, for fits that evaluate the same
 * sweep hundreds of times with slowly changing parameters. Each bias keeps its prepared energy
 * layout and rebuilds it only when the parameters have moved enough to change it (see
 * preparedPointStillValid), so an evaluation costs the transmission sums alone.
 * Same physics and accuracy as trapezoidCurrentDensityWithGradient.
 * @example new TrapezoidSpectrum(biasesV, 300).evaluate(junction, currentDensity, gradient)
 */
export class TrapezoidSpectrum {
  readonly biasesV: Float64Array;
  readonly temperatureK: number;
  #points: PreparedTrapezoidPoint[];
  #gradient = new Float64Array(3);
  #rebuilds = 0;

  constructor(biasesV: Float64Array, temperatureK: number) {
    this.biasesV = Float64Array.from(biasesV);
    this.temperatureK = temperatureK;
    this.#points = Array.from(biasesV, () => createPreparedTrapezoidPoint());
  }

  /** How many layouts were (re)built so far: a cost figure for benchmarks. */
  get rebuilds(): number {
    return this.#rebuilds;
  }

  /**
   * Write J_i (A/m²) for every bias into currentDensity, and when given, ∂J_i/∂(φ1, φ2, d) into
   * gradient[3i … 3i + 2] (A/m² per eV, per eV, per m).
   */
  evaluate(junction: Junction, currentDensity: Float64Array, gradient: Float64Array | null): void {
    const point = this.#gradient;
    for (let i = 0; i < this.biasesV.length; i++) {
      const prepared = this.#points[i];
      const biasV = this.biasesV[i];
      if (!(prepared.builtDecayRatePerEV > 0) || !preparedPointStillValid(prepared, junction, biasV)) {
        prepareTrapezoidPoint(prepared, junction, biasV, this.temperatureK);
        this.#rebuilds++;
      }
      currentDensity[i] = preparedTrapezoidCurrentDensity(prepared, junction, biasV, gradient === null ? null : point);
      if (gradient !== null) {
        gradient[3 * i] = point[0];
        gradient[3 * i + 1] = point[1];
        gradient[3 * i + 2] = point[2];
      }
    }
  }
}
