import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import type { RevisionCompareView } from '@shared/schemas/revision-compare.schema';
import { loadDemoTruss, runToEnd } from '../support/fixtures';
import { launchBrowser, startRunningApp, type RunningApp } from '../support/browser';
import { demoEmail, signIn as apiSignIn, type Tab } from '../support/test-services';

// The checker of revision B of the demo truss T1 sees what changed since revision A, on the real
// server in Chromium: revision A has 10 kN at each of the five upper panel points, revision B
// 16 kN at the apex. Set up through the API as the engineer; read in the browser as the reviewer.

const SHOTS = '/tmp/shots-e2e';
let running: RunningApp;
let browser: Browser;
let reviewer: Page;
let engineer: Tab;
let sheetA = 0;
let sheetB = 0;
let compare: RevisionCompareView;

async function revisionFrom(tab: Tab, apexLoad: number): Promise<number> {
  await loadDemoTruss(tab, apexLoad);
  const run = await runToEnd(tab);
  expect(run.status).toBe('solved');
  const res = await tab.agent.post('/api/trusses/1/sheets').set('X-CSRF-Token', tab.csrf).send({ runId: run.id });
  expect(res.status).toBe(201);
  return res.body.id as number;
}

beforeAll(async () => {
  fs.mkdirSync(SHOTS, { recursive: true });
  running = await startRunningApp();
  engineer = await apiSignIn(running.services.app, demoEmail('engineer'));
  sheetA = await revisionFrom(engineer, 10);
  sheetB = await revisionFrom(engineer, 16);
  compare = (await engineer.agent.get(`/api/sheets/${sheetB}/compare`).expect(200)).body;
  browser = await launchBrowser();
  reviewer = await (await browser.newContext({ viewport: { width: 1360, height: 1000 } })).newPage();
  await reviewer.goto(`${running.baseUrl}/sign-in`);
  await reviewer.getByLabel(/e-mail/i).fill(demoEmail('reviewer'));
  await reviewer.getByLabel(/password/i).fill('panelpoint-demo');
  await reviewer.getByRole('button', { name: /sign in/i }).click();
  await reviewer.waitForURL(/\/projects/);
}, 180_000);

afterAll(async () => {
  await browser?.close();
  await running?.stop();
});

/** The preview frame's document, once the calc sheet inside it has laid out. */
async function previewFrame(page: Page) {
  await page.getByText('Laying out the calc sheet…').waitFor({ state: 'detached', timeout: 30_000 });
  const handle = await page.locator('iframe[title="Calc sheet preview"]').elementHandle();
  const frame = (await handle!.contentFrame())!;
  await frame.waitForSelector('article.step[id]', { state: 'attached' });
  return frame;
}

describe('revision comparison on the sheet page, in Chromium', () => {
  it('when the checker opens revision B, then the panel shows the changed apex load and the force differences', async () => {
    await reviewer.goto(`${running.baseUrl}/sheets/${sheetB}`);
    const panel = reviewer.getByRole('region', { name: 'Changes since revision A' });
    await panel.waitFor({ timeout: 30_000 });
    await expect(panel.getByRole('list', { name: 'What changed, by kind' }).textContent()).resolves.toContain('case D changed at 1 joint (total Fy \u22126.00\u202fkN)');
    const loads = panel.getByRole('table', { name: 'Load changes' });
    const apex = compare.diff.loadCases.changed[0]!.loads[0]!.joint;
    await expect(loads.getByRole('row', { name: `D · ${apex}` }).textContent()).resolves.toBe(`D · ${apex}0.00 / \u221210.000.00 / \u221216.000.00 / \u22126.00`);
    // The end top chord's difference by hand: ΔN = −(ΔP/2)·√5 = −3√5 = −6.71 kN (method of joints at the bearing).
    const forces = panel.getByRole('table', { name: 'Member forces, case D' });
    await expect(forces.getByRole('cell', { name: '\u22126.71', exact: true }).count()).resolves.toBeGreaterThanOrEqual(1);
    const reactions = panel.getByRole('table', { name: 'Reactions, case D' });
    await expect(reactions.getByRole('cell', { name: '+3.00', exact: true }).count()).resolves.toBe(2);
    await reviewer.screenshot({ path: path.join(SHOTS, 'compare-1-panel.png'), fullPage: true });
  }, 90_000);

  it('when the sheet has laid out, then the changed steps are marked and the unchanged ones folded with their count, and a fold opens', async () => {
    const frame = await previewFrame(reviewer);
    await frame.waitForSelector('[data-pp-changed]');
    const state = await frame.evaluate(() => ({
      changed: [...document.querySelectorAll('[data-pp-changed]')].map((el) => el.id),
      folded: [...document.querySelectorAll('[data-pp-folded]')].map((el) => el.id),
      folds: [...document.querySelectorAll('.pp-fold')].map((el) => ({ count: Number(el.getAttribute('data-pp-fold-count')), text: el.textContent ?? '' })),
      steps: [...document.querySelectorAll('article.step[id]')].map((el) => el.id),
    }));
    const onSheet = new Set(state.steps);
    expect(state.changed.sort()).toEqual(compare.steps.changed.map((s) => s.id).filter((id) => onSheet.has(id)).sort());
    expect(state.changed.length).toBeGreaterThan(0);
    expect(state.folded.sort()).toEqual(compare.steps.unchanged.filter((id) => onSheet.has(id)).sort());
    expect(state.folds.reduce((n, f) => n + f.count, 0)).toBe(state.folded.length);
    for (const f of state.folds) expect(f.text).toMatch(/^\d+ unchanged steps? \(\d+\.\d+(\u2013\d+\.\d+)?\) folded — show$/);
    // No changed step is folded.
    expect(state.changed.filter((id) => state.folded.includes(id))).toEqual([]);
    await frame.locator('.pp-fold').last().scrollIntoViewIfNeeded();
    await reviewer.locator('iframe[title="Calc sheet preview"]').screenshot({ path: path.join(SHOTS, 'compare-2-sheet.png') });

    if (state.folds.length > 0) {
      const first = state.folds[0]!;
      await frame.locator('.pp-fold').first().click();
      await expect(frame.evaluate(() => document.querySelectorAll('[data-pp-folded]').length)).resolves.toBe(state.folded.length - first.count);
    }
  }, 90_000);

  it('when the checker clicks a changed step in the panel, then the sheet shows it chosen, by its printed number', async () => {
    const step = compare.steps.changed[0]!;
    const panel = reviewer.getByRole('region', { name: 'Changes since revision A' });
    const button = panel.getByRole('list', { name: 'Changed steps' }).getByRole('button').first();
    await expect(button.textContent()).resolves.toContain(step.number!);
    await button.click();
    const frame = await previewFrame(reviewer);
    await frame.waitForSelector(`[id="${step.id}"][data-pp-selected]`);
    const printed = await frame.evaluate((id) => document.getElementById(id)?.querySelector('.step-no')?.textContent?.trim(), step.id);
    expect(printed).toBe(step.number);
  }, 60_000);

  it('when the checker unticks folding, then every step shows; revision A, the first, has no changes panel', async () => {
    await reviewer.getByLabel('Fold unchanged steps on the sheet').uncheck();
    const frame = await previewFrame(reviewer);
    await expect(frame.evaluate(() => document.querySelectorAll('[data-pp-folded], .pp-fold').length)).resolves.toBe(0);
    await reviewer.goto(`${running.baseUrl}/sheets/${sheetA}`);
    await reviewer.getByRole('heading', { name: /Calc sheet, revision A/ }).waitFor({ timeout: 30_000 });
    await previewFrame(reviewer);
    await expect(reviewer.getByRole('region', { name: /Changes since revision/ }).count()).resolves.toBe(0);
  }, 60_000);
});
