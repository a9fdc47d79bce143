import { describe, expect, it } from 'vitest';
import { FLAG_CODES, flagsForFit, type FitSummaryForFlags, type QualityFlag } from '../../src/analysis/index.ts';
import { CONDUCTANCE_QUANTUM_S, gaussian, mulberry32 } from '../../src/physics/index.ts';
import { assessApproach } from './pipeline.ts';
import { cleanApproach, uniformInteger } from './synthetic.ts';

const converged = { kind: 'iz', converged: true, statusMessage: 'converged: relative step size below stepTolerance' } as const;

function codes(flags: readonly QualityFlag[]): string[] {
  return flags.map((flag) => flag.code);
}

describe('flagsForFit(summary)', () => {
  it('flagsForFit(saturation) writes the clip level, the count and what the fit did with them', () => {
    const summary: FitSummaryForFlags = {
      ...converged,
      saturation: { pointIndices: [0, 1, 2, 3, 4, 5], levelA: 9.98e-9, end: 'start', atKnownLimit: false },
      excludedIndices: [0, 1, 2, 3, 4, 5],
    };
    expect(flagsForFit(summary)).toEqual([
      {
        code: 'saturation',
        reason: 'Current is clipped at 9.98 nA on the 6 closest points (preamp saturation); they were left out of the fit.',
        pointIndices: [0, 1, 2, 3, 4, 5],
      },
    ]);
    const kept = flagsForFit({ ...summary, kind: 'iv', excludedIndices: [] });
    expect(kept[0].reason).toBe('Current is clipped at 9.98 nA on the 6 highest-bias points (preamp saturation); they were kept in the fit.');
  });

  it('flagsForFit(not converged) repeats the status message', () => {
    expect(flagsForFit({ kind: 'iv', converged: false, statusMessage: 'not converged: maxIterations reached' })).toEqual([
      { code: 'no-convergence', reason: 'The fit did not converge (not converged: maxIterations reached); its numbers are not results.' },
    ]);
  });

  it('flagsForFit(every finding) raises every code, in FLAG_CODES order, each with its figure', () => {
    const summary: FitSummaryForFlags = {
      kind: 'iz',
      converged: false,
      statusMessage: 'failed: Jacobian is singular at the end point, the parameters are not determined.',
      metrics: { r2: 0.91, reducedChi2: 4.2, rmsResidual: 0.2, durbinWatson: 0.62, pointsUsed: 100, degreesOfFreedom: 98, points: 110 },
      noiseKnown: true,
      parameters: [
        { name: 'logCurrentAtZero', value: -12, stderr: 0.2, correlations: { slopePerNm: -0.99963 } },
        { name: 'slopePerNm', value: -60, stderr: 0.5, correlations: { logCurrentAtZero: -0.99963 } },
        { name: 'offsetA', value: 0, stderr: NaN, vary: false },
      ],
      barrierEV: 34.3,
      widthNm: 0.05,
      saturation: { pointIndices: [0, 1], levelA: 1e-8, end: 'start', atKnownLimit: false },
      noiseFloor: { pointIndices: [108, 109], noiseFloorA: 2.1e-12, thresholdA: 6.3e-12, estimated: true },
      excludedIndices: [0, 1, 108, 109],
      curvature: {
        intercept: 0,
        linear: -20,
        curvature: 12.5,
        curvatureStandardError: 1.1,
        tStatistic: 11.4,
        degreesOfFreedom: 97,
        pValue: 2.3e-19,
        slopeAtMinimumX: -22.5,
        slopeAtMaximumX: -17.5,
        slopeAtMiddle: -20,
        relativeSlopeChange: 0.25,
        residuals: [],
        pointsUsed: 100,
        nonExponential: true,
      },
      step: {
        index: 40,
        stepSize: 0.31,
        sigma: 0.05,
        statistic: 12.4,
        statisticKind: 't',
        pValue: 1e-20,
        positionsSearched: 97,
        adjustedPValue: 9.7e-19,
        trendDegree: 2,
        pointIndices: [40, 41, 42],
        points: 43,
      },
      stepSeriesIndices: Array.from({ length: 43 }, (_, i) => i + 2),
      conductance: { currentA: [2e-6, 1e-9, 5e-10], biasV: 0.1 },
      hysteresis: { slopeDifferencePerNm: 1.3, slopeSigmas: 4.2, currentRatio: NaN, currentSigmas: NaN, commonZNm: NaN, disagreesIn: 'slope' },
      batchOutliers: [{ quantity: 'apparent barrier', unit: 'eV', value: 34.3, modifiedZScore: 41.2, batchMedian: 4.1 }],
    };
    const flags = flagsForFit(summary);
    expect(codes(flags)).toEqual([...FLAG_CODES]);
    const reason = (code: string) => flags.find((flag) => flag.code === code)!.reason;
    expect(reason('saturation')).toContain('10 nA on the 2 closest points');
    expect(reason('noise-floor')).toBe(
      '2 points lie below 6.3 pA, 3× the estimated 2.1 pA noise floor, where ln|I| no longer follows the exponential; they were left out of the fit.',
    );
    expect(reason('tip-change')).toBe(
      'ln I shifts by 0.31 (current ×1.36, 6.2 σ) from point 42 on (t = 12.4, false-alarm probability ≤ 9.7e-19 over 97 positions), a sudden tip change.',
    );
    expect(flags.find((flag) => flag.code === 'tip-change')!.pointIndices).toEqual([42, 43, 44]);
    // 2e-6 A / 0.1 V = 2e-5 S = 0.258 G0 (G0 = 7.748091729864e-5 S, physics.md §1)
    expect(reason('point-contact')).toBe('Conductance reaches 0.258 G0 (20 µS) at point 0, at or above the 0.01 G0 near-contact limit.');
    expect(reason('non-exponential')).toBe(
      'ln I is curved (c = 12.5 ± 1.1 nm⁻², p = 2.3e-19): its slope changes by 25 % across the window, so one apparent barrier does not describe the curve.',
    );
    expect(reason('hysteresis')).toBe(
      'Approach and retract disagree beyond 3.29σ: slopes differ by 1.3 nm⁻¹ (4.2 combined standard errors), so the junction changed between them.',
    );
    expect(reason('poor-fit')).toContain('R² = 0.91 (below 0.95); reduced χ² = 4.2 with known noise (above 1.5, p = ');
    expect(reason('poor-fit')).toContain('Durbin–Watson d = 0.62 (below 1, p = ');
    expect(reason('no-convergence')).toBe(
      'The fit did not converge (failed: Jacobian is singular at the end point, the parameters are not determined); its numbers are not results.',
    );
    expect(reason('degenerate')).toBe(
      'Parameters are not separately determined (|r| limit 0.999): logCurrentAtZero and slopePerNm are correlated at r = -0.99963.',
    );
    expect(reason('implausible')).toBe(
      'Apparent barrier 34.3 eV is outside the plausible 0.05–10 eV; width 0.05 nm is outside the plausible 0.1–5 nm.',
    );
    expect(reason('batch-outlier')).toBe(
      'Apparent barrier 34.3 eV stands out of its batch (modified z = 41.2, batch median 4.1 eV, limit 3.5).',
    );
    for (const flag of flags) expect(flag.reason.endsWith('.'), flag.code).toBe(true);
  });

  it('flagsForFit rejects a summary without kind, converged or statusMessage', () => {
    expect(() => flagsForFit({ ...converged, kind: 'xy' as 'iz' })).toThrow("flagsForFit: summary.kind must be 'iz' or 'iv', got \"xy\"");
    expect(() => flagsForFit({ ...converged, converged: 'yes' as unknown as boolean })).toThrow(
      'flagsForFit: summary.converged must be a boolean, got "yes"',
    );
    expect(() => flagsForFit({ ...converged, statusMessage: undefined as unknown as string })).toThrow(
      'flagsForFit: summary.statusMessage must be a string, got undefined',
    );
  });
});

describe('flagsForFit on synthetic approach curves, end to end', () => {
  it('raises no flag on 100 clean seeded approach curves', () => {
    const flagged: string[] = [];
    for (let seed = 1; seed <= 100; seed++) {
      const { flags } = assessApproach(cleanApproach(seed));
      if (flags.length > 0) flagged.push(`seed ${seed}: ${flags.map((flag) => flag.reason).join(' | ')}`);
    }
    expect(flagged).toEqual([]);
  });

  it('raises saturation on a clipped curve and leaves the clipped points out', () => {
    const curve = cleanApproach(21, { points: 128, maximumCurrentA: 3e-9 });
    const currentA = curve.currentA.map((current) => Math.min(current, 1.5e-9));
    const { flags, usedIndices } = assessApproach({ ...curve, currentA });
    expect(codes(flags)).toEqual(['saturation']);
    expect(flags[0].reason).toMatch(/^Current is clipped at 1.5 nA on the \d+ closest points \(preamp saturation\); they were left out of the fit\.$/);
    for (const i of flags[0].pointIndices!) expect(usedIndices).not.toContain(i);
  });

  it('raises noise-floor on a curve that runs into a 2 pA floor', () => {
    const curve = cleanApproach(22, { points: 128, decades: 4, maximumCurrentA: 1e-9, noiseRelative: 0.03 });
    const random = mulberry32(922);
    const currentA = curve.currentA.map((current) => current + 2e-12 * gaussian(random));
    const { flags } = assessApproach({ ...curve, currentA }, { noiseFloorA: 2e-12 });
    expect(codes(flags)).toContain('noise-floor');
    expect(flags.find((flag) => flag.code === 'noise-floor')!.reason).toContain('3× the 2 pA noise floor');
  });

  it('raises tip-change on curves with a 5σ step at a random point, and nothing else but poor-fit', () => {
    for (let seed = 1; seed <= 20; seed++) {
      const curve = cleanApproach(seed);
      const position = uniformInteger(mulberry32(7000 + seed), 2, curve.zNm.length - 2);
      const factor = Math.exp(5 * curve.noiseRelative);
      const currentA = curve.currentA.map((current, i) => (i >= position ? current * factor : current));
      const { flags } = assessApproach({ ...curve, currentA });
      // The straight-line fit through a step has correlated residuals, so poor-fit may come along.
      expect(codes(flags), `seed ${seed}`).toContain('tip-change');
      expect(codes(flags).filter((code) => code !== 'tip-change' && code !== 'poor-fit'), `seed ${seed}`).toEqual([]);
    }
  });

  it('raises point-contact on a curve that reaches 0.05 G0', () => {
    const curve = cleanApproach(23, { maximumCurrentA: 0.05 * CONDUCTANCE_QUANTUM_S * 0.01, biasV: 0.01 });
    const { flags } = assessApproach(curve);
    expect(codes(flags)).toEqual(['point-contact']);
  });

  it('raises non-exponential on a curve whose slope changes by 30 %', () => {
    const curve = cleanApproach(24, { points: 128 });
    const first = curve.zNm[0];
    const span = curve.zNm[curve.zNm.length - 1] - first;
    const curvature = (-0.3 * curve.slopePerNm) / (2 * span);
    const currentA = curve.currentA.map((current, i) => current * Math.exp(curvature * (curve.zNm[i] - first) ** 2));
    const { flags } = assessApproach({ ...curve, currentA });
    expect(codes(flags)).toContain('non-exponential');
    expect(codes(flags)).not.toContain('tip-change');
  });

  it('raises implausible on a decay of 60 nm⁻¹ (φ_ap ≈ 34 eV)', () => {
    // physics.md §2: φ_ap = 0.9525 eV Å² (d lnI/dz)² = 0.9525 · 6² = 34.3 eV
    const { flags } = assessApproach(cleanApproach(25, { slopePerNm: -60 }));
    expect(codes(flags)).toEqual(['implausible']);
    expect(flags[0].reason).toMatch(/^Apparent barrier 34\.\d eV is outside the plausible 0\.05–10 eV\.$/);
  });
});
