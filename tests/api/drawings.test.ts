import fs from 'node:fs';
import path from 'node:path';
import crypto from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Services } from '../../server/bootstrap';
import { Drawing, TrussModelRecord } from '../../server/db/models';
import { demoEmail, signIn, startTestServices, type Tab } from '../support/test-services';

const fixture = (name: string) => fs.readFileSync(path.join(import.meta.dirname, '..', 'fixtures', 'dxf', name));

let services: Services;
let drafter: Tab;
let trussId: number;

beforeAll(async () => {
  services = await startTestServices({ maxUploadBytes: 200_000 });
  drafter = await signIn(services.app, demoEmail('drafter'));
  const truss = await drafter.agent.post('/api/projects/1/trusses').set('X-CSRF-Token', drafter.csrf).send({ name: 'T9 — upload test' });
  trussId = truss.body.id;
});
afterAll(async () => {
  await services.shutdown();
});

const filesInUploads = () => fs.readdirSync(services.config.uploadsDir).length;

function upload(tab: Tab, bytes: Buffer, name: string, fields: Record<string, string> = {}) {
  let req = tab.agent.post(`/api/trusses/${trussId}/drawings`).set('X-CSRF-Token', tab.csrf);
  for (const [k, v] of Object.entries(fields)) req = req.field(k, v);
  return req.attach('file', bytes, name);
}

describe('drawing upload', () => {
  it('when a drafter uploads a millimetre DXF, then version 1 is stored with its SHA-256, import report and the working model', async () => {
    const bytes = fixture('r2000-faults-mm.dxf');
    const res = await upload(drafter, bytes, 'truss-t9.dxf');
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ version: 1, status: 'imported', originalName: 'truss-t9.dxf', size: bytes.length });
    // SHA-256 of the original bytes, computed independently by node:crypto.
    expect(res.body.sha256).toBe(crypto.createHash('sha256').update(bytes).digest('hex'));
    expect(res.body.result.units.unit).toBe('mm');
    expect(res.body.result.joints.length).toBeGreaterThan(3);
    expect(res.body.result.report.length).toBeGreaterThan(0);
    expect(res.body.layers.map((l: { name: string }) => l.name)).toContain('CHORDS');

    const model = await drafter.agent.get(`/api/trusses/${trussId}/model`).expect(200);
    expect(model.body.model.joints).toHaveLength(res.body.result.joints.length);
    expect(model.body.drawingId).toBe(res.body.id);

    // The stored bytes are the uploaded bytes.
    const file = await drafter.agent.get(`/api/drawings/${res.body.id}/file`).buffer(true).parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    expect(Buffer.compare(file.body as Buffer, bytes)).toBe(0);
  });

  it('when a unitless drawing is uploaded without units, then it is kept as a failed version that a re-import with units fixes', async () => {
    const res = await upload(drafter, fixture('r12-four-panel-unitless.dxf'), 'four-panel.dxf');
    expect(res.status).toBe(201);
    expect(res.body.status).toBe('failed');
    expect(res.body.error.code).toBe('units-required');
    expect(res.body.version).toBe(2);

    const engineer = await signIn(services.app, demoEmail('engineer'));
    const fixed = await engineer.agent.post(`/api/drawings/${res.body.id}/reimport`).set('X-CSRF-Token', engineer.csrf).send({ units: 'mm' });
    expect(fixed.status).toBe(200);
    expect(fixed.body.status).toBe('imported');
    expect(fixed.body.result.units).toMatchObject({ unit: 'mm', source: 'option' });
    // Newest version now drives the working model.
    const model = await engineer.agent.get(`/api/trusses/${trussId}/model`).expect(200);
    expect(model.body.drawingId).toBe(res.body.id);
  });

  it('when a re-import names a layer the drawing lacks, then 422 and the last good import stays', async () => {
    const list = await drafter.agent.get(`/api/trusses/${trussId}/drawings`).expect(200);
    expect(list.body.map((d: { version: number }) => d.version)).toEqual([2, 1]);
    const first = list.body[1];
    const before = await Drawing.findByPk(first.id);
    const res = await drafter.agent.post(`/api/drawings/${first.id}/reimport`).set('X-CSRF-Token', drafter.csrf).send({ layers: ['NO-SUCH-LAYER'] });
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/NO-SUCH-LAYER/);
    const after = await Drawing.findByPk(first.id);
    expect(after!.result).toBe(before!.result);
  });

  const refused: [string, Buffer, string][] = [
    ['an empty file', Buffer.alloc(0), 'empty-file'],
    ['a DWG renamed .dxf', Buffer.concat([Buffer.from('AC1027'), crypto.randomBytes(200)]), 'dwg-file'],
    ['a binary DXF', Buffer.concat([Buffer.from('AutoCAD Binary DXF\r\n\x1a\x00'), crypto.randomBytes(100)]), 'binary-dxf'],
    ['a PNG renamed .dxf', Buffer.concat([Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), crypto.randomBytes(100)]), 'image-file'],
    ['a zip renamed .dxf', Buffer.concat([Buffer.from([0x50, 0x4b, 0x03, 0x04]), crypto.randomBytes(100)]), 'zip-file'],
    ['a PDF renamed .dxf', Buffer.from('%PDF-1.7\n1 0 obj\n<<>>\nendobj\n'), 'pdf-file'],
    ['a text file that is not DXF', Buffer.from('Purlin schedule\nP1 4.5 m\nP2 4.5 m\n'), 'not-dxf'],
    ['a truncated DXF', fixture('r2000-faults-mm.dxf').subarray(0, 900), 'truncated'],
  ];
  it.each(refused)('when the upload is %s, then 422 with a clear message and nothing is stored', async (_what, bytes, code) => {
    const drawings = await Drawing.count();
    const files = filesInUploads();
    const model = await TrussModelRecord.findByPk(trussId);
    const res = await upload(drafter, bytes, 'drawing.dxf');
    expect(res.status).toBe(422);
    expect(res.body.error.code).toBe(code);
    expect(res.body.error.message.length).toBeGreaterThan(20);
    expect(await Drawing.count()).toBe(drawings);
    expect(filesInUploads()).toBe(files);
    expect((await TrussModelRecord.findByPk(trussId))!.version).toBe(model!.version);
  });

  it('when the file is over the size limit, then 413 and no file is left behind', async () => {
    const files = filesInUploads();
    const res = await upload(drafter, Buffer.alloc(300_000, 'x'), 'huge.dxf');
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('file-too-large');
    expect(filesInUploads()).toBe(files);
  });

  it('when no file is attached, then 400 file-missing', async () => {
    const res = await drafter.agent.post(`/api/trusses/${trussId}/drawings`).set('X-CSRF-Token', drafter.csrf).field('units', 'mm');
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('file-missing');
  });

  it('when a reviewer tries to upload, then 403 before any byte is stored', async () => {
    const reviewer = await signIn(services.app, demoEmail('reviewer'));
    const files = filesInUploads();
    const res = await upload(reviewer, fixture('r2000-faults-mm.dxf'), 'x.dxf');
    expect(res.status).toBe(403);
    expect(filesInUploads()).toBe(files);
  });

  it('when the units field is not one we know, then 400 and nothing is stored', async () => {
    const drawings = await Drawing.count();
    const res = await upload(drafter, fixture('r2000-faults-mm.dxf'), 'x.dxf', { units: 'furlongs' });
    expect(res.status).toBe(400);
    expect(await Drawing.count()).toBe(drawings);
  });
});
