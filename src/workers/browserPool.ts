/** Main-thread side of the dashboard's web workers: a DOM Worker seen as a pool port, and the pool size. */
import type { WorkerPort } from './pool.ts';

/**
 * A module web worker running browserAnalysisWorker.ts (bundled by Vite from this URL form).
 * @example runPool(tasks, browserPoolSize(), browserAnalysisWorker)
 */
export function browserAnalysisWorker(): WorkerPort {
  const worker = new Worker(new URL('./browserAnalysisWorker.ts', import.meta.url), { type: 'module', name: 'burrow-analysis' });
  return {
    postMessage: (message) => worker.postMessage(message),
    onMessage: (listener) => worker.addEventListener('message', (event: MessageEvent) => listener(event.data)),
    onError: (listener) => {
      worker.addEventListener('error', (event: ErrorEvent) => {
        event.preventDefault();
        listener(new Error(event.message || 'the worker script failed to load or threw'));
      });
      worker.addEventListener('messageerror', () => listener(new Error('a worker message could not be read')));
    },
    terminate: () => worker.terminate(),
  };
}

/**
 * One worker per logical core (navigator.hardwareConcurrency), at least 1, at most 16.
 * @example browserPoolSize() // 2 on a two-core machine
 */
export function browserPoolSize(): number {
  const cores = typeof navigator !== 'undefined' ? navigator.hardwareConcurrency : 0;
  return Math.max(1, Math.min(16, Number.isFinite(cores) && cores > 0 ? cores : 2));
}
