/// <reference lib="webworker" />
/** Web-worker side of the dashboard's pool: unpacks `{ id, task }`, runs the shared core, posts `{ id, result }` or `{ id, error }`. */
import { serveTasks } from './pool.ts';
import { handleBrowserTask, type BrowserTask, type BrowserTaskResult } from './browserTasks.ts';

const scope = self as unknown as DedicatedWorkerGlobalScope;
serveTasks<BrowserTask, BrowserTaskResult>(
  (message) => scope.postMessage(message),
  (listener) => scope.addEventListener('message', (event: MessageEvent) => listener(event.data)),
  handleBrowserTask,
);
