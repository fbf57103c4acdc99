import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { launchBrowser, startRunningApp, type RunningApp } from '../support/browser';

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

describe('signing in through the built app in Chromium', () => {
  it('when the demo engineer signs in, then the projects list shows the demo warehouse-roof project', async () => {
    const page = await browser.newPage();
    await page.goto(`${running.baseUrl}/projects`);
    // No session yet: the guard sends us to the sign-in page.
    await page.waitForURL(/\/sign-in/);
    await page.getByLabel(/e-mail/i).fill('engineer@demo.panelpoint.test');
    await page.getByLabel(/password/i).fill('panelpoint-demo');
    await page.getByRole('button', { name: /sign in/i }).click();
    await page.waitForURL(/\/projects/);
    const jobNumber = page.getByText('HV-2417').first();
    await jobNumber.waitFor({ timeout: 15_000 });
    expect(await jobNumber.isVisible()).toBe(true);
    expect(await page.getByText(/Kestrel Logistics/).first().isVisible()).toBe(true);
    await page.close();
  });

  it('when the password is wrong, then the page says so and stays on sign-in', async () => {
    const page = await browser.newPage();
    await page.goto(`${running.baseUrl}/sign-in`);
    await page.getByLabel(/e-mail/i).fill('engineer@demo.panelpoint.test');
    await page.getByLabel(/password/i).fill('not-the-password');
    await page.getByRole('button', { name: /sign in/i }).click();
    await page.getByText(/do not match/).waitFor();
    expect(page.url()).toMatch(/\/sign-in/);
    await page.close();
  });
});
