import { describe, expect, it } from 'vitest';
import { formatRelative, formatSI, formatValue, formatWithError, plural } from '../../src/state/format.ts';

describe('state/format', () => {
  it('formatWithError writes the value to the decimal place of a two-figure error', () => {
    // Common practice, no source: the error to two significant figures, the value to match.
    expect(formatWithError(4.5237, 0.0318)).toBe('4.524 ± 0.032');
    expect(formatWithError(-13.117, 0.17)).toBe('-13.12 ± 0.17');
    expect(formatWithError(5.6901, 0.0241)).toBe('5.690 ± 0.024');
    expect(formatWithError(123.4, 12)).toBe('123 ± 12');
  });

  it('formatWithError falls back to the value alone, and to a dash for missing values', () => {
    expect(formatWithError(4.5237, null)).toBe('4.524');
    expect(formatWithError(4.5237, Number.NaN)).toBe('4.524');
    expect(formatWithError(null, 0.1)).toBe('—');
  });

  it('formatWithError moves very large or small values into a shared exponent', () => {
    expect(formatWithError(3.2e-12, 4.1e-13)).toBe('(3.20 ± 0.41)e-12');
  });

  it('formatValue keeps three significant figures and trims trailing zeros', () => {
    expect(formatValue(4.5)).toBe('4.5');
    expect(formatValue(9.98123)).toBe('9.98');
    expect(formatValue(2.5e-7)).toBe('2.5e-7');
    expect(formatValue(undefined)).toBe('—');
  });

  it('formatSI picks the prefix that brings the value into [1, 1000)', () => {
    expect(formatSI(9.98e-9, 'A')).toBe('9.98 nA');
    expect(formatSI(2.1e7, 'A/m²')).toBe('21 MA/m²');
    expect(formatSI(0, 'A')).toBe('0 A');
  });

  it('formatRelative and plural', () => {
    expect(formatRelative(4, 0.1)).toBe('2.5 %');
    expect(formatRelative(0, 0.1)).toBe('—');
    expect(plural(1, 'curve')).toBe('1 curve');
    expect(plural(3, 'curve')).toBe('3 curves');
  });
});
