// Entry of a Node worker thread: registers the TypeScript loader (tsx), then loads the worker
// module named in workerData. Node-only; the browser loads its worker through Vite instead.
import { workerData } from 'node:worker_threads';
import { register } from 'tsx/esm/api';

register();
await import(workerData.moduleUrl);
