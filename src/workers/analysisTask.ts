/** The one task the analysis workers run: fit and flag one curve with the session's settings. */
import { analyzeCurve, type CurveInput, type CurveResult } from '../analysis/analyzeCurve.ts';
import type { AnalysisSettings } from '../fit/index.ts';

export interface AnalysisTask {
  curve: CurveInput;
  settings: AnalysisSettings;
}
export type AnalysisTaskResult = CurveResult;

/** Run one task (same code in a web worker, a worker thread, or in-process). */
export function runAnalysisTask(task: AnalysisTask): AnalysisTaskResult {
  return analyzeCurve(task.curve, task.settings);
}
