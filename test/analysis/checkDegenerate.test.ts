import { describe, expect, it } from 'vitest';
import { checkDegenerate } from '../../src/analysis/index.ts';

describe('checkDegenerate', () => {
  it('checkDegenerate flags |r| > 0.999 from a nested or flat matrix', () => {
    const names = ['barrierHeightEV', 'gapNm', 'areaNm2'];
    const nested = [
      [1, 0.2, -0.9995],
      [0.2, 1, 0.5],
      [-0.9995, 0.5, 1],
    ];
    const expected = { correlatedPairs: [{ first: 'barrierHeightEV', second: 'areaNm2', correlation: -0.9995 }], unidentifiable: [] };
    expect(checkDegenerate(nested, names)).toEqual(expected);
    expect(checkDegenerate(Float64Array.from(nested.flat()), names)).toEqual(expected);
    expect(checkDegenerate([[1, 0.999], [0.999, 1]], ['a', 'b'])).toBeNull();
  });

  it('checkDegenerate names parameters without a finite standard error', () => {
    const finding = checkDegenerate([[1, NaN], [NaN, NaN]], ['barrierHeightEV', 'gapNm'], [0.1, NaN]);
    expect(finding?.unidentifiable).toEqual(['barrierHeightEV', 'gapNm']);
    expect(checkDegenerate([[1, 0], [0, 1]], ['a', 'b'], [0.1, Infinity])?.unidentifiable).toEqual(['b']);
  });

  it('checkDegenerate rejects a matrix that does not match the names', () => {
    expect(() => checkDegenerate([1, 0, 0], ['a', 'b'])).toThrow('checkDegenerate: correlation must have 4 entries (flat 2×2) to match names, got 3');
    expect(() => checkDegenerate([[1, 0]], ['a', 'b'])).toThrow('checkDegenerate: correlation must be 2×2 to match names, got 1 rows');
  });
});
