/**
 * Text helpers of the HTML report: escaping of anything that comes from data, and number formats
 * (values to the precision their uncertainty supports, p-values, a true minus sign). Pure.
 */

const HTML_ESCAPES: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' };

/**
 * Escape text for HTML element content and quoted attribute values: & < > " ' become entities,
 * so a file name like `<script>` shows as text and never runs. Any value is turned into text first.
 * Source: OWASP Cross Site Scripting Prevention Cheat Sheet, rule #1 and #2 (common practice; from memory).
 * @example escapeHtml('<script>alert("x")</script>') // '&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt;'
 */
export function escapeHtml(value: unknown): string {
  return String(value ?? '').replace(/[&<>"']/g, (character) => HTML_ESCAPES[character]);
}

/** The typographic minus sign (U+2212) in place of a leading hyphen. */
function minus(text: string): string {
  return text.startsWith('-') ? `\u2212${text.slice(1)}` : text;
}

/**
 * Decimal places that show an uncertainty to two significant figures (and its value to match),
 * between 0 and 8: decimals = 1 − floor(log10 u).
 * Source: common practice for quoting a value with its uncertainty (two significant figures of the
 * uncertainty), e.g. the GUM (JCGM 100:2008) §7.2.6 [from memory].
 * @example decimalsForUncertainty(0.0295) // 3
 */
export function decimalsForUncertainty(uncertainty: number): number {
  if (!(uncertainty > 0) || !Number.isFinite(uncertainty)) return 3;
  return Math.min(8, Math.max(0, 1 - Math.floor(Math.log10(uncertainty))));
}

/**
 * A number with a fixed count of decimals and a true minus sign; '—' for null or non-finite.
 * @example formatFixed(-0.29114, 3) // '−0.291'
 */
export function formatFixed(value: number | null | undefined, decimals: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  const text = value.toFixed(decimals);
  return minus(Number(text) === 0 ? text.replace(/^-/, '') : text);
}

/**
 * A number to a count of significant figures (no exponent for 1e-3 ≤ |x| < 1e6), true minus sign,
 * '—' for null or non-finite.
 * @example formatSignificant(1.41714726845, 3) // '1.42'
 */
export function formatSignificant(value: number | null | undefined, significantFigures = 3): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  if (value === 0) return '0';
  const magnitude = Math.abs(value);
  if (magnitude >= 1e-3 && magnitude < 1e6) return minus(String(Number(value.toPrecision(significantFigures))));
  const [mantissa, exponent] = value.toExponential(significantFigures - 1).split('e');
  return minus(`${Number(mantissa)}e${Number(exponent)}`);
}

/**
 * A p-value: two significant figures, exponent form below 1e-3, '< 1e-300' at the floor of doubles.
 * @example formatPValue(2.776e-14) // '2.8e-14'
 */
export function formatPValue(pValue: number | null | undefined): string {
  if (pValue === null || pValue === undefined || !Number.isFinite(pValue)) return '—';
  if (pValue < 1e-300) return '< 1e-300';
  return formatSignificant(pValue, 2);
}
