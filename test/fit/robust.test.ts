import { describe, expect, it } from 'vitest';
import {
  fitModel,
  gaussian,
  makeParameters,
  medianAbsoluteScale,
  mulberry32,
  robustCost,
  robustLevenbergMarquardt,
  robustWeight,
  type FitModelInput,
  type LeastSquaresProblem,
} from '../../src/fit/index.ts';
import { expectRelClose } from '../helpers.ts';

const N_POINTS = 60;

interface Case {
  label: string;
  truth: Record<string, number>;
  parameters: FitModelInput['parameters'];
  x: Float64Array;
  clean: Float64Array;
  withOutliers: Float64Array;
  outlierIndices: number[];
  evaluate: FitModelInput['evaluate'];
}

/** A line and an exponential decay with seeded noise, and the same data with 10 % gross outliers. */
function cases(): Case[] {
  const x = Float64Array.from({ length: N_POINTS }, (_, i) => i / 6);
  const outlierIndices = Array.from({ length: N_POINTS }, (_, i) => i).filter((i) => i % 10 === 3);
  const make = (seed: number, model: (xi: number) => number, noise: number, jump: number) => {
    const rng = mulberry32(seed);
    const clean = Float64Array.from(x, (xi) => model(xi) + noise * gaussian(rng));
    const withOutliers = Float64Array.from(clean);
    for (const i of outlierIndices) withOutliers[i] += jump; // 10 % of the points, 50–80 σ away
    return { clean, withOutliers };
  };
  const line = make(17, (xi) => 1 + 2 * xi, 0.1, 8);
  const decay = make(5, (xi) => 5 * Math.exp(-0.8 * xi), 0.02, 1);
  return [
    {
      label: 'line',
      truth: { intercept: 1, slope: 2 },
      parameters: makeParameters([{ name: 'intercept', value: 0 }, { name: 'slope', value: 1 }]),
      x,
      ...line,
      outlierIndices,
      evaluate(p, out) {
        for (let i = 0; i < N_POINTS; i++) out[i] = p[0] + p[1] * x[i];
      },
    },
    {
      label: 'exponential',
      truth: { amplitude: 5, rate: 0.8 },
      parameters: makeParameters([{ name: 'amplitude', value: 3 }, { name: 'rate', value: 1 }]),
      x,
      ...decay,
      outlierIndices,
      evaluate(p, out) {
        for (let i = 0; i < N_POINTS; i++) out[i] = p[0] * Math.exp(-p[1] * x[i]);
      },
    },
  ];
}

describe('robust losses', () => {
  it('robustWeight and robustCost follow their formulas', () => {
    // soft-l1: ρ = 2(√(1+z) − 1), w = 1/√(1+z); cauchy: ρ = ln(1+z), w = 1/(1+z) (Triggs et al. 2000, from memory); by hand at z = 3
    expect(robustCost('soft-l1', 3)).toBe(2);
    expect(robustWeight('soft-l1', 3)).toBe(0.5);
    expectRelClose(robustCost('cauchy', 3), Math.log(4), 1e-15);
    expect(robustWeight('cauchy', 3)).toBe(0.25);
    expect(robustCost('linear', 3)).toBe(3);
    expect(robustWeight('linear', 3)).toBe(1);
    // the weight is the derivative of the cost, checked by a central difference
    for (const loss of ['soft-l1', 'cauchy'] as const) {
      const slope = (robustCost(loss, 2 + 1e-6) - robustCost(loss, 2 - 1e-6)) / 2e-6;
      expectRelClose(robustWeight(loss, 2), slope, 1e-8);
    }
  });

  it('medianAbsoluteScale is 1.4826 × median |r|', () => {
    // normalised MAD, consistency constant 1.4826 for Gaussian noise (Hampel 1974, from memory)
    expectRelClose(medianAbsoluteScale([1, -1, 2, -2, 100]), 1.4826 * 2, 1e-15);
    expectRelClose(medianAbsoluteScale([0, 0, 0, 3]), Math.sqrt(9 / 4), 1e-15);
    expect(() => medianAbsoluteScale([])).toThrow('medianAbsoluteScale: residuals must not be empty, got 0 entries');
  });

  for (const testCase of cases()) {
    it(`fitModel(${testCase.label}, 10 % gross outliers) is recovered by soft-l1 and cauchy, not by plain least squares`, () => {
      const { parameters, evaluate, truth } = testCase;
      const reference = fitModel({ parameters, nPoints: N_POINTS, measured: testCase.clean, evaluate });
      const plain = fitModel({ parameters, nPoints: N_POINTS, measured: testCase.withOutliers, evaluate });
      // σ of each parameter from the clean data: the yardstick for "recovered"
      const sigma = (name: string) => reference.parameters.find((p) => p.name === name)!.stderr;

      const plainWorst = Math.max(...plain.parameters.map((p) => Math.abs(p.value - truth[p.name]) / sigma(p.name)));
      expect(plain.converged).toBe(true);
      expect(plainWorst).toBeGreaterThan(5);

      for (const loss of ['soft-l1', 'cauchy'] as const) {
        const robust = fitModel({ parameters, nPoints: N_POINTS, measured: testCase.withOutliers, evaluate, loss });
        expect(robust.converged, `${loss}: ${robust.message}`).toBe(true);
        expect(robust.loss).toBe(loss);
        for (const parameter of robust.parameters) {
          expect(Math.abs(parameter.value - truth[parameter.name]), `${loss} ${parameter.name}`).toBeLessThanOrEqual(3 * sigma(parameter.name));
        }
        for (let i = 0; i < N_POINTS; i++) {
          if (testCase.outlierIndices.includes(i)) expect(robust.robustWeights[i], `${loss} outlier ${i}`).toBeLessThan(0.1);
          else if (loss === 'cauchy') expect(robust.robustWeights[i], `${loss} point ${i}`).toBeGreaterThan(0.3);
        }
      }
    });
  }

  it('robustLevenbergMarquardt ends at a stationary point of the robust cost', () => {
    const [line] = cases();
    const x = line.x;
    const y = line.withOutliers;
    const problem: LeastSquaresProblem = {
      nParams: 2,
      nResiduals: N_POINTS,
      residuals(p, out) {
        for (let i = 0; i < N_POINTS; i++) out[i] = y[i] - (p[0] + p[1] * x[i]);
      },
    };
    const result = robustLevenbergMarquardt(problem, [0, 1], { loss: 'cauchy', lossScale: 0.3 });
    expect(result.converged).toBe(true);
    expect(result.reweightIterations).toBeGreaterThan(1);
    expect(result.lossScale).toBe(0.3);
    // ∂/∂p Σ c² ρ((r/c)²) = Σ 2 ρ'(z) r ∂r/∂p = 0 at the optimum; compare with the scale of its terms
    let gradientIntercept = 0;
    let gradientSlope = 0;
    let size = 0;
    for (let i = 0; i < N_POINTS; i++) {
      const r = result.rawResiduals[i];
      const weight = robustWeight('cauchy', (r / 0.3) ** 2);
      gradientIntercept += weight * r * -1;
      gradientSlope += weight * r * -x[i];
      size += Math.abs(weight * r * x[i]);
    }
    expect(Math.abs(gradientIntercept)).toBeLessThanOrEqual(1e-8 * size);
    expect(Math.abs(gradientSlope)).toBeLessThanOrEqual(1e-8 * size);
  });

  it('robustLevenbergMarquardt with loss linear is plain least squares', () => {
    const [, decay] = cases();
    const input = { parameters: decay.parameters, nPoints: N_POINTS, measured: decay.withOutliers, evaluate: decay.evaluate };
    const plain = fitModel(input);
    const linear = fitModel({ ...input, loss: 'linear' });
    expect(Array.from(linear.params)).toEqual(Array.from(plain.params));
    expect(() => fitModel({ ...input, loss: 'huber' as never })).toThrow(
      'robustLevenbergMarquardt: loss must be one of linear, soft-l1, cauchy, got huber',
    );
    expect(() => fitModel({ ...input, loss: 'cauchy', lossScale: 0 })).toThrow(
      'robustLevenbergMarquardt: lossScale must be a finite number > 0, got 0',
    );
  });
});
