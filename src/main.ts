/**
 * Entry point of the dashboard: the outside world (web workers sized to the cores, IndexedDB,
 * localStorage, the clock) is wired into the state classes here, then the app is mounted and the
 * last session (or the demo) is opened.
 */
import './ui/theme.css';
import { mount } from 'svelte';
import { CurveView } from './state/curveView.svelte.ts';
import { SessionDb } from './state/sessionDb.ts';
import type { SessionEnv } from './state/session.svelte.ts';
import { TaskClient } from './state/taskClient.ts';
import { Theme } from './state/theme.svelte.ts';
import { Workspace } from './state/workspace.svelte.ts';
import App from './ui/App.svelte';
import type { BrowserTask, BrowserTaskResult } from './workers/browserTasks.ts';
import { browserAnalysisWorker, browserPoolSize } from './workers/browserPool.ts';

const target = document.getElementById('app');
if (!target) throw new Error('main: no #app element in index.html');

async function openDb(): Promise<SessionDb | null> {
  try {
    return typeof indexedDB === 'undefined' ? null : await SessionDb.open(indexedDB);
  } catch {
    // Private windows may refuse IndexedDB: the dashboard still works, sessions live in memory.
    return null;
  }
}

function storage(): Storage | null {
  try {
    return window.localStorage;
  } catch {
    return null;
  }
}

const env: SessionEnv = {
  createWorker: browserAnalysisWorker,
  poolSize: browserPoolSize(),
  db: await openDb(),
  now: () => new Date(),
  newId: () => crypto.randomUUID(),
  saveDelayMs: 400,
  refitDelayMs: 350,
  flushIntervalMs: 150,
};

const workspace = new Workspace(env);
const view = new CurveView(workspace, new TaskClient<BrowserTask, BrowserTaskResult>(browserAnalysisWorker));
const theme = new Theme(storage());
document.documentElement.dataset.theme = theme.name;

export default mount(App, { target, props: { workspace, theme, view } });
void workspace.start();
