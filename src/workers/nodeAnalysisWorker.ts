/** worker_threads side of the analysis pool: unpacks tasks, runs the shared core, posts results. */
import { parentPort } from 'node:worker_threads';
import { serveTasks } from './pool.ts';
import { runAnalysisTask, type AnalysisTask, type AnalysisTaskResult } from './analysisTask.ts';

const port = parentPort;
if (!port) throw new Error('nodeAnalysisWorker: must run in a worker thread');
serveTasks<AnalysisTask, AnalysisTaskResult>(
  (message) => port.postMessage(message),
  (listener) => port.on('message', listener),
  runAnalysisTask,
);
