import { describe, expect, it } from 'vitest';
import { createSolver, fitModel, gaussian, makeParameters, mulberry32, type FitModelInput } from '../../src/fit/index.ts';
import { expectRelClose } from '../helpers.ts';

const N_POINTS = 200;
const TRUE = { amplitude: 4, decayPerNm: 1.7, offset: 0.3 };
const NOISE = 0.02;

/** Seeded synthetic approach curve: y = amplitude · exp(−decayPerNm · gapNm) + offset + noise. */
function syntheticCurve(seed: number): { gapNm: Float64Array; measured: Float64Array } {
  const rng = mulberry32(seed);
  const gapNm = new Float64Array(N_POINTS);
  const measured = new Float64Array(N_POINTS);
  for (let i = 0; i < N_POINTS; i++) {
    gapNm[i] = (3 * i) / (N_POINTS - 1);
    measured[i] = TRUE.amplitude * Math.exp(-TRUE.decayPerNm * gapNm[i]) + TRUE.offset + NOISE * gaussian(rng);
  }
  return { gapNm, measured };
}

/** The model of all three parameters [amplitude, decayPerNm, offset] and its full Jacobian. */
function decayModel(gapNm: Float64Array): Pick<FitModelInput, 'evaluate' | 'jacobian'> {
  return {
    evaluate(p, out) {
      for (let i = 0; i < gapNm.length; i++) out[i] = p[0] * Math.exp(-p[1] * gapNm[i]) + p[2];
    },
    jacobian(p, out) {
      for (let i = 0; i < gapNm.length; i++) {
        const decay = Math.exp(-p[1] * gapNm[i]);
        out[3 * i] = decay;
        out[3 * i + 1] = -p[0] * gapNm[i] * decay;
        out[3 * i + 2] = 1;
      }
    },
  };
}

const startParameters = () =>
  makeParameters([
    { name: 'amplitude', value: 2, min: 0 },
    { name: 'decayPerNm', value: 1, min: 0, max: 20 },
    { name: 'offset', value: 0 },
  ]);

describe('fitModel', () => {
  it('fitModel recovers the parameters of seeded synthetic curves within 3σ', () => {
    for (const seed of [1, 2, 3, 4]) {
      const { gapNm, measured } = syntheticCurve(seed);
      const weights = new Float64Array(N_POINTS).fill(1 / NOISE);
      const fit = fitModel({ parameters: startParameters(), nPoints: N_POINTS, measured, weights, ...decayModel(gapNm) });
      expect(fit.converged, fit.message).toBe(true);
      expect(fit.uncertaintiesOk).toBe(true);
      for (const parameter of fit.parameters) {
        const truth = TRUE[parameter.name as keyof typeof TRUE];
        expect(Math.abs(parameter.value - truth), `${parameter.name} seed ${seed}`).toBeLessThanOrEqual(3 * parameter.stderr);
      }
      // with weights 1/σ the reduced χ² is χ²/ν-distributed with mean 1; ±0.3 is > 4 standard deviations for ν = 197
      expect(Math.abs(fit.reducedChiSquare - 1)).toBeLessThanOrEqual(0.3);
    }
  });

  it('fitModel holds fixed parameters and fits the others', () => {
    const { gapNm, measured } = syntheticCurve(5);
    const seenOffsets = new Set<number>();
    const model = decayModel(gapNm);
    const parameters = makeParameters([
      { name: 'amplitude', value: 2 },
      { name: 'decayPerNm', value: 1 },
      { name: 'offset', value: 0.25, vary: false },
    ]);
    const fit = fitModel({
      parameters,
      nPoints: N_POINTS,
      measured,
      evaluate(p, out) {
        seenOffsets.add(p[2]);
        model.evaluate(p, out);
      },
      jacobian: model.jacobian,
    });
    expect([...seenOffsets]).toEqual([0.25]);
    expect(fit.nFree).toBe(2);
    expect(fit.freeNames).toEqual(['amplitude', 'decayPerNm']);
    expect(fit.params).toHaveLength(2);
    const offset = fit.parameters[2];
    expect(offset.value).toBe(0.25);
    expect(offset.vary).toBe(false);
    expect(Number.isNaN(offset.stderr)).toBe(true);
    expect(offset.correlations).toEqual({});
    expect(fit.parameters[0].value).toBe(fit.params[0]);
    expect(parameters[0].value).toBe(2); // inputs are not mutated
  });

  it('fitModel picks the free columns of the full analytic Jacobian', () => {
    const { gapNm, measured } = syntheticCurve(6);
    const parameters = makeParameters([
      { name: 'amplitude', value: 2 },
      { name: 'decayPerNm', value: 1.7, vary: false },
      { name: 'offset', value: 0 },
    ]);
    const model = decayModel(gapNm);
    const analytic = fitModel({ parameters, nPoints: N_POINTS, measured, ...model });
    const numeric = fitModel({ parameters, nPoints: N_POINTS, measured, evaluate: model.evaluate, jacobianMethod: 'richardson' });
    expect(analytic.converged).toBe(true);
    for (let j = 0; j < 2; j++) {
      expectRelClose(analytic.params[j], numeric.params[j], 1e-9);
      expectRelClose(analytic.stderr[j], numeric.stderr[j], 1e-7);
    }
    // with the decay held the model is linear in amplitude and offset, so one Jacobian settles it
    expect(analytic.iterations).toBeLessThanOrEqual(3);
  });

  it('fitModel builds residuals (measured − model) × weight', () => {
    const { gapNm, measured } = syntheticCurve(7);
    const weights = Float64Array.from({ length: N_POINTS }, (_, i) => 1 + (i % 3));
    const fit = fitModel({ parameters: startParameters(), nPoints: N_POINTS, measured, weights, ...decayModel(gapNm) });
    let chiSquare = 0;
    for (let i = 0; i < N_POINTS; i++) {
      chiSquare += ((measured[i] - fit.bestFit[i]) * weights[i]) ** 2;
      expectRelClose(fit.residuals[i], (measured[i] - fit.bestFit[i]) * weights[i], 1e-9);
    }
    expectRelClose(fit.chiSquare, chiSquare, 1e-12);
  });

  it('fitModel reports a parameter stopped by its max, with correlations that match the matrix', () => {
    const { gapNm, measured } = syntheticCurve(8);
    const parameters = makeParameters([
      { name: 'amplitude', value: 2, min: 0 },
      { name: 'decayPerNm', value: 1, min: 0, max: 1.2 },
      { name: 'offset', value: 0 },
    ]);
    const fit = fitModel({ parameters, nPoints: N_POINTS, measured, ...decayModel(gapNm) });
    expect(fit.status).toBe('stuck-at-bound');
    expect(fit.parameters[1].atBound).toBe('upper');
    expect(fit.parameters[1].value).toBe(1.2);
    expect(fit.uncertaintyNote).toContain('decayPerNm at its upper bound 1.2');
    const amplitude = fit.parameters[0];
    expect(amplitude.atBound).toBeNull();
    expect(amplitude.correlations.offset).toBe(fit.correlation[0 * 3 + 2]);
    expect(fit.parameters[2].correlations.amplitude).toBeCloseTo(amplitude.correlations.offset, 12);
    expect(Math.abs(amplitude.correlations.offset)).toBeLessThanOrEqual(1);
  });

  it('fitModel reuses a given workspace and gives identical results', () => {
    const { gapNm, measured } = syntheticCurve(9);
    const solver = createSolver(3, N_POINTS);
    const input = { parameters: startParameters(), nPoints: N_POINTS, measured, ...decayModel(gapNm) };
    const fresh = fitModel(input);
    const reused = fitModel({ ...input, solver });
    const again = fitModel({ ...input, solver });
    expect(Array.from(reused.params)).toEqual(Array.from(fresh.params));
    expect(Array.from(again.stderr)).toEqual(Array.from(fresh.stderr));
    expect(() => fitModel({ ...input, solver: createSolver(2, N_POINTS) })).toThrow(
      'fitModel: solver must be sized 3 params × 200 points, got 2 × 200',
    );
  });

  it('fitModel throws on caller mistakes', () => {
    const { gapNm, measured } = syntheticCurve(1);
    const base = { parameters: startParameters(), nPoints: N_POINTS, measured, ...decayModel(gapNm) };
    expect(() => fitModel({ ...base, measured: measured.subarray(1) })).toThrow(
      'fitModel: measured must have nPoints (200) entries, got 199',
    );
    expect(() => fitModel({ ...base, weights: new Float64Array(N_POINTS).fill(-1) })).toThrow(
      'fitModel: weights[0] must be finite and ≥ 0, got -1',
    );
    const allFixed = makeParameters([{ name: 'a', value: 1, vary: false }]);
    expect(() => fitModel({ ...base, parameters: allFixed })).toThrow(
      'fitModel: at least one parameter must have vary: true, got 0 of 1',
    );
  });
});
