/**
 * One long-lived worker for requests that should answer quickly (the selected curve's detail, the
 * WKB check), speaking the pool's message protocol ({ id, task } → { id, result } | { id, error }).
 * A promise per id; callers drop replies they no longer want by comparing their own request
 * counter. The worker is started on first use and restarted after a failure.
 */
import type { ReplyMessage, WorkerPort } from '../workers/pool.ts';

export class TaskClient<Task, Result> {
  readonly #createPort: () => WorkerPort;
  #port: WorkerPort | null = null;
  #next = 0;
  readonly #pending = new Map<number, { resolve: (result: Result) => void; reject: (error: Error) => void }>();

  constructor(createPort: () => WorkerPort) {
    this.#createPort = createPort;
  }

  /** Run one task; rejects with the worker's error message. */
  run(task: Task): Promise<Result> {
    const port = this.#ensurePort();
    const id = this.#next++;
    return new Promise<Result>((resolve, reject) => {
      this.#pending.set(id, { resolve, reject });
      port.postMessage({ id, task });
    });
  }

  #ensurePort(): WorkerPort {
    if (this.#port) return this.#port;
    const port = this.#createPort();
    port.onMessage((message) => {
      const reply = message as ReplyMessage<Result>;
      const waiting = this.#pending.get(reply.id);
      if (!waiting) return;
      this.#pending.delete(reply.id);
      if ('error' in reply) waiting.reject(new Error(reply.error));
      else waiting.resolve(reply.result);
    });
    port.onError((error) => {
      for (const waiting of this.#pending.values()) waiting.reject(error);
      this.#pending.clear();
      if (this.#port === port) this.#port = null;
      port.terminate();
    });
    this.#port = port;
    return port;
  }

  /** Stop the worker; pending requests reject. */
  dispose(): void {
    for (const waiting of this.#pending.values()) waiting.reject(new Error('TaskClient: disposed'));
    this.#pending.clear();
    this.#port?.terminate();
    this.#port = null;
  }
}
