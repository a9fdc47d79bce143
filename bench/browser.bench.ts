/**
 * The dashboard under a batch of about 1,000 curves (the demo files, repeated under new names), in
 * Debian's Chromium against the built app: time to import and fit them through the worker pool,
 * whether the progress bar moved steadily, how quickly Cancel stops a refit, and the longest
 * main-thread task seen by a PerformanceObserver('longtask') (target: none over 100 ms).
 * Prints figures; asserts nothing.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { buildAndServe, launchBrowser } from '../test/browser/harness.ts';

const TARGET_CURVES = 1000;

interface PageLog {
  longTasks: { start: number; duration: number }[];
  progress: { t: number; done: number; total: number; phase: string }[];
}

/**
 * Installed before the app's scripts: long tasks and every progress-bar change, with times. Given
 * as text, not as a function: tsx wraps named functions in a helper the page does not have.
 */
const RECORDER = `
  (() => {
    const log = { longTasks: [], progress: [] };
    window.__benchLog = log;
    new PerformanceObserver((list) => {
      for (const entry of list.getEntries()) log.longTasks.push({ start: entry.startTime, duration: entry.duration });
    }).observe({ type: 'longtask', buffered: true });
    new MutationObserver(() => {
      const bar = document.querySelector('[data-testid=progress-bar]');
      const phase = document.querySelector('[data-testid=progress]')?.getAttribute('data-phase') ?? 'idle';
      const done = Number(bar?.getAttribute('aria-valuenow') ?? NaN);
      const total = Number(bar?.getAttribute('aria-valuemax') ?? NaN);
      const last = log.progress[log.progress.length - 1];
      if (!last || !Object.is(last.done, done) || last.phase !== phase) log.progress.push({ t: performance.now(), done, total, phase });
    }).observe(document, { subtree: true, childList: true, attributes: true, attributeFilter: ['aria-valuenow', 'data-phase'] });
  })();
`;

function describeGaps(samples: PageLog['progress'], phase: string, from: number, to: number): string {
  const fitting = samples.filter((s) => s.phase === phase && s.t >= from && s.t <= to && Number.isFinite(s.done));
  if (fitting.length < 2) return `${fitting.length} progress updates`;
  const gaps: number[] = [];
  for (let i = 1; i < fitting.length; i++) gaps.push(fitting[i].t - fitting[i - 1].t);
  gaps.sort((a, b) => a - b);
  const median = gaps[gaps.length >> 1];
  const longest = gaps[gaps.length - 1];
  return `${fitting.length} progress updates, median gap ${median.toFixed(0)} ms, longest gap ${longest.toFixed(0)} ms`;
}

function describeLongTasks(tasks: PageLog['longTasks'], from: number, to: number): string {
  const inWindow = tasks.filter((t) => t.start >= from && t.start <= to);
  const longest = inWindow.reduce((m, t) => Math.max(m, t.duration), 0);
  const over100 = inWindow.filter((t) => t.duration > 100).length;
  return `${inWindow.length} long tasks (> 50 ms), longest ${longest.toFixed(0)} ms, ${over100} over 100 ms`;
}

export default async function (): Promise<void> {
  const app = await buildAndServe();
  const browser = await launchBrowser();
  try {
    const page = await browser.context.newPage();
    await page.addInitScript({ content: RECORDER });
    await page.goto(app.url);
    const allFitted = (minimum: number) =>
      page.waitForFunction(
        (min) => {
          const text = document.querySelector('[data-testid=status-counts]')?.textContent ?? '';
          const match = /(\d+) curves? · (\d+) fitted/.exec(text);
          return match !== null && Number(match[1]) >= min && match[1] === match[2] && document.querySelector('[data-testid=progress]')?.getAttribute('data-phase') === 'idle';
        },
        minimum,
        { timeout: 600_000, polling: 250 },
      );
    await allFitted(50);

    // The batch: every demo file, copied under new names until there are TARGET_CURVES curves.
    const folder = new URL('../sample-data/', import.meta.url);
    const demo = readdirSync(folder)
      .filter((f) => /\.(csv|tsv|txt|dat)$/.test(f))
      .map((name) => ({ name, text: readFileSync(new URL(name, folder), 'utf8') }));
    const demoCurves = Number(/(\d+) curves/.exec((await page.getByTestId('status-counts').textContent()) ?? '')?.[1] ?? 0);
    const copies = Math.ceil(TARGET_CURVES / demoCurves);
    const files: { name: string; text: string }[] = [];
    for (let k = 1; k <= copies; k++) for (const f of demo) files.push({ name: `copy${String(k).padStart(2, '0')}-${f.name}`, text: f.text });
    const expected = copies * demoCurves;
    console.log(`batch: ${files.length} files, ${expected} curves (${copies} copies of the ${demo.length} demo files), ${app.origin}, ${await page.evaluate(() => navigator.hardwareConcurrency)} workers`);

    await page.locator('.session-menu summary').click();
    await page.getByTestId('new-session').click();
    await page.getByTestId('empty-session').waitFor();

    // The File objects are made in the page first, so that handing them over (a harness cost) is
    // not counted; then the file input receives them as if the user had picked them.
    await page.evaluate((list) => {
      const transfer = new DataTransfer();
      for (const f of list) transfer.items.add(new File([f.text], f.name, { type: 'text/plain' }));
      (window as unknown as { __batch: DataTransfer }).__batch = transfer;
    }, files);
    const t0 = await page.evaluate(() => performance.now());
    await page.evaluate(() => {
      const input = document.querySelector('[data-testid=file-input]') as HTMLInputElement;
      input.files = (window as unknown as { __batch: DataTransfer }).__batch.files;
      input.dispatchEvent(new Event('change', { bubbles: true }));
    });
    await page.waitForFunction(() => document.querySelector('[data-testid=progress]')?.getAttribute('data-phase') === 'fitting', null, { timeout: 120_000, polling: 20 });
    const tFit = await page.evaluate(() => performance.now());
    await allFitted(expected);
    const tEnd = await page.evaluate(() => performance.now());
    let log = await page.evaluate(() => (window as unknown as { __benchLog: PageLog }).__benchLog);
    const message = await page.getByTestId('progress-message').textContent();
    console.log(`import of ${files.length} files (workers): ${(tFit - t0).toFixed(0)} ms`);
    console.log(`fit of ${expected} curves through the pool: ${(tEnd - tFit).toFixed(0)} ms (${((tEnd - tFit) / expected).toFixed(2)} ms per curve); app says "${message}"`);
    console.log(`progress while fitting: ${describeGaps(log.progress, 'fitting', tFit, tEnd)}`);
    console.log(`main thread, import + fit: ${describeLongTasks(log.longTasks, t0, tEnd)}`);

    // Cancellation: a settings change refits everything; cancel a third of the way in.
    await page.getByTestId('tab-settings').click();
    const temperature = page.locator('input[data-field="temperatureK"][data-run=""]');
    await temperature.fill('77');
    const tChange = await page.evaluate(() => performance.now());
    await temperature.press('Tab');
    await page.waitForFunction(
      (third) => Number(document.querySelector('[data-testid=progress-bar]')?.getAttribute('aria-valuenow') ?? 0) >= third,
      Math.floor(expected / 3),
      { timeout: 120_000, polling: 20 },
    );
    const tCancel = await page.evaluate(() => performance.now());
    await page.getByTestId('cancel').click();
    await page.waitForFunction(() => document.querySelector('[data-testid=progress]')?.getAttribute('data-phase') === 'idle', null, { timeout: 30_000, polling: 10 });
    const tStopped = await page.evaluate(() => performance.now());
    await page.waitForTimeout(500);
    log = await page.evaluate(() => (window as unknown as { __benchLog: PageLog }).__benchLog);
    const afterStop = log.progress.filter((s) => s.t > tStopped && s.phase === 'fitting').length;
    const stale = await page.getByTestId('fit-stale').textContent();
    const doneAtCancel = Math.max(...log.progress.filter((s) => s.t >= tChange && s.t <= tCancel && s.phase === 'fitting').map((s) => s.done));
    console.log(`cancel at ${doneAtCancel}/${expected}: idle ${(tStopped - tCancel).toFixed(0)} ms after the click, ${afterStop} progress updates after that, button now "${stale}"`);
    console.log(`progress while refitting: ${describeGaps(log.progress, 'fitting', tChange, tCancel)}`);
    console.log(`main thread, refit + cancel: ${describeLongTasks(log.longTasks, tChange, tStopped + 500)}`);

    const tResume = await page.evaluate(() => performance.now());
    await page.getByTestId('fit-stale').click();
    await allFitted(expected);
    const tResumed = await page.evaluate(() => performance.now());
    log = await page.evaluate(() => (window as unknown as { __benchLog: PageLog }).__benchLog);
    console.log(`resume: the rest fitted in ${(tResumed - tResume).toFixed(0)} ms`);
    console.log(`main thread, whole run: ${describeLongTasks(log.longTasks, 0, tResumed)}`);
  } finally {
    await browser.close();
    await app.close();
  }
}
