import { describe, expect, it } from 'vitest';
import { parseHeaderCell } from '../../src/io/index.ts';

describe('parseHeaderCell', () => {
  it('parseHeaderCell(each unit form) splits name and unit', () => {
    expect(parseHeaderCell('z (nm)')).toEqual({ name: 'z', unitText: 'nm', form: 'parentheses' });
    expect(parseHeaderCell('Current [pA]')).toEqual({ name: 'Current', unitText: 'pA', form: 'brackets' });
    expect(parseHeaderCell('bias/mV')).toEqual({ name: 'bias', unitText: 'mV', form: 'slash' });
    expect(parseHeaderCell('I_A')).toEqual({ name: 'I', unitText: 'A', form: 'underscore' });
    expect(parseHeaderCell('Z_m')).toEqual({ name: 'Z', unitText: 'm', form: 'underscore' });
    expect(parseHeaderCell('current in pA')).toEqual({ name: 'current', unitText: 'pA', form: 'in' });
    expect(parseHeaderCell('Bias V')).toEqual({ name: 'Bias', unitText: 'V', form: 'space' });
    expect(parseHeaderCell('gap')).toEqual({ name: 'gap', unitText: '', form: 'none' });
  });

  it('parseHeaderCell keeps slashes and underscores that are not units in the name', () => {
    expect(parseHeaderCell('dI/dV')).toEqual({ name: 'dI/dV', unitText: '', form: 'none' });
    expect(parseHeaderCell('dI/dV (nA/V)')).toMatchObject({ name: 'dI/dV', unitText: 'nA/V' });
    expect(parseHeaderCell('I_ret')).toMatchObject({ name: 'I_ret', unitText: '' });
    expect(parseHeaderCell('tip_height_nm')).toMatchObject({ name: 'tip_height', unitText: 'nm' });
  });

  it('parseHeaderCell(quoted cell) removes RFC 4180 quotes and keeps unknown bracketed units', () => {
    // RFC 4180, section 2, rule 7: a doubled quote inside a quoted field is one quote
    expect(parseHeaderCell('"current ""raw"" (pA)"')).toMatchObject({ name: 'current "raw"', unitText: 'pA' });
    expect(parseHeaderCell('gap (qu)')).toMatchObject({ name: 'gap', unitText: 'qu' });
    expect(parseHeaderCell('gap (tip to sample surface)')).toMatchObject({ name: 'gap (tip to sample surface)', unitText: '' });
  });
});
