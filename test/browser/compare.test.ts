/**
 * The comparison tab end to end, against the built app in Debian's Chromium (same harness as the
 * dashboard tests): the demo's runs A-gold and A-graphite compared by apparent barrier, the map of
 * the 6×6 grid run, clicking a point opens its curve, a tag groups curves, and the downloaded
 * report. Every request is recorded; a host other than the app's own, or a console error, fails.
 */
import { readFileSync } from 'node:fs';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildAndServe, launchBrowser, waitAllFitted, type LaunchedBrowser, type ServedApp } from './harness.ts';

let app: ServedApp;
let browser: LaunchedBrowser;
let page: Page;
const foreign: string[] = [];
const consoleErrors: string[] = [];


/** The pairwise row of groups a and b (either order). */
function pairRow(a: string, b: string) {
  return page.locator(`[data-testid=compare-pairs] tr[data-a="${a}"][data-b="${b}"], [data-testid=compare-pairs] tr[data-a="${b}"][data-b="${a}"]`);
}

beforeAll(async () => {
  app = await buildAndServe();
  browser = await launchBrowser();
  browser.context.on('request', (request) => {
    const url = request.url();
    if (!/^(blob|data):/.test(url) && new URL(url).origin !== app.origin) foreign.push(url);
  });
  page = await browser.context.newPage();
  page.on('console', (message) => {
    if (message.type() === 'error') consoleErrors.push(message.text());
  });
  page.on('pageerror', (error) => consoleErrors.push(error.message));
  await page.goto(app.url);
  await waitAllFitted(page, 50);
}, 120_000);

afterAll(async () => {
  await browser?.close();
  await app?.close();
});

describe('Compare tab in Chromium', () => {
  it('by apparent barrier and run, A-gold is higher than A-graphite with Welch p < 0.01', async () => {
    await page.getByTestId('tab-compare').click();
    await page.getByTestId('compare-panel').waitFor();
    expect(await page.getByTestId('compare-quantity').inputValue()).toBe('apparentBarrierEV');
    expect(await page.getByTestId('compare-group-by').inputValue()).toBe('run');
    const row = pairRow('A-gold', 'A-graphite');
    await expect.poll(() => row.count()).toBe(1);
    const [a, difference, welchP] = await Promise.all([row.getAttribute('data-a'), row.getByTestId('pair-difference').textContent(), row.getByTestId('pair-welch-p').textContent()]);
    // A − B is positive when A is A-gold, negative the other way round.
    const value = Number((difference ?? '').replace('\u2212', '-').split(' ')[0]);
    expect(a === 'A-gold' ? value : -value).toBeGreaterThan(0);
    expect(Number(welchP)).toBeLessThan(0.01);
    const sentences = await page.getByTestId('compare-sentence').allTextContents();
    expect(sentences.some((s) => /A-gold is higher than A-graphite by \d\.\d+ eV \(95 % CI \d\.\d+–\d\.\d+\), Welch p = /.test(s))).toBe(true);
    // The strip-and-box plot draws every curve; flagged ones hollow.
    expect(await page.locator('[data-testid=compare-strip] circle.point').count()).toBeGreaterThan(20);
    expect(await page.locator('[data-testid=compare-strip] .point.flagged').count()).toBeGreaterThan(0);
    expect(await page.locator('[data-testid=compare-groups] tbody tr').count()).toBeGreaterThan(2);
    // The drift panel draws a Theil–Sen line.
    expect(await page.locator('[data-testid=compare-drift] .trend').count()).toBe(1);
  });

  it('include flagged curves puts the flagged A-gold curves into the statistics', async () => {
    const gold = page.locator('[data-testid=compare-groups] tr[data-group="A-gold"] td');
    const before = Number(await gold.nth(1).textContent());
    expect(await gold.nth(2).textContent()).toMatch(/flagged/);
    await page.getByTestId('compare-include-flagged').check();
    await expect.poll(async () => Number(await gold.nth(1).textContent())).toBeGreaterThan(before);
    expect(await gold.nth(2).textContent()).not.toMatch(/flagged/);
    await page.getByTestId('compare-include-flagged').uncheck();
    await expect.poll(async () => Number(await gold.nth(1).textContent())).toBe(before);
  });

  it('the map of run B-gold-grid draws 36 cells with a legend', async () => {
    await page.getByTestId('compare-map-group').selectOption('B-gold-grid');
    await expect.poll(() => page.locator('[data-testid=compare-map] rect.cell').count()).toBe(36);
    expect(await page.locator('[data-testid=compare-map] .colour-bar').count()).toBe(1);
    expect(await page.locator('[data-testid=compare-map] rect.cell title').first().textContent()).toMatch(/eV/);
  });

  it('clicking a point opens its curve in the curve tab', async () => {
    const point = page.locator('[data-testid=compare-strip] circle.point').first();
    const id = await point.getAttribute('data-curve-id');
    await point.click();
    await page.locator(`[data-testid=curve-panel][data-curve="${id}"]`).waitFor();
    await page.getByTestId('tab-compare').click();
    // The choices survive the trip.
    expect(await page.getByTestId('compare-map-group').inputValue()).toBe('B-gold-grid');
  });

  it('a tag given to the open curve makes its own group when grouping by tag', async () => {
    await page.getByTestId('tag-input').fill('odd site');
    await page.getByTestId('tag-apply').click();
    await page.getByTestId('compare-group-by').selectOption('tag');
    await expect.poll(() => page.locator('[data-testid=compare-groups] tbody tr').allTextContents()).toEqual(
      expect.arrayContaining([expect.stringContaining('odd site'), expect.stringContaining('(untagged)')]),
    );
    await page.getByTestId('compare-group-by').selectOption('run');
  });

  it('Report downloads a self-contained report.html with the plots and the pairwise table', async () => {
    const [file] = await Promise.all([page.waitForEvent('download'), page.getByTestId('compare-report').click()]);
    expect(file.suggestedFilename()).toBe('report.html');
    const html = readFileSync(await file.path(), 'utf8');
    expect(html.startsWith('<!doctype html>')).toBe(true);
    expect(html).toContain('<svg');
    expect(html).toContain('class="plot strip-box"');
    expect(html).toContain('<table class="pairwise"');
    expect(html).toContain('A-graphite');
    expect(html.match(/<rect class="cell/g)?.length).toBe(36);
    expect(html).not.toMatch(/<script/i);
  });

  it('the page made no request outside its own origin and printed no console error', () => {
    expect(foreign).toEqual([]);
    expect(consoleErrors).toEqual([]);
  });
});
