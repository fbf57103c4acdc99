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

const kn = (text: string | null) => Number((text ?? '').replace('\u2212', '-').trim());

async function memberForce(tag: string): Promise<number> {
  const row = page.locator('tr', { has: page.locator('td:first-child', { hasText: new RegExp(`^${tag}$`) }) });
  return kn(await row.locator('td').nth(4).textContent());
}

// One engineer's day on the demo truss T1 (12 m span, 3 m rise, six 2 m panels), in order.
describe('the engineer loads, runs and reads the demo truss in Chromium', () => {
  let preview: TakeoffPreviewView | null = null;

  it('when the engineer clicks the bearings and runs a roof loading, then the model saves with the takeoff loads', async () => {
    await page.goto(`${running.baseUrl}/sign-in`);
    await page.getByLabel(/e-mail/i).fill('engineer@demo.panelpoint.test');
    await page.getByLabel(/password/i).fill('panelpoint-demo');
    await page.getByRole('button', { name: /sign in/i }).click();
    await page.waitForURL(/\/projects/);
    await page.getByRole('link', { name: 'HV-2417' }).click();
    await page.getByRole('link', { name: /^T1/ }).click();
    await page.getByRole('tab', { name: 'Model & loads' }).click();

    // Joint F is the left bearing (0, 0), joint L the right bearing (12, 0).
    await page.getByRole('button', { name: /^Joint F at \(0\.000, 0\.000\)/ }).click();
    await page.getByRole('radio', { name: 'Pin' }).click();
    await page.getByRole('button', { name: 'Done' }).click();
    await page.getByRole('button', { name: /^Joint L at \(12\.000, 0\.000\)/ }).click();
    await page.getByRole('radio', { name: 'Roller' }).click();
    await page.getByRole('button', { name: 'Done' }).click();
    expect(await page.getByLabel('Support 1: joint').count()).toBe(1);

    await page.getByRole('tab', { name: 'Members' }).click();
    await page.getByRole('button', { name: 'Suggest groups from the outline' }).click();
    expect(await page.getByText('6 top chord · 6 bottom chord · 9 web').isVisible()).toBe(true);

    await page.getByRole('tab', { name: 'Roof loading' }).click();
    page.on('response', async (response) => {
      if (response.url().endsWith('/takeoff/preview') && response.ok()) preview = (await response.json()) as TakeoffPreviewView;
    });
    await page.getByLabel('Area load 1: load case').selectOption('new:dead');
    await page.getByLabel('Area load 1: q').fill('0.9');
    await page.getByLabel('Truss spacing, m').fill('4.5');
    await page.getByLabel('Number of trusses').fill('8');
    await page.getByLabel('Which truss').selectOption('1');
    await page.getByRole('table', { name: 'Roof loading of load case D1' }).waitFor({ timeout: 15_000 });
    const use = page.getByRole('button', { name: 'Use these loads' });
    await expect.poll(() => use.isEnabled(), { timeout: 10_000 }).toBe(true);
    // "Use these loads" first says what it will change and saves nothing until confirmed.
    await use.click();
    const confirm = page.getByRole('alertdialog', { name: "Use the roof loading's loads" });
    await confirm.waitFor({ timeout: 10_000 });
    await confirm.getByRole('button', { name: 'Cancel' }).click();
    expect(await confirm.count()).toBe(0);
    expect(await page.getByText('Model save 1').isVisible()).toBe(true);

    await use.click();
    await confirm.waitFor({ timeout: 10_000 });
    // The new case D1 had no loads: the roof loading's are added; count and total Fy as the preview computed them.
    const d1 = preview!.result.caseLoads.D1!;
    const row = confirm.getByRole('row', { name: /^D1 / });
    expect(await row.locator('td').nth(1).textContent()).toBe('loads added');
    expect(await row.locator('td').nth(2).textContent()).toBe('0');
    expect(Number(await row.locator('td').nth(4).textContent())).toBe(d1.length);
    expect(Number(await row.locator('td').nth(5).textContent())).toBeCloseTo(d1.reduce((s, l) => s + l.fy, 0), 2);
    expect(await page.getByText('Model save 1').isVisible()).toBe(true);
    await confirm.getByRole('button', { name: 'Save these loads' }).click();
    await page.getByText('Model saved.').waitFor({ timeout: 15_000 });
    expect(await page.getByText('Model save 2').isVisible()).toBe(true);
    expect(preview?.input.trussIndex).toBe(1);
  }, 90_000);

  it('when the engineer runs the analysis, then the end top-chord force DF matches the method of joints at the left bearing', async () => {
    await page.getByRole('tab', { name: 'Runs & results' }).click();
    await page.getByRole('button', { name: 'Run analysis' }).click();
    await page.getByText('Stable and statically determinate.').waitFor({ timeout: 30_000 });

    // Expected value by hand from the roof loading's own joint loads (vertical, fy < 0):
    // R_F from ΣM about L = 0 (span 12 m, roller at L vertical), then the method of joints at F
    // (Hibbeler, Engineering Mechanics: Statics, §6.2): ΣFy = R_F + fy_F + F_DF·sin θ = 0, with
    // DF from (0, 0) to (2, 1), sin θ = 1/√5. The bottom chord FG is horizontal and drops out.
    const loads = preview!.result.caseLoads.D1!;
    const x = new Map([['j6', 0], ['j4', 2], ['j2', 4], ['j1', 6], ['j3', 8], ['j5', 10], ['j12', 12]]);
    const reactionF = loads.reduce((sum, l) => sum + -l.fy * (12 - x.get(l.joint)!), 0) / 12;
    const fyF = loads.find((l) => l.joint === 'j6')!.fy;
    const expected = -(reactionF + fyF) * Math.sqrt(5);
    expect(expected).toBeLessThan(-10); // a real compression, not a vacuous zero

    expect(await memberForce('DF')).toBeCloseTo(expected, 2);
    const row = page.locator('tr', { has: page.locator('td:first-child', { hasText: /^DF$/ }) });
    expect(await row.locator('td').nth(5).textContent()).toBe('(C)');
    // Mirror symmetry of the truss and its loads: EL carries the same force.
    expect(await memberForce('EL')).toBeCloseTo(expected, 2);

    // The reaction envelope for bearing design: one case and no combinations, so Ry at F is the
    // R_F found above by moments about L, both largest and least, and there is no uplift.
    await page.getByLabel('Results of').selectOption('envelope');
    const table = page.getByRole('table', { name: 'Reaction envelope' });
    await table.waitFor({ timeout: 10_000 });
    const ryF = table.locator('tr', { has: page.locator('td:first-child', { hasText: /^F$/ }) }).locator('xpath=following-sibling::tr[1]');
    expect(await ryF.locator('td').nth(1).textContent()).toBe('Ry');
    expect(kn(await ryF.locator('td').nth(2).textContent())).toBeCloseTo(reactionF, 2);
    expect(kn(await ryF.locator('td').nth(4).textContent())).toBeCloseTo(reactionF, 2);
    expect(await ryF.locator('td').nth(3).textContent()).toBe('D1');
    expect(await page.getByText('No uplift: every support bears down under every load case.').isVisible()).toBe(true);
    expect(await page.getByRole('link', { name: 'Reactions (CSV)' }).getAttribute('href')).toMatch(/^\/api\/runs\/\d+\/reactions\.csv$/);
  }, 60_000);

  it('when the engineer asks for the calc sheet PDF, then a progress line follows the print job and a download link with the page count replaces it', async () => {
    await page.getByRole('button', { name: 'Make the calc sheet PDF' }).click();
    const progress = page.getByRole('status').filter({ hasText: /^Calc sheet PDF: / });
    await progress.waitFor({ timeout: 15_000 });
    expect(await page.getByRole('progressbar', { name: 'Calc sheet PDF progress' }).count()).toBe(1);
    const link = page.getByRole('link', { name: /^Download the calc sheet PDF \(\d+ pages\)$/ });
    await link.waitFor({ timeout: 120_000 });
    expect(await progress.count()).toBe(0);
    const href = (await link.getAttribute('href'))!;
    expect(href).toMatch(/^\/api\/sheet-jobs\/\d+\/pdf$/);
    const pdf = await page.request.get(`${running.baseUrl}${href}`);
    expect(pdf.status()).toBe(200);
    const body = await pdf.body();
    expect(body.subarray(0, 5).toString()).toBe('%PDF-');
    const pages = (body.toString('latin1').match(/\/Type\s*\/Page(?!s)/g) ?? []).length;
    expect(await link.textContent()).toBe(`Download the calc sheet PDF (${pages} pages)`);
  }, 150_000);

  it('when the roller is taken away and the model is run again, then the run says unstable, names the joints, shows no forces, and the first run is out of date', async () => {
    await page.getByRole('tab', { name: 'Model & loads' }).click();
    // The takeoff's purlin picker may still be open below with its own joint L: take the main drawing's, which comes first.
    await page.getByRole('button', { name: /^Joint L at / }).first().click();
    await page.getByRole('radio', { name: 'None' }).click();
    await page.getByRole('button', { name: 'Done' }).click();
    await page.getByRole('button', { name: 'Save model' }).click();
    await page.getByText('Model save 3').waitFor({ timeout: 15_000 });

    await page.getByRole('tab', { name: 'Runs & results' }).click();
    await page.getByRole('button', { name: 'Run analysis' }).click();
    await page.getByText('Unstable: this truss cannot carry load as modelled.').waitFor({ timeout: 30_000 });
    expect(await page.getByText(/Joints that can move:/).isVisible()).toBe(true);
    expect(await page.getByText('Member forces', { exact: true }).count()).toBe(0);
    expect(await page.getByText('out of date: the model changed after this run', { exact: true }).count()).toBe(1);
  }, 60_000);
  it('when the engineer detaches the takeoff loads, then a confirmation says the takeoff will no longer update them, and after it they are edited by hand', async () => {
    await page.getByRole('tab', { name: 'Model & loads' }).click();
    await page.getByRole('tab', { name: 'Load cases & loads' }).click();
    const count = preview!.result.caseLoads.D1!.length;
    // Read-only: the roof loading's rows have no inputs, and say where they come from.
    expect(await page.getByRole('row', { name: /from the roof loading$/ }).count()).toBe(count);
    expect(await page.getByLabel('Load 1: Fy, kN').count()).toBe(0);

    await page.getByRole('button', { name: 'Detach and edit by hand' }).click();
    const dialog = page.getByRole('alertdialog', { name: 'Detach the loads of case D1' });
    await dialog.waitFor({ timeout: 10_000 });
    expect(await dialog.textContent()).toContain('The roof loading will no longer update the loads of case D1');
    await dialog.getByRole('button', { name: 'Detach' }).click();
    await page.getByText('Loads detached: edit them by hand now.').waitFor({ timeout: 15_000 });
    await page.getByText('Model save 4').waitFor({ timeout: 15_000 });
    expect(await page.getByRole('row', { name: /from the roof loading$/ }).count()).toBe(0);

    const fy = page.getByLabel('Load 1: Fy, kN');
    await fy.fill('-99');
    await page.getByRole('button', { name: 'Save model' }).click();
    await page.getByText('Model save 5').waitFor({ timeout: 15_000 });
    expect(await page.getByLabel('Load 1: Fy, kN').inputValue()).toBe('-99');
  }, 60_000);
});
