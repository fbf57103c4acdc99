import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import type { TrussModelView } from '@shared/schemas/drawing.schema';
import type { RunView } from '@shared/schemas/run.schema';
import { DRAWING_INK, LOAD_STYLE, REACTION_STYLE } from '@shared/drawing/truss-svg';
import { buildClientIfNeeded, launchBrowser, startRunningApp, type RunningApp } from '../support/browser';

/**
 * The app shows each joint's free-body diagram beside its equations, drawn by the same code as
 * the calc sheet (shared/drawing/truss-svg.ts). Real server, real SQLite file, Chromium at
 * 1280 px. FBD_SHOTS=<folder> keeps the screenshot to look at.
 *
 * Loads of our own on the demo truss T1 (12 m span, pin at x = 0, roller at x = 12 m): 6 kN down
 * at each of the five top joints and 4 kN down at the roller's own joint. By statics (moments
 * about the pin; the five top loads are symmetric about midspan, from memory): the roller carries
 * 5 × 6 / 2 + 4 = 19.00 kN up, the pin 15.00 kN up and no horizontal force.
 */

let running: RunningApp;
let browser: Browser;
let page: Page;

beforeAll(async () => {
  buildClientIfNeeded();
  running = await startRunningApp();
  browser = await launchBrowser();
  page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
}, 300_000);

afterAll(async () => {
  await browser?.close();
  await running?.stop();
});

describe('free-body diagrams in the run results', () => {
  it('when the engineer reads a solved run, then each joint step shows its diagram with member forces and reactions labelled and typeset', async () => {
    await page.goto(`${running.baseUrl}/sign-in`);
    await page.getByLabel(/e-mail/i).fill('engineer@demo.panelpoint.test');
    await page.getByLabel(/password/i).fill('panelpoint-demo');
    await page.getByRole('button', { name: /sign in/i }).click();
    await page.waitForURL(/\/projects/);

    const csrf = ((await (await page.request.get(`${running.baseUrl}/api/session`)).json()) as { csrfToken: string }).csrfToken;
    const current = (await (await page.request.get(`${running.baseUrl}/api/trusses/1/model`)).json()) as TrussModelView;
    const at = (x: number, y: number) => current.model.joints.find((j) => Math.abs(j.x - x) < 1e-6 && Math.abs(j.y - y) < 1e-6)!;
    const top: [number, number][] = [[2, 1], [4, 2], [6, 3], [8, 2], [10, 1]];
    const pin = at(0, 0);
    const roller = at(12, 0);
    const saved = await page.request.put(`${running.baseUrl}/api/trusses/1/model`, {
      headers: { 'X-CSRF-Token': csrf },
      data: {
        version: current.version,
        supports: [
          { joint: pin.id, kind: 'pin' },
          { joint: roller.id, kind: 'roller', angleDeg: 90 },
        ],
        loadCases: [
          {
            id: 'D',
            name: 'Roofing and a hoist at the roller',
            category: 'dead',
            loads: [...top.map(([x, y]) => ({ joint: at(x, y).id, fx: 0, fy: -6 })), { joint: roller.id, fx: 0, fy: -4 }],
          },
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
    const runId = Number((await page.locator(results).first().getAttribute('aria-label'))!.replace('Run ', ''));
    const run = (await (await page.request.get(`${running.baseUrl}/api/runs/${runId}`)).json()) as RunView;
    const jointSteps = run.analysis!.cases[0].jointSteps;
    expect(jointSteps.length).toBeGreaterThan(3);

    // Every joint step of the case shows a diagram; no other step does.
    const withFbd = page.locator(`${results} li[data-step]:has(svg.fbd)`);
    expect(await withFbd.count()).toBe(jointSteps.length);
    const fbdOf = (tag: string) => page.locator(`${results} li[data-step] svg[aria-label="Free-body diagram of joint ${tag}"]`);

    // Each diagram labels every member at its joint with F and the member's tag as a subscript:
    // the step's unknowns "= ?" (as the sheet draws them, before the step solves them), the forces
    // found by earlier steps with their value and sense in the app's units.
    for (const step of jointSteps) {
      const fbd = fbdOf(step.jointTag);
      await fbd.scrollIntoViewIfNeeded();
      expect(await fbd.isVisible(), step.jointTag).toBe(true);
      const text = (await fbd.textContent())!;
      expect(text, step.jointTag).not.toMatch(/_/);
      for (const u of step.unknowns.filter((x) => x.ref.type === 'member')) expect(text, `${step.jointTag} ${u.label}`).toContain(`F${u.label} = ?`);
      for (const k of step.known.filter((x) => x.ref.type === 'member')) {
        const v = k.value!;
        const want = Math.abs(v) < 1e-6 ? `F${k.label} = 0` : `F${k.label} = ${Math.abs(v).toFixed(2)}\u202fkN (${v > 0 ? 'T' : 'C'})`;
        expect(text, `${step.jointTag} ${k.label}`).toContain(want);
      }
      // The subscript is a lowered, smaller tspan, not the same line of text.
      const sub = await fbd.locator('tspan[dy]').first().evaluate((el) => ({ dy: Number(el.getAttribute('dy')), size: Number(el.getAttribute('font-size')) }));
      expect(sub.dy).toBeGreaterThan(0);
      expect(sub.size).toBeLessThan(12);
    }

    // The support joints: reactions by statics (see the note at the top).
    const reactionText = async (tag: string) => (await fbdOf(tag).textContent())!;
    const rollerStep = jointSteps.find((s) => s.jointTag === roller.tag);
    const pinStep = jointSteps.find((s) => s.jointTag === pin.tag);
    expect(pinStep, 'the pin joint is worked as a step').toBeTruthy();
    expect(rollerStep, 'the roller joint is worked as a step').toBeTruthy();
    expect(await reactionText(pin.tag)).toContain(`R${pin.tag},y = 15.00\u202fkN`);
    {
      const text = await reactionText(roller.tag);
      expect(text).toContain(`R${roller.tag},y = 19.00\u202fkN`);
      // The hoist load at the roller: its own symbol and colour, a filled head; the reaction on
      // the same vertical line drawn beside it (dashed, open head), so they cannot read as one arrow.
      expect(text).toContain(`P${roller.tag},y = 4.00\u202fkN`);
      const fbd = fbdOf(roller.tag);
      const loadX = await fbd.locator(`line[stroke="${LOAD_STYLE.stroke}"]`).first().evaluate((el) => Number(el.getAttribute('x1')));
      const reactionLine = fbd.locator(`line[stroke="${REACTION_STYLE.stroke}"][stroke-dasharray]`).first();
      const reactionX = await reactionLine.evaluate((el) => Number(el.getAttribute('x1')));
      expect(Math.abs(reactionX - loadX)).toBeGreaterThanOrEqual(10);
      expect(await fbd.locator(`path[fill="${DRAWING_INK.paper}"][stroke="${REACTION_STYLE.stroke}"]`).count()).toBeGreaterThan(0);
      await fbd.scrollIntoViewIfNeeded();
    }
    if (process.env.FBD_SHOTS) {
      await page.screenshot({ path: `${process.env.FBD_SHOTS}/joint-fbd.png` });
      await page.locator(`${results} li[data-step]:has(svg[aria-label="Free-body diagram of joint ${roller.tag}"])`).screenshot({ path: `${process.env.FBD_SHOTS}/joint-fbd-roller.png` });
    }
  }, 180_000);
});
