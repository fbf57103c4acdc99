import fs from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Services } from '../../server/bootstrap';
import { Drawing } from '../../server/db/models';
import { demoEmail, signIn, startTestServices, type Tab } from '../support/test-services';
import { blockBomb, deepNesting, dxf, line, lineMissingEnd, mutualInsert, selfInsert, zeroLengthOnly } from '../support/hostile-dxf';

// Drawings from outside sources, built to hurt: each is refused with its one sentence (422),
// the stored upload is removed and no drawing version is written. Before, these gave 500 while
// the layers were listed, and the nested-block file exploded into a million joints.
let services: Services;
let drafter: Tab;
let trussId: number;

beforeAll(async () => {
  services = await startTestServices({ maxUploadBytes: 200_000 });
  drafter = await signIn(services.app, demoEmail('drafter'));
  trussId = (await drafter.agent.post('/api/projects/1/trusses').set('X-CSRF-Token', drafter.csrf).send({ name: 'T30 — hostile drawings' })).body.id;
});
afterAll(async () => {
  await services.shutdown();
});

const upload = (bytes: Buffer, name: string) =>
  drafter.agent.post(`/api/trusses/${trussId}/drawings`).set('X-CSRF-Token', drafter.csrf).attach('file', bytes, name);

describe('hostile drawings', () => {
  const cases: [string, () => Buffer, string, RegExp][] = [
    ['a block that inserts itself', selfInsert, 'block-problem', /contains a reference to itself \(through LOOP → LOOP\)/],
    ['two blocks inserting each other', mutualInsert, 'block-problem', /through A → B → A/],
    ['blocks nested 40 deep', () => deepNesting(40), 'block-problem', /nested more than 32 deep/],
    ['3 kB of nested blocks that explode into a million segments', () => blockBomb(10, 4), 'drawing-too-large', /more than 200,000 line segments/],
    ['a LINE without an end', lineMissingEnd, 'bad-coordinate', /lacks a start or end point/],
  ];
  for (const [what, make, code, message] of cases) {
    it(`${what}: 422 with one sentence saying what to do, nothing stored`, async () => {
      const before = { versions: await Drawing.count({ where: { trussId } }), files: fs.readdirSync(services.config.uploadsDir).length };
      const bytes = make();
      const started = Date.now();
      const res = await upload(bytes, 'from-outside.dxf');
      expect(res.status).toBe(422);
      expect(res.body.error.code).toBe(code);
      expect(res.body.error.message).toMatch(message);
      expect(res.body.error.message).toMatch(/\.$/);
      expect(res.body.error.message).not.toMatch(/\n/);
      expect(Date.now() - started).toBeLessThan(5_000);
      expect(await Drawing.count({ where: { trussId } })).toBe(before.versions);
      expect(fs.readdirSync(services.config.uploadsDir).length).toBe(before.files);
    });
  }

  it('a drawing of only zero-length lines is kept as a failed version with its sentence (not 500), and the app goes on answering', async () => {
    const res = await upload(zeroLengthOnly(), 'points-only.dxf');
    expect(res.status).toBe(201);
    expect(res.body.status).toBe('failed');
    expect(res.body.error).toMatchObject({ code: 'no-lines' });
    expect(res.body.error.message).toMatch(/zero length/);
    // a sound drawing after all that still imports
    const ok = await upload(dxf([line(0, 0, 4000, 0), line(4000, 0, 2000, 1500), line(2000, 1500, 0, 0)]), 'triangle.dxf');
    expect(ok.status).toBe(201);
    expect(ok.body.status).toBe('imported');
  });
});
