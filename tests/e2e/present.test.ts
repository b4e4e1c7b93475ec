import assert from 'node:assert/strict';
import path from 'node:path';
import { after, before, describe, test } from 'node:test';
import type { Browser, Page } from 'playwright-core';
import { ARTIFACTS, BASE_URL, api, launchBrowser, personPage, signIn } from './browser';

const LEAD = { email: 'lead@demo.rungbook.example', password: 'demo-lead-pass' };
const DEMO_TITLE = /Long-range O\(3\) in d = 3/;
const sizes = [
  { name: 'phone', width: 390, height: 844 },
  { name: 'phone-landscape', width: 844, height: 390 },
  { name: 'wide', width: 1440, height: 900 },
];

interface CellState {
  label: string;
  state: string;
}

/** The demo notebook of the lead, computed once (run all, then wait until no cell is queued or running). */
async function computedDemo(page: Page): Promise<{ id: string; labels: string[] }> {
  const list = await api(page, 'GET', '/api/notebooks');
  const found = (list.json.notebooks as { id: string; title: string }[]).find((notebook) => DEMO_TITLE.test(notebook.title));
  assert.ok(found, 'the demo notebook is seeded for the lead');
  await api(page, 'POST', `/api/notebooks/${found.id}/run-all`, {});
  for (let attempt = 0; attempt < 300; attempt += 1) {
    const cells = (await api(page, 'GET', `/api/notebooks/${found.id}`)).json.notebook.cells as CellState[];
    if (cells.every((cell) => cell.state !== 'running' && cell.state !== 'queued')) return { id: found.id, labels: cells.map((cell) => cell.label) };
    await page.waitForTimeout(1000);
  }
  throw new Error('the demo notebook did not finish computing');
}

/** Elements of the slide whose right edge passes the screen's, as "tag.class (right px)". */
function overflowing(page: Page): Promise<string[]> {
  return page.evaluate(() => {
    const limit = document.documentElement.clientWidth + 1;
    const slide = document.querySelector('[data-testid="presentation"]');
    if (!slide) return ['no presentation'];
    const wide: string[] = [];
    for (const element of Array.from(slide.querySelectorAll('*'))) {
      const box = element.getBoundingClientRect();
      if (box.width === 0 || box.right <= limit) continue;
      // content inside a scroller the reader can swipe is fine; only what sticks out of the screen counts
      let clipped = false;
      for (let parent = element.parentElement; parent && parent !== slide; parent = parent.parentElement) {
        const style = getComputedStyle(parent);
        if (/(auto|scroll|hidden)/.test(style.overflowX) && parent.getBoundingClientRect().right <= limit) clipped = true;
      }
      if (!clipped) wide.push(`${element.tagName.toLowerCase()}.${String(element.className).split(' ')[0]} (${Math.round(box.right)} px)`);
    }
    return wide;
  });
}

for (const size of sizes) {
  describe(`presentation at ${size.width}×${size.height}`, () => {
    let browser: Browser;
    let page: Page;
    before(async () => {
      browser = await launchBrowser();
      page = await personPage(browser, size);
    });
    after(() => browser?.close());

    test('every slide of the demo notebook fits the screen, without editing controls', async () => {
      await signIn(page, LEAD.email, LEAD.password);
      const demo = await computedDemo(page);
      await page.goto(`${BASE_URL}/notebooks/${demo.id}/present`);
      await page.getByTestId('presentation').waitFor();
      const problems: string[] = [];
      for (const [index, label] of demo.labels.entries()) {
        await page.getByTestId(`slide-${label}`).waitFor();
        await page.waitForTimeout(300);
        for (const element of await overflowing(page)) problems.push(`${label}: ${element}`);
        assert.equal(await page.locator('[data-testid$="-edit"], [data-testid$="-run"]').count(), 0, `slide ${label} shows editing controls`);
        // Nor copy menus, run facts, "Show points", "Save SVG" or export chips: they are clutter on a slide.
        assert.equal(await page.locator('[aria-label="Copy options"], [data-testid$="-facts"], [data-testid$="-result-points"], [data-testid$="-plot-svg"], [data-testid="comparison-menu"]').count(), 0, `slide ${label} shows result actions`);
        await page.screenshot({ path: path.join(ARTIFACTS, `present-${size.name}-${String(index + 1).padStart(2, '0')}-${label}.png`) });
        if (index < demo.labels.length - 1) await page.getByTestId('presentation-next').click();
      }
      assert.deepEqual(problems, []);
    });

    test('ν is set in the math face and v in the text face', async () => {
      const statuses = await page.evaluate(async () => {
        await document.fonts.ready;
        const probe = document.createElement('div');
        probe.style.fontFamily = 'RungbookGreek, Inter_400Regular';
        probe.style.fontSize = '40px';
        probe.textContent = 'ν v';
        probe.setAttribute('data-testid', 'nu-v-probe');
        document.body.appendChild(probe);
        await document.fonts.load('40px RungbookGreek', 'ν');
        return Array.from(document.fonts as unknown as Iterable<FontFace>).filter((face) => face.family.replace(/["']/g, '') === 'RungbookGreek').map((face) => face.status);
      });
      assert.deepEqual(statuses, ['loaded']);
      await page.getByTestId('nu-v-probe').screenshot({ path: path.join(ARTIFACTS, `present-${size.name}-nu-v.png`) });
    });
  });
}
