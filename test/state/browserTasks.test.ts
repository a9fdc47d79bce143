import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { analyzeCurve } from '../../src/analysis/index.ts';
import { DEFAULT_SETTINGS } from '../../src/fit/index.ts';
import { importText } from '../../src/io/index.ts';
import { curveInput } from '../../src/state/fitKey.ts';
import { decodeText, sniffTextEncoding } from '../../src/state/decodeText.ts';
import { handleBrowserTask, importTask } from '../../src/workers/browserTasks.ts';

const fixture = (name: string) => new Uint8Array(readFileSync(new URL(`../fixtures/import/${name}`, import.meta.url)));
const memory = { version: 1 as const, answers: {} };

describe('workers/browserTasks', () => {
  it('importTask decodes bytes like the CLI reader and imports them', () => {
    const reply = importTask({ type: 'import', fileName: 'comma-single.csv', bytes: fixture('comma-single.csv'), memory });
    expect(reply.encoding).toBe('utf-8');
    expect(reply.file.curves.length).toBe(1);
    expect(reply.file.rawText).toBe(new TextDecoder().decode(fixture('comma-single.csv')));
  });

  it('importTask reports a malformed file as located problems, never as an exception', () => {
    const reply = importTask({ type: 'import', fileName: 'bad-ragged.csv', bytes: fixture('bad-ragged.csv'), memory });
    expect(reply.file.problems[0]).toMatchObject({ file: 'bad-ragged.csv', line: 4, column: 3, severity: 'error', code: 'ragged' });
    const noInput = importTask({ type: 'import', fileName: 'x.csv', memory });
    expect(noInput.file.problems[0].code).toBe('noInput');
    const badMapping = importTask({ type: 'import', fileName: 'x.csv', text: '1,2\n3,4\n', mapping: { columnRoles: { 9: 'distance' } }, memory });
    expect(badMapping.file.problems[0].code).toBe('mappingRejected');
  });

  it('decodeText reads Latin-1 when the bytes are not UTF-8, and keeps a UTF-8 BOM', () => {
    expect(sniffTextEncoding(Uint8Array.of(0x7a, 0xc5, 0x0a))).toBe('latin1');
    expect(decodeText(Uint8Array.of(0x41, 0xc5)).text).toBe('AÅ');
    expect(decodeText(Uint8Array.of(0xef, 0xbb, 0xbf, 0x41)).text).toBe('\ufeffA');
    expect(decodeText(Uint8Array.of(0xff, 0xfe, 0x41, 0x00)).text).toBe('\ufeffA');
  });

  it('handleBrowserTask(analyze) gives exactly analyzeCurve, through structured cloning', () => {
    const curve = importText(new TextDecoder().decode(fixture('comma-single.csv')), 'comma-single.csv').curves[0];
    const reply = handleBrowserTask(structuredClone({ type: 'analyze' as const, curve: curveInput(curve, null), settings: { ...DEFAULT_SETTINGS } }));
    expect(reply.type === 'analyze' && reply.result).toEqual(analyzeCurve(curve, DEFAULT_SETTINGS));
  });

  it('handleBrowserTask names an unknown task type', () => {
    expect(() => handleBrowserTask({ type: 'nope' } as never)).toThrow('handleBrowserTask: type must be analyze, import, detail or deviation, got nope');
  });
});
