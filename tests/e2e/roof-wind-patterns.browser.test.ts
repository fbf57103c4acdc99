import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import type { TakeoffPreviewView } from '@shared/schemas/run.schema';
import { launchBrowser, startRunningApp, type RunningApp } from '../support/browser';

let running: RunningApp;
let browser: Browser;
let page: Page;

beforeAll(async () => {
  running = await startRunningApp();
  browser = await launchBrowser();
  page = await browser.newPage({ viewport: { width: 1360, height: 1000 } });
}, 180_000);

afterAll(async () => {
  await browser?.close();
  await running?.stop();
});

const num = (text: string | null) => Number((text ?? '').replace('\u2212', '-').replace(/,/g, '').trim());

// The demo truss T1: 12 m span, 3 m rise, top-chord joints every 2 m (pitch 1:2), in Chromium
// against the real server.
describe('the engineer checks snow span patterns and wind on the slopes of the demo truss', () => {
  let last: TakeoffPreviewView | null = null;

  it('when snow over three equal purlin spans is ticked for span patterns, then the first interior truss shows spans 1 and 2 loaded at 1.2 wL', async () => {
    await page.goto(`${running.baseUrl}/sign-in`);
    await page.getByLabel(/e-mail/i).fill('engineer@demo.panelpoint.test');
    await page.getByLabel(/password/i).fill('panelpoint-demo');
    await page.getByRole('button', { name: /sign in/i }).click();
    await page.waitForURL(/\/projects/);
    await page.getByRole('link', { name: 'HV-2417' }).click();
    await page.getByRole('link', { name: /^T1/ }).click();
    await page.getByRole('tab', { name: 'Model & loads' }).click();
    await page.getByRole('tab', { name: 'Members' }).click();
    await page.getByRole('button', { name: 'Suggest groups from the outline' }).click();
    await page.getByRole('tab', { name: 'Roof loading' }).click();
    page.on('response', async (response) => {
      if (response.url().endsWith('/takeoff/preview') && response.ok()) last = (await response.json()) as TakeoffPreviewView;
    });

    await page.getByLabel('Area load 1: load case').selectOption('new:snow');
    await page.getByLabel('Area load 1: q').fill('1.2');
    await page.getByLabel('Area load 1: basis').selectOption('plan');
    await page.getByLabel('Area load 1: check unfavourable span patterns').check();
    await page.getByLabel('Truss spacing, m').fill('4.5');
    await page.getByLabel('Number of trusses').fill('4');
    await page.getByLabel('Which truss').selectOption('1');
    const table = page.getByRole('table', { name: /^Roof loading of load case S/ });
    await table.getByText('spans 1 and 2 loaded').waitFor({ timeout: 15_000 });
    // AISC Manual Table 3-23, three equal spans (from memory): interior reaction 1.20 wL with the two
    // spans either side loaded, against 1.10 wL with all three.
    expect(await table.getByText(`${(1.2 * 4.5).toFixed(3)} m per 1 kN/m continuous`).count()).toBe(1);
    expect(await table.getByText(`all spans loaded: ${(1.1 * 4.5).toFixed(3)} m`).count()).toBe(1);
    // An interior purlin: plan width 2 m, w = 1.2 × 2 = 2.4 kN/m, reaction 1.2 × 4.5 × 2.4 kN, down.
    const row = table.locator('tbody tr').nth(1); // purlins in order of x: the eave, then x = 2 m
    expect(num(await row.locator('td').nth(6).textContent())).toBeCloseTo(-1.2 * 4.5 * 2.4, 2);
  }, 120_000);

  it('when wind is put on both slopes, then the ridge purlin shows the hand resolution and the loads are saved into a wind case', async () => {
    await page.getByLabel('Wind on the roof slopes').check();
    await page.getByLabel('Wind: load case').selectOption('new:wind');
    await page.getByLabel('Wind: velocity pressure q').fill('0.5');
    await page.getByLabel('Wind: windward slope').selectOption('left');
    await page.getByLabel('Wind: windward coefficient').fill('-0.3');
    await page.getByLabel('Wind: leeward coefficient').fill('-0.6');
    const table = page.getByRole('table', { name: /^Wind on the roof, load case W/ });
    await table.waitFor({ timeout: 15_000 });
    // Ridge purlin (x = 6 m): panels of length √5 m at ±26.57° (sin = ±1/√5, cos = 2/√5). Windward:
    // p = 0.5 × (−0.3), w_n = p·√5/2; leeward: p = 0.5 × (−0.6). F = w_n (sin θ, −cos θ) per panel
    // half (statics, from memory): wx = −0.075 + 0.15 = 0.075, wy = 0.15 + 0.30 = 0.45 kN/m. Times the
    // purlin factor with all spans loaded, 1.1 × 4.5 m (Table 3-23 as above; wind takes no span pattern).
    const ridge = table.locator('tr', { has: page.locator('td:nth-child(2)', { hasText: /^6\.000$/ }) });
    await expect.poll(async () => num(await ridge.locator('td').nth(2).textContent()), { timeout: 10_000 }).toBeCloseTo(0.075, 3);
    expect(num(await ridge.locator('td').nth(3).textContent())).toBeCloseTo(0.45, 3);
    expect(num(await ridge.locator('td').nth(4).textContent())).toBeCloseTo(1.1 * 4.5 * 0.075, 2);
    expect(num(await ridge.locator('td').nth(5).textContent())).toBeCloseTo(1.1 * 4.5 * 0.45, 2);

    const use = page.getByRole('button', { name: 'Use these loads' });
    await expect.poll(() => use.isEnabled(), { timeout: 10_000 }).toBe(true);
    await use.click();
    // Nothing is saved until the change is confirmed (two cases: the snow and the wind one).
    const confirm = page.getByRole('alertdialog', { name: "Use the roof loading's loads" });
    await confirm.waitFor({ timeout: 10_000 });
    expect(await confirm.getByRole('row').count()).toBe(1 + Object.keys(last!.result.caseLoads).length);
    await confirm.getByRole('button', { name: 'Save these loads' }).click();
    await page.getByText('Model saved.').waitFor({ timeout: 15_000 });
    expect(last?.input.wind?.cLeeward).toBe(-0.6);
    expect(last?.input.areaLoads[0]?.patterns).toBe(true);
    // The saved model has the wind case with sideways loads from the takeoff.
    const saved = await page.evaluate(async () => {
      const trussId = location.pathname.match(/trusses\/(\d+)/)?.[1];
      const res = await fetch(`/api/trusses/${trussId}/model`);
      return (await res.json()) as { model: { loadCases: { id: string; category: string; source?: string; loads: { fx: number }[] }[] }; takeoff: unknown };
    });
    const windCase = saved.model.loadCases.find((c) => c.category === 'wind');
    expect(windCase?.loads.some((l) => Math.abs(l.fx) > 0.1)).toBe(true);
    expect(windCase?.source).toBe('roof-loading');
  }, 120_000);

  it('when the wind coefficient is left without q, then the preview says so in one sentence and nothing can be used', async () => {
    await page.getByLabel('Wind: velocity pressure q').fill('');
    await page.getByText(/without a velocity pressure q/).waitFor({ timeout: 15_000 });
    expect(await page.getByRole('button', { name: 'Use these loads' }).isEnabled()).toBe(false);
  }, 60_000);
});
