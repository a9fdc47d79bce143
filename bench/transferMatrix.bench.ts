/**
 * Cost of the exact (transfer-matrix) path: one transmission, one current-density bias point.
 * Reference case: trapezoid 4 → 3 eV over 10 Å (φ1 = φ2 = 4 eV, E_F = 5 eV, V = 1 V, E = E_F), the
 * physics.md §11 check.
 */
import { medianMs } from './timing.ts';
import { exactCurrentDensity, transferMatrixTransmission } from '../src/physics/transferMatrix.ts';
import { imageRoundedProfile } from '../src/physics/imagePotential.ts';
import { trapezoidProfile, type Junction } from '../src/physics/barrierProfile.ts';

const format = (ms: number): string => (ms >= 1 ? `${ms.toFixed(2)} ms` : `${(ms * 1000).toFixed(1)} µs`);

export default async function (): Promise<void> {
  const junction: Junction = { tipWorkFunctionEV: 4, sampleWorkFunctionEV: 4, gapM: 1e-9, fermiEnergyEV: 5 };
  const profile = trapezoidProfile(junction, 1, 1);
  const converged = transferMatrixTransmission(profile, 5);
  const loops = 200;

  const convergedMs = medianMs(() => {
    for (let i = 0; i < loops; i++) transferMatrixTransmission(profile, 5);
  }) / loops;
  const fixedMs = medianMs(() => {
    // The trapezoid is one sample interval, so slices per interval = slices.
    for (let i = 0; i < loops; i++) transferMatrixTransmission(profile, 5, { fixedSlicesPerInterval: converged.slices });
  }) / loops;
  console.log(`transmission, trapezoid 4 → 3 eV, 10 Å: T = ${converged.transmission.toExponential(6)}, ${converged.slices} slices, est. error ${converged.estimatedRelativeError.toExponential(1)}`);
  console.log(`  converged call (doubling + Richardson): ${format(convergedMs)} median`);
  console.log(`  one evaluation at ${converged.slices} slices:      ${format(fixedMs)} median (${((fixedMs * 1e6) / converged.slices).toFixed(1)} ns per slice)`);

  const stm: Junction = { ...junction, fermiEnergyEV: 5.5 };
  const points: Array<[string, Junction | ReturnType<typeof imageRoundedProfile>, number, number]> = [
    ['trapezoid 4 eV, 10 Å, 0.1 V, 0 K', stm, 0.1, 0],
    ['trapezoid 4 eV, 10 Å, 1 V, 300 K', stm, 1, 300],
    ['image-rounded (400 intervals), 10 Å, 0.1 V, 0 K', imageRoundedProfile(stm, 0.1), 0.1, 0],
  ];
  for (const [label, barrier, bias, temperature] of points) {
    let result = exactCurrentDensity(barrier, bias, temperature);
    const ms = medianMs(() => {
      result = exactCurrentDensity(barrier, bias, temperature);
    }, 11, 2);
    console.log(
      `exactCurrentDensity, ${label}: ${format(ms)} median per bias point ` +
        `(J = ${result.currentDensityAPerM2.toExponential(5)} A/m², ${result.evaluations} transmissions, ${result.slices} slices, est. error ${result.estimatedRelativeError.toExponential(1)})`,
    );
  }
}
