import { describe, expect, it } from 'vitest';
import { checkPlausibility } from '../../src/analysis/index.ts';

describe('checkPlausibility', () => {
  it('checkPlausibility accepts the edges and flags values outside 0.05–10 eV and 0.1–5 nm', () => {
    expect(checkPlausibility({ barrierEV: 0.05, widthNm: 5 })).toBeNull();
    expect(checkPlausibility({ barrierEV: 10, widthNm: 0.1 })).toBeNull();
    expect(checkPlausibility({})).toBeNull();
    expect(checkPlausibility({ barrierEV: 12.3 })?.implausible).toEqual([
      { quantity: 'barrier', value: 12.3, index: 0, minimum: 0.05, maximum: 10, unit: 'eV' },
    ]);
    expect(checkPlausibility({ barrierEV: [4.5, 0.01], widthNm: 7 })?.implausible.map((entry) => [entry.quantity, entry.index])).toEqual([
      ['barrier', 1],
      ['width', 0],
    ]);
    expect(checkPlausibility({ barrierEV: NaN })?.implausible[0].value).toBeNaN();
  });

  it('checkPlausibility rejects a non-numeric width', () => {
    expect(() => checkPlausibility({ widthNm: '1' as unknown as number })).toThrow('checkPlausibility: widthNm must be a number, got "1"');
  });
});
