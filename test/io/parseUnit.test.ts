import { describe, expect, it } from 'vitest';
import { parseUnit, parseUnitAs } from '../../src/io/index.ts';

describe('parseUnit', () => {
  it('parseUnit(prefixed units) gives the SI factor of each prefix', () => {
    // BIPM SI Brochure, 9th ed. (2019), Table 7: f 1e-15, p 1e-12, n 1e-9, µ 1e-6, m 1e-3, k 1e3
    expect(parseUnit('fA')[0]).toMatchObject({ dimension: 'current', scaleToSI: 1e-15, siUnit: 'A' });
    expect(parseUnit('pA')[0].scaleToSI).toBe(1e-12);
    expect(parseUnit('nm')[0]).toMatchObject({ dimension: 'length', scaleToSI: 1e-9, siUnit: 'm' });
    expect(parseUnit('µm')[0].scaleToSI).toBe(1e-6);
    expect(parseUnit('\u03bcm')[0].scaleToSI).toBe(1e-6);
    expect(parseUnit('um')[0].scaleToSI).toBe(1e-6);
    expect(parseUnit('mV')[0]).toMatchObject({ dimension: 'voltage', scaleToSI: 1e-3 });
    expect(parseUnit('kHz')[0]).toMatchObject({ dimension: 'frequency', scaleToSI: 1e3 });
    expect(parseUnit('ms')[0]).toMatchObject({ dimension: 'time', scaleToSI: 1e-3 });
    expect(parseUnit('nS')[0]).toMatchObject({ dimension: 'conductance', scaleToSI: 1e-9 });
  });

  it('parseUnit(Å, A, angstrom) reads lengths of 1e-10 m; a bare A is ampere first, ångström second', () => {
    // BIPM SI Brochure, 8th ed. (2006), Table 8: 1 Å = 1e-10 m
    expect(parseUnit('Å')[0]).toMatchObject({ dimension: 'length', scaleToSI: 1e-10 });
    // Unicode: U+212B ANGSTROM SIGN normalises (NFC) to U+00C5
    expect(parseUnit('\u212b')[0].scaleToSI).toBe(1e-10);
    expect(parseUnit('angstrom')[0].scaleToSI).toBe(1e-10);
    expect(parseUnit('A').map((u) => u.dimension)).toEqual(['current', 'length']);
    expect(parseUnitAs('A', 'length')?.scaleToSI).toBe(1e-10);
    expect(parseUnit('nA').map((u) => u.dimension)).toEqual(['current']);
  });

  it('parseUnit(quotients) reads piezo calibrations and conductances in A/V', () => {
    expect(parseUnit('nm/V')[0]).toMatchObject({ dimension: 'lengthPerVoltage', scaleToSI: 1e-9, siUnit: 'm/V' });
    expect(parseUnit('Å/V')[0].scaleToSI).toBe(1e-10);
    expect(parseUnit('nA/V')[0]).toMatchObject({ dimension: 'conductance', scaleToSI: 1e-9 });
    expect(parseUnit('m/mV')[0].scaleToSI).toBe(1000);
  });

  it('parseUnit(°C) carries the Kelvin offset', () => {
    // BIPM SI Brochure, 9th ed., 2.3.1: t/°C = T/K − 273.15
    expect(parseUnit('°C')[0]).toMatchObject({ dimension: 'temperature', scaleToSI: 1, offsetToSI: 273.15, siUnit: 'K' });
    expect(parseUnit('mK')[0].scaleToSI).toBe(1e-3);
  });

  it('parseUnit(not a unit) returns no reading', () => {
    expect(parseUnit('')).toEqual([]);
    expect(parseUnit('qu')).toEqual([]);
    expect(parseUnit('dV')).toEqual([]);
    expect(parseUnit('ret')).toEqual([]);
    expect(parseUnit('nÅ')).toEqual([]);
  });
});
