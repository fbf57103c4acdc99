import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { DeleteObjectCommand, GetObjectCommand, ListObjectsV2Command, PutObjectCommand } from '@aws-sdk/client-s3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ORPHAN_GRACE_MS, sweepLeftovers, type Services } from '../../server/bootstrap';
import { Drawing, SheetRevision } from '../../server/db/models';
import { sweepOrphans } from '../../server/storage/file-hygiene';
import { fakeS3Start, type FakeS3 } from '../support/s3-fake';
import { demoEmail, demoUserId, signIn, startTestServices, type Tab } from '../support/test-services';
import { fixtureRun } from '../support/fixtures';
import { tinyPdfRenderer } from '../support/tiny-pdf';

/**
 * Drawings and issued sheets in an S3-compatible object store: a real local S3 server (s3rver
 * from npm, on a free loopback port, data in a temp folder) started and stopped here, the
 * server on a real SQLite file with real sessions and the real SMTP sink, talking to the store
 * through the AWS SDK. The bucket is read and tampered with directly through a client of the
 * test's own. Issued PDFs come from the small hand-built PDF renderer the review tests use.
 */

const PREFIX = 'firm-a';
let s3: FakeS3;
let services: Services;
const tab = {} as Record<'drafter' | 'engineer' | 'reviewer', Tab>;
const renderer = tinyPdfRenderer();
const fixture = (name: string) => fs.readFileSync(path.join(import.meta.dirname, '..', 'fixtures', 'dxf', name));
const sha = (b: Buffer) => crypto.createHash('sha256').update(b).digest('hex');
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

/** Every key in the bucket under the prefix, read with the test's own client. */
async function bucketKeys(): Promise<string[]> {
  const out = await s3.client.send(new ListObjectsV2Command({ Bucket: s3.bucket, Prefix: `${PREFIX}/` }));
  return (out.Contents ?? []).map((o) => o.Key!).sort();
}
async function bucketObject(key: string): Promise<Buffer> {
  const out = await s3.client.send(new GetObjectCommand({ Bucket: s3.bucket, Key: key }));
  return Buffer.from(await out.Body!.transformToByteArray());
}

const solvedRun = fixtureRun;

/** Draft → in check → checked → issued, through the API. */
async function issue(trussId: number): Promise<number> {
  const runId = await solvedRun(trussId);
  const id = (await post(tab.engineer, `/api/trusses/${trussId}/sheets`, { runId }).expect(201)).body.id as number;
  await post(tab.engineer, `/api/sheets/${id}/submit`, { checkerId: await demoUserId() }).expect(200);
  await post(tab.reviewer, `/api/sheets/${id}/check`).expect(200);
  await post(tab.engineer, `/api/sheets/${id}/issue`).expect(200);
  return id;
}

beforeAll(async () => {
  s3 = await fakeS3Start();
  services = await startTestServices({ storage: s3.storage(PREFIX) }, { realFile: true, review: { renderer } });
  for (const role of ['drafter', 'engineer', 'reviewer'] as const) tab[role] = await signIn(services.app, demoEmail(role));
});
afterAll(async () => {
  await services?.shutdown();
  if (services) {
    fs.rmSync(services.config.dataDir, { recursive: true, force: true });
    fs.rmSync(services.config.uploadsDir, { recursive: true, force: true });
  }
  await s3?.close();
});

describe('drawings in the object store', () => {
  it('the demo drawing went to the bucket at start, not to the uploads folder', async () => {
    const demo = (await Drawing.findOne({ where: { trussId: 1 } }))!;
    expect(await bucketKeys()).toEqual([`${PREFIX}/drawings/${demo.storedName}`]);
    expect(sha(await bucketObject(`${PREFIX}/drawings/${demo.storedName}`))).toBe(demo.sha256);
    expect(fs.readdirSync(services.config.uploadsDir)).toEqual([]);
  });

  it('when a drafter uploads a DXF, then it is stored in the bucket and read back through the API byte for byte', async () => {
    const bytes = fixture('r2000-faults-mm.dxf');
    const truss = await post(tab.drafter, '/api/projects/1/trusses', { name: 'T-S3 upload' }).expect(201);
    const up = await tab.drafter.agent.post(`/api/trusses/${truss.body.id}/drawings`).set('X-CSRF-Token', tab.drafter.csrf).attach('file', bytes, 'roof.dxf');
    expect(up.status).toBe(201);
    // SHA-256 of the uploaded bytes by node:crypto, and the object in the bucket read by our own client.
    expect(up.body.sha256).toBe(sha(bytes));
    const row = (await Drawing.findByPk(up.body.id))!;
    expect(Buffer.compare(await bucketObject(`${PREFIX}/drawings/${row.storedName}`), bytes)).toBe(0);
    const back = await binary(tab.drafter, `/api/drawings/${up.body.id}/file`).expect(200);
    expect(Buffer.compare(back.body as Buffer, bytes)).toBe(0);
    expect(back.headers['content-disposition']).toContain('roof.dxf');
    // A re-import reads the bytes from the bucket again.
    await post(tab.engineer, `/api/drawings/${up.body.id}/reimport`, { units: 'mm' }).expect(200);
    expect(fs.readdirSync(services.config.uploadsDir)).toEqual([]);
  });

  it('when the upload is not a DXF, then 422 with its sentence and nothing is written to the bucket', async () => {
    const before = await bucketKeys();
    const res = await tab.drafter.agent.post('/api/trusses/2/drawings').set('X-CSRF-Token', tab.drafter.csrf).attach('file', Buffer.from('%PDF-1.4 not a drawing'), 'x.dxf');
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/\.$/);
    expect(await bucketKeys()).toEqual(before);
  });

  it('when a drawing object is gone from the bucket, then its download and re-import answer one sentence (409), not 500', async () => {
    const bytes = fixture('r2000-faults-mm.dxf');
    const up = await tab.drafter.agent.post('/api/trusses/2/drawings').set('X-CSRF-Token', tab.drafter.csrf).attach('file', bytes, 'gable.dxf').expect(201);
    const row = (await Drawing.findByPk(up.body.id))!;
    await s3.client.send(new DeleteObjectCommand({ Bucket: s3.bucket, Key: `${PREFIX}/drawings/${row.storedName}` }));
    const file = await tab.drafter.agent.get(`/api/drawings/${row.id}/file`);
    expect(file.status).toBe(409);
    expect(file.body.error).toEqual({
      code: 'drawing-file-missing',
      message: `The file of drawing version ${row.version} is missing from the object store; ask your admin to restore it from backup, or upload the drawing again.`,
    });
    const again = await post(tab.engineer, `/api/drawings/${row.id}/reimport`, { units: 'mm' });
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('drawing-file-missing');
  });
});

describe('issued sheets in the object store', () => {
  let sheetId: number;
  let key: string;
  let issued: Buffer;

  it('when a sheet is issued, then its PDF is in the bucket and the archive download passes its SHA-256 check', async () => {
    sheetId = await issue(1);
    const row = (await SheetRevision.findByPk(sheetId))!;
    key = `${PREFIX}/issued-sheets/${row.pdfStoredName}`;
    expect(await bucketKeys()).toContain(key);
    const res = await binary(tab.drafter, `/api/sheets/${sheetId}/pdf`).expect(200);
    issued = res.body as Buffer;
    // The served bytes hash (node:crypto) to the SHA-256 recorded at issue, and are the bucket's bytes.
    expect(sha(issued)).toBe(row.sha256);
    expect(Buffer.compare(issued, await bucketObject(key))).toBe(0);
    expect(issued.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    expect((await verify(tab.drafter, issued)).body).toMatchObject({ signature: 'valid', archivedFile: 'intact' });
  });

  it('when the object is altered in the store, then the archive download refuses it with the sentence (409) and verify says altered', async () => {
    const altered = Buffer.from(issued);
    altered[altered.indexOf('Revision') + 2] ^= 0x20;
    await s3.client.send(new PutObjectCommand({ Bucket: s3.bucket, Key: key, Body: altered }));
    const res = await tab.drafter.agent.get(`/api/sheets/${sheetId}/pdf`);
    expect(res.status).toBe(409);
    expect(res.body.error).toEqual({ code: 'archived-file-altered', message: 'The archived file no longer matches its record; restore it from backup.' });
    expect((await verify(tab.drafter, issued)).body).toMatchObject({ signature: 'valid', archivedFile: 'altered' });
  });

  it('when the object is missing from the store, then the download says so in one sentence (409) and verify says missing', async () => {
    await s3.client.send(new DeleteObjectCommand({ Bucket: s3.bucket, Key: key }));
    const res = await tab.drafter.agent.get(`/api/sheets/${sheetId}/pdf`);
    expect(res.status).toBe(409);
    expect(res.body.error).toEqual({ code: 'archived-file-missing', message: 'The archived file of revision A is missing from the object store; restore it from backup.' });
    expect((await verify(tab.drafter, issued)).body).toMatchObject({ archivedFile: 'missing' });
    // Restored from backup: served again.
    await s3.client.send(new PutObjectCommand({ Bucket: s3.bucket, Key: key, Body: issued }));
    expect(sha((await binary(tab.drafter, `/api/sheets/${sheetId}/pdf`).expect(200)).body as Buffer)).toBe(sha(issued));
  });
});

describe('the sweep of left-overs on the object store', () => {
  it('removes an object no drawing names once it is older than the grace period, and keeps referenced drawings and issued sheets', async () => {
    const orphan = 'dddddddddddddddddddddddddddddddd.dxf';
    await s3.client.send(new PutObjectCommand({ Bucket: s3.bucket, Key: `${PREFIX}/drawings/${orphan}`, Body: Buffer.from('0\nEOF\n') }));
    // Something else in the bucket beside Panelpoint's keys is never touched.
    await s3.client.send(new PutObjectCommand({ Bucket: s3.bucket, Key: `${PREFIX}/drawings/notes/readme.txt`, Body: Buffer.from('kept') }));
    const before = await bucketKeys();
    const referenced = new Set((await Drawing.findAll({ raw: true })).map((d) => d.storedName));

    // Young: kept (another server process may be about to write its row), and the log says so.
    const log: string[] = [];
    expect(await sweepLeftovers(services.stores, (m) => log.push(m))).toEqual([]);
    expect(log.join('\n')).toMatch(/Kept 1 unreferenced upload/);
    expect(await bucketKeys()).toEqual(before);

    // Two hours on: removed, alone.
    const later = await sweepOrphans({ store: services.stores.drawings, isReferenced: (k) => referenced.has(k), graceMs: ORPHAN_GRACE_MS, now: Date.now() + 2 * 3600 * 1000 });
    expect(later).toEqual({ removed: [orphan], kept: [] });
    expect(await bucketKeys()).toEqual(before.filter((k) => !k.endsWith(orphan)));
  });
});

describe('a store that stops answering', () => {
  it('gives one sentence and 503 for a download, not 500', async () => {
    await s3.close();
    const res = await tab.drafter.agent.get(`/api/sheets/${(await SheetRevision.findOne({ where: { status: 'issued' } }))!.id}/pdf`);
    expect(res.status).toBe(503);
    expect(res.body.error.code).toBe('file-store-unavailable');
    expect(res.body.error.message).toMatch(/^The object store did not hand out a stored file \(connection refused\), so nothing was read or stored; try again in a minute/);
  });
});
