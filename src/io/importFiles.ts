import { importChunks, importText, type TextChunks } from './importText.ts';
import { ProblemLog } from './problemLog.ts';
import type { ImportedFile, ImportOptions, MappingAnswer } from './types.ts';

/** One file to import: its name and either its whole text or its chunks. */
export interface ImportInput {
  fileName: string;
  text?: string;
  chunks?: TextChunks;
  /** Answer for this file only (wins over options.mapping and the memory). */
  mapping?: MappingAnswer;
  sourcePath?: string;
}

/**
 * A result for a file that could not be read at all (unreadable path, unexpected failure):
 * no curves, one located error.
 * @example failedImport('a.csv', 'readFailed', 'cannot read: ENOENT').problems[0].line // 1
 */
export function failedImport(fileName: string, code: string, message: string, sourcePath?: string): ImportedFile {
  const log = new ProblemLog(fileName);
  log.add({ code, severity: 'error', line: 1, column: 1, message });
  return {
    fileName,
    ...(sourcePath !== undefined ? { sourcePath } : {}),
    dialect: { delimiter: ',', decimalMark: '.', headerLine: null, unitsLine: null, dataStartLine: null, hasBOM: false, lineEnding: 'none', quoted: false },
    metadata: {},
    columns: [],
    curves: [],
    problems: log.list(),
    headerSignature: 'unread',
    mappingSource: 'detected',
    rowCount: 0,
  };
}

/**
 * Import several files, one result per input in the same order. A file that fails (bad data, a
 * mapping answer that does not fit it, a stream that breaks) yields its own result with problems
 * and never affects the others, so files already loaded stay loaded.
 * @example (await importFiles([{ fileName: 'a.csv', text: 'z,I\n' }, { fileName: 'b.csv', text: '' }])).length // 2
 */
export async function importFiles(inputs: readonly ImportInput[], options: ImportOptions = {}): Promise<ImportedFile[]> {
  const results: ImportedFile[] = [];
  for (const input of inputs) {
    const fileOptions: ImportOptions = {
      ...options,
      ...(input.mapping ? { mapping: input.mapping } : {}),
      ...(input.sourcePath !== undefined ? { sourcePath: input.sourcePath } : {}),
    };
    try {
      if (input.text !== undefined) results.push(importText(input.text, input.fileName, fileOptions));
      else if (input.chunks !== undefined) results.push(await importChunks(input.chunks, input.fileName, fileOptions));
      else results.push(failedImport(input.fileName, 'noInput', 'no text was given for this file', input.sourcePath));
    } catch (error) {
      const name = (error as Error).name === 'MappingError' ? 'mappingRejected' : 'readFailed';
      results.push(failedImport(input.fileName, name, (error as Error).message, input.sourcePath));
    }
  }
  return results;
}
