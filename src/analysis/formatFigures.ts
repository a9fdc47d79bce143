/**
 * Number formatting for flag reasons (internal; not re-exported from index.ts). Three significant
 * figures by default, SI prefixes for currents and conductances.
 */

/**
 * A number with a given count of significant figures, without exponent for 1e-3 ≤ |x| < 1e5 and
 * without trailing zeros after the decimal point.
 * @example formatNumber(9.98123) // '9.98'
 * @example formatNumber(2.5e-7) // '2.5e-7'
 */
export function formatNumber(value: number, significantFigures = 3): string {
  if (!Number.isFinite(value)) return String(value);
  if (value === 0) return '0';
  const magnitude = Math.abs(value);
  if (magnitude >= 1e-3 && magnitude < 1e5) {
    const text = value.toPrecision(significantFigures);
    return text.includes('.') && !text.includes('e') ? text.replace(/\.?0+$/, '') : text;
  }
  const [mantissa, exponent] = value.toExponential(significantFigures - 1).split('e');
  const trimmedMantissa = mantissa.includes('.') ? mantissa.replace(/\.?0+$/, '') : mantissa;
  return `${trimmedMantissa}e${Number(exponent)}`;
}

const SI_PREFIXES: readonly { readonly factor: number; readonly prefix: string }[] = [
  { factor: 1, prefix: '' },
  { factor: 1e-3, prefix: 'm' },
  { factor: 1e-6, prefix: 'µ' },
  { factor: 1e-9, prefix: 'n' },
  { factor: 1e-12, prefix: 'p' },
  { factor: 1e-15, prefix: 'f' },
];

/**
 * A value in an SI unit with the prefix that puts it in [1, 1000): 9.98e-9 A → '9.98 nA'.
 * @example formatWithPrefix(9.98e-9, 'A') // '9.98 nA'
 */
export function formatWithPrefix(value: number, unit: string, significantFigures = 3): string {
  const magnitude = Math.abs(value);
  if (!Number.isFinite(value) || magnitude === 0) return `${formatNumber(value, significantFigures)} ${unit}`;
  for (const { factor, prefix } of SI_PREFIXES) {
    if (magnitude >= factor * (1 - 5e-4)) return `${formatNumber(value / factor, significantFigures)} ${prefix}${unit}`;
  }
  return `${formatNumber(value, significantFigures)} ${unit}`;
}

/**
 * A probability for a reason: two significant figures, exponent below 1e-3.
 * @example formatProbability(3.2e-12) // '3.2e-12'
 */
export function formatProbability(probability: number): string {
  if (probability < 1e-300) return '< 1e-300';
  return formatNumber(probability, 2);
}

/**
 * A percentage with at most three significant figures.
 * @example formatPercent(0.2412) // '24.1 %'
 */
export function formatPercent(fraction: number): string {
  return `${formatNumber(100 * fraction, 3)} %`;
}

/**
 * "N point" or "N points".
 * @example pointsPhrase(1) // '1 point'
 */
export function pointsPhrase(count: number): string {
  return count === 1 ? '1 point' : `${count} points`;
}
