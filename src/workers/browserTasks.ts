/**
 * The tasks the dashboard's web workers run, and the one function that answers them. Each task is
 * computed from its own message alone (same core as the CLI), so results do not depend on which
 * worker ran it:
 * - analyze: fit and flag one curve (runAnalysisTask, i.e. analyzeCurve);
 * - import: decode one file's bytes and import it (importText), arrays copied out of shared buffers;
 * - detail: the per-point arrays of the curve views (state/curveDetail);
 * - deviation: WKB against exact current for one junction (state/barrierDiagram).
 */
import type { CurveResult } from '../analysis/index.ts';
import type { AnalysisSettings } from '../fit/index.ts';
import { failedImport, importText, MappingMemory, type ImportedFile, type MappingAnswer, type MappingMemoryJSON } from '../io/index.ts';
import type { Junction } from '../physics/index.ts';
import type { CurveInput } from '../analysis/index.ts';
import { wkbDeviation, type WkbDeviation } from '../state/barrierDiagram.ts';
import { approachDetail, spectrumDetail, type CurveDetail } from '../state/curveDetail.ts';
import { decodeText, type DecodedEncoding } from '../state/decodeText.ts';
import { runAnalysisTask } from './analysisTask.ts';

/** One message to a browser worker. */
export type BrowserTask =
  | { type: 'analyze'; curve: CurveInput; settings: AnalysisSettings }
  | { type: 'import'; fileName: string; bytes?: Uint8Array; text?: string; mapping?: MappingAnswer; memory: MappingMemoryJSON }
  | { type: 'detail'; curve: CurveInput; settings: AnalysisSettings }
  | { type: 'deviation'; junction: Junction; biasV: number; temperatureK: number; imagePotential: boolean };

/** The reply to each task type. */
export type BrowserTaskResult =
  | { type: 'analyze'; result: CurveResult }
  | { type: 'import'; file: ImportedFile; encoding: DecodedEncoding | 'text' }
  | { type: 'detail'; detail: CurveDetail }
  | { type: 'deviation'; deviation: WkbDeviation };

/** A file's curves with arrays of their own (views into one column buffer would be cloned whole). */
function ownArrays(file: ImportedFile): ImportedFile {
  return {
    ...file,
    curves: file.curves.map((curve) => ({
      ...curve,
      x: curve.x.byteLength === curve.x.buffer.byteLength ? curve.x : curve.x.slice(),
      current: curve.current.byteLength === curve.current.buffer.byteLength ? curve.current : curve.current.slice(),
    })),
  };
}

/**
 * Import one file in a worker: bytes are decoded as the CLI does (BOM, UTF-8, else Latin-1); a
 * malformed mapping answer or an unexpected failure gives a file with one located error.
 * @example importTask({ type: 'import', fileName: 'a.csv', text: 'z (nm),I (pA)\n0.5,1\n0.6,2\n', memory: { version: 1, answers: {} } }).file.curves.length // 1
 */
export function importTask(task: Extract<BrowserTask, { type: 'import' }>): Extract<BrowserTaskResult, { type: 'import' }> {
  let text: string;
  let encoding: DecodedEncoding | 'text' = 'text';
  if (task.text !== undefined) text = task.text;
  else if (task.bytes !== undefined) ({ text, encoding } = decodeText(task.bytes));
  else return { type: 'import', file: failedImport(task.fileName, 'noInput', 'no text was given for this file'), encoding };
  try {
    const memory = MappingMemory.fromJSON(task.memory);
    const file = importText(text, task.fileName, { memory, ...(task.mapping ? { mapping: task.mapping } : {}) });
    return { type: 'import', file: ownArrays(file), encoding };
  } catch (error) {
    const code = (error as Error).name === 'MappingError' ? 'mappingRejected' : 'readFailed';
    return { type: 'import', file: { ...failedImport(task.fileName, code, (error as Error).message), rawText: text }, encoding };
  }
}

/**
 * Answer one task (see the file comment); throws only on a malformed task, which the pool reports
 * as that task's error.
 * @example handleBrowserTask({ type: 'analyze', curve, settings }).type // 'analyze'
 */
export function handleBrowserTask(task: BrowserTask): BrowserTaskResult {
  switch (task.type) {
    case 'analyze':
      return { type: 'analyze', result: runAnalysisTask({ curve: task.curve, settings: task.settings }) };
    case 'import':
      return importTask(task);
    case 'detail':
      return { type: 'detail', detail: task.curve.kind === 'iz' ? approachDetail(task.curve, task.settings) : spectrumDetail(task.curve, task.settings) };
    case 'deviation':
      return { type: 'deviation', deviation: wkbDeviation(task.junction, task.biasV, task.temperatureK, task.imagePotential) };
    default:
      throw new Error(`handleBrowserTask: type must be analyze, import, detail or deviation, got ${String((task as { type?: unknown }).type)}`);
  }
}
