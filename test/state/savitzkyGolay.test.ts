import { describe, expect, it } from 'vitest';
import { savitzkyGolay } from '../../src/state/savitzkyGolay.ts';
import { mulberry32 } from '../../src/physics/index.ts';

describe('savitzkyGolay', () => {
  it('savitzkyGolay is exact for a quadratic, also at the ends', () => {
    const x = Array.from({ length: 21 }, (_, i) => -1 + i * 0.1);
    const y = x.map((v) => 2 - 3 * v + 0.5 * v * v);
    const { smoothed, derivative } = savitzkyGolay(x, y, 3);
    for (let i = 0; i < x.length; i++) {
      expect(smoothed[i]).toBeCloseTo(y[i], 12);
      expect(derivative[i]).toBeCloseTo(-3 + x[i], 11);
    }
  });

  it('savitzkyGolay on even spacing equals the tabulated 5-point first-derivative filter', () => {
    // Savitzky & Golay, Anal. Chem. 36, 1627 (1964): quadratic, 5 points, first derivative
    // coefficients (−2, −1, 0, 1, 2)/10 per unit spacing.
    const random = mulberry32(11);
    const y = Array.from({ length: 9 }, () => random());
    const x = y.map((_, i) => i);
    const { derivative } = savitzkyGolay(x, y, 2);
    const expected = (-2 * y[2] - y[3] + y[5] + 2 * y[6]) / 10;
    expect(derivative[4]).toBeCloseTo(expected, 12);
  });

  it('savitzkyGolay handles uneven spacing as a true local fit and names bad arguments', () => {
    const x = [0, 0.1, 0.3, 0.35, 0.7, 1.0, 1.1];
    const y = x.map((v) => v * v);
    expect(savitzkyGolay(x, y, 2).derivative[3]).toBeCloseTo(0.7, 10);
    expect(() => savitzkyGolay([0, 1], [0], 1)).toThrow('savitzkyGolay: y must have the length of x (2), got 1');
    expect(() => savitzkyGolay([0, 1], [0, 1], 0)).toThrow('savitzkyGolay: halfWidth must be an integer >= 1, got 0');
  });
});
