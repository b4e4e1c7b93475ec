import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';

export const BASE_URL = process.env.E2E_BASE_URL ?? 'http://127.0.0.1:8080';
export const ARTIFACTS = path.resolve(__dirname, '..', '..', 'test-artifacts', 'e2e');

export const viewports = [
  { name: 'phone', width: 390, height: 844 },
  { name: 'wide', width: 1440, height: 900 },
];

/** Debian's Chromium with a fresh profile; the flags keep it off the (closed) network. */
export async function openBrowser(viewport: { width: number; height: number }): Promise<BrowserContext> {
  fs.mkdirSync(ARTIFACTS, { recursive: true });
  return chromium.launchPersistentContext(fs.mkdtempSync(path.join(os.tmpdir(), 'rungbook-chromium-')), {
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    headless: true,
    viewport,
    acceptDownloads: true,
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
}

/**
 * One Chromium for several people: each context (`personContext`) has its own cookies and storage,
 * like separate browsers, at a fraction of the memory.
 */
export async function launchBrowser(): Promise<Browser> {
  fs.mkdirSync(ARTIFACTS, { recursive: true });
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    headless: true,
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
}

export async function personPage(browser: Browser, viewport: { width: number; height: number }): Promise<Page> {
  const context = await browser.newContext({ viewport, acceptDownloads: true });
  return context.newPage();
}

export async function signIn(page: Page, email: string, password: string) {
  await page.goto(`${BASE_URL}/sign-in`);
  await page.getByTestId('sign-in-email').fill(email);
  await page.getByTestId('sign-in-password').fill(password);
  await page.getByTestId('sign-in-submit').click();
  await page.waitForURL(`${BASE_URL}/notebooks`);
}

export interface ApiReply {
  status: number;
  json: any;
}

/** A request from inside the page: the person's own cookies and our Origin, as the app itself sends them. */
export async function api(page: Page, method: 'GET' | 'POST' | 'PATCH' | 'DELETE', url: string, body?: unknown): Promise<ApiReply> {
  return page.evaluate(
    async ({ method, url, body }) => {
      const headers: Record<string, string> = { Accept: 'application/json' };
      if (body !== undefined) headers['Content-Type'] = 'application/json';
      const reply = await fetch(url, { method, credentials: 'include', headers, body: body === undefined ? undefined : JSON.stringify(body) });
      return { status: reply.status, json: await reply.json().catch(() => null) };
    },
    { method, url, body },
  );
}
