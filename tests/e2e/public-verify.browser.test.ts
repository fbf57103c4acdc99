import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { APIRequestContext, Browser } from 'playwright-core';
import type { TrussModelView } from '@shared/schemas/drawing.schema';
import { buildClientIfNeeded, launchBrowser, startRunningApp, type RunningApp } from '../support/browser';

/**
 * The verify address printed on an issued sheet, opened in Chromium by someone who has never
 * signed in: the page shows the sheet's printed facts, then says whether a dropped PDF is the
 * issued copy or an altered one (naming the sheet it claims to be). The sheet is issued through
 * the real check flow and printed by the server's own Chromium. LAYOUT_SHOTS=<folder> keeps a screenshot.
 */

let running: RunningApp;
let browser: Browser;

beforeAll(async () => {
  buildClientIfNeeded();
  running = await startRunningApp();
  browser = await launchBrowser();
}, 300_000);

afterAll(async () => {
  await browser?.close();
  await running?.stop();
});

async function signedIn(email: string): Promise<{ api: APIRequestContext; csrf: string }> {
  const context = await browser.newContext();
  const api = context.request;
  let csrf = ((await (await api.get(`${running.baseUrl}/api/session`)).json()) as { csrfToken: string }).csrfToken;
  const res = await api.post(`${running.baseUrl}/api/session`, { headers: { 'X-CSRF-Token': csrf }, data: { email, password: 'panelpoint-demo' } });
  expect(res.status()).toBe(200);
  csrf = ((await (await api.get(`${running.baseUrl}/api/session`)).json()) as { csrfToken: string }).csrfToken;
  return { api, csrf };
}

describe('public verify page', () => {
  it('when someone not signed in opens the verify address and drops the issued PDF, then an altered copy, the page says which is which', async () => {
    const url = (p: string) => `${running.baseUrl}${p}`;
    const engineer = await signedIn('engineer@demo.panelpoint.test');
    const reviewer = await signedIn('reviewer@demo.panelpoint.test');
    const current = (await (await engineer.api.get(url('/api/trusses/1/model'))).json()) as TrussModelView;
    const at = (x: number, y: number) => current.model.joints.find((j) => Math.abs(j.x - x) < 1e-6 && Math.abs(j.y - y) < 1e-6)!.id;
    const w = { headers: { 'X-CSRF-Token': engineer.csrf } };
    expect(
      (
        await engineer.api.put(url('/api/trusses/1/model'), {
          ...w,
          data: {
            version: current.version,
            supports: [
              { joint: at(0, 0), kind: 'pin' },
              { joint: at(12, 0), kind: 'roller', angleDeg: 90 },
            ],
            loadCases: [{ id: 'D', name: 'Roof dead load', category: 'dead', loads: [[2, 1], [6, 3], [10, 1]].map(([x, y]) => ({ joint: at(x, y), fx: 0, fy: -6.4 })) }],
            combinations: [],
            members: [],
          },
        })
      ).status(),
    ).toBe(200);
    const runId = ((await (await engineer.api.post(url('/api/trusses/1/runs'), { ...w, data: {} })).json()) as { id: number }).id;
    for (let i = 0; i < 400; i++) {
      const run = (await (await engineer.api.get(url(`/api/runs/${runId}`))).json()) as { status: string };
      if (run.status === 'solved') break;
      await new Promise((r) => setTimeout(r, 50));
    }
    const sheetId = ((await (await engineer.api.post(url('/api/trusses/1/sheets'), { ...w, data: { runId } })).json()) as { id: number }).id;
    const checkers = (await (await engineer.api.get(url('/api/checkers'))).json()) as { id: number; email: string }[];
    const checkerId = checkers.find((c) => c.email === 'reviewer@demo.panelpoint.test')!.id;
    expect((await engineer.api.post(url(`/api/sheets/${sheetId}/submit`), { ...w, data: { checkerId } })).status()).toBe(200);
    expect((await reviewer.api.post(url(`/api/sheets/${sheetId}/check`), { headers: { 'X-CSRF-Token': reviewer.csrf }, data: {} })).status()).toBe(200);
    expect((await engineer.api.post(url(`/api/sheets/${sheetId}/issue`), { ...w, data: {} })).status()).toBe(200);
    const pdf = Buffer.from(await (await reviewer.api.get(url(`/api/sheets/${sheetId}/pdf`))).body());

    // A visitor with a fresh browser: no cookie, never signed in.
    const visitor = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await visitor.newPage();
    await page.goto(url(`/verify/${sheetId}`));
    const facts = page.getByRole('region', { name: 'Issued sheet' });
    await facts.waitFor({ timeout: 15_000 });
    expect(await facts.textContent()).toContain(`Issued sheet ${sheetId} is the current revision of this truss.`);
    expect(await facts.textContent()).toContain('HV-2417');
    expect(page.url()).toBe(url(`/verify/${sheetId}`));

    await page.getByLabel('PDF to verify').setInputFiles({ name: 'issued.pdf', mimeType: 'application/pdf', buffer: pdf });
    const answer = page.getByRole('region', { name: 'Verification result' });
    await answer.getByText(`This file is exactly issued sheet ${sheetId}`, { exact: false }).waitFor({ timeout: 15_000 });

    const altered = Buffer.from(pdf);
    altered[altered.indexOf('stream\n', 0, 'latin1') + 40] ^= 0x01;
    await page.getByLabel('PDF to verify').setInputFiles({ name: 'edited.pdf', mimeType: 'application/pdf', buffer: altered });
    await answer.getByText(`This file claims to be issued sheet ${sheetId}`, { exact: false }).waitFor({ timeout: 15_000 });
    expect(await answer.textContent()).toContain('but its bytes differ from the copy archived at issue');
    if (process.env.LAYOUT_SHOTS) await page.screenshot({ path: `${process.env.LAYOUT_SHOTS}/public-verify.png`, fullPage: true });
    await visitor.close();
  }, 180_000);
});
