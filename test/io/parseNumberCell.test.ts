import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { isBlankCell, isNonFiniteSpelling, parseNumberCell } from '../../src/io/parseNumberCell.ts';

describe('parseNumberCell', () => {
  it('parseNumberCell(decimal point and comma forms) reads the number', () => {
    expect(parseNumberCell('1.25', '.')).toBe(1.25);
    expect(parseNumberCell('1,25', ',')).toBe(1.25);
    expect(parseNumberCell('-3.5e-10', '.')).toBe(-3.5e-10);
    expect(parseNumberCell('4,5E+3', ',')).toBe(4500);
    expect(parseNumberCell(' 7 \r', '.')).toBe(7);
    expect(parseNumberCell('.5', '.')).toBe(0.5);
    expect(parseNumberCell('-0', '.')).toBe(-0);
  });

  it('parseNumberCell(text, hex, the wrong decimal mark, empty) gives NaN', () => {
    for (const cell of ['', '  ', 'abc', '0x1A', '1.2.3', '1e', '-', '1,5']) expect(parseNumberCell(cell, '.')).toBeNaN();
    expect(parseNumberCell('1.5', ',')).toBeNaN();
    expect(isBlankCell(' \r')).toBe(true);
    expect(isBlankCell(' 0')).toBe(false);
    expect(isNonFiniteSpelling('-Inf')).toBe(true);
    expect(isNonFiniteSpelling('1.#IND')).toBe(true);
    expect(isNonFiniteSpelling('nan')).toBe(true);
  });

  it('parseNumberCell(text of any double) equals Number(text): the fast path equals Number() bit for bit', () => {
    // Clinger 1990 fast path: exact when the significand < 2^53 and |power of ten| <= 22
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), (x) => {
        expect(Object.is(parseNumberCell(String(x), '.'), Number(String(x)))).toBe(true);
        expect(Object.is(parseNumberCell(x.toPrecision(7), '.'), Number(x.toPrecision(7)))).toBe(true);
        expect(Object.is(parseNumberCell(x.toFixed(4).replace('.', ','), ','), Number(x.toFixed(4)))).toBe(true);
      }),
      { seed: 314, numRuns: 2000 },
    );
  });
});
