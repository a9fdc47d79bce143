/**
 * Solver speed and accuracy at a glance.
 *  1. Median µs per fit of a 512-point, 4-parameter sum of two exponentials
 *     y = a1·exp(−k1·x) + a2·exp(−k2·x) with seeded noise, analytic Jacobian, one reused workspace
 *     (the app fits 16,384 such curves; the target is ≤ 10 ms per curve including the model).
 *     Also the same fit through fitModel, and with central differences instead of the Jacobian.
 *  2. NIST StRD digits (LRE) for all 22 data sets from both starts, with the model compiled from
 *     models.json's formula and a Richardson finite-difference Jacobian (the test suite checks the
 *     same sets with exact derivatives).
 * Run: npx tsx bench/run.ts solver
 */
import { readFileSync } from 'node:fs';
import { createSolver, fitModel, gaussian, levenbergMarquardt, makeParameters, mulberry32 } from '../src/fit/index.ts';
import type { LeastSquaresProblem } from '../src/fit/index.ts';
import { medianMs } from './timing.ts';

const N_POINTS = 512;
const TRUE_PARAMS = [3, 1.3, 1, 0.25];

interface Curve {
  x: Float64Array;
  y: Float64Array;
}

function makeCurves(count: number, seed: number): Curve[] {
  const rng = mulberry32(seed);
  const curves: Curve[] = [];
  for (let c = 0; c < count; c++) {
    const x = new Float64Array(N_POINTS);
    const y = new Float64Array(N_POINTS);
    for (let i = 0; i < N_POINTS; i++) {
      x[i] = (5 * i) / (N_POINTS - 1);
      const [a1, k1, a2, k2] = TRUE_PARAMS;
      y[i] = a1 * Math.exp(-k1 * x[i]) + a2 * Math.exp(-k2 * x[i]) + 0.01 * gaussian(rng);
    }
    curves.push({ x, y });
  }
  return curves;
}

function twoExponentialProblem(curve: Curve, withJacobian: boolean): LeastSquaresProblem {
  const { x, y } = curve;
  return {
    nParams: 4,
    nResiduals: N_POINTS,
    residuals(p, out) {
      for (let i = 0; i < N_POINTS; i++) out[i] = y[i] - (p[0] * Math.exp(-p[1] * x[i]) + p[2] * Math.exp(-p[3] * x[i]));
    },
    jacobian: withJacobian
      ? (p, out) => {
          for (let i = 0; i < N_POINTS; i++) {
            const e1 = Math.exp(-p[1] * x[i]);
            const e2 = Math.exp(-p[3] * x[i]);
            const row = i * 4;
            out[row] = -e1;
            out[row + 1] = p[0] * x[i] * e1;
            out[row + 2] = -e2;
            out[row + 3] = p[2] * x[i] * e2;
          }
        }
      : undefined,
  };
}

const START = [2, 2, 1.5, 0.1];

function benchTiming(): void {
  const curves = makeCurves(64, 2024);
  const solver = createSolver(4, N_POINTS);
  const problems = curves.map((curve) => twoExponentialProblem(curve, true));
  const problemsFd = curves.map((curve) => twoExponentialProblem(curve, false));
  let failures = 0;
  let iterations = 0;
  const runAnalytic = (): void => {
    for (const problem of problems) {
      const result = solver.solve(problem, START);
      if (!result.converged) failures++;
      iterations += result.iterations;
    }
  };
  const analyticMs = medianMs(runAnalytic, 15, 3) / curves.length;
  const meanIterations = iterations / (18 * curves.length);

  const runFiniteDifference = (): void => {
    for (const problem of problemsFd) solver.solve(problem, START, { jacobianMethod: 'central' });
  };
  const finiteDifferenceMs = medianMs(runFiniteDifference, 7, 1) / curves.length;

  const parameters = makeParameters([
    { name: 'amplitudeFast', value: START[0], min: 0 },
    { name: 'decayFastPerNm', value: START[1], min: 0 },
    { name: 'amplitudeSlow', value: START[2], min: 0 },
    { name: 'decaySlowPerNm', value: START[3], min: 0 },
  ]);
  const runFitModel = (): void => {
    for (const curve of curves) {
      const { x, y } = curve;
      fitModel({
        parameters,
        nPoints: N_POINTS,
        measured: y,
        solver,
        evaluate(p, out) {
          for (let i = 0; i < N_POINTS; i++) out[i] = p[0] * Math.exp(-p[1] * x[i]) + p[2] * Math.exp(-p[3] * x[i]);
        },
        jacobian(p, out) {
          for (let i = 0; i < N_POINTS; i++) {
            const e1 = Math.exp(-p[1] * x[i]);
            const e2 = Math.exp(-p[3] * x[i]);
            const row = i * 4;
            out[row] = e1;
            out[row + 1] = -p[0] * x[i] * e1;
            out[row + 2] = e2;
            out[row + 3] = -p[2] * x[i] * e2;
          }
        },
      });
    }
  };
  const fitModelMs = medianMs(runFitModel, 15, 3) / curves.length;

  console.log(`two-exponential fit, ${N_POINTS} points × 4 parameters, ${curves.length} curves per run`);
  console.log(`  solver, analytic Jacobian, reused workspace: ${(analyticMs * 1000).toFixed(0)} µs per fit (median), ${meanIterations.toFixed(1)} iterations, ${failures} not converged`);
  console.log(`  fitModel (bounds, names, covariance):        ${(fitModelMs * 1000).toFixed(0)} µs per fit`);
  console.log(`  solver, central differences:                 ${(finiteDifferenceMs * 1000).toFixed(0)} µs per fit`);
  console.log(`  16,384 curves at the analytic rate: ${((analyticMs * 16384) / 1000).toFixed(1)} s on one core (target ≤ 10 ms per curve)`);
}

interface NistEntry {
  name: string;
  file: string;
  difficulty: string;
  formula: string;
  response: string;
  parameters: string[];
  data_columns: string[];
  data_lines: [number, number];
  start1: number[];
  start2: number[];
  certified_values: number[];
  certified_std_dev: number[];
  certified_rss: number;
}

function logRelativeError(actual: number, expected: number): number {
  if (!Number.isFinite(actual)) return 0;
  if (actual === expected) return 11;
  const relative = expected === 0 ? Math.abs(actual) : Math.abs(actual - expected) / Math.abs(expected);
  return Math.max(0, Math.min(11, -Math.log10(relative)));
}

function benchNist(): void {
  // shared/ sits beside the repository: <repo>/../shared/reference-data/nist-strd/
  const folder = new URL('../../shared/reference-data/nist-strd/', import.meta.url);
  const models = JSON.parse(readFileSync(new URL('models.json', folder), 'utf8')) as { datasets: NistEntry[] };
  console.log('\nNIST StRD, Richardson differences: worst LRE of parameters / standard deviations / RSS, status');
  console.log(`  ${'data set'.padEnd(9)} ${'level'.padEnd(8)} ${'Start 1'.padEnd(34)} Start 2`);
  for (const entry of models.datasets) {
    const lines = readFileSync(new URL(entry.file, folder), 'utf8').split(/\r?\n/);
    const rows: number[][] = [];
    for (let line = entry.data_lines[0]; line <= entry.data_lines[1]; line++) {
      rows.push(lines[line - 1].trim().split(/\s+/).map(Number));
    }
    const mathNames = 'const {exp,log,sqrt,sin,cos,atan,PI:pi}=Math; return ';
    const model = new Function(...entry.parameters, ...entry.data_columns, mathNames + entry.formula) as (...values: number[]) => number;
    const response = new Function(...entry.data_columns, mathNames + entry.response) as (...values: number[]) => number;
    const observed = rows.map((row) => response(...row));
    const problem: LeastSquaresProblem = {
      nParams: entry.parameters.length,
      nResiduals: rows.length,
      residuals(p, out) {
        const values = Array.from(p);
        for (let i = 0; i < rows.length; i++) out[i] = observed[i] - model(...values, ...rows[i]);
      },
    };
    const cells: string[] = [];
    for (const start of [entry.start1, entry.start2]) {
      const result = levenbergMarquardt(problem, start, { jacobianMethod: 'richardson', parameterNames: entry.parameters });
      const params = Math.min(...entry.certified_values.map((c, j) => logRelativeError(result.params[j], c)));
      const deviations = Math.min(...entry.certified_std_dev.map((c, j) => logRelativeError(result.stderr[j], c)));
      const rss = logRelativeError(result.chiSquare, entry.certified_rss);
      cells.push(`${params.toFixed(1).padStart(4)} / ${deviations.toFixed(1).padStart(4)} / ${rss.toFixed(1).padStart(4)} ${result.status.padEnd(15)}`);
    }
    console.log(`  ${entry.name.padEnd(9)} ${entry.difficulty.padEnd(8)} ${cells.join(' ')}`);
  }
}

export default async function (): Promise<void> {
  benchTiming();
  benchNist();
}
