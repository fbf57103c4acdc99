import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import type { TrussModelView } from '@shared/schemas/drawing.schema';
import { launchBrowser, startRunningApp, type RunningApp } from '../support/browser';

let running: RunningApp;
let browser: Browser;
let page: Page;
const shots = path.resolve(import.meta.dirname, '..', '..', 'tmp-screens');

beforeAll(async () => {
  running = await startRunningApp();
  browser = await launchBrowser();
  page = await browser.newPage({ viewport: { width: 1360, height: 1000 } });
}, 180_000);

afterAll(async () => {
  await browser?.close();
  await running?.stop();
});

/**
 * The engineer gives the demo truss T1 (12 m span, six 2 m panels) its supports and a dead load
 * through the API, then enters the member design in the app, runs it and reads the utilisation
 * on the diagram and in the table, in Chromium.
 */
describe('member design in the workspace', () => {
  it('saves a design, runs it and shows each member’s utilisation written on the diagram and in the table, with the failing filter', async () => {
    await page.goto(`${running.baseUrl}/sign-in`);
    await page.getByLabel(/e-mail/i).fill('engineer@demo.panelpoint.test');
    await page.getByLabel(/password/i).fill('panelpoint-demo');
    await page.getByRole('button', { name: /sign in/i }).click();
    await page.waitForURL(/\/projects/);

    // Supports and a 12 kN dead load at every bottom-chord joint between the bearings, by the API (same session).
    const csrf = ((await (await page.request.get(`${running.baseUrl}/api/session`)).json()) as { csrfToken: string }).csrfToken;
    const view = (await (await page.request.get(`${running.baseUrl}/api/trusses/1/model`)).json()) as TrussModelView;
    const left = view.model.joints.find((j) => j.x === 0 && j.y === 0)!;
    const right = view.model.joints.find((j) => Math.abs(j.x - 12) < 1e-9 && j.y === 0)!;
    const inner = view.model.joints.filter((j) => j.y === 0 && j.x > 0 && j.x < 12);
    const saved = await page.request.put(`${running.baseUrl}/api/trusses/1/model`, {
      headers: { 'X-CSRF-Token': csrf },
      data: {
        version: view.version,
        supports: [{ joint: left.id, kind: 'pin' }, { joint: right.id, kind: 'roller', angleDeg: 90 }],
        loadCases: [{ id: 'D', name: 'Dead', category: 'dead', loads: inner.map((j) => ({ joint: j.id, fx: 0, fy: -12 })) }],
        combinations: [{ name: '1.4D', factors: { D: 1.4 } }],
        members: [],
      },
    });
    expect(saved.status()).toBe(200);

    await page.getByRole('link', { name: 'HV-2417' }).click();
    await page.getByRole('link', { name: /^T1/ }).click();
    await page.getByRole('tab', { name: 'Member design' }).click();
    await page.getByLabel('Section shape').selectOption('rect-hollow');
    await page.getByLabel('Section B').fill('50');
    await page.getByLabel('Section H').fill('50');
    await page.getByLabel('Section t').fill('3');
    await page.getByLabel('Section t').blur();
    await page.getByRole('button', { name: 'Save member design' }).click();
    await page.getByText('Member design saved.').waitFor({ timeout: 15_000 });

    await page.getByRole('tab', { name: 'Runs & results' }).click();
    await page.getByRole('button', { name: 'Run analysis' }).click();
    await page.getByText(/Member design — AISC 360-16, LRFD/).waitFor({ timeout: 30_000 });
    const table = page.getByRole('table', { name: 'Member design checks' });
    const count = view.model.members.length;
    expect(await table.locator('tbody tr').count()).toBe(count);
    // Every member's utilisation is written on the diagram as a label.
    const diagram = page.getByRole('group', { name: /Utilisation diagram/ });
    const labels = await diagram.locator('text').allTextContents();
    expect(labels.filter((t) => /^\d+\.\d\d( ✗)?$/.test(t.trim())).length).toBe(count);

    fs.mkdirSync(shots, { recursive: true });
    await page.getByLabel('Design summary').scrollIntoViewIfNeeded();
    await diagram.screenshot({ path: path.join(shots, 'member-design-diagram.png') });
    await page.emulateMedia({ colorScheme: 'light' });
    await page.addStyleTag({ content: 'html { filter: grayscale(1); }' });
    await diagram.screenshot({ path: path.join(shots, 'member-design-diagram-grey.png') });

    // The failing filter keeps exactly the rows marked failing.
    const failingRows = await table.locator('tbody tr[data-band="fails"]').count();
    await page.getByLabel('Design filter').selectOption('failing');
    expect(await table.locator('tbody tr').count()).toBe(failingRows);
  }, 150_000);

  it('draws the deflected shape under the service combination, exaggerated with its scale written', async () => {
    await page.addStyleTag({ content: 'html { filter: none; }' });
    const csrf = ((await (await page.request.get(`${running.baseUrl}/api/session`)).json()) as { csrfToken: string }).csrfToken;
    const view = (await (await page.request.get(`${running.baseUrl}/api/trusses/1/model`)).json()) as TrussModelView;
    const mid = view.model.joints.find((j) => Math.abs(j.x - 6) < 1e-9 && j.y === 0)!;
    const saved = await page.request.put(`${running.baseUrl}/api/trusses/1/design`, {
      headers: { 'X-CSRF-Token': csrf },
      data: {
        version: view.version,
        design: {
          standard: 'aisc360-16-lrfd',
          groups: [{ name: 'All', members: 'all', material: { kind: 'grade', grade: 'A992' }, section: { shape: 'rect-hollow', B: 100, H: 100, t: 6 } }],
          deflection: { joints: [mid.id], combinations: ['1.4D'], limit: 240 },
        },
      },
    });
    expect(saved.status()).toBe(200);
    await page.reload();
    await page.getByRole('tab', { name: 'Runs & results' }).click();
    await page.getByRole('button', { name: 'Run analysis' }).click();
    const caption = page.getByTestId('shape-caption');
    await caption.waitFor({ timeout: 30_000 });
    const text = (await caption.textContent()) ?? '';
    expect(text).toMatch(/^Under 1\.4D: movements drawn \d+ × their size; the truss as drawn is dashed\. Largest movement \d+\.\d\d mm at /);
    // The largest movement is at least the vertical deflection the table gives at midspan.
    const table = page.getByRole('table', { name: 'Deflections' });
    const dy = Math.abs(Number((await table.locator('tbody tr td').nth(3).textContent())!.replace('\u2212', '-')));
    const largest = Number(/Largest movement (\d+\.\d\d) mm/.exec(text)![1]);
    expect(largest).toBeGreaterThanOrEqual(dy - 0.005);
    const drawing = page.getByRole('group', { name: 'Deflected shape under 1.4D' });
    expect(await drawing.locator('line').count()).toBeGreaterThan(0);
    await drawing.scrollIntoViewIfNeeded();
    await drawing.screenshot({ path: path.join(shots, 'member-design-deflected-shape.png') });
  }, 120_000);

  it('on a US customary project the design tab and the results show ksi, in, in², kip and in, never MPa', async () => {
    const csrf = ((await (await page.request.get(`${running.baseUrl}/api/session`)).json()) as { csrfToken: string }).csrfToken;
    const projects = (await (await page.request.get(`${running.baseUrl}/api/projects`)).json()) as { id: number; jobNumber: string }[];
    const project = projects.find((p) => p.jobNumber === 'HV-2417')!;
    const patched = await page.request.patch(`${running.baseUrl}/api/projects/${project.id}`, { headers: { 'X-CSRF-Token': csrf }, data: { unitSystem: 'US' } });
    expect(patched.status()).toBe(200);
    await page.reload();
    await page.getByRole('tab', { name: 'Member design' }).click();
    // The saved section (100 × 100 × 6 mm) is shown in inches: 100 / 25.4 = 3.93701 (6 figures).
    await expect.poll(() => page.getByLabel('Section B').inputValue()).toBe('3.93701');
    expect(await page.getByText('B (in)').count()).toBe(1);
    // Steel values entered: the A992 values appear as 50 / 65 / 29 000 ksi.
    await page.getByLabel('Steel').selectOption('values');
    expect(await page.getByLabel('Steel Fy').inputValue()).toBe('50');
    expect(await page.getByLabel('Steel E').inputValue()).toBe('29000');
    expect(await page.getByText('Fy (ksi)').count()).toBe(1);

    await page.getByRole('tab', { name: 'Runs & results' }).click();
    const steps = page.getByLabel(/^Design steps of /);
    await steps.waitFor({ timeout: 30_000 });
    const text = (await steps.textContent()) ?? '';
    expect(text).toMatch(/ksi/);
    expect(text).toMatch(/in²/);
    expect(text).toMatch(/\d kip/);
    expect(text).not.toMatch(/MPa|mm²|kN/);
    const table = page.getByRole('table', { name: 'Member design checks' });
    expect(await table.locator('thead').textContent()).toMatch(/Tension \(kip\)/);
    const deflections = page.getByRole('table', { name: 'Deflections' });
    expect(await deflections.locator('thead').textContent()).toMatch(/δy \(in\)/);
    expect(await page.getByTestId('shape-caption').textContent()).toMatch(/Largest movement \d+\.\d{3} in at /);
    await steps.scrollIntoViewIfNeeded();
    await steps.screenshot({ path: path.join(shots, 'member-design-us-steps.png') });
  }, 120_000);
});
