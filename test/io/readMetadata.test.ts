import { describe, expect, it } from 'vitest';
import { ProblemLog } from '../../src/io/problemLog.ts';
import { parseMetadataLine, readMetadata } from '../../src/io/readMetadata.ts';

function read(lines: string[], delimiter: ',' | ';' = ',', decimalMark: '.' | ',' = '.') {
  const log = new ProblemLog('m.txt');
  const metadata = readMetadata(lines.map((text, i) => ({ line: i + 1, text })), delimiter, decimalMark, log);
  return { metadata, problems: log.list() };
}

describe('parseMetadataLine', () => {
  it('parseMetadataLine(each form) splits key and value, markers removed', () => {
    expect(parseMetadataLine('# Sample: gold film', ',')).toEqual({ label: 'Sample', value: 'gold film' });
    expect(parseMetadataLine('% bias = -0.5 V', ',')).toEqual({ label: 'bias', value: '-0.5 V' });
    expect(parseMetadataLine('// tip: W', ',')).toEqual({ label: 'tip', value: 'W' });
    expect(parseMetadataLine('; date\t2024-01-02', ';')).toEqual({ label: 'date', value: '2024-01-02' });
    expect(parseMetadataLine('Setpoint;50;pA', ';')).toEqual({ label: 'Setpoint', value: '50 pA' });
    expect(parseMetadataLine('started at 10:20', ',')).toEqual({ label: 'started at 10', value: '20' });
    expect(parseMetadataLine('# just words, no key', ',')).toEqual({ label: '', value: 'just words, no key' });
    expect(parseMetadataLine('#########', ',')).toBeNull();
  });
});

describe('readMetadata', () => {
  it('readMetadata(known quantities) gives Burrow keys with SI values', () => {
    const { metadata, problems } = read(['Set point: 0,2 nA', 'Sample bias = 250 mV', 'Temp: -269,0 °C', 'z sensitivity: 8 Å/V', 'tip: PtIr'], ';', ',');
    expect(problems).toEqual([]);
    expect(metadata.setpointCurrent).toMatchObject({ raw: '0,2 nA', unit: 'A', label: 'Set point', line: 1 });
    expect(metadata.setpointCurrent.value).toBeCloseTo(2e-10, 22);
    expect(metadata.biasVoltage).toMatchObject({ value: 0.25, unit: 'V' });
    // BIPM SI Brochure 9th ed., 2.3.1: T/K = t/°C + 273.15
    expect(metadata.temperature.value).toBeCloseTo(4.15, 10);
    expect(metadata.piezoZCalibration).toMatchObject({ unit: 'm/V' });
    expect(metadata.piezoZCalibration.value).toBeCloseTo(8e-10, 22);
    expect(metadata.tip.raw).toBe('PtIr');
  });

  it('readMetadata keeps every other key, numbers under unknown keys in SI, free text as notes', () => {
    const { metadata } = read(['lock-in amplitude: 10 mV', 'operator: QX', 'free words here', 'more free words', 'operator: ZY', 'gain: 9']);
    expect(metadata['lock-in amplitude']).toMatchObject({ value: 0.01, unit: 'V' });
    expect(metadata.operator.raw).toBe('QX');
    expect(metadata['operator (2)'].raw).toBe('ZY');
    expect(metadata.note1.raw).toBe('free words here');
    expect(metadata.note2.raw).toBe('more free words');
    expect(metadata.gain).toMatchObject({ value: 9, unit: '' });
  });

  it('readMetadata warns about a known quantity with an implausible bare number or a wrong unit', () => {
    const { metadata, problems } = read(['setpoint: 100', 'bias: 3 nm', 'bias (V): 0.4', 'temperature: cold']);
    expect(metadata.setpointCurrent.value).toBeUndefined();
    expect(metadata['biasVoltage (2)'].value).toBe(0.4);
    expect(problems.map((p) => `${p.code} ${p.line}`)).toEqual(['metadataUnit 1', 'metadataUnit 2', 'metadataValue 4']);
  });
});
