import assert from 'node:assert/strict';
import fs from 'node:fs';
import path from 'node:path';
import { after, before, describe, test } from 'node:test';
import type { Browser, Page } from 'playwright-core';
import { PLANTED_KINK, inventedBoundCsv } from '../../server/seed/demoDatasets';
import { ARTIFACTS, BASE_URL, api, launchBrowser, personPage, signIn, viewports } from './browser';

/** The demo lead (seeded on a local start). */
const LEAD = { email: 'lead@demo.rungbook.example', password: 'demo-lead-pass' };
const PATIENCE_MS = 90_000;


/** A notebook with a model & parameters cell and a scan over s, made through the API (the notebook e2e test covers making cells by hand). */
async function notebookWithScan(page: Page, title: string): Promise<string> {
  const created = await api(page, 'POST', '/api/notebooks', { title });
  assert.equal(created.status, 201);
  const id = created.json.notebook.id as string;
  const setup = { kind: 'setup', model: { preset: 'on', N: 3 }, d: '3', s: '1.75', loops: 2, digits: 20 };
  const scan = { kind: 'scan', uses: 'params', from: '1.55', to: '1.95', points: 41, quantities: ['Delta_phi2'] };
  assert.equal((await api(page, 'POST', `/api/notebooks/${id}/cells`, { label: 'params', input: setup })).status, 201);
  assert.equal((await api(page, 'POST', `/api/notebooks/${id}/cells`, { label: 'scan', input: scan })).status, 201);
  return id;
}

for (const viewport of viewports) {
  describe(`datasets in Chromium at ${viewport.name} size (${viewport.width}×${viewport.height})`, () => {
    let browser: Browser;
    let page: Page;
    const shot = (step: string) => page.screenshot({ path: path.join(ARTIFACTS, `data-${viewport.name}-${step}.png`), fullPage: true });

    before(async () => {
      browser = await launchBrowser();
      page = await personPage(browser, viewport);
    });
    after(() => browser?.close());

    test('upload a CSV → map columns → compare with the scan → overlay, residuals and the kink marker', async () => {
      await signIn(page, LEAD.email, LEAD.password);
      const notebookId = await notebookWithScan(page, `Invented bound check (${viewport.name})`);
      await page.goto(`${BASE_URL}/notebooks/${notebookId}`);
      await page.getByTestId('data-toggle').click();
      await page.getByTestId('dataset-panel').waitFor();

      // A table with a word where a number belongs is refused with its line number, before anything is sent.
      const broken = inventedBoundCsv().replace(/\n0\.530,[^\n]*/, '\n0.530,about 1.56');
      await page.getByTestId('dataset-file-input').setInputFiles({ name: 'invented-bound.csv', mimeType: 'text/csv', buffer: Buffer.from(broken) });
      await page.getByTestId('dataset-preview').waitFor();
      await page.getByTestId('dataset-x-column-0').click();
      await page.getByTestId('dataset-y-column-1').click();
      await page.getByTestId('dataset-problems').waitFor();
      // line 1 is the comment, line 2 the header, x = 0.520 + 0.002·k is on line 3 + k: 0.530 is line 8
      assert.match((await page.getByTestId('dataset-problems').textContent()) ?? '', /line 8/i);
      await shot('1-problem-by-line');

      await page.getByTestId('dataset-file-input').setInputFiles({ name: 'invented-bound.csv', mimeType: 'text/csv', buffer: Buffer.from(inventedBoundCsv()) });
      await page.getByTestId('dataset-preview').waitFor();
      assert.match((await page.getByTestId('dataset-preview-summary').textContent()) ?? '', /111/);
      await page.getByTestId('dataset-x-column-0').click();
      await page.getByTestId('dataset-y-column-1').click();
      await page.getByTestId('dataset-yerror-kind-none').click();
      await page.getByTestId('dataset-x-axis-Delta_phi').click();
      await page.getByTestId('dataset-y-axis-Delta_phi2').click();
      await page.getByTestId('dataset-shape-boundary').click();
      await page.getByTestId('dataset-label').fill('bound');
      await page.getByTestId('dataset-name').fill('Invented bound (e2e)');
      await page.getByTestId('dataset-source').fill('Invented for the browser test');
      await shot('2-columns-mapped');
      await page.getByTestId('dataset-submit').click();
      await page.getByTestId('dataset-bound').waitFor({ timeout: PATIENCE_MS });
      await shot('3-dataset-listed');

      await page.getByTestId('dataset-bound-compare').click();
      await page.locator('[data-testid$="-run"]').last().waitFor();
      await page.getByTestId('run-all').click();
      const plot = page.getByTestId('comparison-plot').first();
      await plot.waitFor({ timeout: PATIENCE_MS });
      await plot.scrollIntoViewIfNeeded();
      for (const part of ['comparison-curve-order1', 'comparison-curve-order2', 'comparison-boundary', 'comparison-kink-0', 'comparison-data-range']) {
        assert.ok((await page.getByTestId(part).count()) >= 1, `${part} is drawn`);
      }
      await shot('4-overlay-with-kink');

      const kinks = (await page.getByTestId('comparison-kinks').textContent()) ?? '';
      const found = /(0\.6\d+)\s*±\s*(0\.0\d+)/.exec(kinks);
      assert.ok(found, `a kink position with its uncertainty is listed: ${kinks}`);
      assert.ok(Math.abs(Number(found[1]) - PLANTED_KINK.x) <= Number(found[2]), `found ${found[1]} ± ${found[2]}, planted ${PLANTED_KINK.x}`);

      await page.getByTestId('comparison-residuals').scrollIntoViewIfNeeded();
      assert.ok((await page.getByTestId('comparison-residual-plot').count()) >= 1);
      assert.match((await page.getByTestId('comparison-summary').textContent()) ?? '', /RMS/);
      await shot('5-residuals');
      const width = await page.evaluate(() => document.documentElement.scrollWidth);
      assert.ok(width <= viewport.width + 1, `no sideways scrolling of the page (${width} px wide)`);
    });
  });
}
