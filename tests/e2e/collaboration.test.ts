import assert from 'node:assert/strict';
import path from 'node:path';
import { after, before, describe, test } from 'node:test';
import type { Browser, Page } from 'playwright-core';
import type { CapturedMessage } from '../../shared/api/schemas';
import { ARTIFACTS, BASE_URL, api, launchBrowser, personPage, signIn, viewports } from './browser';

/** Person A: the demo lead (seeded); the mention handle is the part of the address before the @. */
const LEAD = { email: 'lead@demo.rungbook.example', password: 'demo-lead-pass', name: 'Teodor Vashti (demo lead)', handle: 'lead' };
const ADMIN = { email: 'admin@demo.rungbook.example', password: 'demo-admin-pass' };
/** Waiting for something another person caused (mail, a live event): generous, never an assertion on time. */
const PATIENCE_MS = 30_000;

const escapeRegExp = (text: string) => text.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');


async function waitUntil<T>(what: string, probe: () => Promise<T | undefined | null | false>): Promise<T> {
  const deadline = Date.now() + PATIENCE_MS;
  for (;;) {
    const found = await probe();
    if (found) return found;
    if (Date.now() > deadline) throw new Error(`waited ${PATIENCE_MS / 1000} s for ${what}`);
    await new Promise((resolve) => setTimeout(resolve, 250));
  }
}

/** The mail fake's outbox as the site admin reads it (GET /api/admin/mail, newest first). */
async function waitForMail(admin: Page, to: string, subject: RegExp): Promise<CapturedMessage> {
  return waitUntil(`an e-mail to ${to} with a subject like ${subject}`, async () => {
    const reply = await admin.request.get(`${BASE_URL}/api/admin/mail`);
    assert.equal(reply.status(), 200);
    const { messages } = (await reply.json()) as { messages: CapturedMessage[] };
    return messages.find((message) => message.to.toLowerCase().includes(to.toLowerCase()) && subject.test(message.subject));
  });
}

function linkIn(message: CapturedMessage, pathStart: string): string {
  const match = new RegExp(`${escapeRegExp(BASE_URL)}${escapeRegExp(pathStart)}\\S*`).exec(message.text);
  assert.ok(match, `no ${pathStart} link in "${message.subject}":\n${message.text}`);
  return match[0];
}

async function unreadOnBadge(page: Page): Promise<number> {
  const badge = page.getByTestId('nav-activity-badge');
  if ((await badge.count()) === 0) return 0;
  const text = (await badge.first().textContent()) ?? '';
  return text === '99+' ? 100 : Number(text);
}

/** Controls only editors and owners get; a commenter or a link visitor must see none of them. */
const EDIT_CONTROLS = ['run-all', 'add-cell', 'save-version', 'share-button', 'notebook-rename', 'cell-setup-menu', 'cell-setup-edit', 'cell-setup-run', 'cell-flow-run'];

async function assertNoEditControls(page: Page, who: string) {
  for (const testId of EDIT_CONTROLS) assert.equal(await page.getByTestId(testId).count(), 0, `${who} sees ${testId}`);
}

/** Three cells whose labels the steps below refer to: a note, the model & parameters, an RG flow. */
function notebookFile(title: string) {
  return {
    format: 'rungbook-notebook',
    formatVersion: 1,
    title,
    summary: 'Two people check one derivation (invented test data).',
    cells: [
      { label: 'intro', input: { kind: 'note', text: 'Long-range O(N) model in $d = 2s - \\varepsilon$: check the two-loop flow.' } },
      { label: 'setup', input: { kind: 'setup', model: { preset: 'on', N: 1 }, d: '3', s: '1.75', loops: 2, digits: 30 } },
      { label: 'flow', input: { kind: 'flow', uses: 'setup' } },
    ],
  };
}

for (const viewport of viewports) {
  describe(`two people on one notebook in Chromium at ${viewport.name} size (${viewport.width}×${viewport.height})`, () => {
    let browser: Browser;
    let a: Page;
    let b: Page;
    let admin: Page;
    const stamp = `${Date.now().toString(36)}${Math.random().toString(36).slice(2, 6)}`;
    const title = `Two-person check ${viewport.name} ${stamp} (invented)`;
    const B = { name: `Invented Colleague ${viewport.name}`, email: `b-${viewport.name}-${stamp}@test.rungbook.example`, password: 'colleague-password-1' };
    const commentText = `Is the sign of the two-loop term right for ${viewport.name}?`;
    let notebookId = '';
    let cellIds: Record<string, string> = {};
    let bUserId = '';
    const shot = (page: Page, step: string) => page.screenshot({ path: path.join(ARTIFACTS, `collab-${viewport.name}-${step}.png`), fullPage: true });
    const notebookUrl = () => `${BASE_URL}/notebooks/${notebookId}`;

    before(async () => {
      browser = await launchBrowser();
      [a, b, admin] = await Promise.all([personPage(browser, viewport), personPage(browser, viewport), personPage(browser, viewport)]);
      await signIn(admin, ADMIN.email, ADMIN.password);
    });
    after(() => browser?.close());

    test('1. A shares the notebook with B (no account yet) as commenter: an invitation is e-mailed', async () => {
      await signIn(a, LEAD.email, LEAD.password);
      const imported = await api(a, 'POST', '/api/notebooks/import', notebookFile(title));
      assert.equal(imported.status, 201);
      notebookId = imported.json.notebook.id;
      cellIds = Object.fromEntries(imported.json.notebook.cells.map((cell: { label: string; id: string }) => [cell.label, cell.id]));
      assert.deepEqual(Object.keys(cellIds).sort(), ['flow', 'intro', 'setup']);

      await a.goto(notebookUrl());
      await a.getByTestId('cell-flow').waitFor();
      await a.getByTestId('share-button').click();
      await a.waitForURL(`${notebookUrl()}/sharing`);
      await a.getByTestId('share-email').fill(B.email);
      await a.getByTestId('share-role-commenter').click();
      await a.getByTestId('share-add').click();
      const done = a.getByTestId('share-done');
      await done.waitFor();
      assert.match(await done.innerText(), new RegExp(`invitation to ${escapeRegExp(B.email)}`));
      const invitation = a.getByTestId(`invitation-row-${B.email}`);
      await invitation.waitFor();
      assert.match((await invitation.textContent()) ?? '', /Commenter/);
      await invitation.scrollIntoViewIfNeeded();
      await shot(a, '1-share-panel-invitation-sent');

      const mail = await waitForMail(admin, B.email, /invited you to/);
      assert.match(mail.subject, new RegExp(escapeRegExp(title)));
      assert.match(mail.text, /as a commenter/);
    });

    test('2. B signs up from the invitation, confirms the address, finds the notebook shared with them and cannot edit it', async () => {
      assert.ok(notebookId, 'step 1 created the notebook');
      const invitation = await waitForMail(admin, B.email, /invited you to/);
      await b.goto(linkIn(invitation, '/sign-up?'));
      await b.getByTestId('sign-up-invited').waitFor();
      assert.equal(await b.getByTestId('sign-up-email').inputValue(), B.email);
      await b.getByTestId('sign-up-name').fill(B.name);
      await b.getByTestId('sign-up-password').fill(B.password);
      await shot(b, '2-invited-sign-up-B');
      await b.getByTestId('sign-up-submit').click();
      await b.getByTestId('sign-up-sent').waitFor();

      const confirmation = await waitForMail(admin, B.email, /Confirm your Rungbook e-mail address/);
      await b.goto(linkIn(confirmation, '/verify-email?token='));
      await b.getByTestId('verify-password').fill(B.password);
      await b.getByTestId('verify-submit').click();
      await b.waitForURL(`${BASE_URL}/notebooks`);
      bUserId = (await api(b, 'GET', '/api/me')).json.user.id;

      await b.getByTestId('notebook-filter-shared').click();
      await b.getByTestId(`notebook-${notebookId}`).waitFor();
      assert.equal(await b.getByTestId(`notebook-${notebookId}-role`).textContent(), 'Commenter');
      assert.match((await b.getByTestId(`notebook-${notebookId}-shared-by`).textContent()) ?? '', new RegExp(escapeRegExp(LEAD.name)));
      await shot(b, '2-shared-with-me-list-B');

      await b.getByTestId(`notebook-${notebookId}`).click();
      await b.waitForURL(notebookUrl());
      await b.getByTestId('cell-flow').waitFor();
      // textContent, not innerText: the badge is upper-cased by CSS only.
      assert.equal(await b.getByTestId('role-badge').textContent(), 'Commenter');
      await b.getByTestId('live-status').filter({ hasText: 'Live' }).waitFor();
      await assertNoEditControls(b, 'a commenter');
      // The comment button is there: commenting is what this role is for.
      await b.getByTestId('cell-comments-setup').waitFor();

      const before = await api(b, 'GET', `/api/notebooks/${notebookId}`);
      assert.equal(before.status, 200);
      const intro = before.json.notebook.cells.find((cell: { label: string }) => cell.label === 'intro');
      const edit = await api(b, 'PATCH', `/api/notebooks/${notebookId}/cells/${intro.id}`, { input: { kind: 'note', text: 'Overwritten by a commenter' }, revision: intro.revision });
      assert.equal(edit.status, 403);
      assert.equal(edit.json.error.code, 'forbidden');
      const afterEdit = await api(b, 'GET', `/api/notebooks/${notebookId}`);
      assert.deepEqual(afterEdit.json.notebook.cells.find((cell: { label: string }) => cell.label === 'intro').input, notebookFile(title).cells[0].input);
      await shot(b, '2-commenter-view-B');
    });

    test('3. B comments on a cell mentioning A: A sees it live, in activity, and the e-mail is in the outbox', async () => {
      assert.ok(bUserId, 'step 2 signed B up');
      await a.goto(notebookUrl());
      await a.getByTestId('live-status').filter({ hasText: 'Live' }).waitFor();
      await a.getByTestId(`presence-${bUserId}`).waitFor();
      // From the API, not the badge: the badge may not have loaded yet.
      const unreadBefore: number = (await api(a, 'GET', '/api/activity')).json.unread;
      // Survives only if the page is never reloaded.
      await a.evaluate(() => Object.assign(window, { stillTheSamePage: true }));

      await b.getByTestId('cell-comments-setup').click();
      const panel = b.getByTestId('cell-comments-setup-panel');
      const box = panel.getByTestId('comment-box');
      await box.fill(`${commentText} `);
      await box.pressSequentially('@le');
      const option = b.getByTestId(`mention-option-${LEAD.handle}`);
      await option.waitFor();
      assert.match((await option.textContent()) ?? '', new RegExp(escapeRegExp(LEAD.name)));
      await shot(b, '3-mention-autocomplete-B');
      await option.click();
      assert.equal(await box.inputValue(), `${commentText} @${LEAD.handle} `);
      await panel.getByTestId('comment-send').click();
      const sent = panel.locator('[data-testid^="comment-body-"]').filter({ hasText: commentText });
      await sent.waitFor();
      assert.match((await sent.textContent()) ?? '', new RegExp(`@${LEAD.handle}`));
      await shot(b, '3-comment-sent-B');

      const arrived = a.getByTestId('notebook-comments').locator('[data-testid^="comment-body-"]').filter({ hasText: commentText });
      await arrived.waitFor({ timeout: PATIENCE_MS });
      assert.equal(await a.evaluate(() => (window as unknown as { stillTheSamePage?: boolean }).stillTheSamePage), true);
      // The badge counts the mention without a reload (the page marker below is still there).
      await waitUntil(`the unread badge to show more than ${unreadBefore}`, async () => (await unreadOnBadge(a)) > unreadBefore);
      assert.equal(await a.evaluate(() => (window as unknown as { stillTheSamePage?: boolean }).stillTheSamePage), true);
      await arrived.scrollIntoViewIfNeeded();
      await shot(a, '3-comment-live-for-A');

      const mention = await waitForMail(admin, LEAD.email, new RegExp(`^${escapeRegExp(B.name)} mentioned you in ${escapeRegExp(title)}$`));
      assert.match(mention.text, new RegExp(escapeRegExp(commentText)));
      assert.match(mention.text, new RegExp(escapeRegExp(notebookUrl())));
      await admin.goto(`${BASE_URL}/mail`);
      await admin.getByTestId('captured-message').filter({ hasText: `${B.name} mentioned you in ${title}` }).first().waitFor();
      await shot(admin, '3-mention-mail-in-outbox');

      await a.getByTestId('nav-activity').click();
      await a.waitForURL(`${BASE_URL}/activity`);
      const item = a.getByTestId('activity-list').locator('[data-testid^="activity-item-"]').filter({ hasText: `${B.name} mentioned you in "${title}"` });
      await item.first().waitFor();
      assert.equal(await item.count(), 1);
      assert.equal(await item.locator('[data-testid$="-unread"]').count(), 1);
      await shot(a, '3-activity-mention-A');
      // The entry leads to the commented cell.
      await item.click();
      await a.waitForURL(`${notebookUrl()}?cell=${cellIds.setup}`);
      await a.getByTestId('highlighted-cell').getByTestId('cell-setup').waitFor();
    });

    test('4. A presents; B follows the presenter from cell to cell, then stops following', async () => {
      assert.ok(bUserId, 'step 2 signed B up');
      await a.getByTestId('open-present').click();
      await a.waitForURL(`${notebookUrl()}/present`);
      await a.getByTestId('presenting-self').waitFor();
      await a.getByTestId('presentation-next').click();
      await a.getByTestId('presentation-counter').filter({ hasText: '2 / 3' }).waitFor();
      await a.getByTestId('slide-setup').waitFor();

      const bar = b.getByTestId('presenter-bar');
      await bar.filter({ hasText: `${LEAD.name} is presenting — at setup` }).waitFor({ timeout: PATIENCE_MS });
      await shot(b, '4-presenter-bar-B');
      await b.getByTestId('follow-presenter').click();
      await b.getByTestId('highlighted-cell').getByTestId('cell-setup').waitFor();
      await b.getByTestId('cell-setup-presenter').waitFor();
      await bar.filter({ hasText: `Following ${LEAD.name} — at setup` }).waitFor();
      await shot(b, '4-following-B-at-setup');
      await shot(a, '4-presenting-A-at-setup');

      await a.getByTestId('presentation-next').click();
      await a.getByTestId('presentation-counter').filter({ hasText: '3 / 3' }).waitFor();
      await a.getByTestId('slide-flow').waitFor();
      await b.getByTestId('highlighted-cell').getByTestId('cell-flow').waitFor({ timeout: PATIENCE_MS });
      await b.getByTestId('cell-flow-presenter').waitFor();
      assert.equal(await b.getByTestId('cell-setup-presenter').count(), 0);
      await shot(b, '4-following-B-at-flow');

      await b.getByTestId('stop-following').click();
      await b.getByTestId('follow-presenter').waitFor();
      assert.equal(await b.getByTestId('cell-flow-presenter').count(), 0);
      await shot(b, '4-stopped-following-B');

      await a.getByTestId('presentation-leave').click();
      await a.waitForURL(notebookUrl());
      await b.getByTestId('presenter-bar').waitFor({ state: 'detached', timeout: PATIENCE_MS });
    });

    test('5. A creates a viewer link; opened signed out, it shows the notebook read-only', async () => {
      assert.ok(notebookId, 'step 1 created the notebook');
      await a.getByTestId('share-button').click();
      await a.waitForURL(`${notebookUrl()}/sharing`);
      // B confirmed the address: the invitation became a membership.
      const member = a.getByTestId(`member-row-${B.email}`);
      await member.waitFor();
      assert.match((await member.textContent()) ?? '', /Commenter/);
      assert.equal(await a.getByTestId(`invitation-row-${B.email}`).count(), 0);
      await a.getByTestId('link-role-viewer').click();
      await a.getByTestId('link-create').click();
      const url = ((await a.getByTestId('link-url').textContent()) ?? '').trim();
      assert.match(url, new RegExp(`^${escapeRegExp(BASE_URL)}/shared/[A-Za-z0-9_-]{43}$`));
      await a.getByTestId('link-url').scrollIntoViewIfNeeded();
      await shot(a, '5-share-link-created-A');

      const visitor = await personPage(browser, viewport);
      await visitor.goto(url);
      await visitor.getByTestId('shared-banner').waitFor();
      assert.equal(await visitor.getByTestId('shared-title').textContent(), title);
      assert.equal(await visitor.getByTestId('shared-role').textContent(), 'Viewer');
      for (const label of ['intro', 'setup', 'flow']) await visitor.getByTestId(`cell-${label}`).waitFor();
      await visitor.locator('[data-testid^="comment-body-"]').filter({ hasText: commentText }).waitFor();
      await assertNoEditControls(visitor, 'a signed-out link visitor');
      assert.equal(await visitor.getByTestId('comment-box').count(), 0);
      assert.equal(await visitor.getByTestId('notebook-comment-box').count(), 0);
      assert.equal((await api(visitor, 'GET', '/api/me')).status, 401);
      await shot(visitor, '5-link-opened-signed-out');
    });
  });
}
