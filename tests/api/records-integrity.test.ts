import { execFile } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { promisify } from 'node:util';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Services } from '../../server/bootstrap';
import { AnalysisRun, SheetRevision, SheetRevisionEvent, SigningKey } from '../../server/db/models';
import { databaseEnv, demoEmail, demoUserId, dropGuard, signIn, startTestServices, type Tab } from '../support/test-services';
import { fixtureRun } from '../support/fixtures';
import { tinyPdfRenderer } from '../support/tiny-pdf';

/**
 * Signing keys, database guards and the audit chain on a real SQLite file (WAL), with the
 * analysis_runs table as the run source, the real SMTP sink and real sessions. The server is
 * stopped and started again on the same folder to check what a start does with the key file.
 */

const run = promisify(execFile);
const root = path.resolve(import.meta.dirname, '../..');
const tsx = path.join(root, 'node_modules', '.bin', 'tsx');

let services: Services;
let live = false;
let dataDir: string;
let databaseStorage: string;
const tab = {} as Record<'engineer' | 'reviewer' | 'admin' | 'drafter', Tab>;
const renderer = tinyPdfRenderer();
const keyFile = () => path.join(dataDir, 'firm-signing-key.pem');

const post = (t: Tab, url: string, body: object = {}) => t.agent.post(url).set('X-CSRF-Token', t.csrf).send(body);
const binary = (t: Tab, url: string) =>
  t.agent
    .get(url)
    .buffer(true)
    .parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    });
const verify = (t: Tab, bytes: Buffer) => t.agent.post('/api/archive/verify').set('X-CSRF-Token', t.csrf).attach('file', bytes, 'sheet.pdf');
const sha = (b: Buffer) => crypto.createHash('sha256').update(b).digest('hex');
/** The key id computed here independently: SHA-256 of the SPKI DER of the PEM (Node's crypto), first 16 hex digits. */
const keyIdOfPem = (pem: string) => sha(crypto.createPublicKey(pem).export({ type: 'spki', format: 'der' })).slice(0, 16);

/** SQLite's message of a refused raw statement ('not refused' when it went through). */
async function rawRefusal(sql: string): Promise<string> {
  try {
    await services.sequelize.query(sql);
  } catch (err) {
    const e = err as { parent?: { message?: string }; message: string };
    return e.parent?.message ?? e.message;
  }
  return 'not refused';
}

async function signInAll() {
  for (const role of ['drafter', 'engineer', 'reviewer', 'admin'] as const) tab[role] = await signIn(services.app, demoEmail(role));
}

const solvedRun = fixtureRun;

/** Draft → in check (with a resolved comment) → checked → issued; returns the revision id and its issue view. */
async function issue(trussId: number, runId: number) {
  const id = (await post(tab.engineer, `/api/trusses/${trussId}/sheets`, { runId }).expect(201)).body.id as number;
  await post(tab.engineer, `/api/sheets/${id}/submit`, { checkerId: await demoUserId() }).expect(200);
  const c = await post(tab.reviewer, `/api/sheets/${id}/comments`, { anchor: 'reactions', body: 'Show the reaction directions.' }).expect(201);
  await tab.reviewer.agent.patch(`/api/sheet-comments/${c.body.id}`).set('X-CSRF-Token', tab.reviewer.csrf).send({ resolved: true }).expect(200);
  await post(tab.reviewer, `/api/sheets/${id}/check`).expect(200);
  const issued = await post(tab.engineer, `/api/sheets/${id}/issue`).expect(200);
  return { id, commentId: c.body.id as number, issue: issued.body.issue };
}

beforeAll(async () => {
  services = await startTestServices({}, { realFile: true, review: { renderer } });
  live = true;
  ({ dataDir, databaseStorage } = services.config);
  await signInAll();
});
afterAll(async () => {
  if (live) await services.shutdown();
  fs.rmSync(dataDir, { recursive: true, force: true });
});

describe('signing keys, issued-record guards and the audit chain (real SQLite file)', () => {
  let runA: number;
  let revA: { id: number; commentId: number; issue: { keyId: string; keyFingerprint: string; record: string } };
  let revB: { id: number; commentId: number; issue: { keyId: string; keyFingerprint: string; record: string } };
  let revT2: number;
  let pdfA: Buffer;
  let firstKey: { keyId: string; publicKeyPem: string };

  it('when a sheet is issued, then its record names the key id: the first 16 hex digits of the SHA-256 of the public key', async () => {
    expect(services.config.databaseStorage).not.toBe(':memory:');
    firstKey = (await tab.admin.agent.get('/api/firm/signing-key').expect(200)).body;
    runA = await solvedRun(1);
    revA = await issue(1, runA);
    expect(revA.issue.keyId).toBe(keyIdOfPem(firstKey.publicKeyPem));
    expect(revA.issue.keyId).toBe(firstKey.keyId);
    const record = JSON.parse(revA.issue.record);
    expect(record).toMatchObject({ formatVersion: 2, keyId: firstKey.keyId, sheetId: revA.id });
    pdfA = (await binary(tab.drafter, `/api/sheets/${revA.id}/pdf`).expect(200)).body as Buffer;
    expect((await verify(tab.drafter, pdfA)).body).toMatchObject({ signature: 'valid', archivedFile: 'intact' });
  });

  it('when an admin rotates the key, then the new key signs new sheets and the older sheet still verifies under its own key id', async () => {
    const before = fs.readFileSync(keyFile(), 'utf8');
    const rotated = await post(tab.admin, '/api/firm/signing-keys/rotate');
    expect(rotated.status).toBe(201);
    expect(rotated.body).toMatchObject({ current: true, retiredAt: null, sheetsSigned: 0 });
    expect(rotated.body.keyId).not.toBe(firstKey.keyId);
    expect(rotated.body.keyId).toBe(keyIdOfPem(rotated.body.publicKeyPem));
    // The key file now holds the new private key, still readable by the server's user only.
    const after = fs.readFileSync(keyFile(), 'utf8');
    expect(after).not.toBe(before);
    expect(keyIdOfPem(crypto.createPublicKey(crypto.createPrivateKey(after)).export({ type: 'spki', format: 'pem' }).toString())).toBe(rotated.body.keyId);
    expect(fs.statSync(keyFile()).mode & 0o777).toBe(0o600);
    expect((await tab.engineer.agent.get('/api/firm/signing-keys')).status).toBe(403);

    revB = await issue(1, await solvedRun(1));
    expect(revB.issue.keyId).toBe(rotated.body.keyId);

    const keys = (await tab.admin.agent.get('/api/firm/signing-keys').expect(200)).body as { keyId: string; current: boolean; retiredAt: string | null; createdAt: string; sheetsSigned: number }[];
    expect(keys.map((k) => [k.keyId, k.current, k.sheetsSigned])).toEqual([
      [rotated.body.keyId, true, 1],
      [firstKey.keyId, false, 1],
    ]);
    expect(Date.parse(keys[1].retiredAt!)).toBeGreaterThanOrEqual(Date.parse(keys[1].createdAt));

    // A was superseded by B, legitimately, and still verifies under the retired key.
    const checkA = await verify(tab.drafter, pdfA);
    expect(checkA.body).toMatchObject({ signature: 'valid', archivedFile: 'intact', match: { sheetId: revA.id, status: 'superseded', supersededBy: { id: revB.id } } });
    const pdfB = (await binary(tab.drafter, `/api/sheets/${revB.id}/pdf`).expect(200)).body as Buffer;
    expect((await verify(tab.drafter, pdfB)).body).toMatchObject({ signature: 'valid', match: { sheetId: revB.id, status: 'issued' } });
  });

  it('when the retired public key is deleted or changed with raw SQL, then the database refuses it', async () => {
    expect(await rawRefusal(`DELETE FROM signing_keys WHERE "keyId" = '${firstKey.keyId}'`)).toMatch(/signing key is kept forever/);
    expect(await rawRefusal(`UPDATE signing_keys SET "publicKeyPem" = 'x' WHERE "keyId" = '${firstKey.keyId}'`)).toMatch(/kept forever/);
    expect(await rawRefusal(`UPDATE signing_keys SET "retiredAt" = NULL WHERE "keyId" = '${firstKey.keyId}'`)).toMatch(/kept forever/);
    expect(await SigningKey.count()).toBe(2);
  });

  it('when an issued revision is superseded by anything but a later issued revision of its own truss, then the trigger refuses it', async () => {
    revT2 = (await issue(2, await solvedRun(2))).id;
    const laterDraft = (await post(tab.engineer, '/api/trusses/1/sheets', { runId: await solvedRun(1) }).expect(201)).body.id as number;
    const at = `'${new Date().toISOString()}'`;
    const supersede = (by: number | string) => `UPDATE sheet_revisions SET status = 'superseded', "supersededById" = ${by}, "supersededAt" = ${at} WHERE id = ${revB.id}`;
    expect(await rawRefusal(supersede(revT2))).toMatch(/superseded only by a later issued revision of the same truss/); // other truss
    expect(await rawRefusal(supersede(laterDraft))).toMatch(/superseded only by a later issued revision/); // not issued
    expect(await rawRefusal(supersede(revA.id))).toMatch(/superseded only by a later issued revision/); // earlier revision
    expect(await rawRefusal(supersede('NULL'))).toMatch(/superseded only by a later issued revision/);
    expect((await SheetRevision.findByPk(revB.id))!.status).toBe('issued');
    // No ready-made issued row can be inserted either.
    expect(
      await rawRefusal(
        `INSERT INTO sheet_revisions ("trussId", "runId", number, status, "preparedById", "createdAt", "updatedAt") VALUES (1, ${runA}, 99, 'issued', 1, ${at}, ${at})`,
      ),
    ).toMatch(/inserted as a draft/);
  });

  it('when a comment or the run behind an issued sheet is changed with raw SQL, then the trigger refuses it; a draft’s run is not frozen', async () => {
    expect(await rawRefusal(`UPDATE sheet_comments SET body = 'rewritten' WHERE id = ${revA.commentId}`)).toMatch(/comments of an issued sheet revision/);
    expect(await rawRefusal(`UPDATE sheet_comments SET "resolvedAt" = NULL WHERE id = ${revB.commentId}`)).toMatch(/comments of an issued/);
    expect(await rawRefusal(`DELETE FROM sheet_comments WHERE id = ${revB.commentId}`)).toMatch(/comments of an issued/);
    expect(
      await rawRefusal(
        `INSERT INTO sheet_comments ("revisionId", "trussId", anchor, body, "authorId", "createdAt", "updatedAt") VALUES (${revB.id}, 1, 'x', 'late', 1, '2026-01-01', '2026-01-01')`,
      ),
    ).toMatch(/comments of an issued/);
    expect(await rawRefusal(`UPDATE analysis_runs SET summary = '{"forged":true}' WHERE id = ${runA}`)).toMatch(/analysis run behind an issued sheet/);
    expect(await rawRefusal(`DELETE FROM analysis_runs WHERE id = ${runA}`)).toMatch(/analysis run behind an issued sheet/);
    expect((await AnalysisRun.findByPk(runA))!.summary).toBe('{"note":"fixture run"}');
    const loose = await solvedRun(1);
    expect(await rawRefusal(`UPDATE analysis_runs SET summary = '{"note":"edited"}' WHERE id = ${loose}`)).toBe('not refused');
  });

  it('when the audit chain is checked, then every line follows the one before it, and the first line hashes as documented', async () => {
    const res = await tab.admin.agent.get('/api/admin/audit-chain').expect(200);
    expect(res.body).toMatchObject({ ok: true, broken: null, lines: await SheetRevisionEvent.count() });
    expect((await tab.reviewer.agent.get('/api/admin/audit-chain')).status).toBe(403);
    // Line 1 recomputed here: HMAC-SHA-256 (RFC 2104, Node's crypto) under the audit key file's
    // secret of the JSON with keys in code-unit order, prevHash 64 zeros.
    const first = (await SheetRevisionEvent.findOne({ order: [['id', 'ASC']] }))!;
    const text =
      `{"actorId":${first.actorId},"at":${JSON.stringify(new Date(first.at).toISOString())},"fromStatus":null,"id":${first.id},` +
      `"note":${JSON.stringify(first.note)},"prevHash":"${'0'.repeat(64)}","revisionId":${first.revisionId},"toStatus":"draft"}`;
    expect(first.prevHash).toBe('0'.repeat(64));
    const secret = Buffer.from(JSON.parse(fs.readFileSync(path.join(dataDir, 'audit-chain-key.json'), 'utf8')).secret, 'hex');
    expect(first.hash).toBe(crypto.createHmac('sha256', secret).update(text, 'utf8').digest('hex'));
    expect(first.hash).not.toBe(sha(Buffer.from(text, 'utf8')));
    const second = (await SheetRevisionEvent.findOne({ where: { id: first.id + 1 } }))!;
    expect(second.prevHash).toBe(first.hash);
    const cmd = await run(tsx, [path.join(root, 'scripts', 'audit-verify.ts')], { cwd: root, env: { ...process.env, DATA_DIR: dataDir, ...databaseEnv(services) } });
    expect(cmd.stdout).toMatch(/^OK: \d+ audit line\(s\)/);
  });

  it('when an archived PDF is changed on disk, then its download is refused with the sentence and 409; a missing one too', async () => {
    const row = (await SheetRevision.findByPk(revT2))!;
    const file = path.join(dataDir, 'issued-sheets', row.pdfStoredName!);
    const original = fs.readFileSync(file);
    const altered = Buffer.from(original);
    altered[altered.indexOf('Revision') + 2] ^= 0x20;
    fs.writeFileSync(file, altered);
    const res = await tab.drafter.agent.get(`/api/sheets/${revT2}/pdf`);
    expect(res.status).toBe(409);
    expect(res.body.error).toEqual({ code: 'archived-file-altered', message: 'The archived file no longer matches its record; restore it from backup.' });
    fs.rmSync(file);
    const gone = await tab.drafter.agent.get(`/api/sheets/${revT2}/pdf`);
    expect(gone.status).toBe(409);
    expect(gone.body.error.code).toBe('archived-file-missing');
    fs.writeFileSync(file, original);
    expect(sha((await binary(tab.drafter, `/api/sheets/${revT2}/pdf`).expect(200)).body as Buffer)).toBe(row.sha256);
  });

  it('when an audit line is changed behind the triggers, then audit:verify (as a command) and the admin API name that line', async () => {
    const middle = (await SheetRevisionEvent.findAll({ order: [['id', 'ASC']] }))[3];
    await dropGuard(services.sequelize, 'sheet_revision_events_no_update');
    await services.sequelize.query(`UPDATE sheet_revision_events SET note = 'nothing to see' WHERE id = ${middle.id}`);
    const cmd = await run(tsx, [path.join(root, 'scripts', 'audit-verify.ts')], { cwd: root, env: { ...process.env, DATA_DIR: dataDir, ...databaseEnv(services) } }).then(
      () => ({ code: 0, stdout: '' }),
      (err: { code: number; stdout: string }) => ({ code: err.code, stdout: err.stdout }),
    );
    expect(cmd.code).toBe(1);
    expect(cmd.stdout).toContain(`BROKEN: The audit log is broken at line ${middle.id} (sheet revision ${middle.revisionId}`);
    expect(cmd.stdout).toMatch(/content no longer matches its keyed hash/);
    const api = await tab.admin.agent.get('/api/admin/audit-chain').expect(200);
    expect(api.body).toMatchObject({ ok: false, broken: { eventId: middle.id, revisionId: middle.revisionId } });
  });

  it('when the server starts again with the key file missing or replaced, then it refuses, naming the file and the backup, and writes no key', async () => {
    const current = (await SigningKey.findOne({ where: { retiredAt: null } }))!.keyId;
    await services.shutdown();
    live = false;
    const kept = fs.readFileSync(keyFile());
    fs.rmSync(keyFile());
    const start = () => startTestServices({ dataDir, databaseStorage, uploadsDir: services.config.uploadsDir }, { review: { renderer } });
    await expect(start()).rejects.toThrow(new RegExp(`${keyFile().replace(/[.*+?^${}()|[\]\\/]/g, '\\$&')} is missing, but 3 issued sheet\\(s\\) are signed with key ${current}: restore that file from your backup`));
    expect(fs.existsSync(keyFile())).toBe(false);

    // The real server process: exit 1 and the same sentence.
    const child = await run(tsx, [path.join(root, 'server', 'index.ts')], { cwd: root, env: { ...process.env, DATA_DIR: dataDir, ...databaseEnv(services), NODE_ENV: 'test', PORT: '3999' } }).then(
      () => ({ code: 0, stderr: '' }),
      (err: { code: number; stderr: string }) => ({ code: err.code, stderr: err.stderr }),
    );
    expect(child.code).toBe(1);
    expect(child.stderr).toMatch(/Panelpoint could not start: The firm signing key .*firm-signing-key\.pem is missing/);
    expect(fs.existsSync(keyFile())).toBe(false);

    // Another key in its place (a new one, or a retired one) is refused too.
    fs.writeFileSync(keyFile(), crypto.generateKeyPairSync('ed25519').privateKey.export({ type: 'pkcs8', format: 'pem' }), { mode: 0o600 });
    await expect(start()).rejects.toThrow(new RegExp(`never used, but the current key is ${current}: restore the key file of key ${current}`));

    // The backup restored: it starts and every sheet verifies, A under the retired key.
    fs.writeFileSync(keyFile(), kept, { mode: 0o600 });
    services = await start();
    live = true;
    await signInAll();
    expect((await verify(tab.drafter, pdfA)).body).toMatchObject({ signature: 'valid', match: { sheetId: revA.id } });
    expect(await SigningKey.count()).toBe(2);
  });
});
