import { mkdir, mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { importPaths, listDataFiles, listSettingsFiles, readTextChunks, sniffEncoding } from '../../src/io/readFileNode.ts';

let folder = '';

beforeAll(async () => {
  folder = await mkdtemp(join(tmpdir(), 'burrow-io-'));
  await mkdir(join(folder, 'runs', 'day2'), { recursive: true });
  await mkdir(join(folder, 'runs', '.hidden'), { recursive: true });
  const table = 'gap (nm),current (pA)\n0.5,100\n0.6,37\n0.7,13\n';
  await writeFile(join(folder, 'runs', 'b.csv'), table);
  await writeFile(join(folder, 'runs', 'a.txt'), table);
  await writeFile(join(folder, 'runs', 'notes.md'), '# not data');
  await writeFile(join(folder, 'runs', 'settings.json'), '{}');
  await writeFile(join(folder, 'runs', 'day2', 'tip-B-settings.json'), '{}');
  await writeFile(join(folder, 'runs', 'day2', 'c.dat'), table);
  await writeFile(join(folder, 'runs', '.hidden', 'd.csv'), table);
  // Latin-1 bytes: µ is 0xB5 and Å is 0xC5 in ISO 8859-1.
  await writeFile(join(folder, 'latin1.csv'), Buffer.from('gap (\xc5),I (\xb5A)\n5,1e-3\n6,4e-4\n7,1e-4\n', 'latin1'));
  // UTF-16LE with its byte order mark FF FE (Unicode Standard, section 23.8).
  await writeFile(join(folder, 'utf16.csv'), Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from('z (nm),I (pA)\r\n0.5,10\r\n0.6,4\r\n', 'utf16le')]));
});

afterAll(async () => {
  await rm(folder, { recursive: true, force: true });
});

describe('readFileNode', () => {
  it('listDataFiles(folder) walks sub-folders in name order, skipping hidden entries and other extensions', async () => {
    expect(await listDataFiles(['runs', 'missing.csv'], folder)).toEqual([join('runs', 'a.txt'), join('runs', 'b.csv'), join('runs', 'day2', 'c.dat'), 'missing.csv']);
  });

  it('listSettingsFiles finds the settings files kept with the data; listDataFiles leaves them out even when named', async () => {
    expect(await listSettingsFiles(['runs', 'other.json'], folder)).toEqual([join('runs', 'day2', 'tip-B-settings.json'), join('runs', 'settings.json')]);
    expect(await listSettingsFiles([join('runs', 'settings.json'), join('runs', 'b.csv')], folder)).toEqual([join('runs', 'settings.json')]);
    expect(await listDataFiles([join('runs', 'settings.json'), join('runs', 'b.csv')], folder)).toEqual([join('runs', 'b.csv')]);
  });

  it('sniffEncoding(first bytes) recognises UTF-16 marks, valid UTF-8 and falls back to Latin-1', () => {
    expect(sniffEncoding(new Uint8Array([0xff, 0xfe, 0x41, 0x00]))).toBe('utf-16le');
    expect(sniffEncoding(new Uint8Array([0xfe, 0xff, 0x00, 0x41]))).toBe('utf-16be');
    expect(sniffEncoding(new TextEncoder().encode('µm'))).toBe('utf-8');
    expect(sniffEncoding(new Uint8Array([0x28, 0xb5, 0x41, 0x29]))).toBe('latin1');
  });

  it('readTextChunks decodes Latin-1 and UTF-16 files and keeps the byte order mark', async () => {
    let text = '';
    for await (const chunk of readTextChunks(join(folder, 'utf16.csv'))) text += chunk;
    expect(text.startsWith('\ufeffz (nm)')).toBe(true);
    const files = await importPaths(['latin1.csv', 'utf16.csv'], { cwd: folder });
    expect(files.map((f) => [f.encoding, f.columns.map((c) => c.unit), f.problems])).toEqual([
      ['latin1', ['Å', 'µA'], []],
      ['utf-16le', ['nm', 'pA'], []],
    ]);
    expect(files[0].curves[0].current[0]).toBeCloseTo(1e-9, 20);
    expect(files[1].dialect.hasBOM).toBe(true);
    expect(files[1].sourcePath).toBe(join(folder, 'utf16.csv'));
  });

  it('importPaths keeps going past a file that cannot be read', async () => {
    const files = await importPaths(['runs/b.csv', 'missing.csv', 'runs/a.txt'], { cwd: folder });
    expect(files.map((f) => [f.fileName, f.curves.length, f.problems.map((p) => p.code)])).toEqual([
      ['runs/b.csv', 1, []],
      ['missing.csv', 0, ['readFailed']],
      ['runs/a.txt', 1, []],
    ]);
    expect(files[1].problems[0].message).toBe('cannot read the file (ENOENT)');
  });
});
