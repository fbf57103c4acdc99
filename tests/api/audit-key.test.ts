import { execFile } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { promisify } from 'node:util';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Services } from '../../server/bootstrap';
import { SheetRevisionEvent } from '../../server/db/models';
import { databaseEnv, demoEmail, demoUserId, dropGuard, signIn, startTestServices, type Tab } from '../support/test-services';
import { fixtureRun } from '../support/fixtures';
import { tinyPdfRenderer } from '../support/tiny-pdf';

/**
 * The keyed audit chain on a real database (a SQLite file, or PostgreSQL in that project) with
 * real sessions: someone who can write the database but not read the audit key file in the data
 * folder rewrites lines and recomputes their hashes, removes the last line, or rewinds the log to
 * an unkeyed one; the check names the break each time. Hashes are recomputed here with Node's own
 * crypto (HMAC-SHA-256, RFC 2104; SHA-256, FIPS 180-4) over the documented canonical text.
 */

const run = promisify(execFile);
const root = path.resolve(import.meta.dirname, '../..');
const tsx = path.join(root, 'node_modules', '.bin', 'tsx');
const renderer = tinyPdfRenderer();

let services: Services;
let live = false;
let dataDir: string;
let databaseStorage: string;
let engineer: Tab;
let admin: Tab;
const keyFile = () => path.join(dataDir, 'audit-chain-key.json');
const post = (t: Tab, url: string, body: object = {}) => t.agent.post(url).set('X-CSRF-Token', t.csrf).send(body);

interface Line {
  id: number;
  revisionId: number;
  fromStatus: string | null;
  toStatus: string;
  actorId: number | null;
  note: string;
  at: Date;
  prevHash: string | null;
  hash: string | null;
}

/** The documented text of a line: JSON with keys in code-unit order, `at` in ISO 8601. */
const lineText = (prev: string, l: Line) =>
  `{"actorId":${JSON.stringify(l.actorId)},"at":${JSON.stringify(new Date(l.at).toISOString())},"fromStatus":${JSON.stringify(l.fromStatus)},"id":${l.id},` +
  `"note":${JSON.stringify(l.note)},"prevHash":"${prev}","revisionId":${l.revisionId},"toStatus":${JSON.stringify(l.toStatus)}}`;
const sha = (text: string) => crypto.createHash('sha256').update(text, 'utf8').digest('hex');
const hmac = (secret: Buffer, text: string) => crypto.createHmac('sha256', secret).update(text, 'utf8').digest('hex');
const GENESIS = '0'.repeat(64);

const lines = async (): Promise<Line[]> => (await SheetRevisionEvent.findAll({ order: [['id', 'ASC']], raw: true })) as unknown as Line[];

/** Writes hashes with raw SQL (the attacker's way), the no-update guard dropped beforehand. */
async function setHash(id: number, prevHash: string, hash: string) {
  await services.sequelize.query('UPDATE sheet_revision_events SET "prevHash" = :prevHash, hash = :hash WHERE id = :id', { replacements: { id, prevHash, hash } });
}

/** Re-hashes every line from `from` on with plain SHA-256, as one who has no key would. */
async function rehashUnkeyed(from: number) {
  let prev = GENESIS;
  for (const l of await lines()) {
    if (l.id >= from) {
      const h = sha(lineText(prev, l));
      await setHash(l.id, prev, h);
      prev = h;
    } else prev = l.hash!;
  }
}

async function verifyCommand(): Promise<{ code: number; stdout: string; stderr: string }> {
  return run(tsx, [path.join(root, 'scripts', 'audit-verify.ts')], { cwd: root, env: { ...process.env, DATA_DIR: dataDir, ...databaseEnv(services) } }).then(
    (r) => ({ code: 0, stdout: r.stdout, stderr: r.stderr }),
    (err: { code: number; stdout: string; stderr: string }) => ({ code: err.code, stdout: err.stdout, stderr: err.stderr }),
  );
}

const chain = async () => (await admin.agent.get('/api/admin/audit-chain').expect(200)).body;

const solvedRun = fixtureRun;

/** A draft sheet and its submission: two audit lines. */
async function twoLines() {
  const id = (await post(engineer, '/api/trusses/1/sheets', { runId: await solvedRun(1) }).expect(201)).body.id as number;
  await post(engineer, `/api/sheets/${id}/submit`, { checkerId: await demoUserId() }).expect(200);
}

async function start() {
  services = await startTestServices({ dataDir, databaseStorage, uploadsDir: services.config.uploadsDir }, { review: { renderer } });
  live = true;
  engineer = await signIn(services.app, demoEmail('engineer'));
  admin = await signIn(services.app, demoEmail('admin'));
}

async function stop() {
  await services.shutdown();
  live = false;
}

beforeAll(async () => {
  services = await startTestServices({}, { realFile: true, review: { renderer } });
  live = true;
  ({ dataDir, databaseStorage } = services.config);
  engineer = await signIn(services.app, demoEmail('engineer'));
  admin = await signIn(services.app, demoEmail('admin'));
});
afterAll(async () => {
  if (live) await services.shutdown();
  fs.rmSync(dataDir, { recursive: true, force: true });
});

describe('the keyed audit chain', () => {
  it('when a fresh install writes audit lines, then each hash is the HMAC-SHA-256 of its text under the key file in the data folder (0600)', async () => {
    await twoLines();
    await twoLines();
    const key = JSON.parse(fs.readFileSync(keyFile(), 'utf8'));
    expect(fs.statSync(keyFile()).mode & 0o777).toBe(0o600);
    expect(key.firstKeyedId).toBe(1);
    const secret = Buffer.from(key.secret, 'hex');
    let prev = GENESIS;
    const all = await lines();
    expect(all.length).toBeGreaterThanOrEqual(4);
    for (const l of all) {
      expect(l.prevHash).toBe(prev);
      expect(l.hash).toBe(hmac(secret, lineText(prev, l)));
      expect(l.hash).not.toBe(sha(lineText(prev, l)));
      prev = l.hash!;
    }
    expect(await chain()).toMatchObject({ ok: true, lines: all.length, keyed: all.length, beforeKeying: 0 });
    const cmd = await verifyCommand();
    expect(cmd.code).toBe(0);
    expect(cmd.stdout).toMatch(new RegExp(`^OK: ${all.length} audit line\\(s\\), each one follows the line before it; 0 from before keying`));
  });

  it('when a line is rewritten and it and every later line are re-hashed without the key, then the check names that line', async () => {
    await dropGuard(services.sequelize, 'sheet_revision_events_no_update');
    const before = await lines();
    const target = before[1];
    await services.sequelize.query('UPDATE sheet_revision_events SET note = :note WHERE id = :id', { replacements: { note: 'Nothing happened here.', id: target.id } });
    // The unkeyed recomputation the old chain could not tell from the real thing.
    await rehashUnkeyed(target.id);
    const c = await chain();
    expect(c).toMatchObject({ ok: false, broken: { eventId: target.id, revisionId: target.revisionId } });
    expect(c.broken.reason).toMatch(/no longer matches its keyed hash/);
    const cmd = await verifyCommand();
    expect(cmd.code).toBe(1);
    expect(cmd.stdout).toContain(`BROKEN: The audit log is broken at line ${target.id}`);
    // Put back as it was, for the next case.
    await services.sequelize.query('UPDATE sheet_revision_events SET note = :note WHERE id = :id', { replacements: { note: target.note, id: target.id } });
    for (const l of before) await setHash(l.id, l.prevHash!, l.hash!);
    expect(await chain()).toMatchObject({ ok: true });
  });

  it('when the last line is deleted, then the check says lines were removed from the end, and sealing later lines does not hide it', async () => {
    const before = await lines();
    const last = before.at(-1)!;
    // The guard is gone already on PostgreSQL (one trigger function refuses updates and deletes).
    if (services.sequelize.getDialect() === 'sqlite') await services.sequelize.query('DROP TRIGGER sheet_revision_events_no_delete');
    await services.sequelize.query('DELETE FROM sheet_revision_events WHERE id = :id', { replacements: { id: last.id } });
    const c = await chain();
    expect(c.ok).toBe(false);
    expect(c.message).toMatch(new RegExp(`records ${before.length} line\\(s\\) ending at line ${last.id}, but the log has ${before.length - 1} ending at line ${before.at(-2)!.id}: lines were removed from the end`));
    // A later write seals its lines after the shortened log; the head is not moved over the gap.
    await twoLines();
    expect((await chain()).ok).toBe(false);
    const cmd = await verifyCommand();
    expect(cmd.code).toBe(1);
    expect(cmd.stdout).toMatch(/chain head records/);
  });

  it('when the server starts again with the audit key missing, then it refuses with one sentence and makes no key; another key is refused too', async () => {
    await stop();
    const kept = fs.readFileSync(keyFile());
    fs.rmSync(keyFile());
    const again = () => startTestServices({ dataDir, databaseStorage, uploadsDir: services.config.uploadsDir }, { review: { renderer } });
    await expect(again()).rejects.toThrow(/The audit key .*audit-chain-key\.json is missing, but the sheet audit log has \d+ line\(s\) sealed with it: restore that file from your backup/);
    expect(fs.existsSync(keyFile())).toBe(false);
    fs.writeFileSync(keyFile(), JSON.stringify({ version: 1, secret: crypto.randomBytes(32).toString('hex'), firstKeyedId: 1 }), { mode: 0o600 });
    await expect(again()).rejects.toThrow(/which did not seal this database's audit log: restore the audit key file from your backup/);
    fs.writeFileSync(keyFile(), kept, { mode: 0o600 });
    await start();
  });
});

describe('an audit log from before keying', () => {
  let firstKeyedId: number;
  let oldLines: Line[];

  beforeAll(async () => {
    // Turn this database into what a version before keying left: every line hashed with plain
    // SHA-256, no key file, no chain head. Then start: keying begins after the old lines.
    await stop();
    fs.rmSync(keyFile());
    const { openDatabase } = await import('../../server/db/sequelize');
    const { initModels } = await import('../../server/db/models');
    const seq = await openDatabase(services.config.databaseUrl ?? databaseStorage);
    initModels(seq);
    await seq.query('DELETE FROM audit_chain_heads');
    let prev = GENESIS;
    for (const l of (await SheetRevisionEvent.findAll({ order: [['id', 'ASC']], raw: true })) as unknown as Line[]) {
      const h = sha(lineText(prev, l));
      await seq.query('UPDATE sheet_revision_events SET "prevHash" = :prev, hash = :h WHERE id = :id', { replacements: { prev, h, id: l.id } });
      prev = h;
    }
    await seq.close();
    await start();
    firstKeyedId = JSON.parse(fs.readFileSync(keyFile(), 'utf8')).firstKeyedId;
    oldLines = await lines();
    await twoLines();
  });

  it('when it is checked after keying, then the old lines check by their plain hash and are reported as before keying', async () => {
    expect(firstKeyedId).toBe(oldLines.at(-1)!.id + 1);
    const c = await chain();
    expect(c).toMatchObject({ ok: true, beforeKeying: oldLines.length, keyed: 2 });
    expect(c.message).toMatch(new RegExp(`${oldLines.length} from before keying \\(plain SHA-256\\), 2 keyed with audit key [0-9a-f]{16}`));
    const secret = Buffer.from(JSON.parse(fs.readFileSync(keyFile(), 'utf8')).secret, 'hex');
    const now = await lines();
    const firstKeyed = now.find((l) => l.id === firstKeyedId)!;
    expect(firstKeyed.prevHash).toBe(oldLines.at(-1)!.hash);
    expect(firstKeyed.hash).toBe(hmac(secret, lineText(firstKeyed.prevHash!, firstKeyed)));
    const cmd = await verifyCommand();
    expect(cmd.code).toBe(0);
    expect(cmd.stdout).toContain(`${oldLines.length} from before keying`);
  });

  it('when an old line is rewritten and the old part re-hashed, then the first keyed line no longer follows it', async () => {
    const target = oldLines[2];
    await services.sequelize.query('UPDATE sheet_revision_events SET note = :note WHERE id = :id', { replacements: { note: 'Approved by phone.', id: target.id } });
    let prev = target.prevHash!;
    for (const l of (await lines()).filter((x) => x.id >= target.id && x.id < firstKeyedId)) {
      const h = sha(lineText(prev, l));
      await setHash(l.id, prev, h);
      prev = h;
    }
    const c = await chain();
    expect(c).toMatchObject({ ok: false, broken: { eventId: firstKeyedId } });
    expect(c.broken.reason).toMatch(/does not follow the line before it/);
    // Pointing the keyed line at the forged prefix does not help: its keyed hash no longer checks.
    const fk = (await lines()).find((l) => l.id === firstKeyedId)!;
    await setHash(fk.id, prev, fk.hash!);
    expect((await chain()).broken).toMatchObject({ eventId: firstKeyedId, reason: expect.stringMatching(/keyed hash/) });
    // Put back as it was.
    await services.sequelize.query('UPDATE sheet_revision_events SET note = :note WHERE id = :id', { replacements: { note: target.note, id: target.id } });
    for (const l of oldLines) await setHash(l.id, l.prevHash!, l.hash!);
    await setHash(fk.id, oldLines.at(-1)!.hash!, fk.hash!);
    expect((await chain()).ok).toBe(true);
  });

  it('when the keyed lines are rewritten as unkeyed ones, then the check still knows where keying began (from the key file)', async () => {
    await rehashUnkeyed(firstKeyedId);
    const c = await chain();
    expect(c).toMatchObject({ ok: false, broken: { eventId: firstKeyedId } });
    expect(c.broken.reason).toMatch(/no longer matches its keyed hash/);
  });
});
