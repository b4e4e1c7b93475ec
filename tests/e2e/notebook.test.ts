import assert from 'node:assert/strict';
import fs from 'node:fs';
import path from 'node:path';
import { after, before, describe, test } from 'node:test';
import type { BrowserContext, Page } from 'playwright-core';
import { ARTIFACTS, BASE_URL, openBrowser, viewports } from './browser';

const LEAD = { email: 'lead@demo.rungbook.example', password: 'demo-lead-pass' };

async function texOf(page: Page, testId: string): Promise<string> {
  const formula = page.getByTestId(testId);
  await formula.locator('.katex').first().waitFor();
  return (await formula.locator('annotation').first().textContent()) ?? '';
}

async function waitForState(page: Page, label: string, state: RegExp) {
  try {
    await page.getByTestId(`cell-${label}-state`).filter({ hasText: state }).waitFor({ timeout: 120_000 });
  } catch (error) {
    // say what the cell shows instead, and keep a picture of it
    const shown = await page.getByTestId(`cell-${label}-state`).innerText().catch(() => '(no state badge)');
    await page.screenshot({ path: path.join(ARTIFACTS, `notebook-timeout-${label}.png`), fullPage: true }).catch(() => undefined);
    throw new Error(`cell ${label} did not reach ${state} within 120 s; it shows "${shown}" (${error instanceof Error ? error.message.split('\n')[0] : String(error)})`);
  }
}

for (const viewport of viewports) {
  describe(`notebook in Chromium at ${viewport.name} size (${viewport.width}×${viewport.height})`, () => {
    let context: BrowserContext;
    let page: Page;
    const shot = (step: string) => page.screenshot({ path: path.join(ARTIFACTS, `notebook-${viewport.name}-${step}.png`), fullPage: true });
    const openCellMenu = async (label: string) => {
      if (viewport.width < 1024) await page.getByTestId(`cell-${label}-menu`).click();
    };

    before(async () => {
      fs.mkdirSync(ARTIFACTS, { recursive: true });
      context = await openBrowser(viewport);
      page = context.pages()[0] ?? (await context.newPage());
    });
    after(() => context?.close());

    test('create → parameters, flow, exponents → run → change N → run all → versions → restore → LaTeX → presentation', async () => {
      await page.goto(`${BASE_URL}/sign-in`);
      await page.getByTestId('sign-in-email').fill(LEAD.email);
      await page.getByTestId('sign-in-password').fill(LEAD.password);
      await page.getByTestId('sign-in-submit').click();
      await page.waitForURL(`${BASE_URL}/notebooks`);

      await page.getByTestId('new-notebook').click();
      await page.getByTestId('new-notebook-title').fill(`Long-range Ising check (${viewport.name}, invented)`);
      await page.getByTestId('new-notebook-create').click();
      await page.waitForURL(/\/notebooks\/[a-z0-9]+$/);

      await page.getByTestId('add-cell-setup').click();
      await page.getByTestId('cell-setup').waitFor();
      for (const kind of ['flow', 'exponents']) {
        await page.getByTestId('add-cell').click();
        await page.getByTestId(`add-cell-${kind}`).click();
        await page.getByTestId(`cell-${kind}`).waitFor();
      }
      // Validation at the field, before anything is sent.
      await page.getByTestId('cell-setup-field-d').fill('three');
      assert.match(await page.getByTestId('cell-setup-field-d-error').innerText(), /decimal number/);
      await page.getByTestId('cell-setup-field-d').fill('3');
      await shot('01-cells');

      await page.getByTestId('cell-flow-run').click();
      await page.getByTestId('cell-exponents-run').click();
      await waitForState(page, 'exponents', /Up to date/);
      await waitForState(page, 'flow', /Up to date/);
      // O(1) at d = 3, s = 1.75: the ε coefficient of 1/ν is −(N+2)/(N+8) = −1/3
      // (Fisher, Ma & Nickel 1972, as quoted in Pagni et al. arXiv:2510.02458 eq. (44)), printed as a fraction.
      assert.match(await texOf(page, 'exponent-nuInv'), /1\/\\nu = 1\.75 - \\tfrac\{1\}\{3\}\\,\\varepsilon/);
      // The table shows −1/3 (real minus sign); a tap shows every computed digit of −1/3.
      const table = page.getByTestId('cell-exponents-result-table');
      await table.getByText('\u22121/3', { exact: true }).first().click();
      assert.match(await table.innerText(), /-0\.33333333333333333333/);
      await page.getByTestId('beta-u').locator('.katex').first().waitFor();
      await shot('02-results');

      await page.getByTestId('save-version').click();
      await page.getByTestId('version-message').fill('Ising, N = 1');
      await page.getByTestId('version-save').click();
      await page.getByTestId('version-saved').waitFor();

      // N = 3: flow and exponents now rest on old inputs.
      if (!(await page.getByTestId('cell-setup-field-N').isVisible())) {
        await openCellMenu('setup');
        await page.getByTestId('cell-setup-edit').click();
      }
      await page.getByTestId('cell-setup-field-N').fill('3');
      await page.getByTestId('cell-setup-save').click();
      await waitForState(page, 'exponents', /Out of date/);
      await waitForState(page, 'flow', /Out of date/);
      await page.getByTestId('cell-exponents-stale').waitFor();
      await shot('03-out-of-date');

      await page.getByTestId('run-all').click();
      await waitForState(page, 'exponents', /Up to date/);
      await waitForState(page, 'flow', /Up to date/);
      // O(3): −(N+2)/(N+8) = −5/11 = −0.4545…, printed as the fraction
      assert.match(await texOf(page, 'exponent-nuInv'), /- \\tfrac\{5\}\{11\}\\,\\varepsilon/);
      await page.getByTestId('version-message').fill('Heisenberg, N = 3');
      await page.getByTestId('version-save').click();
      await page.getByTestId('version-saved').filter({ hasText: /version/ }).waitFor();

      await page.getByTestId('export-tex').click();
      const download = page.waitForEvent('download');
      await page.getByTestId('export-tex-download').click();
      const texFile = await (await download).path();
      const tex = fs.readFileSync(texFile, 'utf8');
      assert.match(tex, /\\begin\{document\}/);
      assert.match(tex, /\\end\{document\}/);

      await page.getByTestId('open-history').click();
      await page.waitForURL(/\/versions$/);
      const card = (message: string) => page.locator('[data-testid^="version-"]').filter({ hasText: message }).first();
      await card('Ising, N = 1').locator('[data-testid$="-pick"]').click();
      await card('Heisenberg, N = 3').locator('[data-testid$="-pick"]').click();
      await page.getByTestId('compare-versions').click();
      await page.getByTestId('version-comparison').waitFor();
      assert.equal(await page.getByTestId('compare-setup-change').innerText(), 'changed');
      assert.match(await page.getByTestId('compare-setup-input').innerText(), /3/);
      await shot('04-compare');

      await card('Ising, N = 1').locator('[data-testid$="-open"]').click();
      await page.getByTestId('version-reader').waitFor();
      await card('Ising, N = 1').locator('[data-testid$="-restore"]').click();
      await card('Ising, N = 1').locator('[data-testid$="-restore-confirm"]').click();
      await page.waitForURL(/\/notebooks\/[a-z0-9]+$/);
      assert.match(await texOf(page, 'cell-setup-parameters'), /O\(1\)/);
      await page.getByTestId('run-all').click();
      await waitForState(page, 'exponents', /Up to date/);
      assert.match(await texOf(page, 'exponent-nuInv'), /- \\tfrac\{1\}\{3\}\\,\\varepsilon/);
      await shot('05-restored');

      await page.getByTestId('open-present').click();
      await page.waitForURL(/\/present$/);
      await page.getByTestId('presentation-counter').filter({ hasText: '1 / 3' }).waitFor();
      await page.keyboard.press('ArrowRight');
      await page.getByTestId('presentation-counter').filter({ hasText: '2 / 3' }).waitFor();
      await page.getByTestId('presentation-next').click();
      await page.getByTestId('presentation-counter').filter({ hasText: '3 / 3' }).waitFor();
      await page.getByTestId('slide-exponents').waitFor();
      await shot('06-presentation');
      await page.keyboard.press('ArrowLeft');
      await page.getByTestId('presentation-counter').filter({ hasText: '2 / 3' }).waitFor();
    });
  });
}
