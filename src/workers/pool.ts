/**
 * A pool of workers that runs independent tasks in parallel and returns their results in task
 * order, with progress callbacks and cancellation. The same class drives web workers in the
 * browser and worker_threads in Node: it only needs something that posts and receives messages.
 * Each task is computed from its own input alone, so the results do not depend on the pool size.
 */

/** The part of a worker the pool uses (a DOM Worker or a wrapped worker_threads Worker); onError also covers a worker that exits. */
export interface WorkerPort {
  postMessage(message: unknown): void;
  onMessage(listener: (message: unknown) => void): void;
  onError(listener: (error: Error) => void): void;
  terminate(): void;
}

/** Message to a worker: one task. Reply: `{ id, result }` or `{ id, error }`. */
export interface TaskMessage<Task> {
  id: number;
  task: Task;
}
export type ReplyMessage<Result> = { id: number; result: Result } | { id: number; error: string };

export interface RunOptions {
  /** Called after each finished task with the count done and the total. */
  onProgress?: (done: number, total: number) => void;
  /** Abort to stop: pending tasks are not started, running ones are dropped, the promise rejects. */
  signal?: AbortSignal;
}

export class CancelledError extends Error {
  constructor(done: number, total: number) {
    super(`cancelled after ${done} of ${total} tasks`);
    this.name = 'CancelledError';
  }
}

/**
 * Run `tasks` on `size` workers made by `createWorker` (terminated at the end). Results come back in
 * task order; a task that threw in its worker gives an Error in its slot, so one bad curve never
 * stops the others.
 * @example await runPool(tasks, 2, () => nodeAnalysisWorker(), { onProgress: (d, n) => bar(d / n) })
 */
export async function runPool<Task, Result>(
  tasks: readonly Task[],
  size: number,
  createWorker: () => WorkerPort,
  options: RunOptions = {},
): Promise<(Result | Error)[]> {
  if (!(Number.isInteger(size) && size >= 1)) throw new Error(`runPool: size must be an integer >= 1, got ${size}`);
  const total = tasks.length;
  const results: (Result | Error)[] = new Array(total);
  if (total === 0) return results;
  const workers: WorkerPort[] = [];
  let next = 0;
  let done = 0;
  return new Promise((resolve, reject) => {
    let finished = false;
    const finish = (error?: Error) => {
      if (finished) return;
      finished = true;
      for (const worker of workers) worker.terminate();
      options.signal?.removeEventListener('abort', onAbort);
      if (error) reject(error);
      else resolve(results);
    };
    const onAbort = () => finish(new CancelledError(done, total));
    if (options.signal?.aborted) return finish(new CancelledError(0, total));
    options.signal?.addEventListener('abort', onAbort);
    // The task each worker is running (−1: idle), so a worker that dies can fail just that task.
    const inFlight = new Map<WorkerPort, number>();
    const dispatch = (worker: WorkerPort) => {
      if (finished) return;
      if (next >= total) {
        inFlight.set(worker, -1);
        return;
      }
      const id = next++;
      inFlight.set(worker, id);
      worker.postMessage({ id, task: tasks[id] } satisfies TaskMessage<Task>);
    };
    const record = (id: number, result: Result | Error) => {
      results[id] = result;
      done++;
      options.onProgress?.(done, total);
      if (done === total) finish();
    };
    const start = () => {
      const worker = createWorker();
      workers.push(worker);
      inFlight.set(worker, -1);
      worker.onMessage((message) => {
        if (finished) return;
        const reply = message as ReplyMessage<Result>;
        inFlight.set(worker, -1);
        record(reply.id, 'error' in reply ? new Error(reply.error) : reply.result);
        dispatch(worker);
      });
      // A worker that dies fails only the task it was running; a fresh worker takes its place.
      worker.onError((error) => {
        if (finished || !inFlight.has(worker)) return;
        const id = inFlight.get(worker) as number;
        inFlight.delete(worker);
        worker.terminate();
        workers.splice(workers.indexOf(worker), 1);
        if (id >= 0) record(id, new Error(`worker failed on task ${id}: ${error.message}`));
        if (!finished && next < total) dispatch(start());
      });
      return worker;
    };
    for (let w = 0; w < Math.min(size, total); w++) dispatch(start());
  });
}

/**
 * The worker side: answer each task message with its result, or the error message when it throws.
 * @example serveTasks((message) => self.postMessage(message), (listener) => (self.onmessage = (e) => listener(e.data)), analyzeTask)
 */
export function serveTasks<Task, Result>(
  post: (message: ReplyMessage<Result>) => void,
  listen: (listener: (message: TaskMessage<Task>) => void) => void,
  handle: (task: Task) => Result,
): void {
  listen(({ id, task }) => {
    try {
      post({ id, result: handle(task) });
    } catch (error) {
      post({ id, error: error instanceof Error ? error.message : String(error) });
    }
  });
}
