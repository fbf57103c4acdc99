import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { launchBrowser, startRunningApp, type RunningApp } from '../support/browser';

const fixtures = path.resolve(import.meta.dirname, '..', 'fixtures', 'dxf');

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

async function openT2AsDrafter(): Promise<Page> {
  const page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
  await page.goto(`${running.baseUrl}/sign-in`);
  await page.getByLabel(/e-mail/i).fill('drafter@demo.panelpoint.test');
  await page.getByLabel(/password/i).fill('panelpoint-demo');
  await page.getByRole('button', { name: /sign in/i }).click();
  await page.waitForURL(/\/projects/);
  await page.getByText('HV-2417').first().click();
  // T2 of the demo project has no drawing yet.
  await page.getByRole('link', { name: /^T2/ }).first().click();
  await page.waitForURL(/\/trusses\/\d+/);
  await page.getByText(/Drop the truss’s DXF drawing here/).waitFor({ timeout: 15_000 });
  return page;
}

describe('uploading a drawing through the built app in Chromium', () => {
  // The refused file goes first, while T2 still has no drawing.
  it('when the drafter uploads a PNG renamed .dxf, then one sentence says what is wrong and no version is stored', async () => {
    const page = await openT2AsDrafter();
    // The first bytes of a PNG file (PNG specification, §5.2 signature) and its IHDR chunk start.
    const png = Buffer.from('89504e470d0a1a0a0000000d49484452000000010000000108060000001f15c489', 'hex');
    await page.getByLabel('DXF file').setInputFiles({ name: 'roof-truss.dxf', mimeType: 'application/dxf', buffer: png });

    const alert = page.getByRole('alert').filter({ hasText: /PNG|not a DXF/i }).first();
    await alert.waitFor({ timeout: 15_000 });
    const text = (await alert.innerText()).trim();
    expect(text).toMatch(/PNG/);
    expect(text).toMatch(/DXF/);
    expect(text.split(/(?<=\.)\s+/).length).toBeLessThanOrEqual(2);
    expect(text).not.toMatch(/at \w+ \(|Error:|stack/i);
    // Nothing was stored: the truss still has no drawing version.
    expect(await page.getByText(/Drop the truss’s DXF drawing here/).isVisible()).toBe(true);
    expect(await page.getByRole('list', { name: 'Import report' }).count()).toBe(0);
    await page.close();
  });

  it('when the drafter uploads a DXF with faults to T2, then the truss is drawn and the report lists the repairs', async () => {
    const page = await openT2AsDrafter();
    await page.getByLabel('DXF file').setInputFiles(path.join(fixtures, 'r2000-faults-mm.dxf'));

    const report = page.getByRole('list', { name: 'Import report' });
    await report.waitFor({ timeout: 20_000 });
    const drawing = page.getByRole('img', { name: /Truss drawing: \d+ joints, \d+ members/ });
    expect(await drawing.isVisible()).toBe(true);
    expect(await drawing.locator('line').count()).toBeGreaterThan(0);
    expect(await report.getByRole('listitem').count()).toBeGreaterThan(0);
    // The fixture draws two members crossing without a joint: that must be reported.
    const crossing = report.getByRole('button', { name: /cross without a joint/ });
    expect(await crossing.count()).toBe(1);

    // Choosing the line marks its place in the drawing.
    await crossing.click();
    expect(await crossing.getAttribute('aria-pressed')).toBe('true');
    expect(await drawing.locator('circle[stroke-dasharray]').count()).toBeGreaterThan(0);
    await page.close();
  });
});
