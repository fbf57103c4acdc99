import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import bcrypt from 'bcryptjs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Services } from '../../server/bootstrap';
import { OutboxMessage, SheetRevision, SheetRevisionEvent, User } from '../../server/db/models';
import { DEMO_PASSWORD } from '../../server/seed/demo';
import type { RunRef } from '../../server/modules/sheet-revisions/sheet-renderer';
import { sheetRevisionsRepository as reviewRepository } from '../../server/modules/sheet-revisions/sheet-revisions.repository';
import { dxf, line, zeroLengthOnly } from '../support/hostile-dxf';
import { demoEmail, signIn, startTestServices, type Tab } from '../support/test-services';
import { tinyPdfRenderer } from '../support/tiny-pdf';

/**
 * Choosing the checker on submitting, and "My work" (GET /api/me/work), through the API on a
 * real database file (and PostgreSQL in the postgres project). Runs come from a stub run source
 * as in review.test.ts; drawings are real uploads read by the real import.
 *
 * People: the demo four, a second reviewer (Priya Okafor), a second engineer, a disabled
 * reviewer and an invited reviewer who has not accepted yet.
 */

const RUNS: RunRef[] = [
  { id: 101, trussId: 1, status: 'solved' },
  { id: 102, trussId: 1, status: 'solved' },
  { id: 201, trussId: 2, status: 'solved' },
  { id: 202, trussId: 2, status: 'solved' },
];

let services: Services;
let dataDir: string;
const tab = {} as Record<'drafter' | 'engineer' | 'reviewer' | 'admin' | 'engineer2' | 'reviewer2', Tab>;
const id = {} as Record<'drafter' | 'engineer' | 'reviewer' | 'admin' | 'engineer2' | 'reviewer2' | 'disabled' | 'invited', number>;

const post = (t: Tab, url: string, body: object = {}) => t.agent.post(url).set('X-CSRF-Token', t.csrf).send(body);
const put = (t: Tab, url: string, body: object) => t.agent.put(url).set('X-CSRF-Token', t.csrf).send(body);
const work = async (t: Tab) => (await t.agent.get('/api/me/work').expect(200)).body;
const lastMailId = async () => ((await OutboxMessage.max('id')) as number | null) ?? 0;
async function mailsSince(after: number) {
  const rows = await OutboxMessage.findAll({ order: [['id', 'ASC']] });
  return rows.filter((m) => m.id > after).map((m) => ({ to: (JSON.parse(m.to) as string[]).sort(), subject: m.subject }));
}
/** The revision's row and audit log as stored, to show a refusal wrote nothing. */
async function stored(revisionId: number) {
  const row = (await SheetRevision.findByPk(revisionId, { raw: true }))!;
  const events = await SheetRevisionEvent.count({ where: { revisionId } });
  return { status: row.status, checkerId: row.checkerId, submittedAt: row.submittedAt, updatedAt: String(row.updatedAt), lastNote: row.lastNote, events };
}
const upload = (t: Tab, trussId: number, bytes: Buffer, name: string) =>
  t.agent.post(`/api/trusses/${trussId}/drawings`).set('X-CSRF-Token', t.csrf).attach('file', bytes, name);

beforeAll(async () => {
  dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'panelpoint-data-'));
  services = await startTestServices(
    { dataDir, maxUploadBytes: 256 * 1024 },
    { review: { renderer: tinyPdfRenderer(), runs: { findRun: async (runId) => RUNS.find((r) => r.id === runId) ?? null } } },
  );
  const hash = await bcrypt.hash(DEMO_PASSWORD, 4);
  await User.create({ email: 'second.reviewer@demo.panelpoint.test', name: 'Priya Okafor', role: 'reviewer', passwordHash: hash });
  await User.create({ email: 'second.engineer@demo.panelpoint.test', name: 'Tom Ashdown', role: 'engineer', passwordHash: hash });
  id.disabled = (await User.create({ email: 'gone.reviewer@demo.panelpoint.test', name: 'Olu Brandt', role: 'reviewer', passwordHash: hash, disabled: true })).id;
  id.invited = (await User.create({ email: 'new.reviewer@demo.panelpoint.test', name: 'Mira Lund', role: 'reviewer', passwordHash: null })).id;
  for (const role of ['drafter', 'engineer', 'reviewer', 'admin'] as const) {
    tab[role] = await signIn(services.app, demoEmail(role));
    id[role] = (await User.findOne({ where: { email: demoEmail(role) } }))!.id;
  }
  tab.reviewer2 = await signIn(services.app, 'second.reviewer@demo.panelpoint.test');
  tab.engineer2 = await signIn(services.app, 'second.engineer@demo.panelpoint.test');
  id.reviewer2 = (await User.findOne({ where: { email: 'second.reviewer@demo.panelpoint.test' } }))!.id;
  id.engineer2 = (await User.findOne({ where: { email: 'second.engineer@demo.panelpoint.test' } }))!.id;
});
afterAll(async () => {
  await services.shutdown();
  fs.rmSync(dataDir, { recursive: true, force: true });
});

describe('choosing the checker', () => {
  let a: number; // revision A of truss 1

  it('when an engineer asks who may check, then the active reviewers are listed by name, not the disabled or not yet joined ones, nor engineers', async () => {
    const res = await tab.engineer.agent.get('/api/checkers').expect(200);
    expect(res.body).toEqual([
      { id: id.reviewer2, name: 'Priya Okafor', email: 'second.reviewer@demo.panelpoint.test' },
      { id: id.reviewer, name: 'Rosa Quint', email: 'reviewer@demo.panelpoint.test' },
    ]);
  });

  it('when the preparer submits with no checker, themselves, an unknown id, a drafter, an engineer, a disabled or a not yet joined reviewer, then each gets one sentence (422) and nothing is written', async () => {
    a = (await post(tab.engineer, '/api/trusses/1/sheets', { runId: 101 }).expect(201)).body.id;
    const before = await stored(a);
    const mails = await lastMailId();
    const cases: [object, string, RegExp][] = [
      [{}, 'checker-missing', /^Choose the checker: the reviewer who will check this revision\.$/],
      [{ checkerId: id.engineer }, 'checker-self', /^You prepared this revision, so you cannot be its checker\. Choose a reviewer\.$/],
      [{ checkerId: 999999 }, 'checker-unknown', /^Nobody in the firm has the id 999999\. Choose the checker from the list of reviewers\.$/],
      [{ checkerId: id.drafter }, 'checker-not-reviewer', /^Dana Whitlock is a drafter, not a reviewer, so they cannot check sheets\. Choose a reviewer\.$/],
      [{ checkerId: id.engineer2 }, 'checker-not-reviewer', /^Tom Ashdown is an engineer, not a reviewer/],
      [{ checkerId: id.disabled }, 'checker-inactive', /^Olu Brandt's account is disabled\. Choose an active reviewer\.$/],
      [{ checkerId: id.invited }, 'checker-inactive', /^Mira Lund has not accepted the invitation yet\./],
    ];
    for (const [body, code, message] of cases) {
      const res = await post(tab.engineer, `/api/sheets/${a}/submit`, body);
      expect(res.status, code).toBe(422);
      expect(res.body.error.code).toBe(code);
      expect(res.body.error.message).toMatch(message);
      expect(await stored(a)).toEqual(before);
    }
    // Not a number at all: the field list of the validation (400), still nothing written.
    expect((await post(tab.engineer, `/api/sheets/${a}/submit`, { checkerId: 'Rosa' })).status).toBe(400);
    expect(await stored(a)).toEqual(before);
    expect(await lastMailId()).toBe(mails);
  });

  it('when the preparer submits choosing Rosa, then the revision names her as checker, only she is e-mailed, and only her My work lists it', async () => {
    const mails = await lastMailId();
    const res = await post(tab.engineer, `/api/sheets/${a}/submit`, { checkerId: id.reviewer, note: 'Ready for you' }).expect(200);
    expect(res.body).toMatchObject({ status: 'in-check', checker: { id: id.reviewer, name: 'Rosa Quint' }, checkedBy: null });
    expect(await mailsSince(mails)).toEqual([{ to: ['reviewer@demo.panelpoint.test'], subject: expect.stringContaining('revision A submitted for check') }]);

    const rosa = await work(tab.reviewer);
    expect(rosa.toCheck).toHaveLength(1);
    expect(rosa.toCheck[0]).toMatchObject({
      id: a,
      label: 'A',
      status: 'in-check',
      project: { jobNumber: 'HV-2417' },
      truss: { id: 1 },
      preparedBy: { id: id.engineer, name: 'Eli Marsh' },
      checker: { id: id.reviewer },
      openCommentCount: 0,
    });
    expect(rosa.total).toBe(1);
    const priya = await work(tab.reviewer2);
    expect(priya.toCheck).toEqual([]);
    expect(priya.total).toBe(0);
    // Lists a role has no part in are empty.
    const eli = await work(tab.engineer);
    expect(eli).toEqual({ toCheck: [], returnedToMe: [], readyToIssue: [], drawingsToFix: [], total: 0 });
  });

  it('when another reviewer tries to return or check it, then 403 names the checker and nothing is written', async () => {
    const before = await stored(a);
    for (const action of ['return', 'check']) {
      const res = await post(tab.reviewer2, `/api/sheets/${a}/${action}`, { note: 'mine now' });
      expect(res.status).toBe(403);
      expect(res.body.error.code).toBe('not-checker');
      expect(res.body.error.message).toBe('Revision A was sent to Rosa Quint to check, so only they can return it or mark it checked; an admin can hand it to you.');
    }
    expect(await stored(a)).toEqual(before);
  });

  it('when the checker returns it, then it leaves her list and is returned to the preparer, and only to him', async () => {
    await post(tab.reviewer, `/api/sheets/${a}/comments`, { anchor: 'reactions', body: 'State the reaction directions.' }).expect(201);
    await post(tab.reviewer, `/api/sheets/${a}/return`, { note: 'See the comment.' }).expect(200);
    expect((await work(tab.reviewer)).toCheck).toEqual([]);
    const eli = await work(tab.engineer);
    expect(eli.returnedToMe.map((r: { id: number }) => r.id)).toEqual([a]);
    expect(eli.returnedToMe[0]).toMatchObject({ status: 'returned', openCommentCount: 1 });
    expect(eli.total).toBe(1);
    expect((await work(tab.engineer2)).returnedToMe).toEqual([]);
  });

  let b: number;
  it('when the preparer starts the next revision, then A shows as replaced by B and leaves "returned to me"', async () => {
    b = (await post(tab.engineer, '/api/trusses/1/sheets', { runId: 102 }).expect(201)).body.id;
    const list = (await tab.drafter.agent.get('/api/trusses/1/sheets').expect(200)).body as { id: number; status: string; replacedBy: unknown }[];
    expect(list.find((r) => r.id === a)).toMatchObject({ status: 'returned', replacedBy: { id: b, label: 'B' } });
    expect(list.find((r) => r.id === b)).toMatchObject({ status: 'draft', replacedBy: null });
    expect((await tab.reviewer.agent.get(`/api/sheets/${a}`).expect(200)).body.replacedBy).toEqual({ id: b, label: 'B' });
    expect((await work(tab.engineer)).returnedToMe).toEqual([]);
  });

  it('when the chosen checker has turned "sent for checking" off, then nobody is e-mailed (not the other reviewers either), and once she checks it the preparer has it ready to issue', async () => {
    await put(tab.reviewer2, '/api/me/email-settings', { submitted: false }).expect(200);
    const mails = await lastMailId();
    await post(tab.engineer, `/api/sheets/${b}/submit`, { checkerId: id.reviewer2 }).expect(200);
    expect(await mailsSince(mails)).toEqual([]);
    expect((await work(tab.reviewer2)).toCheck.map((r: { id: number }) => r.id)).toEqual([b]);
    // The earlier comment is on A; resolve it so B can be marked checked.
    const thread = (await tab.engineer.agent.get(`/api/sheets/${b}`).expect(200)).body.comments[0].id;
    await tab.engineer.agent.patch(`/api/sheet-comments/${thread}`).set('X-CSRF-Token', tab.engineer.csrf).send({ resolved: true }).expect(200);
    await post(tab.reviewer2, `/api/sheets/${b}/check`).expect(200);
    const eli = await work(tab.engineer);
    expect(eli.readyToIssue.map((r: { id: number; label: string }) => `${r.id}:${r.label}`)).toEqual([`${b}:B`]);
    expect((await work(tab.engineer2)).readyToIssue).toEqual([]);
    await put(tab.reviewer2, '/api/me/email-settings', { submitted: true }).expect(200);
  });
});

describe('an admin hands a revision to another checker', () => {
  let c: number; // revision A of truss 2

  it('when the new checker could not have been chosen, or the revision is not in check, then one sentence and nothing written', async () => {
    c = (await post(tab.engineer, '/api/trusses/2/sheets', { runId: 201 }).expect(201)).body.id;
    const draft = await post(tab.admin, `/api/sheets/${c}/checker`, { checkerId: id.reviewer2 });
    expect(draft.status).toBe(409);
    expect(draft.body.error.message).toMatch(/only a revision in check can be given another checker/);
    await post(tab.engineer, `/api/sheets/${c}/submit`, { checkerId: id.reviewer }).expect(200);
    const before = await stored(c);
    const cases: [number, string][] = [
      [id.engineer, 'checker-self'],
      [id.drafter, 'checker-not-reviewer'],
      [999999, 'checker-unknown'],
      [id.disabled, 'checker-inactive'],
      [id.reviewer, 'checker-unchanged'],
    ];
    for (const [checkerId, code] of cases) {
      const res = await post(tab.admin, `/api/sheets/${c}/checker`, { checkerId });
      expect(res.status, code).toBe(422);
      expect(res.body.error.code).toBe(code);
    }
    expect(await stored(c)).toEqual(before);
    expect((await post(tab.engineer, `/api/sheets/${c}/checker`, { checkerId: id.reviewer2 })).status).toBe(403);
  });

  it('when the admin hands it to Priya, then she is e-mailed, it moves from Rosa\'s list to hers, the audit log says so, and Rosa can no longer act on it', async () => {
    const mails = await lastMailId();
    const res = await post(tab.admin, `/api/sheets/${c}/checker`, { checkerId: id.reviewer2, note: 'Rosa is away this week.' }).expect(200);
    expect(res.body).toMatchObject({ status: 'in-check', checker: { id: id.reviewer2, name: 'Priya Okafor' } });
    expect(res.body.events.at(-1)).toMatchObject({
      from: 'in-check',
      to: 'in-check',
      by: { name: 'Ada Fenn' },
      note: 'Checker changed from Rosa Quint to Priya Okafor. Rosa is away this week.',
    });
    expect(await mailsSince(mails)).toEqual([{ to: ['second.reviewer@demo.panelpoint.test'], subject: expect.stringContaining('submitted for check') }]);
    const text = (await OutboxMessage.findOne({ order: [['id', 'DESC']] }))!.text;
    expect(text).toContain('Eli Marsh submitted the calc sheet');
    expect(text).toContain('You are its checker: only you can return it or mark it checked.');
    expect(text).toContain('Note: Ada Fenn handed this revision to you to check. Rosa is away this week.');
    expect((await work(tab.reviewer)).toCheck).toEqual([]);
    expect((await work(tab.reviewer2)).toCheck.map((r: { id: number }) => r.id)).toEqual([c]);
    expect((await post(tab.reviewer, `/api/sheets/${c}/check`)).body.error.code).toBe('not-checker');
    // The sealed audit chain still verifies with the extra line.
    expect((await tab.admin.agent.get('/api/admin/audit-chain').expect(200)).body.ok).toBe(true);
    await post(tab.reviewer2, `/api/sheets/${c}/return`, { note: 'Back to you.' }).expect(200);
  });
});

describe('revisions submitted before checkers were chosen', () => {
  it('when a revision is in check without a checker, then every reviewer but its preparer has it to check and any of them may act', async () => {
    const d = (await post(tab.engineer, '/api/trusses/2/sheets', { runId: 202 }).expect(201)).body.id;
    // As the release before 0017 submitted: no checker column written.
    expect(await reviewRepository.transition(d, 'draft', 'in-check', id.engineer, 'old submit', { submittedAt: new Date() })).toBe(true);
    expect((await SheetRevision.findByPk(d))!.checkerId).toBeNull();
    for (const t of [tab.reviewer, tab.reviewer2]) {
      const row = (await work(t)).toCheck.find((r: { id: number }) => r.id === d);
      expect(row).toMatchObject({ checker: null });
    }
    await post(tab.reviewer2, `/api/sheets/${d}/check`).expect(200);
    expect((await work(tab.reviewer)).toCheck.find((r: { id: number }) => r.id === d)).toBeUndefined();
  });
});

describe('drawings with import problems', () => {
  // Truss 2 of the demo project has no drawing yet.
  const triangle = [line(0, 0, 4000, 0), line(4000, 0, 2000, 1500), line(2000, 1500, 0, 0)];

  it('when the newest drawing version of a truss failed to import, then the drafter has it to fix with its sentence; engineers and reviewers do not', async () => {
    const failed = await upload(tab.drafter, 2, zeroLengthOnly(), 'points-only.dxf');
    expect(failed.status).toBe(201);
    expect(failed.body.status).toBe('failed');
    const dana = await work(tab.drafter);
    const row = dana.drawingsToFix.find((d: { truss: { id: number } }) => d.truss.id === 2);
    expect(row).toMatchObject({ drawingId: failed.body.id, version: failed.body.version, status: 'failed', originalName: 'points-only.dxf', problems: [failed.body.error.message], problemCount: 1 });
    expect(dana.total).toBe(dana.drawingsToFix.length);
    expect((await work(tab.engineer)).drawingsToFix).toEqual([]);
    expect((await work(tab.reviewer)).drawingsToFix).toEqual([]);
  });

  it('when a newer version imports with a warning (a member with a free end), then that version is listed with the report\'s warning, and a clean version takes the truss off the list', async () => {
    // A fourth line sticking out of the triangle: one end joins nothing.
    const warned = await upload(tab.drafter, 2, dxf([...triangle, line(4000, 0, 5000, -800)]), 'with-tail.dxf');
    expect(warned.body.status).toBe('imported');
    const warnings = (warned.body.result.report as { severity: string; message: string }[]).filter((e) => e.severity === 'warning').map((e) => e.message);
    expect(warnings.length).toBeGreaterThan(0);
    const row = (await work(tab.drafter)).drawingsToFix.find((d: { truss: { id: number } }) => d.truss.id === 2);
    expect(row).toMatchObject({ drawingId: warned.body.id, status: 'imported', problems: warnings.slice(0, 5), problemCount: warnings.length });

    const clean = await upload(tab.drafter, 2, dxf(triangle), 'triangle.dxf');
    expect(clean.body.status).toBe('imported');
    expect((clean.body.result.report as { severity: string; message: string }[]).filter((e) => e.severity === 'warning').map((e) => e.message)).toEqual([]);
    expect((await work(tab.drafter)).drawingsToFix.find((d: { truss: { id: number } }) => d.truss.id === 2)).toBeUndefined();
  });
});
