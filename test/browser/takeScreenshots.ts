/**
 * npm run screenshots: the main views of the dashboard at 1366×768, saved to static/screenshots/
 * for the README. Builds the app, opens the demo session in Debian's Chromium and walks through it.
 * File names given as arguments (npm run screenshots -- dashboard-compare.png) save only those.
 */
import { mkdirSync, readFileSync } from 'node:fs';
import type { Page } from 'playwright-core';
import { buildAndServe, launchBrowser, waitAllFitted } from './harness.ts';

const out = new URL('../../static/screenshots/', import.meta.url);
const only = process.argv.slice(2);
mkdirSync(out, { recursive: true });

async function openCurve(page: Page, curveId: string): Promise<void> {
  await page.getByLabel('Search curves').fill(curveId.split('#')[0]);
  await page.locator(`.row.curve[data-curve="${curveId}"]`).click();
  await page.getByLabel('Search curves').fill('');
  await page.getByTestId('tab-curve').click();
  await page.locator(`[data-testid=curve-panel][data-curve="${curveId}"] [data-testid=result-card]`).waitFor();
  await page.locator('[data-testid=approach-plots], [data-testid=spectrum-plots]').first().waitFor({ timeout: 60_000 });
  await page.waitForTimeout(600);
}

async function shot(page: Page, name: string): Promise<void> {
  if (only.length > 0 && !only.includes(name)) return;
  await page.mouse.move(1360, 760);
  await page.waitForTimeout(250);
  await page.screenshot({ path: new URL(name, out).pathname });
  console.log(`static/screenshots/${name}`);
}

const app = await buildAndServe();
const browser = await launchBrowser({ width: 1366, height: 768 });
try {
  const page = await browser.context.newPage();
  await page.goto(app.url);
  await waitAllFitted(page);

  await page.getByTestId('tab-compare').click();
  await page.getByTestId('compare-panel').waitFor();
  await shot(page, 'dashboard-compare.png');

  await openCurve(page, 'approach-A-gold-clipped.csv#0/single');
  await page.getByRole('button', { name: /show \d+ points/ }).first().click();
  await shot(page, 'dashboard-approach.png');

  await page.getByTestId('tab-settings').click();
  const image = page.locator('select[data-field="imagePotential"][data-run=""]');
  await image.selectOption('true');
  await page.waitForFunction(() => document.querySelector('[data-testid=progress]')?.getAttribute('data-phase') === 'fitting', null, { timeout: 5000 }).catch(() => {});
  await waitAllFitted(page);
  await openCurve(page, 'spectra-B-gold.tsv#1/single');
  await page.getByTestId('wkb-deviation').locator('strong').waitFor();
  await shot(page, 'dashboard-spectrum.png');

  await page.getByTestId('tab-table').click();
  await page.getByRole('button', { name: /^apparent barrier \(eV\)/ }).click();
  await shot(page, 'dashboard-table.png');

  await page.getByTestId('tab-settings').click();
  const tip = page.locator('input[data-field="tipWorkFunctionEV"][data-run="A-gold"]');
  await tip.fill('-1');
  await tip.press('Tab');
  await shot(page, 'dashboard-settings.png');
  await tip.fill('');
  await tip.press('Tab');

  await page.getByTestId('file-input').setInputFiles([new URL('../fixtures/import/bad-ragged.csv', import.meta.url).pathname]);
  await waitAllFitted(page);
  await page.getByTestId('tab-files').click();
  await page.locator('[data-file="bad-ragged.csv"]').scrollIntoViewIfNeeded();
  await shot(page, 'dashboard-files.png');

  await page.getByTestId('file-input').setInputFiles({
    name: 'no-header.dat',
    mimeType: 'text/plain',
    buffer: readFileSync(new URL('../fixtures/import/no-header.dat', import.meta.url)),
  });
  await page.getByTestId('mapping-dialog').waitFor();
  await shot(page, 'dashboard-mapping.png');
  await page.getByRole('button', { name: 'Later' }).click();

  await page.getByTestId('theme-toggle').click();
  await openCurve(page, 'approach-A-gold-tip-jump.csv#0/single');
  await shot(page, 'dashboard-dark.png');
  await page.getByTestId('theme-toggle').click();
} finally {
  await browser.close();
  await app.close();
}
