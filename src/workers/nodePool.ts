/** Node side of the worker pool: worker_threads running nodeAnalysisWorker.ts through tsx. */
import { availableParallelism } from 'node:os';
import { Worker } from 'node:worker_threads';
import { runPool, type RunOptions, type WorkerPort } from './pool.ts';
import type { AnalysisTask, AnalysisTaskResult } from './analysisTask.ts';

/** A worker_threads Worker seen as a pool port. */
export function nodeAnalysisWorker(): WorkerPort {
  const worker = new Worker(new URL('./nodeBoot.mjs', import.meta.url), {
    workerData: { moduleUrl: new URL('./nodeAnalysisWorker.ts', import.meta.url).href },
  });
  return {
    postMessage: (message) => worker.postMessage(message),
    onMessage: (listener) => worker.on('message', listener),
    onError: (listener) => {
      worker.on('error', listener);
      worker.on('messageerror', listener);
      worker.on('exit', (code) => listener(new Error(`worker thread exited with code ${code}`)));
    },
    terminate: () => void worker.terminate(),
  };
}

/** Pool size for this machine: one worker per core. */
export function defaultPoolSize(): number {
  return Math.max(1, availableParallelism());
}

/** Run analysis tasks on `size` worker threads (default: one per core). */
export function runAnalysisPool(tasks: readonly AnalysisTask[], size = defaultPoolSize(), options: RunOptions = {}): Promise<(AnalysisTaskResult | Error)[]> {
  return runPool<AnalysisTask, AnalysisTaskResult>(tasks, size, nodeAnalysisWorker, options);
}
