import assert from 'node:assert/strict';
import path from 'node:path';
import { after, before, describe, test } from 'node:test';
import type { Browser, Page } from 'playwright-core';
import { ARTIFACTS, BASE_URL, api, launchBrowser, personPage, signIn, viewports } from './browser';

const LEAD = { email: 'lead@demo.rungbook.example', password: 'demo-lead-pass' };

for (const viewport of viewports) {
  describe(`no silent surprises at ${viewport.name}`, () => {
    let browser: Browser;
    let page: Page;
    const shot = (step: string) => page.screenshot({ path: path.join(ARTIFACTS, `surprises-${viewport.name}-${step}.png`), fullPage: true });
    const openMenu = async (label: string) => {
      if (viewport.width < 1024) await page.getByTestId(`cell-${label}-menu`).click();
    };
    before(async () => {
      browser = await launchBrowser();
      page = await personPage(browser, viewport);
    });
    after(() => browser?.close());

    test('unsaved setup prompt, scan window at the field, new cell editor', async () => {
      await signIn(page, LEAD.email, LEAD.password);
      const created = await api(page, 'POST', '/api/notebooks', { title: `Surprises ${viewport.name}` });
      const id = created.json.notebook.id as string;
      await api(page, 'POST', `/api/notebooks/${id}/cells`, { label: 'params', input: { kind: 'setup', model: { preset: 'on', N: 1 }, d: '3', s: '1.75', loops: 1, digits: 20 } });
      await api(page, 'POST', `/api/notebooks/${id}/cells`, { label: 'exps', input: { kind: 'exponents', uses: 'params' } });
      await api(page, 'POST', `/api/notebooks/${id}/cells`, { label: 'scan', input: { kind: 'scan', uses: 'params', from: '1.55', to: '1.95', points: 5, quantities: ['nuInv'] } });
      await page.goto(`${BASE_URL}/notebooks/${id}`);

      await openMenu('params');
      await page.getByTestId('cell-params-edit').click();
      await page.getByTestId('cell-params-field-N').fill('2');
      await page.getByTestId('cell-exps-run').click();
      await page.getByTestId('cell-exps-unsaved').waitFor();
      assert.match(await page.getByTestId('cell-exps-unsaved-question').innerText(), /"params" has unsaved changes/);
      await shot('01-prompt');
      await page.getByTestId('cell-exps-unsaved-cancel').click();
      await page.getByTestId('run-all').click();
      await page.getByTestId('run-all-unsaved').waitFor();
      await shot('02-run-all-prompt');
      await page.getByTestId('run-all-unsaved-cancel').click();
      await page.getByTestId('cell-exps-run').click();
      await page.getByTestId('cell-exps-unsaved-save-and-run').click();
      await page.getByTestId('cell-exps-state').filter({ hasText: /Up to date/ }).waitFor({ timeout: 60_000 });
      const saved = await api(page, 'GET', `/api/notebooks/${id}`);
      const params = saved.json.notebook.cells.find((cell: { label: string }) => cell.label === 'params');
      assert.equal(params.input.model.N, 2);

      await openMenu('scan');
      await page.getByTestId('cell-scan-edit').click();
      await page.getByTestId('cell-scan-field-from').fill('1.4');
      assert.match(await page.getByTestId('cell-scan-field-from-error').innerText(), /\(1\.5, 2\]/);
      await page.getByTestId('cell-scan-field-to').fill('1.3');
      assert.match(await page.getByTestId('cell-scan-field-to-error').innerText(), /larger than its start/);
      await page.getByTestId('cell-scan-field-from').scrollIntoViewIfNeeded();
      await shot('03-scan-window');

      await page.getByTestId('add-cell').click();
      await page.getByTestId('add-cell-note').click();
      await page.getByTestId('cell-note-field-text').waitFor();
      await page.getByTestId('cell-note-field-text').fill('A first note.');
      await page.getByTestId('cell-note-save').click();
      await page.getByTestId('cell-note-note').waitFor();
      assert.equal(await page.getByTestId('cell-note-field-text').count(), 0);
      await shot('04-new-cell-closed');
    });
  });
}
