/**
 * Test doubles for the outside world of the state classes: an in-process "worker" that answers the
 * browser task protocol with the real handler (messages pass through structuredClone and a
 * macrotask, as between threads), a fixed clock, counting ids. No physics or fit is mocked.
 */
import { handleBrowserTask, type BrowserTask, type BrowserTaskResult } from '../../src/workers/browserTasks.ts';
import { serveTasks, type WorkerPort } from '../../src/workers/pool.ts';
import type { SessionEnv } from '../../src/state/session.svelte.ts';
import type { SessionDb } from '../../src/state/sessionDb.ts';

/** A worker port served in this process by handleBrowserTask. */
export function inProcessWorker(counter?: { created: number; terminated: number }): WorkerPort {
  const toMain: ((message: unknown) => void)[] = [];
  let toWorker: ((message: unknown) => void) | null = null;
  let terminated = false;
  if (counter) counter.created++;
  serveTasks<BrowserTask, BrowserTaskResult>(
    (reply) => {
      const copy = structuredClone(reply);
      setTimeout(() => {
        if (!terminated) for (const listener of toMain) listener(copy);
      }, 0);
    },
    (listener) => {
      toWorker = listener as (message: unknown) => void;
    },
    handleBrowserTask,
  );
  return {
    postMessage: (message) => {
      const copy = structuredClone(message);
      setTimeout(() => {
        if (!terminated) toWorker?.(copy);
      }, 0);
    },
    onMessage: (listener) => toMain.push(listener),
    onError: () => {},
    terminate: () => {
      terminated = true;
      if (counter) counter.terminated++;
    },
  };
}

/** A session environment for tests: in-process workers, fixed clock, ids s1, s2, …, no delays. */
export function testEnv(db: SessionDb | null = null, overrides: Partial<SessionEnv> = {}): SessionEnv {
  let next = 0;
  return {
    createWorker: () => inProcessWorker(),
    poolSize: 2,
    db,
    now: () => new Date('2024-05-01T12:00:00.000Z'),
    newId: () => `s${++next}`,
    saveDelayMs: 0,
    refitDelayMs: 0,
    flushIntervalMs: 5,
    ...overrides,
  };
}
