/**
 * What the browser tests, the screenshot script and the browser benchmark share: build the app with
 * Vite into a temporary folder, serve it with `vite preview` on a free loopback port, and drive
 * Debian's Chromium through playwright-core with a fresh temporary profile. No browser download,
 * no network: the page only talks to its own origin.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { AddressInfo } from 'node:net';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { build, preview } from 'vite';

/** The repository root, from this file's location. */
export const REPO_ROOT = fileURLToPath(new URL('../../', import.meta.url));

/** Debian's Chromium (apt-get install chromium). */
export const CHROMIUM_PATH = '/usr/bin/chromium';

export const CHROMIUM_ARGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--no-first-run',
];

/** A built app served on 127.0.0.1. */
export interface ServedApp {
  url: string;
  origin: string;
  close(): Promise<void>;
}

/** Build the app (no source maps) into a temporary folder and preview it on a free port. */
export async function buildAndServe(): Promise<ServedApp> {
  const outDir = mkdtempSync(join(tmpdir(), 'burrow-app-'));
  const configFile = join(REPO_ROOT, 'vite.config.ts');
  await build({ root: REPO_ROOT, configFile, logLevel: 'error', build: { outDir, emptyOutDir: true, sourcemap: false } });
  const server = await preview({
    root: REPO_ROOT,
    configFile,
    logLevel: 'error',
    build: { outDir },
    preview: { host: '127.0.0.1', port: 0, strictPort: false, open: false },
  });
  const address = server.httpServer.address() as AddressInfo;
  const origin = `http://127.0.0.1:${address.port}`;
  return {
    url: `${origin}/`,
    origin,
    async close() {
      await server.close();
      rmSync(outDir, { recursive: true, force: true });
    },
  };
}

/** A Chromium with a fresh profile (IndexedDB survives reloads within it), and its cleanup. */
export interface LaunchedBrowser {
  context: BrowserContext;
  close(): Promise<void>;
}

/** Launch Chromium headless with a fresh temporary user-data folder. */
export async function launchBrowser(viewport = { width: 1366, height: 768 }): Promise<LaunchedBrowser> {
  const userDataDir = mkdtempSync(join(tmpdir(), 'burrow-chromium-'));
  const context = await chromium.launchPersistentContext(userDataDir, {
    executablePath: CHROMIUM_PATH,
    headless: true,
    args: CHROMIUM_ARGS,
    viewport,
    acceptDownloads: true,
    deviceScaleFactor: 1,
    timezoneId: 'UTC',
    locale: 'en-GB',
  });
  return {
    context,
    async close() {
      await context.close();
      rmSync(userDataDir, { recursive: true, force: true });
    },
  };
}

/** Wait until every curve has a result and no job runs (status line "N curves · N fitted", progress idle). */
export async function waitAllFitted(page: Page, minimumCurves = 1, timeoutMs = 60_000): Promise<void> {
  await page.waitForFunction(
    (minimum) => {
      const text = document.querySelector('[data-testid=status-counts]')?.textContent ?? '';
      const match = /(\d+) curves? · (\d+) fitted/.exec(text);
      const phase = document.querySelector('[data-testid=progress]')?.getAttribute('data-phase');
      return match !== null && Number(match[1]) >= minimum && match[1] === match[2] && phase === 'idle' && !document.querySelector('[data-testid=fit-stale]');
    },
    minimumCurves,
    { timeout: timeoutMs },
  );
}
