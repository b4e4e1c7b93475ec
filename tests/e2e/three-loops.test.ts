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

// One viewport: the notebook's layouts are covered by notebook.test.ts; this flow checks the three-loop path.
const phone = viewports[0];

describe(`three loops in a notebook, Chromium at ${phone.name} size`, () => {
  let context: BrowserContext;
  let page: Page;

  before(async () => {
    fs.mkdirSync(ARTIFACTS, { recursive: true });
    context = await openBrowser(phone);
    page = context.pages()[0] ?? (await context.newPage());
  });
  after(() => context?.close());

  test('model cell at 3 loops, s = 2 → exponents to ε³ equal the classic three-loop values', async () => {
    await page.goto(`${BASE_URL}/sign-in`);
    await page.getByTestId('sign-in-email').fill(LEAD.email);
    await page.getByTestId('sign-in-password').fill(LEAD.password);
    await page.getByTestId('sign-in-submit').click();
    await page.waitForURL(`${BASE_URL}/notebooks`);

    await page.getByTestId('new-notebook').click();
    await page.getByTestId('new-notebook-title').fill('Three-loop check (invented)');
    await page.getByTestId('new-notebook-create').click();
    await page.waitForURL(/\/notebooks\/[a-z0-9]+$/);

    await page.getByTestId('add-cell-setup').click();
    await page.getByTestId('cell-setup').waitFor();
    await page.getByTestId('add-cell').click();
    await page.getByTestId('add-cell-exponents').click();
    await page.getByTestId('cell-exponents').waitFor();

    await page.getByTestId('cell-setup-field-d').fill('3');
    await page.getByTestId('cell-setup-field-s').fill('2');
    await page.getByTestId('cell-setup-field-loops-3').click();
    await page.getByTestId('cell-setup-save').click();

    await page.getByTestId('cell-exponents-run').click();
    await page.getByTestId('cell-exponents-state').filter({ hasText: /Up to date/ }).waitFor({ timeout: 180_000 });
    const nuInv = await texOf(page, 'exponent-nuInv');
    await page.screenshot({ path: path.join(ARTIFACTS, 'three-loops-phone-exponents.png'), fullPage: true });
    // O(1), s = 2: the ε³ coefficient of 1/ν is (N+2)/(8(N+8)^5)·(3N³ − 452N² − 2672N − 5312 + 96(N+8)(5N+22)ζ(3))
    // = 0.12452740586… at N = 1 (Kleinert & Schulte-Frohlinde 2001, recalled from memory; the same formula
    // is checked symbolically in tests/unit/diagrams/threeLoop.test.ts)
    assert.match(nuInv, /\\varepsilon\^\{?3\}?/, `no ε³ term in ${nuInv}`);
    assert.match(nuInv, /\+ 0\.1245274059\\,\\varepsilon\^\{3\}/, `ε³ coefficient of 1/ν (shown to 10 digits) in ${nuInv}`);
    // ε²: −(N+2)(13N+44)/(2(N+8)³) = −19/162 at N = 1 (the classic two-loop value, docs/physics.md §7)
    assert.match(nuInv, /- \\tfrac\{19\}\{162\}\\,\\varepsilon\^\{2\}/, `ε² coefficient of 1/ν in ${nuInv}`);
  });
});
