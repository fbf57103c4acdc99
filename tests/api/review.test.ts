import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import bcrypt from 'bcryptjs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Services } from '../../server/bootstrap';
import { OutboxMessage, SheetRevision, User } from '../../server/db/models';
import { DEMO_PASSWORD } from '../../server/seed/demo';
import type { RunRef } from '../../server/modules/sheet-revisions/sheet-renderer';
import { recordsRepository } from '../../server/modules/records/records.repository';
import { sheetRevisionsRepository as reviewRepository } from '../../server/modules/sheet-revisions/sheet-revisions.repository';
import { demoEmail, dropGuard, signIn, startTestServices, type Tab } from '../support/test-services';
import { tinyPdf, tinyPdfRenderer } from '../support/tiny-pdf';

/**
 * The check-and-issue workflow through the API, role by role. Analysis runs come from a stub
 * run source (the workflow only needs a run's truss and status); PDFs from a renderer that
 * writes a real, small PDF with the signature block in it.
 */

// Demo data: project 1 "HV-2417", truss 1 (T1, with the drafter's drawing) and truss 2 (T2).
const RUNS: RunRef[] = [
  { id: 101, trussId: 1, status: 'solved' },
  { id: 102, trussId: 1, status: 'solved' },
  { id: 103, trussId: 1, status: 'unstable' },
  { id: 201, trussId: 2, status: 'solved' },
];

let services: Services;
const renderer = tinyPdfRenderer();
const tab = {} as Record<'drafter' | 'engineer' | 'reviewer' | 'admin' | 'engineer2' | 'reviewer2', Tab>;
let dataDir: string;

const sheetFiles = () => {
  const dir = path.join(dataDir, 'issued-sheets');
  return fs.existsSync(dir) ? fs.readdirSync(dir).sort() : [];
};
const post = (t: Tab, url: string, body: object = {}) => t.agent.post(url).set('X-CSRF-Token', t.csrf).send(body);
const patch = (t: Tab, url: string, body: object) => t.agent.patch(url).set('X-CSRF-Token', t.csrf).send(body);
const binary = (t: Tab, url: string) =>
  t.agent
    .get(url)
    .buffer(true)
    .parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    });
const verify = (t: Tab, bytes: Buffer, name = 'sheet.pdf') => t.agent.post('/api/archive/verify').set('X-CSRF-Token', t.csrf).attach('file', bytes, name);
/** The SQLite message of a refused raw statement (Sequelize wraps a trigger's RAISE as a validation error). */
async function rawRefusal(sql: string): Promise<string> {
  try {
    await services.sequelize.query(sql);
  } catch (err) {
    const e = err as { parent?: { message?: string }; message: string };
    return e.parent?.message ?? e.message;
  }
  return 'not refused';
}
const userIdOf = async (email: string) => (await User.findOne({ where: { email } }))!.id;
const sha = (b: Buffer) => crypto.createHash('sha256').update(b).digest('hex');

async function mailsSince(id: number) {
  const rows = await OutboxMessage.findAll({ order: [['id', 'ASC']] });
  return rows.filter((m) => m.id > id).map((m) => ({ to: (JSON.parse(m.to) as string[]).sort(), subject: m.subject, text: m.text }));
}
const lastMailId = async () => ((await OutboxMessage.max('id')) as number | null) ?? 0;

beforeAll(async () => {
  dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'panelpoint-data-'));
  services = await startTestServices(
    { dataDir, maxUploadBytes: 64 * 1024 },
    { review: { renderer, runs: { findRun: async (id) => RUNS.find((r) => r.id === id) ?? null } } },
  );
  const hash = await bcrypt.hash(DEMO_PASSWORD, 4);
  await User.create({ email: 'second.reviewer@demo.panelpoint.test', name: 'Priya Okafor', role: 'reviewer', passwordHash: hash });
  await User.create({ email: 'second.engineer@demo.panelpoint.test', name: 'Tom Ashdown', role: 'engineer', passwordHash: hash });
  for (const role of ['drafter', 'engineer', 'reviewer', 'admin'] as const) tab[role] = await signIn(services.app, demoEmail(role));
  tab.reviewer2 = await signIn(services.app, 'second.reviewer@demo.panelpoint.test');
  tab.engineer2 = await signIn(services.app, 'second.engineer@demo.panelpoint.test');
});
afterAll(async () => {
  await services.shutdown();
  fs.rmSync(dataDir, { recursive: true, force: true });
});

describe('check, sign and archive', () => {
  let a: number; // revision A of truss 1, returned
  let b: number; // revision B of truss 1, issued then superseded
  let c: number; // revision C of truss 1, issued
  let threadId: number;
  let pdfB: Buffer;
  let pdfC: Buffer;

  it('when a revision is started from a run that is not a solved run of the truss, or by a non-engineer, then it is refused', async () => {
    expect((await post(tab.engineer, '/api/trusses/1/sheets', { runId: 103 })).body.error.code).toBe('run-not-solved');
    expect((await post(tab.engineer, '/api/trusses/1/sheets', { runId: 201 })).body.error.code).toBe('run-of-other-truss');
    expect((await post(tab.engineer, '/api/trusses/1/sheets', { runId: 999 })).status).toBe(422);
    expect((await post(tab.engineer, '/api/trusses/1/sheets', { runId: 'x' })).status).toBe(400);
    expect((await post(tab.drafter, '/api/trusses/1/sheets', { runId: 101 })).status).toBe(403);
    expect((await post(tab.reviewer, '/api/trusses/1/sheets', { runId: 101 })).status).toBe(403);
    expect(await SheetRevision.count()).toBe(0);
  });

  it('when an engineer starts a revision, then it is draft A with a creation line in the audit log', async () => {
    const res = await post(tab.engineer, '/api/trusses/1/sheets', { runId: 101, note: 'first issue for check' });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ number: 1, label: 'A', status: 'draft', runId: 101, preparedBy: { name: 'Eli Marsh' }, project: { jobNumber: 'HV-2417' } });
    expect(res.body.events).toHaveLength(1);
    expect(res.body.events[0]).toMatchObject({ from: null, to: 'draft', by: { name: 'Eli Marsh' }, note: 'first issue for check' });
    a = res.body.id;
  });

  it('when a draft is checked, returned or issued out of order, then 409 names its current status', async () => {
    for (const [who, action] of [['reviewer', 'check'], ['reviewer', 'return'], ['engineer', 'issue']] as const) {
      const res = await post(tab[who], `/api/sheets/${a}/${action}`);
      expect(res.status).toBe(409);
      expect(res.body.error.code).toBe('sheet-status-conflict');
      expect(res.body.error.message).toMatch(/is a draft/);
    }
  });

  it('when someone other than the preparer submits, then it is refused by person or by role', async () => {
    expect((await post(tab.engineer2, `/api/sheets/${a}/submit`)).body.error.code).toBe('not-preparer');
    expect((await post(tab.reviewer, `/api/sheets/${a}/submit`)).status).toBe(403);
    expect((await post(tab.drafter, `/api/sheets/${a}/submit`)).status).toBe(403);
    expect((await SheetRevision.findByPk(a))!.status).toBe('draft');
  });

  it('when the preparer submits choosing a checker, then it is in check with that checker and only the checker gets an e-mail naming job, project, truss, revision and link', async () => {
    const before = await lastMailId();
    const res = await post(tab.engineer, `/api/sheets/${a}/submit`, { checkerId: await userIdOf('second.reviewer@demo.panelpoint.test') });
    expect(res.status).toBe(200);
    expect(res.body.status).toBe('in-check');
    expect(res.body.checker).toMatchObject({ name: 'Priya Okafor' });
    const mails = await mailsSince(before);
    expect(mails).toHaveLength(1);
    expect(mails[0].to).toEqual(['second.reviewer@demo.panelpoint.test']);
    expect(mails[0].subject).toContain('HV-2417');
    expect(mails[0].subject).toContain('Kestrel Logistics');
    expect(mails[0].subject).toContain('T1');
    expect(mails[0].subject).toContain('revision A submitted for check');
    expect(mails[0].text).toContain(`http://panelpoint.test/sheets/${a}`);
  });

  it('when a reviewer comments on a step and the engineer replies, then the thread hangs off the step with its revision', async () => {
    const comment = await post(tab.reviewer, `/api/sheets/${a}/comments`, { anchor: 'case-D/joint-C', body: 'Check the sign of the purlin load here.' });
    expect(comment.status).toBe(201);
    expect(comment.body).toMatchObject({ anchor: 'case-D/joint-C', revisionLabel: 'A', resolved: false, author: { name: 'Rosa Quint' } });
    threadId = comment.body.id;
    const reply = await post(tab.engineer, `/api/sheets/${a}/comments`, { parentId: threadId, body: 'Will flip it in the next revision.' });
    expect(reply.status).toBe(201);
    expect(reply.body).toMatchObject({ parentId: threadId, anchor: 'case-D/joint-C' });
    expect((await post(tab.drafter, `/api/sheets/${a}/comments`, { anchor: 'x', body: 'y' })).status).toBe(403);
    expect((await post(tab.reviewer, `/api/sheets/${a}/comments`, { body: 'no anchor' })).status).toBe(400);
  });

  it('when a reviewer returns it, then only the preparer is told and the revision lists its open comments', async () => {
    const before = await lastMailId();
    const res = await post(tab.reviewer2, `/api/sheets/${a}/return`, { note: 'See joint C.' });
    expect(res.status).toBe(200);
    expect(res.body.status).toBe('returned');
    expect(res.body.openCommentIds).toEqual([threadId]);
    expect(res.body.comments[0].replies).toHaveLength(1);
    expect(res.body.events.map((e: { to: string }) => e.to)).toEqual(['draft', 'in-check', 'returned']);
    expect(res.body.events[2]).toMatchObject({ from: 'in-check', by: { name: 'Priya Okafor' }, note: 'See joint C.' });
    const mails = await mailsSince(before);
    expect(mails.map((m) => m.to)).toEqual([['engineer@demo.panelpoint.test']]);
    expect(mails[0].subject).toContain('revision A returned');
    // A returned revision does not go back into check.
    expect((await post(tab.engineer, `/api/sheets/${a}/submit`)).status).toBe(409);
  });

  it('when the next revision is made, then it shows the earlier comment, which the engineer resolves', async () => {
    const res = await post(tab.engineer, '/api/trusses/1/sheets', { runId: 102 });
    expect(res.body).toMatchObject({ number: 2, label: 'B', status: 'draft' });
    b = res.body.id;
    expect(res.body.comments).toHaveLength(1);
    expect(res.body.comments[0]).toMatchObject({ id: threadId, revisionLabel: 'A', resolved: false });
    const resolved = await patch(tab.engineer, `/api/sheet-comments/${threadId}`, { resolved: true });
    expect(resolved.status).toBe(200);
    expect(resolved.body).toMatchObject({ resolved: true, resolvedBy: { name: 'Eli Marsh' } });
    const view = await tab.reviewer.agent.get(`/api/sheets/${b}`).expect(200);
    expect(view.body.comments[0]).toMatchObject({ revisionLabel: 'A', resolved: true });
    expect(view.body.openCommentIds).toEqual([]);
    const list = await tab.drafter.agent.get('/api/trusses/1/sheets').expect(200);
    expect(list.body.map((r: { label: string; status: string }) => `${r.label}:${r.status}`)).toEqual(['B:draft', 'A:returned']);
  });

  it('when the preparer is made a reviewer, then they still cannot check their own revision', async () => {
    await post(tab.engineer, `/api/sheets/${b}/submit`, { checkerId: await userIdOf(demoEmail('reviewer')) }).expect(200);
    const engineerId = (await User.findOne({ where: { email: demoEmail('engineer') } }))!.id;
    await patch(tab.admin, `/api/users/${engineerId}`, { role: 'reviewer' }).expect(200);
    try {
      const res = await post(tab.engineer, `/api/sheets/${b}/check`);
      expect(res.status).toBe(403);
      expect(res.body.error.code).toBe('own-sheet');
      expect((await post(tab.engineer, `/api/sheets/${b}/return`)).body.error.code).toBe('own-sheet');
    } finally {
      await patch(tab.admin, `/api/users/${engineerId}`, { role: 'engineer' }).expect(200);
    }
  });

  it('when a thread is open, then the revision cannot be checked until it is resolved', async () => {
    const open = await post(tab.reviewer, `/api/sheets/${b}/comments`, { anchor: 'reactions', body: 'State the support reaction directions.' });
    const refused = await post(tab.reviewer, `/api/sheets/${b}/check`);
    expect(refused.status).toBe(409);
    expect(refused.body.error.code).toBe('open-comments');
    expect(refused.body.error.message).toContain('reactions');
    await patch(tab.reviewer, `/api/sheet-comments/${open.body.id}`, { resolved: true }).expect(200);
  });

  it('when a reviewer checks it, then the preparer is told, and neither a reviewer nor a drafter can issue it', async () => {
    const before = await lastMailId();
    const res = await post(tab.reviewer, `/api/sheets/${b}/check`, { note: 'Agreed.' });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ status: 'checked', checkedBy: { name: 'Rosa Quint' } });
    const mails = await mailsSince(before);
    expect(mails.map((m) => m.to)).toEqual([['engineer@demo.panelpoint.test']]);
    expect(mails[0].subject).toContain('revision B checked');
    expect((await post(tab.reviewer, `/api/sheets/${b}/issue`)).status).toBe(403);
    expect((await post(tab.drafter, `/api/sheets/${b}/issue`)).status).toBe(403);
    expect((await post(tab.admin, `/api/sheets/${b}/issue`)).status).toBe(403);
    expect((await tab.engineer.agent.get(`/api/sheets/${b}/pdf`)).body.error.code).toBe('sheet-not-issued');
  });

  it('when an engineer issues it, then the signed PDF is archived with its SHA-256 and a firm signature that verifies with the public key', async () => {
    const before = await lastMailId();
    const res = await post(tab.engineer, `/api/sheets/${b}/issue`);
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ status: 'issued', issuedBy: { name: 'Eli Marsh' } });

    // The renderer was asked for the signature block with the three names and roles.
    const call = renderer.calls.at(-1)!;
    expect(call).toMatchObject({ runId: 102, revisionLabel: 'B' });
    expect(call.signatures).toMatchObject({
      preparedBy: { name: 'Eli Marsh', role: 'Prepared by' },
      checkedBy: { name: 'Rosa Quint', role: 'Checked by' },
      issuedBy: { name: 'Eli Marsh', role: 'Issued by' },
    });

    // The archive serves the exact bytes; their SHA-256 (node:crypto) is the recorded one.
    pdfB = (await binary(tab.drafter, `/api/sheets/${b}/pdf`).expect(200)).body as Buffer;
    expect(pdfB.subarray(0, 5).toString()).toBe('%PDF-');
    expect(pdfB.toString('latin1')).toContain('Checked by: Rosa Quint');
    const issue = res.body.issue;
    expect(issue.sha256).toBe(sha(pdfB));
    expect(issue.size).toBe(pdfB.length);
    expect(issue.signers.map((s: { role: string; name: string }) => `${s.role}:${s.name}`)).toEqual(['prepared:Eli Marsh', 'checked:Rosa Quint', 'issued:Eli Marsh']);

    // The record is canonical JSON (sorted keys, no spaces) naming sheet, revision and hash,
    // and its Ed25519 signature verifies with the published key through node:crypto directly.
    const record = JSON.parse(issue.record);
    expect(record).toMatchObject({ sheetId: b, revision: { number: 2, label: 'B' }, pdf: { sha256: sha(pdfB) } });
    const sortKeys = (v: unknown): unknown =>
      Array.isArray(v) ? v.map(sortKeys) : v && typeof v === 'object' ? Object.fromEntries(Object.keys(v).sort().map((k) => [k, sortKeys((v as Record<string, unknown>)[k])])) : v;
    expect(issue.record).toBe(JSON.stringify(sortKeys(record)));
    const key = await tab.admin.agent.get('/api/firm/signing-key').expect(200);
    expect(key.body.algorithm).toBe('Ed25519');
    const publicKey = crypto.createPublicKey(key.body.publicKeyPem);
    expect(key.body.fingerprint).toBe(sha(publicKey.export({ type: 'spki', format: 'der' })));
    expect(issue.keyFingerprint).toBe(key.body.fingerprint);
    expect(crypto.verify(null, Buffer.from(issue.record), publicKey, Buffer.from(issue.signature, 'base64'))).toBe(true);

    // Everyone on the project: preparer/issuer, checker, and the drafter who uploaded T1's drawing.
    const mails = await mailsSince(before);
    expect(mails).toHaveLength(1);
    expect(mails[0].to).toEqual(['drafter@demo.panelpoint.test', 'engineer@demo.panelpoint.test', 'reviewer@demo.panelpoint.test']);
    expect(mails[0].subject).toContain('revision B issued');
    expect(mails[0].text).toContain(sha(pdfB));
    expect(sheetFiles()).toHaveLength(1);
  });

  it('when anyone tries to change the issued revision through the API, then 409 and nothing changes', async () => {
    const before = await SheetRevision.findByPk(b, { raw: true });
    for (const [who, action] of [['engineer', 'submit'], ['reviewer', 'return'], ['reviewer', 'check'], ['engineer', 'issue']] as const) {
      const res = await post(tab[who], `/api/sheets/${b}/${action}`);
      expect(res.status).toBe(409);
      expect(res.body.error.code).toBe('sheet-issued');
      expect(res.body.error.message).toMatch(/revision B is issued/i);
    }
    expect((await post(tab.reviewer, `/api/sheets/${b}/comments`, { anchor: 'reactions', body: 'late' })).body.error.code).toBe('sheet-issued');
    const threadOnB = (await tab.engineer.agent.get(`/api/sheets/${b}`)).body.comments.find((t: { revisionLabel: string }) => t.revisionLabel === 'B');
    expect((await patch(tab.engineer, `/api/sheet-comments/${threadOnB.id}`, { resolved: false })).body.error.code).toBe('sheet-issued');
    expect(await SheetRevision.findByPk(b, { raw: true })).toEqual(before);
  });

  it('when the issued row is changed or deleted with raw SQL, then the database trigger refuses it', async () => {
    const before = await SheetRevision.findByPk(b, { raw: true });
    expect(await rawRefusal(`UPDATE sheet_revisions SET "checkedByName" = 'Someone Else' WHERE id = ${b}`)).toMatch(/issued sheet revision cannot be changed/);
    expect(await rawRefusal(`UPDATE sheet_revisions SET sha256 = '${'0'.repeat(64)}' WHERE id = ${b}`)).toMatch(/cannot be changed/);
    expect(await rawRefusal(`UPDATE sheet_revisions SET status = 'checked' WHERE id = ${b}`)).toMatch(/cannot be changed/);
    expect(await rawRefusal(`DELETE FROM sheet_revisions WHERE id = ${b}`)).toMatch(/cannot be changed or deleted/);
    expect(await rawRefusal(`UPDATE sheet_revision_events SET note = 'x' WHERE "revisionId" = ${b}`)).toMatch(/append-only/);
    expect(await rawRefusal(`DELETE FROM sheet_revision_events WHERE "revisionId" = ${b}`)).toMatch(/append-only/);
    expect(await SheetRevision.findByPk(b, { raw: true })).toEqual(before);
  });

  it('when a later revision is issued, then the earlier one becomes superseded, logged, and the verify route says so', async () => {
    c = (await post(tab.engineer, '/api/trusses/1/sheets', { runId: 102, note: 'title block fix' })).body.id;
    await post(tab.engineer, `/api/sheets/${c}/submit`, { checkerId: await userIdOf('second.reviewer@demo.panelpoint.test') }).expect(200);
    await post(tab.reviewer2, `/api/sheets/${c}/check`).expect(200);
    const issued = await post(tab.engineer2, `/api/sheets/${c}/issue`);
    expect(issued.status).toBe(200);
    expect(issued.body).toMatchObject({ label: 'C', status: 'issued', issuedBy: { name: 'Tom Ashdown' } });
    pdfC = (await binary(tab.reviewer, `/api/sheets/${c}/pdf`).expect(200)).body as Buffer;

    const viewB = await tab.drafter.agent.get(`/api/sheets/${b}`).expect(200);
    expect(viewB.body).toMatchObject({ status: 'superseded', supersededBy: { id: c, label: 'C' } });
    expect(viewB.body.events.at(-1)).toMatchObject({ from: 'issued', to: 'superseded', by: { name: 'Tom Ashdown' } });

    const checkB = await verify(tab.drafter, pdfB);
    expect(checkB.status).toBe(200);
    expect(checkB.body).toMatchObject({ signature: 'valid', archivedFile: 'intact', match: { sheetId: b, label: 'B', status: 'superseded', supersededBy: { label: 'C' } } });
    expect(checkB.body.verdict).toMatch(/superseded/);
    const checkC = await verify(tab.reviewer, pdfC);
    expect(checkC.body).toMatchObject({ signature: 'valid', match: { sheetId: c, jobNumber: 'HV-2417', supersededBy: null } });
  });

  it('when the archive is searched, then issued and superseded sheets come back with revision, date and signers', async () => {
    const all = await tab.drafter.agent.get('/api/archive').query({ jobNumber: 'hv-2417' }).expect(200);
    expect(all.body.map((e: { label: string; status: string }) => `${e.label}:${e.status}`)).toEqual(['C:issued', 'B:superseded']);
    expect(all.body[0].signers.map((s: { name: string }) => s.name)).toEqual(['Eli Marsh', 'Priya Okafor', 'Tom Ashdown']);
    const current = await tab.drafter.agent.get('/api/archive').query({ q: 'typical interior', superseded: 'exclude' }).expect(200);
    expect(current.body.map((e: { sheetId: number }) => e.sheetId)).toEqual([c]);
    expect((await tab.drafter.agent.get('/api/archive').query({ truss: 'gable' }).expect(200)).body).toEqual([]);
    expect((await tab.drafter.agent.get('/api/archive').query({ superseded: 'maybe' })).status).toBe(400);
  });

  it('when an issued PDF has one byte changed, then it matches no issued sheet', async () => {
    const tampered = Buffer.from(pdfC);
    const at = tampered.indexOf('Revision C');
    tampered[at + 9] = 'D'.charCodeAt(0);
    const res = await verify(tab.drafter, tampered);
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ match: null, signature: null, sha256: sha(tampered) });
    expect(res.body.verdict).toMatch(/does not match any issued calc sheet/);
  });

  it('when the upload is not a PDF, too large or missing, then 400/413 and nothing is written', async () => {
    const files = sheetFiles();
    const rows = await SheetRevision.count();
    const mails = await lastMailId();
    const notPdf = await verify(tab.drafter, Buffer.from('0\nSECTION\n2\nHEADER\n'), 'truss.pdf');
    expect(notPdf.status).toBe(400);
    expect(notPdf.body.error.code).toBe('not-a-pdf');
    const huge = Buffer.concat([Buffer.from('%PDF-1.4\n'), Buffer.alloc(65 * 1024, 0x20)]);
    const tooLarge = await verify(tab.drafter, huge);
    expect(tooLarge.status).toBe(413);
    expect(tooLarge.body.error.code).toBe('file-too-large');
    const missing = await tab.drafter.agent.post('/api/archive/verify').set('X-CSRF-Token', tab.drafter.csrf).send({});
    expect(missing.status).toBe(400);
    expect(sheetFiles()).toEqual(files);
    expect(await SheetRevision.count()).toBe(rows);
    expect(await lastMailId()).toBe(mails);
  });

  it('when the checker returns and checks the same revision at once (two tabs), then one wins and the other gets a 409 naming the status', async () => {
    const id = (await post(tab.engineer, '/api/trusses/2/sheets', { runId: 201 })).body.id;
    await post(tab.engineer, `/api/sheets/${id}/submit`, { checkerId: await userIdOf(demoEmail('reviewer')) }).expect(200);
    const otherTab = await signIn(services.app, demoEmail('reviewer'));
    const [checked, returned] = await Promise.all([post(tab.reviewer, `/api/sheets/${id}/check`), post(otherTab, `/api/sheets/${id}/return`)]);
    expect([checked.status, returned.status].sort()).toEqual([200, 409]);
    const loser = checked.status === 409 ? checked : returned;
    const winner = checked.status === 200 ? checked : returned;
    expect(loser.body.error.code).toBe('sheet-status-conflict');
    expect(loser.body.error.message).toContain(winner.body.status === 'checked' ? 'is checked' : 'is returned');
    const view = await tab.engineer.agent.get(`/api/sheets/${id}`).expect(200);
    // One move only in the audit log.
    expect(view.body.events.map((e: { to: string }) => e.to)).toEqual(['draft', 'in-check', winner.body.status]);
  });

  it('when the status moved between a read and the write, then the conditional update writes nothing and logs nothing', async () => {
    const id = (await post(tab.engineer, '/api/trusses/2/sheets', { runId: 201 })).body.id;
    const reviewerId = (await User.findOne({ where: { email: demoEmail('reviewer') } }))!.id;
    expect(await reviewRepository.transition(id, 'draft', 'in-check', reviewerId, 'first')).toBe(true);
    // A second writer that still believes the revision is a draft.
    expect(await reviewRepository.transition(id, 'draft', 'in-check', reviewerId, 'second')).toBe(false);
    const events = await recordsRepository.events(id);
    expect(events.map((e) => `${e.fromStatus}->${e.toStatus}:${e.note}`)).toEqual(['null->draft:', 'draft->in-check:first']);
  });

  it('when a stored record is tampered (trigger dropped, signer renamed or SHA-256 replaced), then the signature check fails', async () => {
    // Someone with raw database access removes the guard first (the database is in memory).
    await dropGuard(services.sequelize, 'sheet_revisions_frozen_update');
    await services.sequelize.query(`UPDATE sheet_revisions SET "checkedByName" = 'Someone Else' WHERE id = ${c}`);
    const renamed = await verify(tab.drafter, pdfC);
    expect(renamed.body).toMatchObject({ signature: 'invalid', match: { sheetId: c } });
    expect(renamed.body.verdict).toMatch(/changed after issue/);

    // A forger who swaps in the hash of an altered PDF gets a match, but not a valid signature.
    const forged = Buffer.from(pdfB);
    forged[forged.indexOf('Revision B') + 9] = 'Z'.charCodeAt(0);
    await services.sequelize.query(`UPDATE sheet_revisions SET sha256 = '${sha(forged)}' WHERE id = ${b}`);
    const swapped = await verify(tab.drafter, forged);
    expect(swapped.body).toMatchObject({ signature: 'invalid', archivedFile: 'altered', match: { sheetId: b } });
  });
});
