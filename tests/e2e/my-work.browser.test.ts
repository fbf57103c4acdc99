import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import bcrypt from 'bcryptjs';
import type { TrussModelView } from '@shared/schemas/drawing.schema';
import { User } from '../../server/db/models';
import { buildClientIfNeeded, launchBrowser, startRunningApp, type RunningApp } from '../support/browser';

/**
 * Choosing the checker and "My work", in Chromium on the real server: the engineer submits a
 * revision of the demo truss choosing the demo reviewer; the reviewer's bar counts 1 and My
 * work lists it under "To check"; she returns it from there; the engineer's My work then lists
 * it under "Returned to me". The run and the draft are made through the API (the workspace has
 * browser tests of its own); every step of the journey itself is clicked. SHOTS=<folder> keeps screenshots.
 */

const PASSWORD = 'panelpoint-demo';
const ENGINEER = 'engineer@demo.panelpoint.test';
const REVIEWER = 'reviewer@demo.panelpoint.test';
const SHOTS = process.env.SHOTS;

let running: RunningApp;
let browser: Browser;
let engineer: Page;
let reviewer: Page;
let sheetId = 0;
let runId = 0;

beforeAll(async () => {
  buildClientIfNeeded();
  running = await startRunningApp();
  browser = await launchBrowser();
  const pageFor = async () => (await browser.newContext({ viewport: { width: 1360, height: 900 } })).newPage();
  [engineer, reviewer] = await Promise.all([pageFor(), pageFor()]);
}, 300_000);

afterAll(async () => {
  await browser?.close();
  await running?.stop();
});

async function signIn(page: Page, email: string): Promise<void> {
  await page.goto(`${running.baseUrl}/sign-in`);
  await page.getByLabel(/e-mail/i).fill(email);
  await page.getByLabel(/password/i).fill(PASSWORD);
  await page.getByRole('button', { name: /sign in/i }).click();
  await page.waitForURL(/\/projects/);
}

async function shot(page: Page, name: string) {
  if (!SHOTS) return;
  fs.mkdirSync(SHOTS, { recursive: true });
  await page.screenshot({ path: path.join(SHOTS, name) });
}

/** A solved run of the demo truss T1 and draft revision A from it, through the signed-in page's own session. */
async function draftFromApi(page: Page): Promise<number> {
  const api = page.context().request;
  const url = (p: string) => `${running.baseUrl}${p}`;
  const csrf = ((await (await api.get(url('/api/session'))).json()) as { csrfToken: string }).csrfToken;
  const w = { headers: { 'X-CSRF-Token': csrf } };
  const current = (await (await api.get(url('/api/trusses/1/model'))).json()) as TrussModelView;
  const at = (x: number, y: number) => current.model.joints.find((j) => Math.abs(j.x - x) < 1e-6 && Math.abs(j.y - y) < 1e-6)!.id;
  const saved = await api.put(url('/api/trusses/1/model'), {
    ...w,
    // As the public-verify browser test saves it: the model's supports and one dead-load case.
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
  });
  expect(saved.status()).toBe(200);
  runId = ((await (await api.post(url('/api/trusses/1/runs'), { ...w, data: {} })).json()) as { id: number }).id;
  for (let i = 0; i < 400; i++) {
    const run = (await (await api.get(url(`/api/runs/${runId}`))).json()) as { status: string };
    if (run.status === 'solved') break;
    await new Promise((r) => setTimeout(r, 50));
  }
  const sheet = await api.post(url('/api/trusses/1/sheets'), { ...w, data: { runId } });
  expect(sheet.status()).toBe(201);
  return ((await sheet.json()) as { id: number }).id;
}

describe('choosing the checker and My work, in Chromium', () => {
  it('when the engineer submits revision A choosing the demo reviewer, then the sheet names her as checker', async () => {
    await signIn(engineer, ENGINEER);
    sheetId = await draftFromApi(engineer);
    await engineer.goto(`${running.baseUrl}/sheets/${sheetId}`);
    await engineer.getByRole('heading', { name: /Calc sheet, revision A\s*Draft/ }).waitFor({ timeout: 15_000 });

    await engineer.getByRole('button', { name: 'Submit for check', exact: true }).first().click();
    const checker = engineer.getByLabel('Checker');
    await checker.locator('option', { hasText: 'Rosa Quint' }).waitFor({ state: 'attached', timeout: 15_000 });
    // The engineer is not offered as their own checker.
    expect(await checker.locator('option', { hasText: 'Eli Marsh' }).count()).toBe(0);
    // Confirming without a checker asks for one and sends nothing.
    await engineer.getByRole('button', { name: 'Submit for check', exact: true }).last().click();
    await engineer.getByText('Choose the checker: the reviewer who will check this revision.').waitFor();
    await checker.selectOption({ label: `Rosa Quint (${REVIEWER})` });
    await shot(engineer, 'my-work-1-submit.png');
    await engineer.getByRole('button', { name: 'Submit for check', exact: true }).last().click();
    await engineer.getByRole('heading', { name: /Calc sheet, revision A\s*In check/ }).waitFor({ timeout: 15_000 });
    expect(await engineer.getByText('Checker', { exact: true }).count()).toBe(1);
    expect(await engineer.getByText('Rosa Quint').count()).toBeGreaterThan(0);
  }, 120_000);

  it('when the reviewer signs in, then the bar counts 1 beside My work and My work lists A under To check, linking to the sheet', async () => {
    await signIn(reviewer, REVIEWER);
    const nav = reviewer.getByRole('navigation', { name: 'Main' });
    await nav.getByTestId('my-work-count').filter({ hasText: /^1$/ }).waitFor({ timeout: 15_000 });
    await nav.getByRole('link', { name: /My work/ }).click();
    await reviewer.waitForURL(/\/my-work$/);
    const toCheck = reviewer.getByRole('region', { name: 'To check' });
    const link = toCheck.getByRole('link', { name: 'Check it: revision A' });
    await link.waitFor({ timeout: 15_000 });
    expect(await toCheck.getByText(/HV-2417 .* · T1/).count()).toBe(1);
    expect(await toCheck.getByText(/Prepared by Eli Marsh/).count()).toBe(1);
    await shot(reviewer, 'my-work-2-reviewer.png');

    await link.click();
    await reviewer.waitForURL(new RegExp(`/sheets/${sheetId}$`));
    await reviewer.getByRole('heading', { name: /Calc sheet, revision A\s*In check/ }).waitFor({ timeout: 15_000 });
  }, 60_000);

  it('when the reviewer returns A, then her count goes, and the engineer’s My work lists A under Returned to me', async () => {
    await reviewer.getByRole('button', { name: 'Return to the preparer', exact: true }).first().click();
    await reviewer.getByLabel('Why it goes back').fill('State the reaction directions at both bearings.');
    await reviewer.getByRole('button', { name: 'Return to the preparer', exact: true }).last().click();
    await reviewer.getByRole('heading', { name: /Calc sheet, revision A\s*Returned/ }).waitFor({ timeout: 15_000 });
    // The move refreshes the count at once (the query is invalidated), no minute's wait.
    await reviewer.getByTestId('my-work-count').waitFor({ state: 'detached', timeout: 10_000 });

    await engineer.goto(`${running.baseUrl}/my-work`);
    const returned = engineer.getByRole('region', { name: 'Returned to me' });
    await returned.getByRole('link', { name: 'Read the comments: revision A' }).waitFor({ timeout: 15_000 });
    await engineer.getByRole('navigation', { name: 'Main' }).getByTestId('my-work-count').filter({ hasText: /^1$/ }).waitFor({ timeout: 15_000 });
    expect(await engineer.getByRole('region', { name: 'Checked, ready to issue' }).getByText('None of your revisions is checked and waiting to be issued.').count()).toBe(1);
    await shot(engineer, 'my-work-3-engineer.png');
  }, 60_000);

  it('when the engineer starts revision B, then A reads "Returned — replaced by revision B" in the truss’s sheet list and on its page, and leaves Returned to me', async () => {
    await engineer.goto(`${running.baseUrl}/trusses/1?tab=sheets`);
    const start = engineer.getByRole('button', { name: /^New revision from Run \d+$/ });
    await start.waitFor({ timeout: 15_000 });
    await start.click();
    await engineer.getByRole('heading', { name: /Calc sheet, revision B\s*Draft/ }).waitFor({ timeout: 15_000 });

    await engineer.goto(`${running.baseUrl}/trusses/1?tab=sheets`);
    const rowA = engineer.locator('tr', { has: engineer.getByRole('link', { name: 'A', exact: true }) });
    await rowA.getByText('Returned — replaced by revision B').waitFor({ timeout: 15_000 });
    await engineer.goto(`${running.baseUrl}/sheets/${sheetId}`);
    await engineer.getByRole('heading', { name: /Calc sheet, revision A\s*Returned — replaced by revision B/ }).waitFor({ timeout: 15_000 });
    await shot(engineer, 'my-work-4-replaced.png');

    await engineer.goto(`${running.baseUrl}/my-work`);
    await engineer.getByRole('region', { name: 'Returned to me' }).getByText('None of your revisions is waiting on you after a return.').waitFor({ timeout: 15_000 });
    expect(await engineer.getByTestId('my-work-count').count()).toBe(0);
  }, 60_000);

  it('when an admin hands B (sent to Rosa) to a second reviewer, then the sheet names the new checker and the audit log says the checker changed', async () => {
    await User.create({ email: 'second.reviewer@demo.panelpoint.test', name: 'Priya Okafor', role: 'reviewer', passwordHash: await bcrypt.hash(PASSWORD, 4) });
    // The engineer opens B (a draft) from the truss's sheet list and submits it to Rosa.
    await engineer.goto(`${running.baseUrl}/trusses/1?tab=sheets`);
    await engineer.getByRole('link', { name: 'B', exact: true }).click();
    await engineer.getByRole('heading', { name: /Calc sheet, revision B\s*Draft/ }).waitFor({ timeout: 15_000 });
    await engineer.getByRole('button', { name: 'Submit for check', exact: true }).first().click();
    await engineer.getByLabel('Checker').selectOption({ label: `Rosa Quint (${REVIEWER})` });
    await engineer.getByRole('button', { name: 'Submit for check', exact: true }).last().click();
    await engineer.getByRole('heading', { name: /Calc sheet, revision B\s*In check/ }).waitFor({ timeout: 15_000 });

    const admin = await (await browser.newContext({ viewport: { width: 1360, height: 900 } })).newPage();
    const keyErrors: string[] = [];
    admin.on('console', (m) => {
      if (m.type() === 'error' && m.text().includes('two children with the same key')) keyErrors.push(m.text());
    });
    await signIn(admin, 'admin@demo.panelpoint.test');
    await admin.goto(engineer.url());
    await admin.getByRole('button', { name: 'Change the checker' }).click();
    // Neither the preparer nor the current checker is offered.
    const choice = admin.getByLabel('New checker');
    await choice.locator('option', { hasText: 'Priya Okafor' }).waitFor({ state: 'attached', timeout: 15_000 });
    expect(await choice.locator('option', { hasText: 'Rosa Quint' }).count()).toBe(0);
    await choice.selectOption({ label: 'Priya Okafor (second.reviewer@demo.panelpoint.test)' });
    await admin.getByRole('button', { name: 'Hand it over' }).click();
    await admin.getByText('changed the checker (still in check)').waitFor({ timeout: 15_000 });
    expect(await admin.getByText('“Checker changed from Rosa Quint to Priya Okafor.”').count()).toBe(1);
    await admin.getByText(/^Checker:\s*Priya Okafor/).waitFor({ timeout: 15_000 });
    // The form closes once handed over.
    await admin.getByLabel('New checker').waitFor({ state: 'detached', timeout: 15_000 });
    // The hand-over control once sat beside the review panel under the same React key, which left the form on the page.
    expect(keyErrors).toEqual([]);
    await shot(admin, 'my-work-5-handover.png');
  }, 60_000);
});
