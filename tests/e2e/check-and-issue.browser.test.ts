import { execFileSync } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { OutboxMessage } from '../../server/db/models';
import { launchBrowser, startRunningApp, type RunningApp } from '../support/browser';
import { stepLabel } from '../../src/features/sheet-revisions/utils/step-anchor';

// The whole check-and-issue loop on the demo project's T2 (which has no drawing yet), driven
// through the built app in Chromium by three people, each in a browser context of their own.

const SHOTS = '/tmp/shots-e2e';
const PASSWORD = 'panelpoint-demo';
const DRAFTER = 'drafter@demo.panelpoint.test';
const ENGINEER = 'engineer@demo.panelpoint.test';
const REVIEWER = 'reviewer@demo.panelpoint.test';

/**
 * A king-post truss drawn in mm ($INSUNITS = 4): span 8000, rise 2000, written by hand in the
 * DXF group-code format (DXF Reference, Autodesk). Four joints, five members, so a pin and a
 * roller make it statically determinate (m + r = 5 + 3 = 2j).
 */
function kingPostDxf(): string {
  const line = (x1: number, y1: number, x2: number, y2: number) =>
    ['0', 'LINE', '8', 'TRUSS', '10', x1, '20', y1, '30', '0', '11', x2, '21', y2, '31', '0'];
  const groups = [
    ['0', 'SECTION', '2', 'HEADER', '9', '$ACADVER', '1', 'AC1009', '9', '$INSUNITS', '70', '4', '0', 'ENDSEC'],
    ['0', 'SECTION', '2', 'ENTITIES'],
    line(0, 0, 4000, 0),
    line(4000, 0, 8000, 0),
    line(0, 0, 4000, 2000),
    line(4000, 2000, 8000, 0),
    line(4000, 0, 4000, 2000),
    ['0', 'ENDSEC', '0', 'EOF'],
  ];
  return `${groups.flat().join('\n')}\n`;
}

/**
 * Rafter force of the king-post truss above under a single apex load P (kN, down), by the
 * method of joints at a bearing (Hibbeler, Engineering Mechanics: Statics, §6.2): the
 * reaction is P/2 by symmetry, and ΣFy = 0 gives F·sin θ = −P/2 with sin θ = 2/√(4² + 2²).
 * Negative is compression. Printed as the sheet prints it: two decimals, a true minus sign.
 */
function rafterForceText(p: number): string {
  const force = -(p / 2) / (2 / Math.hypot(4, 2));
  return `${force < 0 ? '\u2212' : ''}${Math.abs(force).toFixed(2)}`;
}

let running: RunningApp;
let browser: Browser;
let drafter: Page;
let engineer: Page;
let reviewer: Page;
let trussUrl = '';
let revisionAUrl = '';
let revisionBUrl = '';
let commentText = '';
let pdfPath = '';

beforeAll(async () => {
  fs.mkdirSync(SHOTS, { recursive: true });
  running = await startRunningApp();
  browser = await launchBrowser();
  const pageFor = async () => (await browser.newContext({ viewport: { width: 1360, height: 1000 }, acceptDownloads: true })).newPage();
  [drafter, engineer, reviewer] = await Promise.all([pageFor(), pageFor(), pageFor()]);
}, 180_000);

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

/** Opens a joint's popover by its coordinates in m (the drawing's buttons name them). */
async function openJoint(page: Page, x: number, y: number) {
  const at = `\\(${x.toFixed(3)}, ${y.toFixed(3)}\\)`;
  await page.getByRole('button', { name: new RegExp(`^Joint \\S+ at ${at}`) }).click();
  const popover = page.getByRole('dialog', { name: /^Joint / });
  await popover.waitFor();
  return popover;
}

/** Sets the apex load of case D1 (gravity, kN) through the joint popover, replacing any earlier one. */
async function setApexLoad(page: Page, fy: number): Promise<void> {
  const popover = await openJoint(page, 4, 2);
  const remove = popover.getByRole('button', { name: /^Remove the D1 load/ });
  if ((await remove.count()) > 0) await remove.click();
  const caseSelect = popover.getByLabel('Load case');
  if ((await caseSelect.inputValue()) !== 'D1') await caseSelect.selectOption('new:dead');
  await popover.getByLabel('Fy, kN (negative is down)').fill(String(fy));
  await popover.getByRole('button', { name: 'Add load' }).click();
  await popover.getByText(`Fy ${fy} kN`).waitFor();
  await popover.getByRole('button', { name: 'Done' }).click();
}

async function saveModel(page: Page): Promise<void> {
  await page.getByRole('button', { name: 'Save model' }).click();
  await page.getByText('Unsaved changes').waitFor({ state: 'detached', timeout: 15_000 });
}

/** Runs the saved model and waits until this run is solved; returns the run's number within the truss. */
async function runAnalysis(page: Page): Promise<number> {
  await page.getByRole('tab', { name: 'Runs & results' }).click();
  const [response] = await Promise.all([
    page.waitForResponse((r) => r.request().method() === 'POST' && /\/api\/trusses\/\d+\/runs$/.test(r.url())),
    page.getByRole('button', { name: 'Run analysis' }).click(),
  ]);
  const { number } = (await response.json()) as { id: number; number: number };
  const row = page.locator('tr', { has: page.getByRole('button', { name: `Run ${number}`, exact: true }) });
  await row.getByText('Solved', { exact: true }).waitFor({ timeout: 30_000 });
  await page.getByText('Stable and statically determinate.').waitFor({ timeout: 15_000 });
  return number;
}

/** Starts the next revision from the newest solved run on the truss's Calc sheets tab; returns the sheet's address. */
async function newRevision(page: Page, runNumber: number): Promise<string> {
  await page.goto(`${trussUrl}?tab=sheets`);
  const start = page.getByRole('button', { name: `New revision from Run ${runNumber}` });
  await start.waitFor({ timeout: 15_000 });
  await start.click();
  await page.waitForURL(/\/sheets\/\d+$/);
  return page.url();
}

/** Makes a review move through the sheet's buttons: the button, then its confirm box (submitting names the demo reviewer as checker). */
async function move(page: Page, label: string, note?: string): Promise<void> {
  await page.getByRole('button', { name: label, exact: true }).first().click();
  if (label === 'Submit for check') await page.getByLabel('Checker').selectOption({ label: `Rosa Quint (${REVIEWER})` });
  if (note !== undefined) await page.getByLabel(/Why it goes back|Note for the audit log/).fill(note);
  await page.getByRole('button', { name: label, exact: true }).last().click();
}

async function waitForStatus(page: Page, status: string, timeout = 15_000): Promise<void> {
  await page.getByRole('heading', { name: new RegExp(`Calc sheet, revision [A-Z]+\\s*${status}`) }).waitFor({ timeout });
}

/** The preview frame, once the calc sheet inside it has laid out. */
async function readyPreview(page: Page) {
  await page.getByText('Laying out the calc sheet…').waitFor({ state: 'detached', timeout: 30_000 });
  return page.frameLocator('iframe[title="Calc sheet preview"]');
}

describe('check and issue: from a drafter’s DXF to a verified issued PDF, in Chromium', () => {
  it('when the drafter uploads a king-post truss to T2, then the drawing becomes the truss', async () => {
    await signIn(drafter, DRAFTER);
    await drafter.getByRole('link', { name: 'HV-2417' }).click();
    await drafter.getByRole('link', { name: /^T2/ }).first().click();
    await drafter.waitForURL(/\/trusses\/\d+/);
    trussUrl = drafter.url().replace(/[?#].*$/, '');
    await drafter.getByText(/Drop the truss’s DXF drawing here/).waitFor({ timeout: 15_000 });
    await drafter.getByLabel('DXF file').setInputFiles({ name: 't2-king-post.dxf', mimeType: 'application/dxf', buffer: Buffer.from(kingPostDxf()) });
    await drafter.getByRole('img', { name: 'Truss drawing: 4 joints, 5 members' }).waitFor({ timeout: 20_000 });
    await drafter.screenshot({ path: path.join(SHOTS, '1-drafter-upload.png') });
  }, 60_000);

  it('when the engineer puts bearings and an apex load on it, runs it and starts revision A, then A can be submitted for check', async () => {
    await signIn(engineer, ENGINEER);
    await engineer.goto(trussUrl);
    await engineer.getByRole('tab', { name: 'Model & loads' }).click();

    const left = await openJoint(engineer, 0, 0);
    await left.getByRole('radio', { name: 'Pin' }).click();
    await left.getByRole('button', { name: 'Done' }).click();
    const right = await openJoint(engineer, 8, 0);
    await right.getByRole('radio', { name: 'Roller' }).click();
    await right.getByRole('button', { name: 'Done' }).click();
    await setApexLoad(engineer, -12);
    await saveModel(engineer);

    const runA = await runAnalysis(engineer);
    revisionAUrl = await newRevision(engineer, runA);
    await waitForStatus(engineer, 'Draft');
    const sheet = await readyPreview(engineer);
    // The sheet's largest compression is the rafter AB (left bearing B, apex A): −6√5 kN for 12 kN.
    await sheet.getByText(`AB: ${rafterForceText(12)}`).first().waitFor({ timeout: 15_000 });
    await engineer.screenshot({ path: path.join(SHOTS, '2-engineer-draft-A.png') });

    await move(engineer, 'Submit for check');
    await waitForStatus(engineer, 'In check');
    expect(await engineer.getByRole('button', { name: 'Submit for check' }).count()).toBe(0);
  }, 120_000);

  it('when the reviewer comments on a step and returns A with a note, then A shows the open comment to the engineer', async () => {
    await signIn(reviewer, REVIEWER);
    await reviewer.goto(revisionAUrl);
    await waitForStatus(reviewer, 'In check');
    const sheet = await readyPreview(reviewer);
    // The reviewer queries the reaction at a bearing.
    const step = sheet.locator('.step[id*="/reaction-"]').first();
    const anchor = (await step.getAttribute('id'))!;
    expect(anchor).not.toBe('');
    // Comments are labelled with the step's heading as the sheet prints it.
    const label = stepLabel(anchor, { [anchor]: (await step.locator('h4 a.anchor').innerText()).trim() });
    await step.click();
    commentText = 'The reactions rest on a 12 kN apex load: say where it comes from (roof weight × purlin spacing), or use the roof loading.';
    await reviewer.getByText(`New comment on ${label}`).waitFor();
    await reviewer.getByLabel('What should the preparer look at here?').fill(commentText);
    await reviewer.getByRole('button', { name: 'Comment', exact: true }).click();
    await reviewer.getByRole('region', { name: `Comments on ${label}` }).getByText(commentText).waitFor({ timeout: 15_000 });

    // Marking it checked waits on the open thread; returning needs a note.
    expect(await reviewer.getByRole('button', { name: 'Mark checked' }).isDisabled()).toBe(true);
    await reviewer.getByRole('button', { name: 'Return to the preparer' }).first().click();
    await reviewer.getByRole('button', { name: 'Return to the preparer' }).last().click();
    await reviewer.getByText('Say why it goes back: the preparer reads this first.').waitFor();
    await reviewer.getByLabel('Why it goes back').fill('One open comment on the loads.');
    await reviewer.getByRole('button', { name: 'Return to the preparer' }).last().click();
    await waitForStatus(reviewer, 'Returned');
    await readyPreview(reviewer);
    await reviewer.screenshot({ path: path.join(SHOTS, '3-reviewer-returned-A.png') });

    await engineer.goto(revisionAUrl);
    await waitForStatus(engineer, 'Returned');
    const open = engineer.getByRole('region', { name: 'Open comments' });
    await open.waitFor();
    expect(await open.getByRole('heading').innerText()).toBe('Returned with 1 open comment');
    expect(await open.getByText(commentText).count()).toBe(1);
    // The step's heading replaces its id once the sheet preview has loaded.
    await open.getByText(label, { exact: true }).waitFor({ timeout: 30_000 });
    expect(await open.getByText(label, { exact: true }).count()).toBe(1);
    expect(await engineer.getByText('One open comment on the loads.').count()).toBeGreaterThan(0); // the note, in the audit log
  }, 120_000);

  it('when the engineer changes the load, runs again, starts B and resolves the comment there, then B goes to check with nothing open', async () => {
    await engineer.goto(`${trussUrl}?tab=model`);
    await engineer.getByRole('tab', { name: 'Model & loads' }).click();
    await setApexLoad(engineer, -15);
    await saveModel(engineer);
    const runB = await runAnalysis(engineer);
    revisionBUrl = await newRevision(engineer, runB);
    expect(revisionBUrl).not.toBe(revisionAUrl);
    await waitForStatus(engineer, 'Draft');
    expect(await engineer.getByRole('heading', { name: /Calc sheet, revision B/ }).count()).toBe(1);
    const sheetB = await readyPreview(engineer);
    await sheetB.getByText(`AB: ${rafterForceText(15)}`).first().waitFor({ timeout: 15_000 });

    // The thread made on A is on B too, marked as from A, and can be resolved here.
    const comments = engineer.getByRole('complementary', { name: 'Comments' });
    const thread = comments.locator('article', { hasText: commentText });
    await thread.waitFor({ timeout: 15_000 });
    expect(await thread.getByText('from rev. A').count()).toBe(1);
    expect(await thread.getByText('Open', { exact: true }).count()).toBe(1);
    await thread.getByRole('button', { name: 'Mark resolved' }).click();
    await thread.getByText('Resolved by Eli Marsh', { exact: false }).waitFor({ timeout: 15_000 });
    expect(await thread.getByText('Resolved', { exact: true }).count()).toBe(1);
    await engineer.screenshot({ path: path.join(SHOTS, '4-engineer-B-resolved.png') });

    await move(engineer, 'Submit for check');
    await waitForStatus(engineer, 'In check');
  }, 120_000);

  it('when the reviewer marks B checked and the engineer issues it, then the issued PDF downloads and the verify page accepts it', async () => {
    await reviewer.goto(revisionBUrl);
    await waitForStatus(reviewer, 'In check');
    const check = reviewer.getByRole('button', { name: 'Mark checked' }).first();
    await expect.poll(() => check.isEnabled(), { timeout: 10_000 }).toBe(true);
    await move(reviewer, 'Mark checked');
    await waitForStatus(reviewer, 'Checked');

    await engineer.goto(revisionBUrl);
    await waitForStatus(engineer, 'Checked');
    await move(engineer, 'Issue', 'Issued for construction.');
    await waitForStatus(engineer, 'Issued', 90_000);
    await readyPreview(engineer);
    await engineer.screenshot({ path: path.join(SHOTS, '5-engineer-issued-B.png'), fullPage: true });

    const [download] = await Promise.all([engineer.waitForEvent('download'), engineer.getByRole('link', { name: 'Download issued PDF' }).click()]);
    pdfPath = path.join(running.dataDir, 'downloaded-issued.pdf');
    await download.saveAs(pdfPath);
    const bytes = fs.readFileSync(pdfPath);
    expect(bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    // The fingerprint on the page is the SHA-256 of the bytes we downloaded (FIPS 180-4, by node:crypto).
    const sha256 = crypto.createHash('sha256').update(bytes).digest('hex');
    const shown = (await engineer.getByText(/^[0-9a-f]{64}$/).first().innerText()).trim();
    expect(shown).toBe(sha256);
    // The PDF itself carries the filled signature block and the revised load's rafter force.
    const text = execFileSync('pdftotext', ['-layout', pdfPath, '-'], { encoding: 'utf8' });
    for (const name of ['Eli Marsh', 'Rosa Quint']) expect(text).toContain(name);
    expect(text).toContain(`AB: ${rafterForceText(15)}`);

    // The archive lists it, found by the truss's name, with the same fingerprint.
    await engineer.getByRole('link', { name: 'Archive', exact: true }).click();
    await engineer.waitForURL(/\/archive/);
    await engineer.getByLabel('Search the archive').fill('gable end');
    const row = engineer.locator('tr', { has: engineer.getByRole('link', { name: 'T2 — gable end truss' }) });
    await row.getByRole('link', { name: 'B', exact: true }).waitFor({ timeout: 15_000 });
    expect(await row.count()).toBe(1);
    expect(await row.locator('code').innerText()).toBe(sha256.slice(0, 12));
    expect(await row.getByText('Eli Marsh / Rosa Quint').count()).toBe(1);
    await engineer.screenshot({ path: path.join(SHOTS, '6-archive.png') });

    // Drop the file on the verify page, as a person drags it from their downloads.
    await engineer.getByRole('link', { name: 'Verify a PDF →' }).click();
    await engineer.waitForURL(/\/verify$/);
    const zone = engineer.getByText('Drop a calc sheet PDF here').locator('..');
    const dataTransfer = await engineer.evaluateHandle((b64) => {
      const raw = Uint8Array.from(atob(b64), (c) => c.charCodeAt(0));
      const dt = new DataTransfer();
      dt.items.add(new File([raw], 'HV-2417-T2-rev-B.pdf', { type: 'application/pdf' }));
      return dt;
    }, bytes.toString('base64'));
    await zone.dispatchEvent('drop', { dataTransfer });

    const result = engineer.getByRole('region', { name: 'Verification result' });
    await result.waitFor({ timeout: 20_000 });
    const verdict = await result.locator('p').first().innerText();
    expect(verdict).toMatch(/^This PDF is the issued calc sheet HV-2417 .* T2 .*revision B, issued \d{4}-\d{2}-\d{2}; the signature record is intact\.$/);
    expect(await result.getByText('Matches an issued sheet').count()).toBe(1);
    expect(await result.getByText('Signature record intact').count()).toBe(1);
    expect(await result.getByText('File on record intact').count()).toBe(1);
    expect(await result.getByText('Current', { exact: true }).count()).toBe(1);
    expect(await result.getByText(sha256, { exact: false }).count()).toBe(1);
    await engineer.screenshot({ path: path.join(SHOTS, '7-verify-accepted.png') });
  }, 150_000);

  it('when the flow is done, then the local SMTP sink holds each move’s e-mail with the right recipients', async () => {
    type Mail = { subject: string; to: string[] };
    const mails = async (): Promise<Mail[]> =>
      (await OutboxMessage.findAll({ order: [['id', 'ASC']] }))
        .filter((m) => m.subject.includes('T2'))
        .map((m) => ({ subject: m.subject, to: (JSON.parse(m.to) as string[]).map((a) => a.toLowerCase()).sort() }));
    await expect.poll(async () => (await mails()).length, { timeout: 15_000 }).toBe(5);
    const got = (await mails()).map((m) => ({ what: m.subject.replace(/^.*revision /, ''), to: m.to }));
    // Who hears of each move, as issues 7 and 15 set it: submitted → the chosen checker; returned or
    // checked → the preparer; issued → the project's people (drawing uploaders, preparers, checkers).
    expect(got).toEqual([
      { what: 'A submitted for check', to: [REVIEWER] },
      { what: 'A returned with comments', to: [ENGINEER] },
      { what: 'B submitted for check', to: [REVIEWER] },
      { what: 'B checked', to: [ENGINEER] },
      { what: 'B issued', to: [DRAFTER, ENGINEER, REVIEWER].sort() },
    ]);
  }, 30_000);
});
