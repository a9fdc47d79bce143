/**
 * The dashboard end to end, against the built app (vite build + vite preview on a loopback port)
 * in Debian's Chromium through playwright-core. One browser profile for the whole file, so the
 * steps follow a user's session: the demo opens fitted, files are added, settings change, results
 * are exported, and a reload brings everything back from IndexedDB. Every request the page makes
 * is recorded; any host but the app's own fails the last test, as does any console error.
 */
import { copyFileSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Papa from 'papaparse';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildAndServe, launchBrowser, waitAllFitted, type LaunchedBrowser, type ServedApp } from './harness.ts';

const fixturePath = (name: string) => new URL(`../fixtures/import/${name}`, import.meta.url).pathname;

let app: ServedApp;
let browser: LaunchedBrowser;
let page: Page;
const requests: string[] = [];
const foreign: string[] = [];
const consoleErrors: string[] = [];

/** "N files · M curves · K fitted · F flagged" → numbers. */
async function counts(): Promise<{ curves: number; fitted: number; flagged: number }> {
  const text = (await page.getByTestId('status-counts').textContent()) ?? '';
  const match = /(\d+) curves? · (\d+) fitted · (\d+) flagged/.exec(text);
  if (!match) throw new Error(`status line not understood: ${text}`);
  return { curves: Number(match[1]), fitted: Number(match[2]), flagged: Number(match[3]) };
}


/** Open one curve through the browser's search box (the list is virtualised). */
async function openCurve(curveId: string): Promise<void> {
  const search = page.getByLabel('Search curves');
  await search.fill(curveId.split('#')[0]);
  await page.locator(`.row.curve[data-curve="${CSS.escape(curveId)}"]`).click();
  await search.fill('');
  await page.getByTestId('tab-curve').click();
  await page.locator(`[data-testid=curve-panel][data-curve="${CSS.escape(curveId)}"]`).waitFor();
}

/** Polyfill-free CSS.escape for attribute values used above (quotes and backslashes only). */
const CSS = { escape: (value: string) => value.replace(/["\\]/g, '\\$&') };

async function download(testid: string): Promise<string> {
  await page.locator('details.export summary').click();
  const [file] = await Promise.all([page.waitForEvent('download'), page.getByTestId(testid).click()]);
  return readFileSync(await file.path(), 'utf8');
}

beforeAll(async () => {
  app = await buildAndServe();
  browser = await launchBrowser();
  browser.context.on('request', (request) => {
    const url = request.url();
    requests.push(url);
    if (!/^(blob|data):/.test(url) && new URL(url).origin !== app.origin) foreign.push(url);
  });
  page = await browser.context.newPage();
  page.on('console', (message) => {
    if (message.type() === 'error') consoleErrors.push(message.text());
  });
  page.on('pageerror', (error) => consoleErrors.push(error.message));
  await page.goto(app.url);
}, 120_000);

afterAll(async () => {
  await browser?.close();
  await app?.close();
});

describe('dashboard in Chromium', () => {
  let demoCurves = 0;

  it('the demo session opens already fitted and shows fitted values', async () => {
    await waitAllFitted(page, 50);
    const { curves, flagged } = await counts();
    demoCurves = curves;
    expect(flagged).toBeGreaterThan(0);
    await expect.poll(() => page.getByTestId('session-name').textContent()).toContain('Demo');
    // The first curve is open: its card shows the apparent barrier with an error.
    await expect.poll(() => page.locator('[data-param="φ_ap"]').textContent(), { timeout: 10_000 }).toMatch(/^\d+\.\d+ ± \d\.\d+$/);
    const keyResults = await page.locator('.row.curve .key').allTextContents();
    expect(keyResults.some((t) => /^φap \d\.\d+ ± \d\.\d+ eV$/.test(t))).toBe(true);
  });

  it('keyboard: ↓/↑ move the cursor through the curve list and Enter opens the curve', async () => {
    const ids = await page.locator('.row.curve').evaluateAll((rows) => rows.map((row) => row.getAttribute('data-curve')));
    const open = await page.getByTestId('curve-panel').getAttribute('data-curve');
    const at = ids.indexOf(open);
    expect(at).toBeGreaterThanOrEqual(0);
    await page.getByRole('listbox', { name: 'Curves' }).focus();
    await page.keyboard.press('ArrowDown');
    await page.keyboard.press('ArrowDown');
    await page.keyboard.press('ArrowUp');
    await page.keyboard.press('ArrowDown');
    await page.keyboard.press('Enter');
    await expect.poll(() => page.getByTestId('curve-panel').getAttribute('data-curve')).toBe(ids[at + 2]);
    await page.keyboard.press('ArrowUp');
    await page.keyboard.press('Enter');
    await expect.poll(() => page.getByTestId('curve-panel').getAttribute('data-curve')).toBe(ids[at + 1]);
  });

  it('a flagged curve shows the reason of its flag and rings its points on the plot', async () => {
    await openCurve('approach-A-gold-clipped.csv#0/single');
    const reason = page.getByTestId('flag-reason').first();
    await expect.poll(() => reason.textContent()).toMatch(/^Current is clipped at .+ \(preamp saturation\)/);
    await page.getByRole('button', { name: /show \d+ points/ }).first().click();
    const ring = page.locator('[data-testid=plot-current] [data-testid=highlighted-points]');
    await expect.poll(async () => ((await ring.getAttribute('d')) ?? '').length).toBeGreaterThan(100);
    await expect.poll(() => page.locator('[data-testid=plot-current] .region').first().getAttribute('data-reason')).toBe('preamp saturation');
  });

  it('adding a fixture through the file input adds its curves and fits them', async () => {
    await page.getByTestId('file-input').setInputFiles(fixturePath('sweep-reversal.csv'));
    await waitAllFitted(page, demoCurves + 2);
    expect((await counts()).curves).toBe(demoCurves + 2);
    await page.getByLabel('Search curves').fill('sweep-reversal');
    await expect.poll(() => page.locator('.row.curve .key').allTextContents()).toEqual([expect.stringMatching(/^φap /), expect.stringMatching(/^φap /)]);
    await page.getByLabel('Search curves').fill('');
  });

  it('a malformed file shows a located error while the loaded curves stay', async () => {
    const before = await counts();
    await page.getByTestId('file-input').setInputFiles(fixturePath('bad-ragged.csv'));
    const notice = page.getByTestId('notice-text').filter({ hasText: 'bad-ragged.csv' });
    await expect.poll(() => notice.textContent()).toMatch(/^bad-ragged\.csv, line 4, column 3: row has 3 cells/);
    await waitAllFitted(page, before.curves + 1);
    // The readable rows of the bad file are one more curve; every loaded curve is still there.
    expect((await counts()).curves).toBe(before.curves + 1);
    await page.getByTestId('tab-files').click();
    const problems = page.locator('[data-file="bad-ragged.csv"] [data-testid=file-problems] li');
    await expect.poll(() => problems.allTextContents()).toEqual([expect.stringContaining('bad-ragged.csv:4:3'), expect.stringContaining('bad-ragged.csv:7:2')]);
    await page.getByTestId('tab-curve').click();
  });

  it('a file whose name and metadata hold HTML and script text is shown as plain text', async () => {
    const name = '<img src=x onerror="window.__burrowXss=1">.csv';
    const rows = ['# sample: <script>window.__burrowXss=2</script><b>bold</b>', '# run: <i>run</i>', 'z (nm),I (pA)'];
    for (let i = 0; i < 20; i++) rows.push(`${(0.01 * i).toFixed(2)},${(1000 * Math.exp(-0.2 * i)).toFixed(3)}`);
    const before = await counts();
    await page.getByTestId('file-input').setInputFiles({ name, mimeType: 'text/csv', buffer: Buffer.from(rows.join('\n') + '\n') });
    await waitAllFitted(page, before.curves + 1);
    await page.getByLabel('Search curves').fill('<img');
    await expect.poll(() => page.locator('.row.file').first().textContent()).toBe(name);
    await expect.poll(() => page.locator('.row.run').first().textContent()).toContain('<i>run</i>');
    await page.getByLabel('Search curves').fill('');
    await page.getByTestId('tab-files').click();
    const metadata = page.locator(`[data-file="${CSS.escape(name)}"] [data-testid=file-metadata]`);
    await page.locator(`[data-file="${CSS.escape(name)}"] button.toggle`).click();
    await expect.poll(() => metadata.textContent()).toContain('<script>window.__burrowXss=2</script><b>bold</b>');
    expect(await page.evaluate(() => (window as unknown as { __burrowXss?: number }).__burrowXss)).toBeUndefined();
    expect(await page.locator('#app img, #app script, [data-testid=file-metadata] b, .row.run i').count()).toBe(0);
    await page.getByTestId('tab-curve').click();
  });

  it('changing the tip work function refits and changes the barrier diagram; a bad value gets an inline message', async () => {
    await openCurve('spectra-A-gold.tsv#0/single');
    const diagram = page.getByTestId('barrier-diagram');
    await diagram.waitFor();
    const phi1Before = await diagram.getAttribute('data-phi1');
    const trapezoidBefore = await page.getByTestId('trapezoid').getAttribute('d');
    expect(phi1Before).not.toBe('4.0000');

    await page.getByTestId('tab-settings').click();
    const temperature = page.locator('input[data-field="temperatureK"][data-run=""]');
    await temperature.fill('-3');
    await temperature.press('Tab');
    await expect.poll(() => page.getByTestId('setting-error').textContent()).toBe('temperatureK must be a number >= 0 and <= 2000 K, got -3');
    await temperature.fill('300');
    await temperature.press('Tab');
    await expect.poll(() => page.getByTestId('setting-error').count()).toBe(0);

    const tip = page.locator('input[data-field="tipWorkFunctionEV"][data-run=""]');
    await tip.fill('4.0');
    await tip.press('Tab');
    await page.waitForFunction(() => document.querySelector('[data-testid=progress]')?.getAttribute('data-phase') === 'fitting', null, { timeout: 10_000 }).catch(() => {});
    await waitAllFitted(page, demoCurves);
    await page.getByTestId('tab-curve').click();
    await expect.poll(() => page.getByTestId('barrier-diagram').getAttribute('data-phi1'), { timeout: 15_000 }).toBe('4.0000');
    expect(await page.getByTestId('trapezoid').getAttribute('d')).not.toBe(trapezoidBefore);
    await expect.poll(() => page.locator('[data-param="φ1"]').textContent()).toBe('4');
  });

  it('CSV export downloads and parses back with the same numbers as the JSON export and the card', async () => {
    const csv = await download('export-csv');
    const parsed = Papa.parse<Record<string, string>>(csv, { header: true, comments: '#', skipEmptyLines: true });
    expect(parsed.errors).toEqual([]);
    expect(csv).toContain('# setting tipWorkFunctionEV: 4');
    const json = JSON.parse(await download('export-json')) as { results: Record<string, unknown>[]; settings: { tipWorkFunctionEV: number } };
    expect(json.settings.tipWorkFunctionEV).toBe(4);
    expect(parsed.data.length).toBe(json.results.length);
    expect(parsed.data.length).toBe((await counts()).fitted);
    const byCurve = new Map(json.results.map((r) => [r.curve as string, r]));
    const pairs: [string, string][] = [
      ['apparent barrier (eV)', 'apparentBarrierEV'],
      ['apparent barrier err (eV)', 'apparentBarrierErrEV'],
      ['phi1 tip (eV)', 'phi1EV'],
      ['phi2 sample (eV)', 'phi2EV'],
      ['width (nm)', 'widthNm'],
    ];
    let compared = 0;
    for (const row of parsed.data) {
      const record = byCurve.get(row.curve)!;
      expect(record, row.curve).toBeDefined();
      for (const [header, key] of pairs) {
        const cell = row[header];
        if (record[key] === null) expect(cell).toBe('');
        else {
          expect(Number(cell)).toBe(record[key]);
          compared++;
        }
      }
    }
    expect(compared).toBeGreaterThan(100);
    const spectrum = parsed.data.find((r) => r.curve === 'spectra-A-gold.tsv#0/single')!;
    expect(Number(spectrum['phi1 tip (eV)'])).toBe(4);
  });

  it('a brushed fit window is saved as manual, and a reload restores the session from IndexedDB', async () => {
    await openCurve('approach-A-gold.csv#0/single');
    const plot = page.locator('[data-testid=plot-current] svg[role=img]');
    await plot.waitFor();
    const box = (await plot.boundingBox())!;
    const left = box.x + 56;
    const width = box.width - 56 - 12;
    const y = box.y + 8 + (box.height - 38) / 2;
    await page.mouse.move(left + 0.15 * width, y);
    await page.mouse.down();
    await page.mouse.move(left + 0.5 * width, y, { steps: 6 });
    await page.mouse.move(left + 0.7 * width, y, { steps: 6 });
    await page.mouse.up();
    await expect.poll(() => page.getByTestId('manual-badge').textContent(), { timeout: 10_000 }).toMatch(/^manual window /);
    await waitAllFitted(page, demoCurves);
    const windowText = await page.getByTestId('manual-badge').textContent();
    const barrier = await page.locator('[data-param="φ_ap"]').textContent();
    const status = await page.getByTestId('status-counts').textContent();
    await page.getByLabel('Search curves').fill('approach-A-gold.csv');
    const keys = await page.locator('.row.curve .key').allTextContents();
    await page.getByLabel('Search curves').fill('');
    await expect.poll(() => page.getByTestId('save-status').getAttribute('data-status'), { timeout: 10_000 }).toBe('saved');

    await page.reload();
    await waitAllFitted(page, demoCurves);
    expect(await page.getByTestId('status-counts').textContent()).toBe(status);
    await page.locator('[data-testid=curve-panel][data-curve="approach-A-gold.csv#0/single"]').waitFor();
    await expect.poll(() => page.getByTestId('manual-badge').textContent()).toBe(windowText);
    await expect.poll(() => page.locator('[data-param="φ_ap"]').textContent()).toBe(barrier);
    await page.getByLabel('Search curves').fill('approach-A-gold.csv');
    expect(await page.locator('.row.curve .key').allTextContents()).toEqual(keys);
    await page.getByLabel('Search curves').fill('');
    // Restored, not refitted: no "Fitted N curves" message after the reload.
    expect(await page.getByTestId('progress-message').textContent()).not.toMatch(/Fitted/);
    await page.getByTestId('tab-settings').click();
    expect(await page.locator('input[data-field="tipWorkFunctionEV"][data-run=""]').inputValue()).toBe('4');
  });

  it('a folder with a settings.json kept beside its exports is fitted with those settings', async () => {
    const folder = mkdtempSync(join(tmpdir(), 'burrow-folder-'));
    const settings = JSON.parse(readFileSync(new URL('../../sample-data/settings.json', import.meta.url), 'utf8'));
    writeFileSync(join(folder, 'settings.json'), JSON.stringify({ ...settings, temperatureK: 77 }, null, 1));
    copyFileSync(new URL('../../sample-data/spectra-A-gold.tsv', import.meta.url), join(folder, 'spectra-A-gold.tsv'));
    writeFileSync(join(folder, 'notes.md'), '# not data\n');
    await page.getByRole('button', { name: 'New session' }).click();
    await page.getByTestId('folder-input').setInputFiles(folder);
    await expect.poll(() => page.getByTestId('notice-text').allTextContents()).toContain('Settings from settings.json applied.');
    await waitAllFitted(page, 2);
    // With the tip radius from the file the area is tied, so no spectrum is left degenerate.
    const fitted = await counts();
    expect(fitted.curves).toBe(fitted.fitted);
    expect(fitted.flagged).toBe(0);
    await page.getByTestId('tab-settings').click();
    expect(await page.locator('input[data-field="temperatureK"][data-run=""]').inputValue()).toBe('77');
    expect(await page.locator('input[data-field="tipRadiusNm"][data-run="A-gold"]').inputValue()).toBe('12');
  });

  it('the page made no request outside its own origin and printed no console error', () => {
    expect(requests.length).toBeGreaterThan(3);
    expect(requests.some((url) => url.includes('browserAnalysisWorker'))).toBe(true);
    expect(foreign).toEqual([]);
    expect(consoleErrors).toEqual([]);
  });
});
