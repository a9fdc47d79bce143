import { describe, expect, it } from 'vitest';
import { detectNoiseFloor } from '../../src/analysis/index.ts';
import { gaussian, mulberry32 } from '../../src/physics/index.ts';
import { cleanApproach } from './synthetic.ts';

/** A clean curve running 4 decades down from 1 nA into a 2 pA additive noise floor. */
function curveIntoFloor(seed: number) {
  const curve = cleanApproach(seed, { points: 128, decades: 4, maximumCurrentA: 1e-9, noiseRelative: 0.03 });
  const random = mulberry32(seed + 900);
  const floorA = 2e-12;
  const currentA = curve.currentA.map((current) => current + floorA * gaussian(random));
  return { ...curve, currentA, floorA };
}

describe('detectNoiseFloor', () => {
  it('detectNoiseFloor(noiseFloorA) flags the points below 3σ of the floor', () => {
    const curve = curveIntoFloor(4);
    const finding = detectNoiseFloor(curve.currentA, { noiseFloorA: curve.floorA });
    const expected = curve.currentA.flatMap((current, i) => (Math.abs(current) < 3 * curve.floorA ? [i] : []));
    expect(finding?.pointIndices).toEqual(expected);
    expect(finding?.thresholdA).toBe(6e-12);
    expect(finding?.estimated).toBe(false);
    // All flagged points are in the far tail, where the true current is below ~10 pA.
    for (const i of finding!.pointIndices) expect(curve.trueCurrentA[i]).toBeLessThan(1e-11);
  });

  it('detectNoiseFloor estimates the floor from the low-current tail within a factor of 2', () => {
    let found = 0;
    for (let seed = 1; seed <= 20; seed++) {
      const curve = curveIntoFloor(seed);
      const finding = detectNoiseFloor(curve.currentA);
      if (!finding) continue;
      found++;
      expect(finding.estimated).toBe(true);
      expect(finding.noiseFloorA).toBeGreaterThan(curve.floorA / 2);
      expect(finding.noiseFloorA).toBeLessThan(2 * curve.floorA);
    }
    expect(found).toBe(20);
  });

  it('detectNoiseFloor stays silent on 100 clean approach curves', () => {
    let alarms = 0;
    for (let seed = 1; seed <= 100; seed++) if (detectNoiseFloor(cleanApproach(seed).currentA)) alarms++;
    expect(alarms).toBe(0);
  });

  it('detectNoiseFloor rejects caller mistakes', () => {
    expect(() => detectNoiseFloor([1, 2, 3])).toThrow(
      'detectNoiseFloor: currentA must hold at least 8 values to estimate the floor (or pass noiseFloorA), got 3',
    );
    expect(() => detectNoiseFloor([1, 2, 3], { noiseFloorA: 0 })).toThrow('detectNoiseFloor: noiseFloorA must be a finite number > 0, got 0');
  });
});
