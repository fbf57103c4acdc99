import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import type { TrussModelView } from '@shared/schemas/drawing.schema';
import { buildClientIfNeeded, launchBrowser, startRunningApp, type RunningApp } from '../support/browser';

/**
 * Nothing cut off in the app either: the results of a run of the demo truss T1 at 1280 px, in
 * Chromium. No element of the results scrolls sideways or hides what it holds (scrollWidth above
 * clientWidth), the equations of every step wrap inside their cards, and the envelope's tables
 * take the results' full width with every column on screen. LAYOUT_SHOTS=<folder> keeps
 * screenshots to look at.
 */

let running: RunningApp;
let browser: Browser;
let page: Page;
const WIDTH = 1280;

beforeAll(async () => {
  buildClientIfNeeded();
  running = await startRunningApp();
  browser = await launchBrowser();
  page = await browser.newPage({ viewport: { width: WIDTH, height: 900 } });
}, 300_000);

afterAll(async () => {
  await browser?.close();
  await running?.stop();
});

/** Elements under `selector` whose content is wider than their box (what a reader would have to scroll to, or cannot see). */
async function overflowing(selector: string): Promise<string[]> {
  return page.$$eval(`${selector}, ${selector} *`, (els) =>
    els
      // KaTeX's MathML copy is for screen readers, clipped to 1 px on purpose.
      .filter((el) => el instanceof HTMLElement && !el.closest('.katex-mathml') && el.clientWidth > 0 && el.scrollWidth > el.clientWidth + 1)
      .map((el) => `${el.tagName.toLowerCase()}.${String((el as HTMLElement).className).slice(0, 60)} ${el.scrollWidth}>${el.clientWidth}: ${(el.textContent ?? '').slice(0, 60)}`),
  );
}

async function shot(name: string) {
  if (process.env.LAYOUT_SHOTS) await page.screenshot({ path: `${process.env.LAYOUT_SHOTS}/${name}.png`, fullPage: true });
}

describe('run results at 1280 px', () => {
  it('when the engineer reads a run of the demo truss with two load cases, then no results card overflows and the envelope tables use the full width with every column visible', async () => {
    await page.goto(`${running.baseUrl}/sign-in`);
    await page.getByLabel(/e-mail/i).fill('engineer@demo.panelpoint.test');
    await page.getByLabel(/password/i).fill('panelpoint-demo');
    await page.getByRole('button', { name: /sign in/i }).click();
    await page.waitForURL(/\/projects/);

    // Supports and two load cases through the API, in the signed-in browser's own session.
    const csrf = ((await (await page.request.get(`${running.baseUrl}/api/session`)).json()) as { csrfToken: string }).csrfToken;
    const current = (await (await page.request.get(`${running.baseUrl}/api/trusses/1/model`)).json()) as TrussModelView;
    const at = (x: number, y: number) => current.model.joints.find((j) => Math.abs(j.x - x) < 1e-6 && Math.abs(j.y - y) < 1e-6)!.id;
    const top: [number, number][] = [[2, 1], [4, 2], [6, 3], [8, 2], [10, 1]];
    const saved = await page.request.put(`${running.baseUrl}/api/trusses/1/model`, {
      headers: { 'X-CSRF-Token': csrf },
      data: {
        version: current.version,
        supports: [
          { joint: at(0, 0), kind: 'pin' },
          { joint: at(12, 0), kind: 'roller', angleDeg: 90 },
        ],
        loadCases: [
          { id: 'D', name: 'Roofing, purlins and ceiling', category: 'dead', loads: top.map(([x, y]) => ({ joint: at(x, y), fx: 0, fy: -7.35 })) },
          { id: 'W', name: 'Wind from the left, suction on the roof', category: 'wind', loads: top.map(([x, y]) => ({ joint: at(x, y), fx: 1.85, fy: 4.12 })) },
        ],
        combinations: [],
        members: [],
      },
    });
    expect(saved.status()).toBe(200);

    await page.goto(`${running.baseUrl}/trusses/1`);
    await page.getByRole('tab', { name: 'Runs & results' }).click();
    await page.getByRole('button', { name: 'Run analysis' }).click();
    await page.getByText('Stable and statically determinate.').waitFor({ timeout: 60_000 });
    const results = 'section[aria-label^="Run "]';
    await page.locator(results).first().waitFor();
    // The steps of a load case are on screen (each equation a Tex line).
    expect(await page.locator(`${results} li[data-step]`).count()).toBeGreaterThan(5);
    await shot('results-case');
    expect(await overflowing(results)).toEqual([]);

    await page.getByLabel('Results of').selectOption('envelope');
    const envelope = page.getByRole('table', { name: 'Reaction envelope' });
    await envelope.waitFor({ timeout: 10_000 });
    await shot('results-envelope');
    expect(await overflowing(results)).toEqual([]);
    const section = (await page.locator(results).first().boundingBox())!;
    for (const table of await page.locator(`${results} table`).all()) {
      const box = (await table.boundingBox())!;
      // Full width of the results (the page's own padding aside), not a column of it.
      expect(box.width).toBeGreaterThan(section.width * 0.95);
      for (const th of await table.locator('th').all()) {
        const cell = (await th.boundingBox())!;
        expect(cell.width, await th.textContent() ?? '').toBeGreaterThan(8);
        expect(cell.x + cell.width).toBeLessThanOrEqual(section.x + section.width + 1);
        expect(await th.isVisible()).toBe(true);
      }
    }
  }, 180_000);
});
