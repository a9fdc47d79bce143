import { createImporter } from './createImporter.ts';
import type { ImportedFile, ImportOptions } from './types.ts';

/** Pieces of one file: an async stream of strings (e.g. a decoded File.stream()) or a plain list. */
export type TextChunks = AsyncIterable<string> | Iterable<string>;

/**
 * Import one file given as a whole string. Pure: no file system, no logging; bad input gives
 * problems, not exceptions. The text is kept in `rawText` unless `keepRawText: false`.
 * Throws MappingError only when `options.mapping` is malformed.
 * @example importText('z (nm),I (pA)\n0.5,120\n0.6,80\n', 'a.csv').curves[0].x[0] // 5e-10
 */
export function importText(text: string, fileName: string, options: ImportOptions = {}): ImportedFile {
  const importer = createImporter(fileName, { sizeHintChars: text.length, ...options, keepRawText: false });
  importer.push(text);
  const file = importer.finish();
  return options.keepRawText === false ? file : { ...file, rawText: text };
}

/**
 * Import one file from a stream of text chunks, without holding the whole text (unless
 * `keepRawText: true`). Usable in Node and in a web worker. Same result as importText.
 * @example await importChunks(['z (nm),I (pA)\n0.5,1', '20\n0.6,80\n'], 'a.csv') // 1 curve
 */
export async function importChunks(chunks: TextChunks, fileName: string, options: ImportOptions = {}): Promise<ImportedFile> {
  const importer = createImporter(fileName, options);
  for await (const chunk of chunks) importer.push(chunk);
  return importer.finish();
}
