import { execFileSync } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Services } from '../../server/bootstrap';
import { SheetRevision } from '../../server/db/models';
import { demoEmail, demoUserId, openTab, signIn, startTestServices, type Tab } from '../support/test-services';
import { solvedDemoRun as solvedDemoRunOf } from '../support/fixtures';

/**
 * The issued copy verifies itself: a real sheet issued through the check flow and printed by the
 * real Chromium, on a real SQLite file with real sessions. Every page names the issued sheet, its
 * revision and fingerprint; the last page says how to verify; the public verify page answers
 * without a sign-in, limited per address, and an altered file is told which sheet it claims to be.
 */

let services: Services;
let engineer: Tab;
let reviewer: Tab;
let sheetId: number;
let pdf: Buffer;
let dir: string;
const MAX_BYTES = 4 * 1024 * 1024;

const binary = (res: import('supertest').Test) =>
  res.buffer(true).parse((r, cb) => {
    const chunks: Buffer[] = [];
    r.on('data', (c: Buffer) => chunks.push(c));
    r.on('end', () => cb(null, Buffer.concat(chunks)));
  });
const pageText = (file: string, page: number) => execFileSync('pdftotext', ['-f', String(page), '-l', String(page), file, '-'], { encoding: 'utf8' });
const pages = (file: string) => Number(/Pages:\s+(\d+)/.exec(execFileSync('pdfinfo', [file], { encoding: 'utf8' }))![1]);
const sha = (b: Buffer | string) => crypto.createHash('sha256').update(b).digest('hex');
/** Canonical JSON written here on its own: keys sorted, no whitespace (RFC 8785's rule for these values). */
const canonical = (v: unknown): string =>
  Array.isArray(v)
    ? `[${v.map(canonical).join(',')}]`
    : v !== null && typeof v === 'object'
      ? `{${Object.keys(v)
          .sort()
          .map((k) => `${JSON.stringify(k)}:${canonical((v as Record<string, unknown>)[k])}`)
          .join(',')}}`
      : JSON.stringify(v);

const solvedDemoRun = () => solvedDemoRunOf(engineer);

beforeAll(async () => {
  services = await startTestServices({ maxUploadBytes: MAX_BYTES, verifyAddressLimit: 1000 }, { realFile: true });
  engineer = await signIn(services.app, demoEmail('engineer'));
  reviewer = await signIn(services.app, demoEmail('reviewer'));
  const run = await solvedDemoRun();
  sheetId = (await engineer.agent.post('/api/trusses/1/sheets').set('X-CSRF-Token', engineer.csrf).send({ runId: run.id }).expect(201)).body.id;
  await engineer.agent.post(`/api/sheets/${sheetId}/submit`).set('X-CSRF-Token', engineer.csrf).send({ checkerId: await demoUserId() }).expect(200);
  await reviewer.agent.post(`/api/sheets/${sheetId}/check`).set('X-CSRF-Token', reviewer.csrf).send({}).expect(200);
  await engineer.agent.post(`/api/sheets/${sheetId}/issue`).set('X-CSRF-Token', engineer.csrf).send({}).expect(200);
  pdf = (await binary(reviewer.agent.get(`/api/sheets/${sheetId}/pdf`)).expect(200)).body as Buffer;
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'pp-verify-'));
  fs.writeFileSync(path.join(dir, 'issued.pdf'), pdf);
}, 180_000);

afterAll(async () => {
  await services?.shutdown();
  if (dir) fs.rmSync(dir, { recursive: true, force: true });
  if (services) fs.rmSync(services.config.dataDir, { recursive: true, force: true });
});

/** The fingerprint recomputed here from the signed record as stored: its canonical JSON without "pdf", SHA-256 (Node), 12 hex. */
async function expectedFingerprint(): Promise<string> {
  const row = await SheetRevision.findByPk(sheetId);
  const record = JSON.parse(row!.signedRecord!) as Record<string, unknown>;
  // The record the firm key signs names this very file's SHA-256 (the hash the page cannot print).
  expect((record.pdf as { sha256: string }).sha256).toBe(sha(pdf));
  delete record.pdf;
  return sha(canonical(record)).slice(0, 12);
}

describe('an issued calc sheet that verifies itself', () => {
  it('when the issued PDF is read with pdftotext, then every page names the issued sheet, revision and fingerprint, and the last page how to verify it', async () => {
    const file = path.join(dir, 'issued.pdf');
    const n = pages(file);
    const fp = await expectedFingerprint();
    expect(n).toBeGreaterThan(3);
    for (let i = 1; i <= n; i++) {
      const t = pageText(file, i).replace(/\s+/g, ' ');
      expect(t, `page ${i}`).toContain(`Issued sheet ${sheetId} · revision A · fingerprint ${fp} (of the issue record, not of this PDF file)`);
      expect(t, `page ${i}`).toContain(`Verify at http://panelpoint.test/verify/${sheetId}`);
      expect(t, `page ${i}`).toContain(`Sheet ${i} of ${n}`);
    }
    const last = pageText(file, n).replace(/\s+/g, ' ');
    expect(last).toContain('How to verify this copy');
    expect(last).toContain(`This is issued sheet ${sheetId}, revision A, fingerprint ${fp}.`);
    expect(last).toContain(`Open http://panelpoint.test/verify/${sheetId} (or scan the code)`);
    // The PDF's Title, the metadata Chromium writes, names the sheet too (pdfinfo reads it).
    expect(execFileSync('pdfinfo', [file], { encoding: 'utf8' })).toMatch(new RegExp(`Title:.*issued sheet ${sheetId}, fingerprint ${fp}`));
  });

  it('when someone without any cookie opens the verify address, then they see only what the sheet prints: firm, job, truss, revision, issue date, current', async () => {
    const res = await request(services.app).get(`/api/public/verify/${sheetId}`);
    expect(res.status).toBe(200);
    expect(res.headers['set-cookie']).toBeUndefined();
    const row = await SheetRevision.findByPk(sheetId);
    expect(res.body).toEqual({
      sheetId,
      firm: 'Harrow & Vale Structural (demo)',
      jobNumber: 'HV-2417',
      projectName: expect.stringContaining('Kestrel Logistics'),
      trussName: 'T1 — typical interior truss',
      revision: 'A',
      issuedOn: new Date(row!.issuedAt!).toISOString().slice(0, 10),
      status: 'current',
      supersededBy: null,
      fingerprint: await expectedFingerprint(),
      fingerprintOf: expect.stringContaining('not of the PDF file'),
    });
    // Not a sheet that was issued (a number nobody issued): one sentence, 404.
    const none = await request(services.app).get('/api/public/verify/999999');
    expect(none.status).toBe(404);
    expect(none.body.error.message).toMatch(/^No issued calc sheet has the number 999999\. .*footer\.$/);
    const bad = await request(services.app).get('/api/public/verify/abc');
    expect(bad.status).toBe(404);
    // A revision that exists but is not issued (a draft) is not shown either.
    const draft = (await engineer.agent.post('/api/trusses/1/sheets').set('X-CSRF-Token', engineer.csrf).send({ runId: row!.runId }).expect(201)).body.id;
    expect((await request(services.app).get(`/api/public/verify/${draft}`)).status).toBe(404);
  });

  it('when the issued PDF is dropped on the public page by someone not signed in, then its bytes match the archive', async () => {
    const visitor = await openTab(services.app);
    const res = await visitor.agent.post('/api/public/verify').set('X-CSRF-Token', visitor.csrf).attach('file', pdf, 'sheet.pdf');
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ outcome: 'match', sha256: sha(pdf), recordIntact: true, sheet: { sheetId, revision: 'A', status: 'current' } });
    expect(res.body.verdict).toMatch(new RegExp(`^This file is exactly issued sheet ${sheetId} \\(Harrow & Vale Structural \\(demo\\), job HV-2417 .*revision A, issued \\d{4}-\\d\\d-\\d\\d\\): its bytes match the copy archived at issue\\.$`));
  });

  it('when an altered copy is dropped (one byte of a page stream changed, or an editor appended an update), then it is told which sheet it claims to be and that its bytes differ', async () => {
    const visitor = await openTab(services.app);
    // One byte inside the first page content stream (after "stream\n"), as a hand edit would change a digit.
    const oneByte = Buffer.from(pdf);
    const at = oneByte.indexOf('stream\n', 0, 'latin1') + 7 + 20;
    oneByte[at] ^= 0x01;
    // An incremental update as an editor saves it: a new object and trailer appended (ISO 32000-1 §7.5.6).
    const appended = Buffer.concat([pdf, Buffer.from('\n99 0 obj\n<< /Annot (a note added later) >>\nendobj\n%%EOF\n', 'latin1')]);
    const fp = await expectedFingerprint();
    for (const altered of [oneByte, appended]) {
      const res = await visitor.agent.post('/api/public/verify').set('X-CSRF-Token', visitor.csrf).attach('file', altered, 'sheet.pdf');
      expect(res.status).toBe(200);
      expect(res.body.outcome).toBe('altered');
      expect(res.body.sha256).toBe(sha(altered));
      expect(res.body.sheet).toMatchObject({ sheetId, revision: 'A', fingerprint: fp });
      expect(res.body.verdict).toMatch(new RegExp(`^This file claims to be issued sheet ${sheetId} \\(Harrow & Vale Structural \\(demo\\), job HV-2417 .*\\), but its bytes differ from the copy archived at issue`));
    }
  });

  it('when the upload is not a PDF, or larger than the limit, then one sentence and nothing is stored', async () => {
    const visitor = await openTab(services.app);
    const issuedDir = path.join(services.config.dataDir, 'issued-sheets');
    const before = { files: fs.readdirSync(issuedDir).length, uploads: fs.readdirSync(services.config.uploadsDir).length, rows: await SheetRevision.count() };
    const notPdf = await visitor.agent.post('/api/public/verify').set('X-CSRF-Token', visitor.csrf).attach('file', Buffer.from('0\nSECTION\n2\nHEADER\n'), 'truss.pdf');
    expect(notPdf.status).toBe(400);
    expect(notPdf.body.error.message).toBe('That file is not a PDF (it does not start with "%PDF-"): choose the calc sheet PDF itself.');
    const huge = Buffer.concat([Buffer.from('%PDF-1.4\n'), Buffer.alloc(MAX_BYTES + 1, 0x20)]);
    const tooLarge = await visitor.agent.post('/api/public/verify').set('X-CSRF-Token', visitor.csrf).attach('file', huge, 'big.pdf');
    expect(tooLarge.status).toBe(413);
    expect(tooLarge.body.error.message.split('. ').length).toBeLessThanOrEqual(2);
    const none = await visitor.agent.post('/api/public/verify').set('X-CSRF-Token', visitor.csrf).send({});
    expect(none.status).toBe(400);
    expect({ files: fs.readdirSync(issuedDir).length, uploads: fs.readdirSync(services.config.uploadsDir).length, rows: await SheetRevision.count() }).toEqual(before);
  });
});

describe('public verify rate limit (per network address, in the database)', () => {
  it('when one address asks more than the limit in a window, then 429 with Retry-After and one sentence; the count survives a second server on the same file', async () => {
    const limited = await startTestServices({ verifyAddressLimit: 3, verifyRateWindowMs: 60_000 }, { realFile: true });
    try {
      for (let i = 0; i < 3; i++) expect((await request(limited.app).get('/api/public/verify/999999')).status).toBe(404);
      const refused = await request(limited.app).get('/api/public/verify/999999');
      expect(refused.status).toBe(429);
      expect(Number(refused.headers['retry-after'])).toBeGreaterThan(0);
      expect(Number(refused.headers['retry-after'])).toBeLessThanOrEqual(60);
      expect(refused.body.error.message).toMatch(/^Too many verify requests from your network address: try again in \d+ seconds\.$/);
      // The upload is refused before its body is read.
      const visitor = await openTab(limited.app);
      expect((await visitor.agent.post('/api/public/verify').set('X-CSRF-Token', visitor.csrf).attach('file', Buffer.from('%PDF-1.4\n'), 'a.pdf')).status).toBe(429);
      // Sign-in counts are separate keys in the same table: a refused verify does not lock sign-in.
      await signIn(limited.app, demoEmail('drafter'));
      // A second server process on the same database file sees the same count.
      const again = await startTestServices({ verifyAddressLimit: 3, verifyRateWindowMs: 60_000, dataDir: limited.config.dataDir, databaseStorage: limited.config.databaseStorage });
      try {
        expect((await request(again.app).get('/api/public/verify/999999')).status).toBe(429);
      } finally {
        await again.shutdown();
      }
    } finally {
      await limited.shutdown();
      fs.rmSync(limited.config.dataDir, { recursive: true, force: true });
    }
  }, 60_000);
});
