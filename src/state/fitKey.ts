import { runOf, type CurveInput } from '../analysis/index.ts';
import { settingsForRun, type AnalysisSettings } from '../fit/index.ts';
import type { Curve } from '../io/index.ts';
import type { ManualWindow } from './types.ts';

/**
 * A key that changes exactly when a curve's fit would: the settings in force for its run (session
 * settings with the run's overrides, the override table itself left out) and its manual window.
 * A stored result whose key differs from the current one is stale and gets refitted.
 * @example fitKey(curve, DEFAULT_SETTINGS, null) // '{"tipRadiusNm":null,…}|'
 */
export function fitKey(curve: Pick<Curve, 'fileName' | 'metadata'>, settings: AnalysisSettings, window: ManualWindow | null | undefined): string {
  return `${runSettingsKey(settings, runOf(curve as unknown as CurveInput))}|${window ? `${window.fromNm},${window.toNm}` : ''}`;
}

function runSettingsKey(settings: AnalysisSettings, run: string): string {
  const { runOverrides: _ignored, ...inForce } = settingsForRun(settings, run);
  const ordered = Object.fromEntries(Object.entries(inForce).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0)));
  return JSON.stringify(ordered);
}

/**
 * fitKey for many curves under one settings object: the settings part is worked out once per run.
 * @example const keyOf = fitKeys(settings); keyOf(curve, null) === fitKey(curve, settings, null) // true
 */
export function fitKeys(settings: AnalysisSettings): (curve: Pick<Curve, 'fileName' | 'metadata'>, window: ManualWindow | null | undefined) => string {
  const byRun = new Map<string, string>();
  return (curve, window) => {
    const run = runOf(curve as unknown as CurveInput);
    let key = byRun.get(run);
    if (key === undefined) byRun.set(run, (key = runSettingsKey(settings, run)));
    return `${key}|${window ? `${window.fromNm},${window.toNm}` : ''}`;
  };
}

/**
 * The analysis input of one curve: the import layer's curve with independent copies of its arrays
 * (a large file's curves may share one buffer, which would be cloned whole into every worker
 * message) and the manual window in metres.
 * @example curveInput(curve, { fromNm: 0.1, toNm: 0.3 }).windowM // { fromM: 1e-10, toM: 3e-10 }
 */
export function curveInput(curve: Curve, window: ManualWindow | null | undefined): CurveInput {
  const own = (array: Float64Array) => (array.byteOffset === 0 && array.byteLength === array.buffer.byteLength ? array : array.slice());
  return {
    id: curve.id,
    fileName: curve.fileName,
    index: curve.index,
    segment: curve.segment,
    kind: curve.kind,
    x: own(curve.x),
    current: own(curve.current),
    ...(curve.fixedBiasV !== undefined ? { fixedBiasV: curve.fixedBiasV } : {}),
    ...(curve.fixedGapM !== undefined ? { fixedGapM: curve.fixedGapM } : {}),
    ...(curve.position ? { position: curve.position } : {}),
    metadata: curve.metadata,
    ...(window && curve.kind === 'iz' ? { windowM: { fromM: window.fromNm * 1e-9, toM: window.toNm * 1e-9 } } : {}),
  };
}
