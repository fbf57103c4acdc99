import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { launchBrowser, startRunningApp, type RunningApp } from '../support/browser';

// The firm page in Chromium, as the demo admin: the list of signing keys, a rotation, and the
// audit log chain panel.

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

/** Key id computed here: SHA-256 of the SPKI DER of the key in the file (Node's crypto), first 16 hex digits. */
function keyIdOfFile(file: string): string {
  const der = crypto.createPublicKey(crypto.createPrivateKey(fs.readFileSync(file, 'utf8'))).export({ type: 'spki', format: 'der' });
  return crypto.createHash('sha256').update(der).digest('hex').slice(0, 16);
}

describe('signing keys on the firm page', () => {
  it('when the admin rotates the key, then the list shows the new current key and the old one retired, and the audit chain is OK', async () => {
    const keyFile = path.join(running.dataDir, 'firm-signing-key.pem');
    const first = keyIdOfFile(keyFile);
    const page = await browser.newPage();
    await page.goto(`${running.baseUrl}/sign-in`);
    await page.getByLabel(/e-mail/i).fill('admin@demo.panelpoint.test');
    await page.getByLabel(/password/i).fill('panelpoint-demo');
    await page.getByRole('button', { name: /sign in/i }).click();
    await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'));
    await page.goto(`${running.baseUrl}/admin/firm`);

    const table = page.getByRole('table', { name: 'Signing keys' });
    await table.getByText(first).waitFor({ timeout: 15_000 });
    expect(await table.locator('tbody tr').count()).toBe(1);
    await page.getByText(/^OK: \d+ audit line\(s\)/).waitFor();

    await page.getByRole('button', { name: /rotate the signing key/i }).click();
    await page.getByRole('button', { name: /make a new key/i }).click();
    await table.locator('tbody tr').nth(1).waitFor({ timeout: 15_000 });
    const second = keyIdOfFile(keyFile);
    expect(second).not.toBe(first);
    const rows = await table.locator('tbody tr').allInnerTexts();
    expect(rows[0]).toContain(second);
    expect(rows[0]).toContain('current');
    expect(rows[1]).toContain(first);
    expect(rows[1]).toContain('retired');
    await page.close();
  }, 60_000);
});
