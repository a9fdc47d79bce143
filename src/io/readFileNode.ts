/**
 * Node-only wrapper for the command line: reads files and folders from disk and streams them
 * into the pure importer. The browser and workers use importText/importChunks directly.
 */
import { createReadStream } from 'node:fs';
import { readdir, stat } from 'node:fs/promises';
import { join, resolve } from 'node:path';
import { failedImport } from './importFiles.ts';
import { importChunks } from './importText.ts';
import { isSettingsFileName } from './settingsFile.ts';
import type { ImportedFile, ImportOptions, MappingAnswer } from './types.ts';

/** File name endings picked up when a folder is given (files named explicitly are read whatever their ending, settings files aside). */
export const DATA_FILE_EXTENSIONS: readonly string[] = ['.csv', '.tsv', '.txt', '.dat', '.asc', '.tab', '.prn', '.xy'];

const READ_CHUNK_BYTES = 1024 * 1024;

/**
 * Expand paths into data files: files as given (except settings files, see isSettingsFileName),
 * folders recursively (hidden entries skipped, only DATA_FILE_EXTENSIONS), each folder's entries
 * sorted by name so the order is reproducible. Paths that do not exist are kept, so that reading
 * them reports the error.
 * @example await listDataFiles(['runs/'], process.cwd()) // ['runs/a.csv', 'runs/day2/b.csv']
 */
export function listDataFiles(paths: readonly string[], cwd: string): Promise<string[]> {
  return listFiles(paths, cwd, (name) => DATA_FILE_EXTENSIONS.some((ext) => name.toLowerCase().endsWith(ext)), (path) => !isSettingsFileName(path));
}

/**
 * The settings files among the paths: those named as files, and those inside the folders (walked
 * as listDataFiles walks them).
 * @example await listSettingsFiles(['sample-data'], process.cwd()) // ['sample-data/settings.json']
 */
export function listSettingsFiles(paths: readonly string[], cwd: string): Promise<string[]> {
  return listFiles(paths, cwd, isSettingsFileName, isSettingsFileName);
}

async function listFiles(paths: readonly string[], cwd: string, inFolder: (name: string) => boolean, named: (path: string) => boolean): Promise<string[]> {
  const found: string[] = [];
  const walk = async (shown: string): Promise<void> => {
    const entries = await readdir(resolve(cwd, shown), { withFileTypes: true });
    entries.sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : 0));
    for (const entry of entries) {
      if (entry.name.startsWith('.')) continue;
      const child = join(shown, entry.name);
      if (entry.isDirectory()) await walk(child);
      else if (entry.isFile() && inFolder(entry.name)) found.push(child);
    }
  };
  for (const path of paths) {
    let isDirectory = false;
    try {
      isDirectory = (await stat(resolve(cwd, path))).isDirectory();
    } catch {
      isDirectory = false;
    }
    if (isDirectory) await walk(path);
    else if (named(path)) found.push(path);
  }
  return found;
}

/** Text decoding chosen from the first bytes of a file. */
export type TextEncodingName = 'utf-8' | 'utf-16le' | 'utf-16be' | 'latin1';

/**
 * Choose the decoding of a file from its first bytes: a UTF-16 byte order mark (FF FE / FE FF),
 * else UTF-8 when the bytes are valid UTF-8, else Latin-1 (older Windows exports write µ and Å
 * as single bytes). Source: Unicode Standard, section 23.8 (byte order mark).
 * @example sniffEncoding(new Uint8Array([0xff, 0xfe, 0x41, 0x00])) // 'utf-16le'
 */
export function sniffEncoding(head: Uint8Array): TextEncodingName {
  if (head.length >= 2 && head[0] === 0xff && head[1] === 0xfe) return 'utf-16le';
  if (head.length >= 2 && head[0] === 0xfe && head[1] === 0xff) return 'utf-16be';
  try {
    new TextDecoder('utf-8', { fatal: true }).decode(head, { stream: true });
    return 'utf-8';
  } catch {
    return 'latin1';
  }
}

/**
 * Read a file as text chunks of about 1 MiB, decoded as sniffEncoding decides. The byte order
 * mark is kept as U+FEFF so the importer can report it. `onEncoding` receives the choice.
 */
export async function* readTextChunks(path: string, onEncoding?: (encoding: TextEncodingName) => void): AsyncGenerator<string> {
  const stream = createReadStream(path, { highWaterMark: READ_CHUNK_BYTES });
  let decoder: TextDecoder | undefined;
  for await (const buffer of stream as AsyncIterable<Buffer>) {
    const bytes = new Uint8Array(buffer.buffer, buffer.byteOffset, buffer.byteLength);
    if (!decoder) {
      const encoding = sniffEncoding(bytes.subarray(0, 64 * 1024));
      onEncoding?.(encoding);
      decoder = new TextDecoder(encoding === 'latin1' ? 'latin1' : encoding, { ignoreBOM: true });
    }
    const text = decoder.decode(bytes, { stream: true });
    if (text.length > 0) yield text;
  }
  if (decoder) {
    const rest = decoder.decode();
    if (rest.length > 0) yield rest;
  }
}

/**
 * Import files and folders from disk, one result per file (see listDataFiles for the order).
 * A file that cannot be read gives a result with a 'readFailed' error; the others are unaffected.
 * `mappingFor` may give a per-file answer (by the path shown).
 * @example const files = await importPaths(['a.csv'], { cwd: process.cwd() }); files[0].curves.length
 */
export async function importPaths(
  paths: readonly string[],
  options: ImportOptions & { cwd: string; mappingFor?: (path: string) => MappingAnswer | undefined },
): Promise<ImportedFile[]> {
  const { cwd, mappingFor, ...importOptions } = options;
  const results: ImportedFile[] = [];
  for (const shown of await listDataFiles(paths, cwd)) {
    const absolute = resolve(cwd, shown);
    let encoding: TextEncodingName | undefined;
    try {
      const info = await stat(absolute);
      if (info.isDirectory()) {
        results.push(failedImport(shown, 'readFailed', 'this is a folder with no data files', absolute));
        continue;
      }
      const mapping = mappingFor?.(shown) ?? importOptions.mapping;
      const file = await importChunks(
        readTextChunks(absolute, (e) => (encoding = e)),
        shown,
        { sizeHintChars: info.size, ...importOptions, ...(mapping ? { mapping } : {}), sourcePath: absolute },
      );
      results.push(encoding ? { ...file, encoding } : file);
    } catch (error) {
      const code = (error as NodeJS.ErrnoException).code;
      const isMapping = (error as Error).name === 'MappingError';
      const message = isMapping ? (error as Error).message : `cannot read the file (${code ?? (error as Error).message})`;
      results.push(failedImport(shown, isMapping ? 'mappingRejected' : 'readFailed', message, absolute));
    }
  }
  return results;
}
