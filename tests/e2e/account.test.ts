import assert from 'node:assert/strict';
import fs from 'node:fs';
import path from 'node:path';
import { after, before, describe, test } from 'node:test';
import type { BrowserContext, Page } from 'playwright-core';
import { ARTIFACTS, BASE_URL, openBrowser, viewports } from './browser';

const ADMIN = { email: 'admin@demo.rungbook.example', password: 'demo-admin-pass' };

async function signIn(page: Page, email: string, password: string) {
  await page.goto(`${BASE_URL}/sign-in`);
  await page.getByTestId('sign-in-email').fill(email);
  await page.getByTestId('sign-in-password').fill(password);
  await page.getByTestId('sign-in-submit').click();
}

async function expectNotebooksScreen(page: Page) {
  await page.waitForURL(`${BASE_URL}/notebooks`);
  await page.getByTestId('notebooks-empty').waitFor();
  // The ε-expansion definition is typeset by KaTeX (its MathML keeps the TeX source).
  const formula = page.getByTestId('epsilon-definition');
  await formula.locator('.katex').first().waitFor();
  assert.match((await formula.locator('annotation').textContent()) ?? '', /\\varepsilon = 2s - d/);
}

/** An administrator opens the captured mail in their own browser and reads the first link of a message. */
async function linkFromMail(viewport: (typeof viewports)[number], email: string, subject: string, screenshot?: string): Promise<string> {
  const adminContext = await openBrowser(viewport);
  const adminPage = adminContext.pages()[0] ?? (await adminContext.newPage());
  try {
    await signIn(adminPage, ADMIN.email, ADMIN.password);
    await adminPage.waitForURL(`${BASE_URL}/notebooks`);
    await adminPage.getByTestId('nav-mail').click();
    const message = adminPage.getByTestId('captured-message').filter({ hasText: email }).filter({ hasText: subject }).first();
    await message.waitFor();
    if (screenshot) await adminPage.screenshot({ path: path.join(ARTIFACTS, screenshot), fullPage: true });
    const links = message.getByRole('link');
    return (await links.count()) ? (await links.first().innerText()).trim() : '';
  } finally {
    await adminContext.close();
  }
}

async function signOut(page: Page) {
  await page.getByTestId('nav-account').click();
  await page.getByTestId('sign-out').click();
  await page.waitForURL(`${BASE_URL}/sign-in`);
}

for (const viewport of viewports) {
  describe(`in Chromium at ${viewport.name} size (${viewport.width}×${viewport.height})`, () => {
    let context: BrowserContext;
    let page: Page;
    const shot = (step: string) => page.screenshot({ path: path.join(ARTIFACTS, `${viewport.name}-${step}.png`), fullPage: true });
    const person = {
      name: `Invented Tester ${viewport.name}`,
      email: `tester-${viewport.name}-${Date.now()}@test.rungbook.example`,
      password: 'first-password-123',
    };

    before(async () => {
      fs.mkdirSync(ARTIFACTS, { recursive: true });
      context = await openBrowser(viewport);
      page = context.pages()[0] ?? (await context.newPage());
    });
    after(() => context?.close());

    test('create account → notebooks → sign out → sign in → notebooks', async () => {
      await page.goto(BASE_URL);
      await page.waitForURL(`${BASE_URL}/sign-in`);
      await shot('01-sign-in');
      await page.getByTestId('to-sign-up').click();
      await page.getByTestId('sign-up-name').fill(person.name);
      await page.getByTestId('sign-up-email').fill(person.email);
      await page.getByTestId('sign-up-password').fill(person.password);
      await shot('02-sign-up');
      await page.getByTestId('sign-up-submit').click();
      await page.getByTestId('sign-up-sent').waitFor();
      assert.match(await page.getByTestId('sign-up-sent').innerText(), /sent a message to/);
      // Not confirmed yet: signing in answers like a wrong password; the sign-in page offers a new link.
      await signIn(page, person.email, person.password);
      await page.getByTestId('sign-in-error').waitFor();
      assert.match(await page.getByTestId('sign-in-error').innerText(), /E-mail or password is not correct/);
      await page.getByTestId('to-resend').click();
      await page.getByTestId('resend-email').fill(person.email);
      await page.getByTestId('resend-submit').click();
      await page.getByTestId('resend-sent').waitFor();
      await shot('02b-resend-confirmation');
      // Either link works: asking for a new one does not spend the first.
      const link = await linkFromMail(viewport, person.email, 'Confirm your Rungbook e-mail address');
      assert.match(link, /\/verify-email\?token=/);
      await page.goto(link);
      // Confirming takes the account's password: a link alone signs nobody in.
      await page.getByTestId('verify-password').fill(person.password);
      await page.getByTestId('verify-submit').click();
      await expectNotebooksScreen(page);
      await page.getByTestId(viewport.width >= 1024 ? 'side-rail' : 'bottom-bar').waitFor();
      await shot('03-notebooks');
      await signOut(page);
      await signIn(page, person.email, person.password);
      await expectNotebooksScreen(page);
      await signOut(page);
    });

    test('a wrong password gets a clear message; a sign-up with a taken address looks like any sign-up', async () => {
      await signIn(page, person.email, 'not-my-password');
      const error = page.getByTestId('sign-in-error');
      await error.waitFor();
      assert.match(await error.innerText(), /E-mail or password is not correct/);
      await shot('04-wrong-password');

      await page.goto(`${BASE_URL}/sign-up`);
      await page.getByTestId('sign-up-name').fill('Someone Else (invented)');
      await page.getByTestId('sign-up-email').fill(person.email.toUpperCase());
      await page.getByTestId('sign-up-password').fill('another-password-1');
      await page.getByTestId('sign-up-submit').click();
      // No account enumeration: the same answer as a new sign-up; the address's owner is told by e-mail.
      await page.getByTestId('sign-up-sent').waitFor();
      assert.match(await page.getByTestId('sign-up-sent').innerText(), /sent a message to/);
      await shot('05-duplicate-account');
      await linkFromMail(viewport, person.email, 'Someone tried to sign up with your address');
    });

    test('forgot password → message in the mail capture → follow the link → new password works', async () => {
      await page.goto(`${BASE_URL}/sign-in`);
      await page.getByTestId('to-forgot').click();
      await page.getByTestId('forgot-email').fill(person.email);
      await page.getByTestId('forgot-submit').click();
      await page.getByTestId('forgot-sent').waitFor();
      await shot('06-forgot-sent');

      const link = await linkFromMail(viewport, person.email, 'Reset your Rungbook password', `${viewport.name}-07-captured-mail.png`);
      assert.match(link, new RegExp(`^${BASE_URL.replace(/[.]/g, '\\.')}/reset-password\\?token=`));

      await page.goto(link);
      await page.getByTestId('reset-password').fill('second-password-456');
      await page.getByTestId('reset-submit').click();
      await page.getByTestId('reset-done').waitFor();
      await shot('08-reset-done');

      await signIn(page, person.email, person.password);
      await page.getByTestId('sign-in-error').waitFor();
      await signIn(page, person.email, 'second-password-456');
      await expectNotebooksScreen(page);

      // The link works only once.
      await page.goto(link);
      await page.getByTestId('reset-password').fill('third-password-789');
      await page.getByTestId('reset-submit').click();
      await page.getByTestId('reset-error').waitFor();
      assert.match(await page.getByTestId('reset-error').innerText(), /invalid, already used or expired/);
      await shot('09-reset-link-reused');
    });

    test('account settings: sessions listed and ended, name, password (ends other sessions), e-mail address through its link', async () => {
      const password = 'second-password-456';
      const otherContext = await openBrowser(viewport);
      const otherPage = otherContext.pages()[0] ?? (await otherContext.newPage());
      const otherIsSignedOut = async () => {
        await otherPage.goto(`${BASE_URL}/notebooks`);
        await otherPage.waitForURL(`${BASE_URL}/sign-in`);
      };
      try {
        await signIn(otherPage, person.email, password);
        await expectNotebooksScreen(otherPage);

        await page.goto(`${BASE_URL}/account`);
        await page.getByTestId('session-this-device').waitFor();
        await page.locator('[data-testid^="session-end-"]').first().waitFor();
        await shot('10-account-sessions');
        await page.locator('[data-testid^="session-end-"]').first().click();
        await page.getByTestId('sessions-ended').waitFor();
        assert.match(await page.getByTestId('sessions-ended').innerText(), /That session has ended/);
        await page.getByTestId('sessions-only-this').waitFor();
        await otherIsSignedOut();

        await page.getByTestId('account-name-field').fill(`${person.name} (renamed)`);
        await page.getByTestId('account-name-save').click();
        await page.getByTestId('account-name-saved').waitFor();
        assert.match(await page.getByTestId('account-card').innerText(), /\(renamed\)/);

        await signIn(otherPage, person.email, password);
        await expectNotebooksScreen(otherPage);
        await page.getByTestId('account-password-current').fill(password);
        await page.getByTestId('account-password-new').fill('third-password-789');
        await page.getByTestId('account-password-save').click();
        await page.getByTestId('account-password-changed').waitFor();
        assert.match(await page.getByTestId('account-password-changed').innerText(), /1 other session was signed out/);
        await shot('11-account-password-changed');
        await otherIsSignedOut();

        const oldEmail = person.email;
        const newEmail = oldEmail.replace('tester-', 'moved-');
        await page.getByTestId('account-email-new').fill(newEmail);
        await page.getByTestId('account-email-password').fill('third-password-789');
        await page.getByTestId('account-email-save').click();
        await page.getByTestId('account-email-sent').waitFor();
        await shot('12-account-email-link-sent');
        // Not changed until the link is opened.
        assert.equal(await page.getByTestId('account-email-current').innerText(), oldEmail);
        const link = await linkFromMail(viewport, newEmail, 'Confirm the new address of your Rungbook account');
        assert.match(link, /\/confirm-email\?token=/);
        // Opened where nobody is signed in (the other browser was signed out by the password change):
        // the link alone confirms the address.
        await otherPage.goto(link);
        await otherPage.getByTestId('email-change-confirmed').waitFor();
        await page.reload();
        await page.getByText(newEmail, { exact: true }).first().waitFor();
        await shot('13-account-email-changed');
        await linkFromMail(viewport, oldEmail, 'The address of your Rungbook account has changed');
        person.email = newEmail;
        person.password = 'third-password-789';

        await signOut(page);
        await signIn(page, oldEmail, person.password);
        await page.getByTestId('sign-in-error').waitFor();
        await signIn(page, person.email, person.password);
        await expectNotebooksScreen(page);
      } finally {
        await otherContext.close();
      }
    });
  });
}
