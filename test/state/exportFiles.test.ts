import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { analyzeCurve, finishBatch } from '../../src/analysis/index.ts';
import { DEFAULT_SETTINGS } from '../../src/fit/index.ts';
import { importText } from '../../src/io/index.ts';
import { RESULT_COLUMNS } from '../../src/io/resultColumns.ts';
import { resultsCsv, resultsJson, safeFileName, settingsLines, type ExportContext } from '../../src/state/exportFiles.ts';

const text = ['# run: =HYPERLINK("x")', 'z (nm),I (pA)', ...Array.from({ length: 16 }, (_, i) => `${(0.02 * i).toFixed(2)},${(800 * Math.exp(-21 * 0.02 * i) * (1 + 0.02 * Math.sin(i))).toFixed(4)}`)].join('\n');
const results = finishBatch([analyzeCurve(importText(text, 'a.csv').curves[0])]);
const context: ExportContext = {
  sessionName: 'Demo',
  settings: { ...DEFAULT_SETTINGS, tipRadiusNm: 12, runOverrides: { 'B-gold': { tipRadiusNm: 25 } } },
  manualWindows: { 'a.csv#0/single': { fromNm: 0.02, toNm: 0.2 } },
  exportedAt: '2024-05-01T12:00:00.000Z',
};

describe('state/exportFiles', () => {
  it('resultsCsv parses back (with # comments) to the same numbers in the RESULT_COLUMNS headers', () => {
    const csv = resultsCsv(results, context);
    const parsed = Papa.parse<Record<string, string>>(csv, { header: true, comments: '#', skipEmptyLines: true });
    expect(parsed.errors).toEqual([]);
    expect(parsed.meta.fields).toEqual(RESULT_COLUMNS.map((c) => c.header));
    const row = parsed.data[0];
    expect(Number(row['apparent barrier (eV)'])).toBe(results[0].apparentBarrierEV);
    expect(Number(row['apparent barrier err (eV)'])).toBe(results[0].apparentBarrierErrEV);
    expect(Number(row['R2'])).toBe(results[0].quality.r2);
  });

  it('resultsCsv escapes a cell that a spreadsheet would run as a formula', () => {
    // OWASP "CSV Injection": a leading apostrophe keeps =, +, -, @ cells as text.
    const row = Papa.parse<Record<string, string>>(resultsCsv(results, context), { header: true, comments: '#' }).data[0];
    expect(row.run).toBe(`'=HYPERLINK("x")`);
  });

  it('settingsLines write every setting, each run override and each manual window', () => {
    const lines = settingsLines(context);
    expect(lines[0]).toBe('# Burrow results, session Demo, exported 2024-05-01T12:00:00.000Z');
    expect(lines).toContain('# setting model: auto');
    expect(lines).toContain('# setting tipWorkFunctionEV: none');
    expect(lines).toContain('# setting tipRadiusNm: 12');
    expect(lines).toContain('# setting runOverrides.B-gold.tipRadiusNm: 25');
    expect(lines).toContain('# manual window a.csv#0/single: 0.02 to 0.2 nm');
    expect(lines.filter((l) => l.startsWith('# setting ') && !l.includes('runOverrides')).length).toBe(Object.keys(DEFAULT_SETTINGS).length - 1);
  });

  it('resultsJson carries the settings and writes non-finite numbers as null', () => {
    const parsed = JSON.parse(resultsJson(results, context));
    expect(parsed.format).toBe('burrow-results');
    expect(parsed.settings.tipRadiusNm).toBe(12);
    expect(parsed.results[0].apparentBarrierEV).toBe(results[0].apparentBarrierEV);
    expect(safeFileName('Demo session: 1/2')).toBe('Demo-session-1-2');
  });
});
