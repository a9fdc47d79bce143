import { describe, expect, it } from 'vitest';
import { detectSaturation } from '../../src/analysis/index.ts';
import { cleanApproach } from './synthetic.ts';

describe('detectSaturation', () => {
  it('detectSaturation finds the clipped closest points of a seeded approach curve', () => {
    const curve = cleanApproach(3, { points: 128, maximumCurrentA: 2e-9 });
    const railA = 1e-9;
    const clipped = curve.currentA.map((current) => Math.min(current, railA));
    const expected = clipped.flatMap((current, i) => (current === railA ? [i] : []));
    expect(expected.length).toBeGreaterThanOrEqual(3);
    const finding = detectSaturation(clipped);
    expect(finding).toEqual({ pointIndices: expected, levelA: railA, end: 'start', atKnownLimit: false });
  });

  it('detectSaturation accepts a rail that toggles by one converter step', () => {
    // One step of a 16-bit converter on a 10 nA range: 10 nA / 32768 = 0.305 pA [common practice, no source]
    const step = 10e-9 / 32768;
    const current = [10e-9, 10e-9 - step, 10e-9, 10e-9 - step, 8.1e-9, 6.4e-9, 5.2e-9, 4.1e-9];
    expect(detectSaturation(current)?.pointIndices).toEqual([0, 1, 2, 3]);
  });

  it('detectSaturation finds rails at both ends of an I(V) sweep, one per polarity', () => {
    const current = [-9.97e-9, -9.97e-9, -9.97e-9, -6e-9, -2e-9, 0, 2e-9, 6e-9, 9.95e-9, 9.95e-9];
    expect(detectSaturation(current)).toEqual({
      pointIndices: [0, 1, 2, 8, 9],
      levelA: 9.97e-9,
      end: 'both',
      atKnownLimit: false,
    });
  });

  it('detectSaturation finds the clip at the end of a far-to-close sweep', () => {
    const current = [1e-11, 3e-11, 1e-10, 3e-10, 1e-9, 3e-9, 5e-9, 5e-9];
    expect(detectSaturation(current)?.pointIndices).toEqual([6, 7]);
    expect(detectSaturation(current)?.end).toBe('end');
  });

  it('detectSaturation(knownLimitA) flags every point at the limit, even a single one', () => {
    const current = [10.2e-9, 8e-9, 6e-9, 4e-9];
    expect(detectSaturation(current, { knownLimitA: 10e-9 })).toEqual({
      pointIndices: [0],
      levelA: 10.2e-9,
      end: 'start',
      atKnownLimit: true,
    });
    expect(detectSaturation(current, { knownLimitA: 20e-9 })).toBeNull();
  });

  it('detectSaturation ignores a single maximum and equal values away from the extreme', () => {
    expect(detectSaturation([10e-9, 8e-9, 6e-9, 6e-9, 4e-9])).toBeNull();
    expect(detectSaturation([10e-9, 9.99e-9, 8e-9, 6e-9])).toBeNull();
    // Equal values at the low-current end are not a rail.
    expect(detectSaturation([10e-9, 8e-9, 6e-9, 1e-12, 1e-12])).toBeNull();
  });

  it('detectSaturation stays silent on 100 clean approach curves', () => {
    let alarms = 0;
    for (let seed = 1; seed <= 100; seed++) if (detectSaturation(cleanApproach(seed).currentA)) alarms++;
    expect(alarms).toBe(0);
  });

  it('detectSaturation rejects caller mistakes', () => {
    expect(() => detectSaturation([])).toThrow('detectSaturation: currentA must hold at least 1 value, got 0');
    expect(() => detectSaturation([1, Infinity])).toThrow('detectSaturation: currentA[1] must be a finite number, got Infinity');
    expect(() => detectSaturation([1, 2], { knownLimitA: -1 })).toThrow('detectSaturation: knownLimitA must be a finite number > 0, got -1');
    expect(() => detectSaturation([1, 2], { relativeTolerance: 2 })).toThrow('detectSaturation: relativeTolerance must be within [0, 1), got 2');
  });
});
