import { describe, expect, it } from 'vitest';
import { CancelledError, runPool, serveTasks, type ReplyMessage, type TaskMessage, type WorkerPort } from '../../src/workers/pool.ts';

/** An in-process worker: answers asynchronously; task value −1 kills the worker, −2 throws in the handler. */
function fakeWorker(log: string[]): WorkerPort {
  let onMessage: (m: unknown) => void = () => {};
  let onError: (e: Error) => void = () => {};
  let alive = true;
  let serve: (m: TaskMessage<number>) => void = () => {};
  serveTasks<number, number>(
    (reply: ReplyMessage<number>) => setTimeout(() => alive && onMessage(reply), 1),
    (listener) => (serve = listener),
    (task) => {
      if (task === -2) throw new Error('bad task');
      return task * 2;
    },
  );
  return {
    postMessage(message) {
      const { task } = message as TaskMessage<number>;
      log.push(`task ${task}`);
      if (task === -1) {
        setTimeout(() => alive && onError(new Error('worker crashed')), 1);
        return;
      }
      serve(message as TaskMessage<number>);
    },
    onMessage: (listener) => (onMessage = listener),
    onError: (listener) => (onError = listener),
    terminate: () => {
      alive = false;
    },
  };
}

describe('runPool', () => {
  it('returns results in task order whatever the pool size', async () => {
    const tasks = Array.from({ length: 25 }, (_, i) => i);
    for (const size of [1, 2, 5]) {
      const results = await runPool<number, number>(tasks, size, () => fakeWorker([]));
      expect(results).toEqual(tasks.map((t) => t * 2));
    }
  });

  it('a task that throws, or a worker that dies, fails only its own slot', async () => {
    const log: string[] = [];
    const results = await runPool<number, number>([1, -2, 3, -1, 5, 6], 2, () => fakeWorker(log));
    expect(results[0]).toBe(2);
    expect(results[1]).toBeInstanceOf(Error);
    expect((results[1] as Error).message).toBe('bad task');
    expect(results[3]).toBeInstanceOf(Error);
    expect((results[3] as Error).message).toContain('worker failed on task 3');
    expect([results[2], results[4], results[5]]).toEqual([6, 10, 12]);
  });

  it('reports progress for every task and can be cancelled', async () => {
    const seen: number[] = [];
    await runPool<number, number>([1, 2, 3, 4], 2, () => fakeWorker([]), { onProgress: (done) => seen.push(done) });
    expect(seen).toEqual([1, 2, 3, 4]);
    const controller = new AbortController();
    const run = runPool<number, number>(Array.from({ length: 100 }, (_, i) => i), 2, () => fakeWorker([]), {
      signal: controller.signal,
      onProgress: (done) => done === 3 && controller.abort(),
    });
    await expect(run).rejects.toBeInstanceOf(CancelledError);
  });
});
