import { levenbergMarquardt as mlLevenbergMarquardt } from 'ml-levenberg-marquardt';
import { describe, expect, it } from 'vitest';
import {
  createSolver,
  gaussian,
  levenbergMarquardt,
  mulberry32,
  SOLVER_STATUS,
  type LeastSquaresProblem,
  type SolverStatus,
} from '../../src/fit/index.ts';
import { expectRelClose } from '../helpers.ts';

/** y = amplitude · exp(−rate · x) sampled at x, with residual y − model and its exact Jacobian. */
function decayProblem(x: Float64Array, y: Float64Array, withJacobian = true): LeastSquaresProblem {
  return {
    nParams: 2,
    nResiduals: x.length,
    residuals(p, out) {
      for (let i = 0; i < x.length; i++) out[i] = y[i] - p[0] * Math.exp(-p[1] * x[i]);
    },
    jacobian: withJacobian
      ? (p, out) => {
          for (let i = 0; i < x.length; i++) {
            const decay = Math.exp(-p[1] * x[i]);
            out[2 * i] = -decay;
            out[2 * i + 1] = p[0] * x[i] * decay;
          }
        }
      : undefined,
  };
}

/** Seeded synthetic decay: amplitude 5, rate 0.8 on x = 0 … 5, Gaussian noise σ = 0.05. */
function syntheticDecay(seed: number, nPoints = 60): { x: Float64Array; y: Float64Array } {
  const rng = mulberry32(seed);
  const x = new Float64Array(nPoints);
  const y = new Float64Array(nPoints);
  for (let i = 0; i < nPoints; i++) {
    x[i] = (5 * i) / (nPoints - 1);
    y[i] = 5 * Math.exp(-0.8 * x[i]) + 0.05 * gaussian(rng);
  }
  return { x, y };
}

/** Straight line y = intercept + slope · x as a least-squares problem (exact Jacobian). */
function lineProblem(x: number[], y: number[]): LeastSquaresProblem {
  return {
    nParams: 2,
    nResiduals: x.length,
    residuals(p, out) {
      for (let i = 0; i < x.length; i++) out[i] = y[i] - (p[0] + p[1] * x[i]);
    },
    jacobian(_p, out) {
      for (let i = 0; i < x.length; i++) {
        out[2 * i] = -1;
        out[2 * i + 1] = -x[i];
      }
    },
  };
}

describe('levenbergMarquardt on problems with a known answer', () => {
  it('levenbergMarquardt(line) equals the closed-form regression, with its covariance', () => {
    const x = [0, 1, 2, 3, 4, 5, 6];
    const y = [1.1, 2.9, 5.2, 7.1, 8.8, 11.2, 13.1];
    const result = levenbergMarquardt(lineProblem(x, y), [0, 0]);
    const n = x.length;
    const meanX = x.reduce((a, b) => a + b) / n;
    const meanY = y.reduce((a, b) => a + b) / n;
    let sxx = 0;
    let sxy = 0;
    for (let i = 0; i < n; i++) {
      sxx += (x[i] - meanX) ** 2;
      sxy += (x[i] - meanX) * (y[i] - meanY);
    }
    const slope = sxy / sxx;
    const intercept = meanY - slope * meanX;
    let rss = 0;
    for (let i = 0; i < n; i++) rss += (y[i] - intercept - slope * x[i]) ** 2;
    const s2 = rss / (n - 2);
    expect(result.converged).toBe(true);
    // Ordinary least-squares line, closed form: slope = Sxy/Sxx, intercept = ȳ − slope·x̄ (common practice, no source)
    expectRelClose(result.params[1], slope, 1e-12);
    expectRelClose(result.params[0], intercept, 1e-12);
    expectRelClose(result.chiSquare, rss, 1e-12);
    // var(slope) = s²/Sxx, var(intercept) = s²(1/n + x̄²/Sxx), cov = −x̄ s²/Sxx (common practice, no source)
    expectRelClose(result.covariance[3], s2 / sxx, 1e-10);
    expectRelClose(result.covariance[0], s2 * (1 / n + (meanX * meanX) / sxx), 1e-10);
    expectRelClose(result.covariance[1], (-meanX * s2) / sxx, 1e-10);
    expectRelClose(result.covariance[2], result.covariance[1], 1e-14);
    expectRelClose(result.stderr[1], Math.sqrt(s2 / sxx), 1e-10);
    expectRelClose(result.correlation[1], result.covariance[1] / (result.stderr[0] * result.stderr[1]), 1e-12);
    expect(result.correlation[0]).toBe(1);
    expect(result.nFree).toBe(2);
    expect(result.nPoints).toBe(7);
    expectRelClose(result.reducedChiSquare, s2, 1e-12);
    // lmfit's definitions (from memory): aic = n ln(χ²/n) + 2p, bic = n ln(χ²/n) + p ln n
    expectRelClose(result.aic, n * Math.log(rss / n) + 4, 1e-10);
    expectRelClose(result.bic, n * Math.log(rss / n) + 2 * Math.log(n), 1e-10);
    expect(result.uncertaintiesOk).toBe(true);
    expect(result.uncertaintyNote).toBe('');
  });

  it('levenbergMarquardt agrees with ml-levenberg-marquardt on a seeded exponential decay', () => {
    const { x, y } = syntheticDecay(7);
    const ours = levenbergMarquardt(decayProblem(x, y), [4, 1]);
    const theirs = mlLevenbergMarquardt(
      { x: Array.from(x), y: Array.from(y) },
      ([amplitude, rate]: number[]) => (t: number) => amplitude * Math.exp(-rate * t),
      {
        initialValues: [4, 1],
        jacobianFunction: ([amplitude, rate]: number[]) => (t: number) => [Math.exp(-rate * t), -amplitude * t * Math.exp(-rate * t)],
        damping: 1e-2,
        maxIterations: 2000,
        errorTolerance: 0,
        improvementThreshold: 1e-3,
      },
    );
    expect(ours.converged).toBe(true);
    // ml-levenberg-marquardt 5.1.0 (npm), an independent general-purpose LM implementation
    expectRelClose(ours.params[0], theirs.parameterValues[0], 1e-6);
    expectRelClose(ours.params[1], theirs.parameterValues[1], 1e-6);
    expectRelClose(ours.chiSquare, theirs.parameterError, 1e-6);
    // the fit is near the generating values, amplitude 5 and rate 0.8, within 3σ
    expect(Math.abs(ours.params[0] - 5)).toBeLessThanOrEqual(3 * ours.stderr[0]);
    expect(Math.abs(ours.params[1] - 0.8)).toBeLessThanOrEqual(3 * ours.stderr[1]);
  });

  it('levenbergMarquardt reaches the same optimum with exact, central, forward and Richardson Jacobians', () => {
    const { x, y } = syntheticDecay(11);
    const exact = levenbergMarquardt(decayProblem(x, y), [1, 2]);
    for (const jacobianMethod of ['forward', 'central', 'richardson'] as const) {
      const approximate = levenbergMarquardt(decayProblem(x, y, false), [1, 2], { jacobianMethod });
      expect(approximate.converged, jacobianMethod).toBe(true);
      expectRelClose(approximate.params[0], exact.params[0], 1e-7);
      expectRelClose(approximate.params[1], exact.params[1], 1e-7);
      expectRelClose(approximate.stderr[1], exact.stderr[1], jacobianMethod === 'forward' ? 1e-4 : 1e-6);
    }
  });
});

describe('levenbergMarquardt with box bounds', () => {
  it('never evaluates outside the box and reports a parameter stuck at its bound', () => {
    const { x, y } = syntheticDecay(3);
    const base = decayProblem(x, y);
    const lower = [0, 0];
    const upper = [10, 0.5]; // the best rate, 0.8, lies outside
    const outside: number[][] = [];
    const problem: LeastSquaresProblem = {
      ...base,
      residuals(p, out) {
        if (p[0] < lower[0] || p[0] > upper[0] || p[1] < lower[1] || p[1] > upper[1]) outside.push(Array.from(p));
        base.residuals(p, out);
      },
    };
    for (const jacobian of ['exact', 'central'] as const) {
      const result = levenbergMarquardt(jacobian === 'exact' ? problem : { ...problem, jacobian: undefined }, [1, 0.1], {
        lower,
        upper,
        parameterNames: ['amplitude', 'rate'],
      });
      expect(outside, jacobian).toEqual([]);
      expect(result.params[1]).toBe(0.5);
      expect(result.atBound).toEqual([null, 'upper']);
      expect(result.status).toBe('stuck-at-bound');
      expect(result.converged).toBe(true);
      expect(result.message).toContain('rate at its upper bound 0.5');
      expect(result.uncertaintiesOk).toBe(false);
      expect(result.uncertaintyNote).toContain('rate at its upper bound');
      expect(Number.isNaN(result.stderr[1])).toBe(true);
      expect(result.stderr[0]).toBeGreaterThan(0);
      // With the rate held at 0.5 the amplitude is linear: its optimum is Σ y e / Σ e² (common practice, no source)
      let numerator = 0;
      let denominator = 0;
      for (let i = 0; i < x.length; i++) {
        const decay = Math.exp(-0.5 * x[i]);
        numerator += y[i] * decay;
        denominator += decay * decay;
      }
      expectRelClose(result.params[0], numerator / denominator, 1e-9);
    }
  });

  it('gives the unbounded answer when the bounds are not active', () => {
    const { x, y } = syntheticDecay(5);
    const free = levenbergMarquardt(decayProblem(x, y), [4, 1]);
    const boxed = levenbergMarquardt(decayProblem(x, y), [4, 1], { lower: [0, 0.1], upper: [100, 10] });
    expect(boxed.status).not.toBe('stuck-at-bound');
    expect(boxed.atBound).toEqual([null, null]);
    expectRelClose(boxed.params[0], free.params[0], 1e-10);
    expectRelClose(boxed.params[1], free.params[1], 1e-10);
    expect(boxed.uncertaintiesOk).toBe(true);
  });

  it('moves off a bound it starts on when the gradient points inside', () => {
    const { x, y } = syntheticDecay(5);
    const result = levenbergMarquardt(decayProblem(x, y), [4, 0.1], { lower: [0, 0.1], upper: [100, 10] });
    expect(result.converged).toBe(true);
    expect(result.atBound).toEqual([null, null]);
    expectRelClose(result.params[1], 0.8, 0.05);
  });

  it('throws when the start lies outside the box or the bounds are crossed', () => {
    const { x, y } = syntheticDecay(5);
    expect(() => levenbergMarquardt(decayProblem(x, y), [4, 2], { upper: [10, 1] })).toThrow(
      'levenbergMarquardt: start[1] (p1) must be within [-Infinity, 1], got 2',
    );
    expect(() => levenbergMarquardt(decayProblem(x, y), [4, 1], { lower: [0, 3], upper: [10, 1] })).toThrow(
      'levenbergMarquardt: lower[1] must be < upper[1] (p1), got lower 3, upper 1',
    );
    expect(() => levenbergMarquardt(decayProblem(x, y), [4, 1], { lower: [0] })).toThrow(
      'levenbergMarquardt: lower must have 2 entries, got 1',
    );
  });
});

describe('levenbergMarquardt status and uncertainty reporting', () => {
  it('reports a rank-deficient Jacobian as singular and names the parameters', () => {
    // model (a + b)·x: only the sum is determined
    const x = [1, 2, 3, 4, 5];
    const y = [2.1, 3.9, 6.2, 7.8, 10.1];
    const problem: LeastSquaresProblem = {
      nParams: 2,
      nResiduals: 5,
      residuals(p, out) {
        for (let i = 0; i < 5; i++) out[i] = y[i] - (p[0] + p[1]) * x[i];
      },
      jacobian(_p, out) {
        for (let i = 0; i < 5; i++) {
          out[2 * i] = -x[i];
          out[2 * i + 1] = -x[i];
        }
      },
    };
    const result = levenbergMarquardt(problem, [1, 0.5], { parameterNames: ['slopeA', 'slopeB'] });
    expect(result.status).toBe('singular');
    expect(result.converged).toBe(false);
    expect(result.uncertaintiesOk).toBe(false);
    expect(result.uncertaintyNote).toMatch(/slope[AB] is a linear combination of the others/);
    expect(result.message.startsWith(SOLVER_STATUS.singular.message)).toBe(true);
    expect(Number.isNaN(result.stderr[0])).toBe(true);
    // the determined combination is still fitted: Σxy/Σx² (common practice, no source)
    expectRelClose(result.params[0] + result.params[1], 110.2 / 55, 1e-10);
  });

  it('reports a parameter with no effect as singular, naming it and saying it is at its start', () => {
    const problem: LeastSquaresProblem = {
      nParams: 2,
      nResiduals: 4,
      residuals(p, out) {
        for (let i = 0; i < 4; i++) out[i] = i + 0.1 * (i % 2) - p[0] * i;
      },
    };
    const result = levenbergMarquardt(problem, [0.5, 3], { parameterNames: ['gain', 'unused'] });
    expect(result.status).toBe('singular');
    expect(result.uncertaintyNote).toContain('unused has no effect on the residuals (zero Jacobian column) (still at its start value)');
    expect(result.message).toContain('unused');
  });

  it('flags an ill-conditioned Jacobian, naming the nearly dependent parameters', () => {
    // model a·x + b·(x + δx²): the two columns differ only by δx², so cond(J) grows like 1/δ
    const x = [1, 2, 3, 4, 5, 6];
    const y = [2.1, 3.9, 6.2, 7.8, 10.1, 12.2];
    const nearlyDependent = (delta: number): LeastSquaresProblem => ({
      nParams: 2,
      nResiduals: 6,
      residuals(p, out) {
        for (let i = 0; i < 6; i++) out[i] = y[i] - (p[0] * x[i] + p[1] * (x[i] + delta * x[i] * x[i]));
      },
      jacobian(_p, out) {
        for (let i = 0; i < 6; i++) {
          out[2 * i] = -x[i];
          out[2 * i + 1] = -(x[i] + delta * x[i] * x[i]);
        }
      },
    });
    const options = { parameterNames: ['gainA', 'gainB'], illConditionLimit: 1e10 };
    const flagged = levenbergMarquardt(nearlyDependent(1e-11), [1, 1], options);
    expect(flagged.converged).toBe(true);
    expect(flagged.conditionNumber).toBeGreaterThan(1e10);
    expect(flagged.uncertaintiesOk).toBe(false);
    expect(flagged.uncertaintyNote).toMatch(/^JᵀJ is ill-conditioned .*nearly dependent: (gainA, gainB|gainB, gainA)$/);
    expect(Number.isFinite(flagged.stderr[0])).toBe(true);
    const fine = levenbergMarquardt(nearlyDependent(1e-2), [1, 1], options);
    expect(fine.uncertaintiesOk).toBe(true);
    expect(fine.conditionNumber).toBeLessThan(1e10);
  });

  it('has one message table covering every status', () => {
    const statuses: SolverStatus[] = [
      'converged-ftol',
      'converged-xtol',
      'converged-gtol',
      'converged-zero-residual',
      'max-iterations',
      'max-evaluations',
      'singular',
      'stuck-at-bound',
      'non-finite',
    ];
    expect(Object.keys(SOLVER_STATUS).sort()).toEqual([...statuses].sort());
    for (const status of statuses) {
      expect(SOLVER_STATUS[status].message.length, status).toBeGreaterThan(10);
      expect(SOLVER_STATUS[status].converged, status).toBe(status.startsWith('converged') || status === 'stuck-at-bound');
    }
  });

  it('stops on each tolerance with its own status', () => {
    const { x, y } = syntheticDecay(9);
    const run = (options: object) => levenbergMarquardt(decayProblem(x, y), [1, 2], options);
    const byGradient = run({ gradientTolerance: 1e-2, functionTolerance: 0, stepTolerance: 0 });
    expect(byGradient.status).toBe('converged-gtol');
    expect(byGradient.message).toBe(SOLVER_STATUS['converged-gtol'].message);
    const byStep = run({ stepTolerance: 1e-3, functionTolerance: 0, gradientTolerance: 0 });
    expect(byStep.status).toBe('converged-xtol');
    const byFunction = run({ functionTolerance: 1e-4, stepTolerance: 0, gradientTolerance: 0 });
    expect(byFunction.status).toBe('converged-ftol');
    expect(byFunction.converged).toBe(true);
  });

  it('reports max-iterations and max-evaluations as not converged', () => {
    const { x, y } = syntheticDecay(9);
    const iterations = levenbergMarquardt(decayProblem(x, y), [1, 2], { maxIterations: 2 });
    expect(iterations.status).toBe('max-iterations');
    expect(iterations.converged).toBe(false);
    expect(iterations.iterations).toBe(2);
    expect(iterations.message).toBe(SOLVER_STATUS['max-iterations'].message);
    expect(iterations.uncertaintiesOk).toBe(false);
    const evaluations = levenbergMarquardt(decayProblem(x, y), [1, 2], { maxEvaluations: 3 });
    expect(evaluations.status).toBe('max-evaluations');
    expect(evaluations.nEvaluations).toBe(3);
    expect(evaluations.converged).toBe(false);
  });

  it('reports non-finite residuals at the start without throwing', () => {
    const problem: LeastSquaresProblem = {
      nParams: 1,
      nResiduals: 3,
      residuals(p, out) {
        for (let i = 0; i < 3; i++) out[i] = Math.log(p[0]) - i;
      },
    };
    const result = levenbergMarquardt(problem, [-1], { parameterNames: ['scale'] });
    expect(result.status).toBe('non-finite');
    expect(result.converged).toBe(false);
    expect(result.message).toBe(`${SOLVER_STATUS['non-finite'].message}: at scale = -1`);
  });

  it('steps back from a region where the model is not finite', () => {
    // sqrt(p) model; the first Gauss–Newton step from 4 overshoots below 0 for this data
    const y = [0.05, 0.1, 0.08];
    let nonFiniteTrials = 0;
    const problem: LeastSquaresProblem = {
      nParams: 1,
      nResiduals: 3,
      residuals(p, out) {
        if (p[0] < 0) nonFiniteTrials++;
        for (let i = 0; i < 3; i++) out[i] = y[i] - Math.sqrt(p[0]);
      },
    };
    const result = levenbergMarquardt(problem, [4]);
    expect(nonFiniteTrials).toBeGreaterThan(0);
    expect(result.converged).toBe(true);
    const mean = (0.05 + 0.1 + 0.08) / 3;
    // least squares of a constant is the mean, so sqrt(p) = mean (common practice, no source)
    expectRelClose(result.params[0], mean * mean, 1e-9);
  });

  it('stops with converged-zero-residual on an exact fit', () => {
    const x = [1, 2, 3, 4];
    const problem = lineProblem(x, x.map((value) => 0.5 + 2 * value));
    const result = levenbergMarquardt(problem, [0, 0], { zeroResidualTolerance: 1e-12 });
    expect(result.status).toBe('converged-zero-residual');
    expect(result.converged).toBe(true);
    expectRelClose(result.params[1], 2, 1e-12);
  });

  it('throws on caller mistakes, naming the function, argument and value', () => {
    const { x, y } = syntheticDecay(1);
    expect(() => createSolver(0, 5)).toThrow('createSolver: nParams must be an integer ≥ 1, got 0');
    expect(() => createSolver(3, 2)).toThrow('createSolver: nResiduals must be an integer ≥ nParams (3), got 2');
    expect(() => levenbergMarquardt(decayProblem(x, y), [1])).toThrow('levenbergMarquardt: start must have 2 entries, got 1');
    expect(() => levenbergMarquardt(decayProblem(x, y), [1, NaN])).toThrow('levenbergMarquardt: start[1] (p1) must be finite, got NaN');
    expect(() => levenbergMarquardt(decayProblem(x, y), [1, 1], { maxIterations: 0 })).toThrow(
      'levenbergMarquardt: maxIterations must be an integer ≥ 1, got 0',
    );
    expect(() => levenbergMarquardt(decayProblem(x, y), [1, 1], { functionTolerance: -1 })).toThrow(
      'levenbergMarquardt: functionTolerance must be a finite number ≥ 0, got -1',
    );
    expect(() => createSolver(2, 10).solve(decayProblem(x, y), [1, 1])).toThrow(
      'createSolver.solve: problem must be 2 params × 10 residuals, got 2 × 60',
    );
  });
});

describe('createSolver', () => {
  it('createSolver(...).solve gives the same results on every reuse as levenbergMarquardt', () => {
    const solver = createSolver(2, 60);
    for (const seed of [1, 2, 3]) {
      const { x, y } = syntheticDecay(seed);
      const once = levenbergMarquardt(decayProblem(x, y), [4, 1]);
      const first = solver.solve(decayProblem(x, y), [4, 1]);
      const again = solver.solve(decayProblem(x, y), [4, 1]);
      expect(Array.from(first.params)).toEqual(Array.from(once.params));
      expect(Array.from(again.params)).toEqual(Array.from(once.params));
      expect(Array.from(again.covariance)).toEqual(Array.from(once.covariance));
      expect(again.iterations).toBe(once.iterations);
    }
  });

  it('does not mutate the start array', () => {
    const { x, y } = syntheticDecay(2);
    const start = [4, 1];
    levenbergMarquardt(decayProblem(x, y), start);
    expect(start).toEqual([4, 1]);
  });
});
