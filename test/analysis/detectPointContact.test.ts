import { describe, expect, it } from 'vitest';
import { detectPointContact, FLAG_THRESHOLDS } from '../../src/analysis/index.ts';
import { CONDUCTANCE_QUANTUM_S } from '../../src/physics/index.ts';
import { expectRelClose } from '../helpers.ts';
import { cleanApproach } from './synthetic.ts';

describe('detectPointContact', () => {
  it('detectPointContact gives the conductance in G0', () => {
    // CODATA/SI 2019: G0 = 2e²/h = 7.748091729864e-5 S (physics.md §1); 1e-7 A / 0.01 V = 1e-5 S = 0.129064 G0
    const finding = detectPointContact({ currentA: [1e-9, 1e-8, 1e-7], biasV: 0.01 });
    expectRelClose(finding!.maximumConductanceG0, 1e-5 / 7.748091729864e-5, 1e-10);
    // 1e-8 A / 0.01 V = 1e-6 S = 0.0129 G0 is at or above the 0.01 G0 limit too
    expect(finding).toMatchObject({ maximumIndex: 2, nearContact: true, jump: null, pointIndices: [1, 2] });
  });

  it('detectPointContact flags an approach that reaches 0.05 G0', () => {
    // Closest current 0.05 G0 at 10 mV: 0.05 · 7.748e-5 S · 0.01 V = 38.7 nA
    const curve = cleanApproach(8, { maximumCurrentA: 0.05 * CONDUCTANCE_QUANTUM_S * 0.01, biasV: 0.01 });
    const finding = detectPointContact({ currentA: curve.currentA, biasV: curve.biasV });
    expect(finding?.nearContact).toBe(true);
    expect(finding!.maximumConductanceG0).toBeGreaterThan(FLAG_THRESHOLDS.nearContactConductanceG0.value);
    for (const i of finding!.pointIndices) expect(curve.currentA[i] / 0.01 / CONDUCTANCE_QUANTUM_S).toBeGreaterThanOrEqual(0.01);
  });

  it('detectPointContact finds a jump to contact below the near-contact limit', () => {
    // Closest points jump ×8 to about 1.2e-3 G0 (a jump to contact onto an adsorbate: above the
    // 1e-3 G0 landing level, still below the 0.01 G0 near-contact limit at this bias)
    const curve = cleanApproach(9, { points: 128, maximumCurrentA: 1.2e-8, biasV: 1 });
    const currentA = curve.currentA.map((current, i) => (i < 5 ? current * 8 : current));
    const finding = detectPointContact({ currentA, biasV: curve.biasV });
    expect(finding?.nearContact).toBe(false);
    expect(finding?.jump).toMatchObject({ fromIndex: 4, toIndex: 5 });
    expect(finding!.jump!.factor).toBeGreaterThan(6);
    expect(finding?.pointIndices).toEqual([4]);
  });

  it('detectPointContact reads a ×3 step far from contact as no contact (a tip change)', () => {
    const curve = cleanApproach(10, { points: 128, maximumCurrentA: 1e-9, biasV: 0.1 });
    const currentA = curve.currentA.map((current, i) => (i >= 60 ? current / 3 : current));
    expect(detectPointContact({ currentA, biasV: curve.biasV })).toBeNull();
  });

  it('detectPointContact stays silent on 100 clean approach curves', () => {
    let alarms = 0;
    for (let seed = 1; seed <= 100; seed++) {
      const curve = cleanApproach(seed);
      if (detectPointContact({ currentA: curve.currentA, biasV: curve.biasV })) alarms++;
    }
    expect(alarms).toBe(0);
  });

  it('detectPointContact skips zero bias and the near-zero-bias points of an I(V) sweep', () => {
    const biasV = Array.from({ length: 41 }, (_, i) => -1 + i * 0.05);
    // Ohmic 1e-9 S plus a spike at V = 0.05 V: near zero bias, so it is not taken for a jump.
    const currentA = biasV.map((v) => 1e-9 * v * (1 + 0.3 * v * v));
    currentA[21] *= 10;
    expect(detectPointContact({ currentA, biasV })).toBeNull();
  });

  it('detectPointContact rejects caller mistakes', () => {
    expect(() => detectPointContact({ currentA: [1, 2], biasV: 0 })).toThrow('detectPointContact: biasV must be a finite non-zero number, got 0');
    expect(() => detectPointContact({ currentA: [1, 2], biasV: [0.1] })).toThrow(
      'detectPointContact: biasV must have length 2 (one per point), got 1',
    );
    expect(() => detectPointContact({ currentA: [1, 2], biasV: [0, 0] })).toThrow('detectPointContact: biasV must not be 0 everywhere, got max |V| = 0');
  });
});
