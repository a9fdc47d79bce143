import { describe, expect, it } from 'vitest';
import { decimalsForUncertainty, escapeHtml, formatFixed, formatPValue, formatSignificant } from '../../src/io/reportFormat.ts';

describe('reportFormat', () => {
  it('escapeHtml turns markup and quotes into entities', () => {
    // OWASP XSS prevention cheat sheet, rule 1 [from memory]: & < > " ' are the characters to encode
    expect(escapeHtml(`<script>alert("x")</script> & 'y'`)).toBe('&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt; &amp; &#39;y&#39;');
    expect(escapeHtml(null)).toBe('');
    expect(escapeHtml(3)).toBe('3');
  });

  it('decimalsForUncertainty shows two significant figures of the uncertainty', () => {
    // common practice (two significant figures of an uncertainty), no source: 0.0295 → 0.030, 0.29 → 0.29, 2.3 → 2.3, 23 → 23
    expect([decimalsForUncertainty(0.0295), decimalsForUncertainty(0.29), decimalsForUncertainty(2.3), decimalsForUncertainty(23)]).toEqual([3, 2, 1, 0]);
    expect(decimalsForUncertainty(0)).toBe(3);
  });

  it('formatFixed, formatSignificant and formatPValue use a true minus and an exponent for tiny p', () => {
    expect(formatFixed(-0.29114, 3)).toBe('\u22120.291');
    expect(formatFixed(-0.0001, 2)).toBe('0.00');
    expect(formatFixed(null, 2)).toBe('—');
    expect(formatSignificant(1.41714726845, 3)).toBe('1.42');
    expect(formatSignificant(-2.5e-7, 2)).toBe('\u22122.5e-7');
    expect(formatPValue(2.776e-14)).toBe('2.8e-14');
    expect(formatPValue(0.0217)).toBe('0.022');
    expect(formatPValue(0)).toBe('< 1e-300');
  });
});
