import { describe, expect, it } from 'vitest';
import { DEFAULT_SETTINGS } from '../../src/fit/index.ts';
import { readBundle, writeBundle, type SessionBundle } from '../../src/state/sessionBundle.ts';
import { DEFAULT_FILTERS } from '../../src/state/types.ts';

const bundle: SessionBundle = {
  format: 'burrow-session',
  version: 1,
  name: 'Gold, day 2',
  createdAt: '2024-05-01T10:00:00.000Z',
  exportedAt: '2024-05-01T12:00:00.000Z',
  settings: { ...DEFAULT_SETTINGS, tipWorkFunctionEV: 4.5, runOverrides: { 'A-gold': { tipRadiusNm: 12 } } },
  mappings: { version: 1, answers: { 'comma|2|no header': { columnRoles: { 1: 'distance', 2: 'current' }, units: { 1: 'nm', 2: 'pA' } } } },
  manualWindows: { 'a.csv#0/single': { fromNm: 0.1, toNm: 0.3 } },
  files: [{ key: 'a.csv', fileName: 'a.csv', text: 'z (nm),I (pA)\n0.1,100\n0.2,30\n', mapping: { columnRoles: { 1: 'distance', 2: 'current' } } }],
  results: [],
  view: { selectedCurveId: 'a.csv#0/single', tab: 'table', filters: { ...DEFAULT_FILTERS, kind: 'iz' } },
};

describe('state/sessionBundle', () => {
  it('readBundle(writeBundle(b)) gives the bundle back', () => {
    expect(readBundle(writeBundle(bundle))).toEqual(bundle);
  });

  it('readBundle names the first problem: not JSON, wrong format, bad settings, bad files', () => {
    expect(() => readBundle('{')).toThrow(/^session bundle: not valid JSON/);
    expect(() => readBundle('{"format":"other","version":1}')).toThrow("session bundle: format must be 'burrow-session', got \"other\"");
    const badSettings = { ...bundle, settings: { temperatureK: -1 } };
    expect(() => readBundle(JSON.stringify(badSettings))).toThrow('session bundle: settings: temperatureK must be a number >= 0 and <= 2000 K, got -1');
    expect(() => readBundle(JSON.stringify({ ...bundle, files: [{ fileName: 'a.csv' }] }))).toThrow('session bundle: files[0].text must be a string');
    expect(() => readBundle(JSON.stringify({ ...bundle, files: [bundle.files[0], bundle.files[0]] }))).toThrow("session bundle: files[1]: key 'a.csv' appears twice");
    expect(() => readBundle(JSON.stringify({ ...bundle, manualWindows: { x: { fromNm: 2, toNm: 1 } } }))).toThrow("manualWindows['x'] must be { fromNm, toNm } with fromNm < toNm");
  });

  it('readBundle drops result records that do not look like results (they are fitted again)', () => {
    const broken = { ...bundle, results: [{ curveId: 'a.csv#0/single', fitKey: 'k', result: { curve: 'a.csv#0/single', kind: 'iz', flags: 'oops', quality: {} } }] };
    expect(readBundle(JSON.stringify(broken)).results).toEqual([]);
  });
});
