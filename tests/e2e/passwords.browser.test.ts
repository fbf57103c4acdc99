import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { OutboxMessage } from '../../server/db/models';
import { DEMO_PASSWORD } from '../../server/seed/demo';
import { launchBrowser, startRunningApp, type RunningApp } from '../support/browser';

// Password change, forgot-password and the admin's reset link, through the built app in
// Chromium against the real server, with the e-mail read from the local SMTP sink's outbox.

let running: RunningApp;
let browser: Browser;

beforeAll(async () => {
  running = await startRunningApp();
  browser = await launchBrowser();
}, 180_000);

afterAll(async () => {
  await browser?.close();
  await running?.stop();
});

/** An invented phrase of unrelated words, which the server's rule accepts (the steps below need it to). */
const NEW_PASSWORD = 'lintel osprey bramble cobalt 52';

async function newPage(): Promise<Page> {
  return (await browser.newContext({ viewport: { width: 1360, height: 900 } })).newPage();
}

async function signIn(page: Page, email: string, password: string): Promise<void> {
  await page.goto(`${running.baseUrl}/sign-in`);
  await page.getByLabel(/e-mail/i).fill(email);
  await page.getByLabel('Password', { exact: true }).fill(password);
  await page.getByRole('button', { name: /sign in/i }).click();
  await page.waitForURL(/\/projects/);
}

async function resetTokenFor(address: string, nth: number): Promise<string> {
  const until = Date.now() + 15_000;
  for (;;) {
    const mails = (await OutboxMessage.findAll({ order: [['id', 'ASC']] })).filter((m) => (JSON.parse(m.to) as string[]).includes(address));
    const m = mails[nth - 1] && /\/reset-password\/([A-Za-z0-9_-]+)/.exec(mails[nth - 1].text);
    if (m) return m[1];
    if (Date.now() > until) throw new Error(`no reset mail #${nth} to ${address}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

describe('passwords in the browser', () => {
  it('when someone forgets their password, then the e-mailed link lets them choose a new one (a common one is refused with the reason) and signs them in', async () => {
    const email = 'drafter@demo.panelpoint.test';
    const page = await newPage();
    await page.goto(`${running.baseUrl}/sign-in`);
    await page.getByRole('link', { name: /forgot password/i }).click();
    await page.waitForURL(/\/forgot-password/);
    await page.getByLabel(/e-mail/i).fill(email);
    await page.getByRole('button', { name: /send reset link/i }).click();
    await page.getByRole('status').getByText(/if that address belongs to an account/i).waitFor();

    const token = await resetTokenFor(email, 1);
    await page.goto(`${running.baseUrl}/reset-password/${token}`);
    await page.getByText(email).waitFor();
    await page.getByLabel('New password', { exact: true }).fill('password1234');
    await page.getByLabel('Repeat new password').fill('password1234');
    await page.getByRole('button', { name: /set password/i }).click();
    await page.getByText(/too easy to guess \(this is similar to a commonly used password\)/).first().waitFor();

    await page.getByLabel('New password', { exact: true }).fill(NEW_PASSWORD);
    await page.getByLabel('Repeat new password').fill(NEW_PASSWORD);
    await page.getByRole('button', { name: /set password/i }).click();
    await page.waitForURL(/\/projects/);

    // The link is spent: opening it again says so.
    const again = await newPage();
    await again.goto(`${running.baseUrl}/reset-password/${token}`);
    await again.getByText('This reset link has been used').waitFor();
    await signIn(again, email, NEW_PASSWORD);
  });

  it('when a signed-in engineer changes their password on the account page, then their other browser is signed out', async () => {
    const email = 'engineer@demo.panelpoint.test';
    const other = await newPage();
    await signIn(other, email, DEMO_PASSWORD);
    const page = await newPage();
    await signIn(page, email, DEMO_PASSWORD);
    await page.getByTitle('Your account and password').click();
    await page.waitForURL(/\/account/);
    const form = page.getByRole('form', { name: 'Change password' });
    await form.getByLabel('Current password').fill('not the right one at all');
    await form.getByLabel('New password', { exact: true }).fill(NEW_PASSWORD);
    await form.getByLabel('Repeat new password').fill(NEW_PASSWORD);
    await form.getByRole('button', { name: /change password/i }).click();
    await form.getByText(/current password is not right/).first().waitFor();

    await form.getByLabel('Current password').fill(DEMO_PASSWORD);
    await form.getByRole('button', { name: /change password/i }).click();
    await page.getByText(/Password changed/).waitFor();

    // This tab goes on working; the other browser is sent to sign-in on its next page.
    await page.goto(`${running.baseUrl}/projects`);
    await page.getByText('HV-2417').first().waitFor();
    await other.goto(`${running.baseUrl}/projects`);
    await other.waitForURL(/\/sign-in/);
    await signIn(other, email, NEW_PASSWORD);
  });

  it('when an admin sends a reset link from the users page, then the person gets the e-mail', async () => {
    const page = await newPage();
    await signIn(page, 'admin@demo.panelpoint.test', DEMO_PASSWORD);
    await page.goto(`${running.baseUrl}/admin/users`);
    const row = page.getByRole('row').filter({ hasText: 'reviewer@demo.panelpoint.test' });
    await row.getByRole('button', { name: /send reset link/i }).click();
    await page.getByText(/reset link is on its way to reviewer@demo\.panelpoint\.test/).waitFor();
    const token = await resetTokenFor('reviewer@demo.panelpoint.test', 1);
    expect(token.length).toBeGreaterThan(20);
  });
});
