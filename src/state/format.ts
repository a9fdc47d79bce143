/**
 * Number formatting for the dashboard: values with their uncertainty, counts, SI prefixes. Pure
 * text; no physics. Shared by the result card, the curve browser and the batch table so one
 * number reads the same everywhere.
 */

/**
 * A number with `significantFigures` significant figures, plain between 1e-3 and 1e5, otherwise
 * in exponent form; trailing zeros after the point are dropped. null, undefined and non-finite
 * values give an em dash.
 * @example formatValue(4.52371) // '4.52'
 * @example formatValue(2.5e-7) // '2.5e-7'
 */
export function formatValue(value: number | null | undefined, significantFigures = 3): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  if (value === 0) return '0';
  const magnitude = Math.abs(value);
  if (magnitude >= 1e-3 && magnitude < 1e5) {
    const text = value.toPrecision(significantFigures);
    return text.includes('.') && !text.includes('e') ? text.replace(/\.?0+$/, '') : text;
  }
  const [mantissa, exponent] = value.toExponential(significantFigures - 1).split('e');
  return `${mantissa.includes('.') ? mantissa.replace(/\.?0+$/, '') : mantissa}e${Number(exponent)}`;
}

/**
 * A value and its standard error written to the same decimal place, the error rounded to two
 * significant figures (common practice, no source): 4.5237 ± 0.0318 → '4.524 ± 0.032'.
 * Without a usable error, the value alone with four significant figures.
 * @example formatWithError(4.5237, 0.0318) // '4.524 ± 0.032'
 * @example formatWithError(4.5237, null) // '4.524'
 */
export function formatWithError(value: number | null | undefined, error: number | null | undefined): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  if (error === null || error === undefined || !Number.isFinite(error) || error <= 0) return formatValue(value, 4);
  const magnitude = Math.max(Math.abs(value), error);
  if (magnitude >= 1e5 || magnitude < 1e-3) {
    const exponent = Math.floor(Math.log10(magnitude));
    const scale = 10 ** exponent;
    return `(${formatWithError(value / scale, error / scale)})e${exponent}`;
  }
  const errorExponent = Math.floor(Math.log10(error));
  const decimals = Math.max(0, 1 - errorExponent);
  return `${value.toFixed(decimals)} ± ${error.toFixed(decimals)}`;
}

/**
 * Relative error in percent with two significant figures, or an em dash.
 * @example formatRelative(4.52, 0.045) // '1 %'
 */
export function formatRelative(value: number | null | undefined, error: number | null | undefined): string {
  if (value === null || value === undefined || error === null || error === undefined) return '—';
  if (!Number.isFinite(value) || !Number.isFinite(error) || value === 0) return '—';
  return `${formatValue((100 * Math.abs(error)) / Math.abs(value), 2)} %`;
}

const PREFIXES: readonly [number, string][] = [
  [1e9, 'G'],
  [1e6, 'M'],
  [1e3, 'k'],
  [1, ''],
  [1e-3, 'm'],
  [1e-6, 'µ'],
  [1e-9, 'n'],
  [1e-12, 'p'],
  [1e-15, 'f'],
];

/**
 * A value in an SI unit with the prefix that brings it into [1, 1000).
 * @example formatSI(9.98e-9, 'A') // '9.98 nA'
 */
export function formatSI(value: number | null | undefined, unit: string, significantFigures = 3): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  if (value === 0) return `0 ${unit}`;
  const magnitude = Math.abs(value);
  for (const [factor, prefix] of PREFIXES) {
    if (magnitude >= factor * (1 - 5e-4)) return `${formatValue(value / factor, significantFigures)} ${prefix}${unit}`;
  }
  return `${formatValue(value, significantFigures)} ${unit}`;
}

/**
 * "1 curve", "3 curves".
 * @example plural(3, 'curve') // '3 curves'
 */
export function plural(count: number, noun: string, pluralNoun = `${noun}s`): string {
  return `${count} ${count === 1 ? noun : pluralNoun}`;
}
