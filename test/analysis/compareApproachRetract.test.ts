import { describe, expect, it } from 'vitest';
import { compareApproachRetract, FLAG_THRESHOLDS, type FittedLogCurrentLine } from '../../src/analysis/index.ts';
import { expectRelClose } from '../helpers.ts';
import { cleanApproach, fitLine, type ApproachOptions } from './synthetic.ts';

function fittedLine(seed: number, options: ApproachOptions): FittedLogCurrentLine {
  const curve = cleanApproach(seed, options);
  const line = fitLine(curve.zNm, curve.currentA.map(Math.log));
  return {
    slopePerNm: line.slope,
    slopeErrorPerNm: line.slopeError,
    interceptLn: line.intercept,
    interceptErrorLn: line.interceptError,
    slopeInterceptCovariancePerNm: line.slopeInterceptCovariance,
  };
}

const sweep: ApproachOptions = { points: 128, decades: 2.5, noiseRelative: 0.03, maximumCurrentA: 1e-9, slopePerNm: -20 };

describe('compareApproachRetract', () => {
  it('compareApproachRetract measures the slope difference in combined standard errors', () => {
    // By hand: |−18 − (−20)| / √(0.2² + 0.2²) = 2/0.28284 = 7.0711
    const finding = compareApproachRetract({
      approach: { slopePerNm: -20, slopeErrorPerNm: 0.2 },
      retract: { slopePerNm: -18, slopeErrorPerNm: 0.2 },
    });
    expectRelClose(finding!.slopeSigmas, Math.SQRT2 * 5, 1e-12);
    expect(finding).toMatchObject({ slopeDifferencePerNm: 2, disagreesIn: 'slope' });
    expect(finding!.currentRatio).toBeNaN();
  });

  it('compareApproachRetract compares the currents at a common gap with the slope–intercept covariance', () => {
    // By hand: ln I_a(0.5) = −10 − 20·0.5 = −20, var = 0.1² + 0.25·0.2² − 2·0.5·0.019 = 0.001;
    // ln I_r(0.5) = −9.5 − 20·0.5 = −19.5, same variance; z = 0.5/√0.002 = 11.18; ratio e^0.5
    const line = { slopePerNm: -20, slopeErrorPerNm: 0.2, interceptErrorLn: 0.1, slopeInterceptCovariancePerNm: -0.019 };
    const finding = compareApproachRetract({
      approach: { ...line, interceptLn: -10 },
      retract: { ...line, interceptLn: -9.5 },
      commonZNm: 0.5,
    });
    expect(finding?.disagreesIn).toBe('current');
    expectRelClose(finding!.currentSigmas, 0.5 / Math.sqrt(0.002), 1e-10);
    expectRelClose(finding!.currentRatio, Math.exp(0.5), 1e-12);
  });

  it('compareApproachRetract flags a retract with a lower barrier in 100 seeded pairs', () => {
    let flagged = 0;
    for (let seed = 1; seed <= 100; seed++) {
      const approach = fittedLine(2 * seed, sweep);
      // φ_ap ∝ slope²: −20 → −18 nm⁻¹ is 4.0 → 3.1 eV (physics.md §2)
      const retract = fittedLine(2 * seed + 1, { ...sweep, slopePerNm: -18 });
      if (compareApproachRetract({ approach, retract, commonZNm: 0.5 })) flagged++;
    }
    expect(flagged).toBe(100);
  });

  it('compareApproachRetract stays silent on 100 seeded pairs of the same junction', () => {
    let flagged = 0;
    let largest = 0;
    for (let seed = 1; seed <= 100; seed++) {
      const approach = fittedLine(2 * seed + 100000, sweep);
      const retract = fittedLine(2 * seed + 100001, sweep);
      const none = compareApproachRetract({ approach, retract, commonZNm: 0.5 });
      if (none) flagged++;
      largest = Math.max(largest, Math.abs(retract.slopePerNm - approach.slopePerNm) / Math.hypot(approach.slopeErrorPerNm, retract.slopeErrorPerNm));
    }
    expect(flagged).toBe(0);
    expect(largest).toBeLessThan(FLAG_THRESHOLDS.hysteresisSigmas.value);
  });

  it('compareApproachRetract rejects caller mistakes', () => {
    const good = { slopePerNm: -20, slopeErrorPerNm: 0.2 };
    expect(() => compareApproachRetract({ approach: { slopePerNm: -20, slopeErrorPerNm: 0 }, retract: good })).toThrow(
      'compareApproachRetract: approach.slopeErrorPerNm must be a finite number > 0, got 0',
    );
    expect(() => compareApproachRetract({ approach: good, retract: good, commonZNm: 0.5 })).toThrow(
      'compareApproachRetract: commonZNm needs interceptLn and interceptErrorLn on both lines, got approach without them',
    );
  });
});
