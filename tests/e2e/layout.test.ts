import assert from 'node:assert/strict';
import path from 'node:path';
import { after, before, describe, test } from 'node:test';
import type { Browser, Page } from 'playwright-core';
import { ARTIFACTS, BASE_URL, api, launchBrowser, personPage, signIn, viewports } from './browser';

const LEAD = { email: 'lead@demo.rungbook.example', password: 'demo-lead-pass' };
const DEMO_TITLE = /Long-range O\(3\) in d = 3/;
/** The O(2) notebook of the issue: preset O(N) with N = 2, d = 3, s = 1.75, exponents and fixed points. */
const O2_CELLS = [
  { label: 'params', input: { kind: 'setup', model: { preset: 'on', N: 2 }, d: '3', s: '1.75', loops: 2, digits: 20 } },
  { label: 'exps', input: { kind: 'exponents', uses: 'params' } },
  { label: 'fixed', input: { kind: 'fixedpoints', uses: 'params' } },
];
/** What counts as a result element: typeset formulas, tables and the outputs and results of cells. */
const MEASURED = ['.katex', '.katex-display', '[data-formula]', 'table', '[data-testid$="-table"]', '[data-testid$="-hscroll"]', '[data-testid$="-output"]', '[data-testid$="-result"]'];
/** Chromium's largest screenshot side is 16384 px: a taller page is saved in parts. */
const SHOT_PART = 12_000;

interface CellState {
  label: string;
  kind: string;
  state: string;
}

async function notebookCells(page: Page, id: string): Promise<CellState[]> {
  return (await api(page, 'GET', `/api/notebooks/${id}`)).json.notebook.cells as CellState[];
}

/** Runs every cell and waits until none is queued or running (polling the API the app itself polls). */
async function computed(page: Page, id: string): Promise<CellState[]> {
  await api(page, 'POST', `/api/notebooks/${id}/run-all`, {});
  for (let attempt = 0; attempt < 300; attempt += 1) {
    const cells = await notebookCells(page, id);
    if (cells.every((cell) => cell.state !== 'running' && cell.state !== 'queued')) return cells;
    await page.waitForTimeout(1000);
  }
  throw new Error(`notebook ${id} did not finish computing`);
}

async function demoNotebook(page: Page): Promise<string> {
  const list = await api(page, 'GET', '/api/notebooks');
  const found = (list.json.notebooks as { id: string; title: string }[]).find((notebook) => DEMO_TITLE.test(notebook.title));
  assert.ok(found, 'the demo notebook is seeded for the lead');
  return found.id;
}

async function freshO2Notebook(page: Page, viewportName: string): Promise<string> {
  const created = await api(page, 'POST', '/api/notebooks', { title: `O(2) layout check (${viewportName})` });
  assert.equal(created.status, 201, JSON.stringify(created.json));
  const id = created.json.notebook.id as string;
  for (const cell of O2_CELLS) {
    const added = await api(page, 'POST', `/api/notebooks/${id}/cells`, cell);
    assert.equal(added.status, 201, JSON.stringify(added.json));
  }
  return id;
}

/** Opens the notebook and waits until every computed cell shows its output with typeset formulas. */
async function openComputed(page: Page, id: string, cells: CellState[]) {
  await page.goto(`${BASE_URL}/notebooks/${id}`);
  // Notes and model & parameters cells run no job: they carry no state and no run output.
  for (const cell of cells.filter((candidate) => candidate.kind !== 'note' && candidate.kind !== 'setup')) {
    await page.getByTestId(`cell-${cell.label}-state`).filter({ hasText: /Up to date/ }).waitFor({ timeout: 60_000 });
    await page.getByTestId(`cell-${cell.label}-output`).waitFor();
  }
  await page.locator('.katex').first().waitFor();
  await page.evaluate(() => document.fonts.ready);
  // A table decides whether it needs a scroll cue after its first layout: let that settle.
  await page.waitForTimeout(500);
}

/**
 * Every measured element that is wider than its container, or whose own content is wider than its box
 * (scrollWidth > clientWidth + 1), named with its cell. Exempt: what sits in a scroller marked
 * "…-hscroll" with a visible cue ("…-cue") next to it.
 */
function layoutProblems(page: Page, selectors: string[]): Promise<string[]> {
  return page.evaluate((selectorList) => {
    const shown = (element: Element) => {
      const box = element.getBoundingClientRect();
      return box.width > 0 && box.height > 0 && getComputedStyle(element).visibility !== 'hidden';
    };
    // The cue sits next to the scroller: inside its parent or grandparent (a table's frame), outside the scroller itself.
    const cueVisible = (scroller: Element) => {
      if (!(scroller.getAttribute('data-testid') ?? '').endsWith('-hscroll')) return false;
      const frame = scroller.parentElement?.parentElement ?? scroller.parentElement;
      const cues = frame ? Array.from(frame.querySelectorAll('[data-testid$="-cue"]')) : [];
      return cues.some((cue) => !scroller.contains(cue) && shown(cue));
    };
    const inMarkedScroller = (element: Element) => {
      for (let node: Element | null = element; node; node = node.parentElement) if (cueVisible(node)) return true;
      return false;
    };
    const isInline = (element: Element) => getComputedStyle(element).display.startsWith('inline') && getComputedStyle(element).display !== 'inline-block';
    const container = (element: Element) => {
      let parent = element.parentElement;
      while (parent && isInline(parent)) parent = parent.parentElement;
      return parent;
    };
    const describe = (element: Element) => {
      const cell = element.closest('[data-testid^="cell-"]')?.getAttribute('data-testid') ?? 'page';
      const own = element.getAttribute('data-testid') ?? `${element.tagName.toLowerCase()}.${String(element.className).split(' ')[0]}`;
      const tex = element.querySelector('annotation')?.textContent?.slice(0, 60);
      return `${cell} › ${own}${tex ? ` [${tex}]` : ''}`;
    };
    const problems: string[] = [];
    for (const element of Array.from(document.querySelectorAll(selectorList.join(',')))) {
      if (!shown(element) || inMarkedScroller(element)) continue;
      if (!isInline(element) && element.scrollWidth > element.clientWidth + 1) {
        problems.push(`${describe(element)}: content ${element.scrollWidth} px in a ${element.clientWidth} px box`);
      }
      const outer = container(element);
      if (!outer) continue;
      const box = element.getBoundingClientRect();
      const frame = outer.getBoundingClientRect();
      const left = frame.left + outer.clientLeft;
      const right = left + outer.clientWidth;
      if (box.right > right + 1 || box.left < left - 1) problems.push(`${describe(element)}: ${Math.round(box.width)} px wide in a ${outer.clientWidth} px container`);
    }
    const page = document.documentElement;
    if (page.scrollWidth > page.clientWidth + 1) problems.push(`the page scrolls sideways (${page.scrollWidth} px in ${page.clientWidth} px)`);
    return problems;
  }, selectors);
}

/** The notebook's scroller: the tallest element that scrolls vertically. */
function scrollerHeights(page: Page): Promise<{ content: number; view: number }> {
  return page.evaluate(() => {
    let best = { content: document.documentElement.scrollHeight, view: document.documentElement.clientHeight };
    for (const element of Array.from(document.querySelectorAll('div'))) {
      const overflowY = getComputedStyle(element).overflowY;
      if (/(auto|scroll)/.test(overflowY) && element.scrollHeight > best.content) best = { content: element.scrollHeight, view: element.clientHeight };
    }
    return best;
  });
}

/** The whole page: the window made as tall as the notebook (in parts past Chromium's limit), then put back. */
async function fullPageShots(page: Page, viewport: { width: number; height: number }, name: string): Promise<string[]> {
  const { content, view } = await scrollerHeights(page);
  const total = viewport.height + Math.max(0, content - view);
  const files: string[] = [];
  const parts = Math.ceil(total / SHOT_PART);
  await page.setViewportSize({ width: viewport.width, height: Math.min(total, SHOT_PART) });
  for (let part = 0; part < parts; part += 1) {
    await page.evaluate((top) => {
      for (const element of Array.from(document.querySelectorAll('div'))) {
        if (/(auto|scroll)/.test(getComputedStyle(element).overflowY) && element.scrollHeight > element.clientHeight) element.scrollTop = top;
      }
    }, part * (SHOT_PART - viewport.height));
    await page.waitForTimeout(300);
    const file = `${name}${parts > 1 ? `-part${part + 1}` : ''}.png`;
    await page.screenshot({ path: path.join(ARTIFACTS, file) });
    files.push(file);
  }
  await page.setViewportSize(viewport);
  return files;
}

for (const viewport of viewports) {
  describe(`results fit their containers at ${viewport.width}×${viewport.height}`, () => {
    let browser: Browser;
    let page: Page;
    before(async () => {
      browser = await launchBrowser();
      page = await personPage(browser, viewport);
      // tsx compiles named inner functions with esbuild's keepNames, which calls a __name helper that
      // functions handed to page.evaluate do not carry into the page: give the page a no-op one.
      await page.addInitScript({ content: 'globalThis.__name = (target) => target;' });
      await signIn(page, LEAD.email, LEAD.password);
    });
    after(() => browser?.close());

    const notebooks = [
      { name: 'demo', open: () => demoNotebook(page) },
      { name: 'o2', open: () => freshO2Notebook(page, viewport.name) },
    ];
    for (const notebook of notebooks) {
      test(`${notebook.name}: no formula, table or result is wider than its container`, async () => {
        const id = await notebook.open();
        const cells = await computed(page, id);
        for (const cell of cells) assert.notEqual(cell.state, 'failed', `${cell.label} failed`);
        await openComputed(page, id, cells);
        const measured = await page.locator(MEASURED.join(',')).count();
        assert.ok(measured > 0, 'the notebook shows results to measure');
        const problems = await layoutProblems(page, MEASURED);
        const shots = await fullPageShots(page, viewport, `layout-${viewport.name}-${notebook.name}-page`);
        console.log(`layout ${viewport.name} ${notebook.name}: ${measured} elements measured; screenshots ${shots.join(', ')}`);
        assert.deepEqual(problems, []);
      });
    }
  });
}
