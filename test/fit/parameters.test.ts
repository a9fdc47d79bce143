import { describe, expect, it } from 'vitest';
import { makeParameter, makeParameters, withParameter } from '../../src/fit/index.ts';

describe('makeParameter', () => {
  it('makeParameter fills the defaults', () => {
    expect(makeParameter({ name: 'decayPerNm', value: 10, min: 0 })).toEqual({
      name: 'decayPerNm',
      value: 10,
      initValue: 10,
      min: 0,
      max: Infinity,
      vary: true,
    });
    expect(makeParameter({ name: 'gapNm', value: 0.5, initValue: 0.4, vary: false }).initValue).toBe(0.4);
  });

  it('makeParameter rejects crossed bounds and values outside them', () => {
    expect(() => makeParameter({ name: 'x', value: 2, min: 3, max: 1 })).toThrow('makeParameter: min must be < max, got min 3, max 1');
    expect(() => makeParameter({ name: 'x', value: 2, min: 1, max: 1 })).toThrow('makeParameter: min must be < max, got min 1, max 1');
    expect(() => makeParameter({ name: 'k', value: 3, min: 0, max: 1 })).toThrow('makeParameter: value of k must be within [0, 1], got 3');
    expect(() => makeParameter({ name: 'k', value: NaN })).toThrow('makeParameter: value of k must be finite, got NaN');
    expect(() => makeParameter({ name: '', value: 1 })).toThrow('makeParameter: name must be a non-empty string, got ""');
  });

  it('makeParameters rejects duplicate names', () => {
    expect(() => makeParameters([{ name: 'a', value: 1 }, { name: 'a', value: 2 }])).toThrow(
      'makeParameters: names must be unique, got a twice',
    );
    expect(makeParameters([{ name: 'a', value: 1 }, { name: 'b', value: 2 }]).map((p) => p.name)).toEqual(['a', 'b']);
  });

  it('withParameter returns a validated copy and leaves the original alone', () => {
    const original = makeParameter({ name: 'a', value: 1, min: 0 });
    const fixed = withParameter(original, { vary: false });
    expect(fixed.vary).toBe(false);
    expect(original.vary).toBe(true);
    expect(() => withParameter(original, { value: -1 })).toThrow('makeParameter: value of a must be within [0, Infinity], got -1');
  });
});
