/**
 * Cost of one WKB-trapezoid current-density evaluation at 300 K, per bias point, and of a 512-point
 * curve. Target: ≤ 2 µs per point (≤ 1 ms per 512-point curve) on one core.
 */
import { trapezoidCurrentDensity, trapezoidCurrentDensityWithGradient, type Junction } from '../src/physics/index.ts';
import { medianMs } from './timing.ts';

const points = 512;
const biases = new Float64Array(points);
for (let i = 0; i < points; i++) biases[i] = -1 + (2 * i) / (points - 1) + 1e-6;

function curve(junction: Junction, temperatureK: number, withGradient: boolean): number {
  const gradient = new Float64Array(3);
  let sum = 0;
  for (let i = 0; i < points; i++) {
    sum += withGradient
      ? trapezoidCurrentDensityWithGradient(junction, biases[i], temperatureK, gradient)
      : trapezoidCurrentDensity(junction, biases[i], temperatureK);
  }
  return sum;
}

export default async function physicsBench(): Promise<void> {
  const cases: [string, Junction, number, boolean][] = [
    ['WKB trapezoid 4.5/4.5 eV, 0.8 nm, 300 K', { tipWorkFunctionEV: 4.5, sampleWorkFunctionEV: 4.5, gapM: 8e-10, fermiEnergyEV: 5.5 }, 300, false],
    ['WKB trapezoid 3.8/4.6 eV, 1.2 nm, 300 K', { tipWorkFunctionEV: 3.8, sampleWorkFunctionEV: 4.6, gapM: 1.2e-9, fermiEnergyEV: 5.5 }, 300, false],
    ['  same, with the 3-parameter gradient', { tipWorkFunctionEV: 3.8, sampleWorkFunctionEV: 4.6, gapM: 1.2e-9, fermiEnergyEV: 5.5 }, 300, true],
    ['WKB trapezoid 4.5/4.5 eV, 0.8 nm, 4.2 K', { tipWorkFunctionEV: 4.5, sampleWorkFunctionEV: 4.5, gapM: 8e-10, fermiEnergyEV: 5.5 }, 4.2, false],
    ['WKB trapezoid 4.5/4.5 eV, 2.0 nm, 300 K (full Fermi grid)', { tipWorkFunctionEV: 4.5, sampleWorkFunctionEV: 4.5, gapM: 2e-9, fermiEnergyEV: 5.5 }, 300, false],
  ];
  console.log('case'.padEnd(60), 'ns/point'.padStart(9), 'ms/512-pt curve'.padStart(16));
  for (const [name, junction, temperatureK, withGradient] of cases) {
    const ms = medianMs(() => curve(junction, temperatureK, withGradient), 41, 5);
    console.log(name.padEnd(60), ((ms * 1e6) / points).toFixed(0).padStart(9), ms.toFixed(3).padStart(16));
  }
  console.log('target: <= 2000 ns/point, <= 1 ms per 512-point curve (one core)');
}
