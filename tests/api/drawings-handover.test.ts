import fs from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Services } from '../../server/bootstrap';
import { Drawing, TrussModelRecord } from '../../server/db/models';
import { demoEmail, signIn, startTestServices, type Tab } from '../support/test-services';
import { circle, dxf, dxfIn, line, parallelChordTruss, polyline } from '../support/hostile-dxf';

// Drawings that hand over (issue 15 item 5), through the upload route on a real database:
// groups at import so the roof loading starts at once, the mechanism warning, flat 3D
// polylines, and the refusals (no lines, a polyline not flat) that store nothing.
let services: Services;
let drafter: Tab;
let engineer: Tab;

beforeAll(async () => {
  services = await startTestServices({ maxUploadBytes: 200_000 });
  drafter = await signIn(services.app, demoEmail('drafter'));
  engineer = await signIn(services.app, demoEmail('engineer'));
});
afterAll(async () => {
  await services.shutdown();
});

async function newTruss(name: string): Promise<number> {
  const res = await drafter.agent.post('/api/projects/1/trusses').set('X-CSRF-Token', drafter.csrf).send({ name });
  expect(res.status).toBe(201);
  return res.body.id;
}
const upload = (trussId: number, bytes: Buffer, name: string) =>
  drafter.agent.post(`/api/trusses/${trussId}/drawings`).set('X-CSRF-Token', drafter.csrf).attach('file', bytes, name);
const nothingStored = async (trussId: number, filesBefore: number) => {
  expect(await Drawing.count({ where: { trussId } })).toBe(0);
  expect(await TrussModelRecord.count({ where: { trussId } })).toBe(0);
  expect(fs.readdirSync(services.config.uploadsDir).length).toBe(filesBefore);
};

describe('a drawing that hands over', () => {
  it('when a drafter uploads CHORDS and WEBS with the middle diagonal missing, then the report warns of the mechanism naming its joints, and the engineer can preview the roof loading at once', async () => {
    const trussId = await newTruss('T41 — handover');
    // three 3 m by 2 m panels in metres; top row A B C D, bottom row E F G H
    const res = await upload(trussId, dxf(parallelChordTruss({ panels: 3, a: 3, h: 2, skipDiagonal: 1 })), 't41.dxf');
    expect(res.status).toBe(201);
    expect(res.body.status).toBe('imported');
    const warning = res.body.result.report.find((e: { kind: string }) => e.kind === 'mechanism');
    expect(warning.severity).toBe('warning');
    // m = 12, j = 8, r = 3 assumed: 15 < 16 (the count rule m + r ≥ 2j, from memory)
    expect(warning.message).toMatch(/m \+ r = 12 \+ 3 = 15 is less than 2j = 16, taking r = 3 reactions \(a pin and a roller/);
    expect([...warning.jointTags].sort()).toEqual(['B', 'C', 'F', 'G']);

    const model = (await engineer.agent.get(`/api/trusses/${trussId}/model`).expect(200)).body.model;
    const tagsOf = (g: string) => model.members.filter((m: { group?: string }) => m.group === g).map((m: { tag: string }) => m.tag).sort();
    expect(tagsOf('top-chord')).toEqual(['AB', 'BC', 'CD']);
    expect(tagsOf('bottom-chord')).toEqual(['EF', 'FG', 'GH']);
    expect(tagsOf('web')).toHaveLength(6);
    // the top-chord joints, as the app takes them from the groups, are enough for a preview
    const idOf = (tag: string) => model.joints.find((j: { tag: string }) => j.tag === tag).id;
    const preview = await engineer.agent
      .post(`/api/trusses/${trussId}/takeoff/preview`)
      .set('X-CSRF-Token', engineer.csrf)
      .send({ topChordJoints: ['A', 'B', 'C', 'D'].map(idOf), areaLoads: [{ caseId: 'D', q: 0.5, unit: 'kPa', basis: 'plan' }], spacing: 4, trussCount: 5, trussIndex: 2, method: 'tributary' });
    expect(preview.status).toBe(200);
    // tributary widths on plan: 1.5 m at the ends, 3 m inside; w = q × spacing × width (from memory)
    const byJoint = Object.fromEntries(preview.body.result.purlins.map((p: { joint: string; widthPlan: number }) => [p.joint, p.widthPlan]));
    expect(byJoint[idOf('A')]).toBeCloseTo(1.5, 12);
    expect(byJoint[idOf('B')]).toBeCloseTo(3, 12);
  });

  it('when a second drawing version has its layers in another order, then the groups the engineer set are kept', async () => {
    const trussId = await newTruss('T42 — second version');
    await upload(trussId, dxf(parallelChordTruss({ panels: 2, a: 3, h: 2 })), 'v1.dxf').expect(201);
    const v1 = (await engineer.agent.get(`/api/trusses/${trussId}/model`)).body;
    const ab = v1.model.members.find((m: { tag: string }) => m.tag === 'AB');
    const members = v1.model.members.map((m: { id: string; group?: string }) => ({ id: m.id, group: m.id === ab.id ? 'other' : m.group }));
    const saved = await engineer.agent
      .put(`/api/trusses/${trussId}/model`)
      .set('X-CSRF-Token', engineer.csrf)
      .send({ version: v1.version, supports: [], loadCases: [], combinations: [], members });
    expect(saved.status).toBe(200);
    const reversed = parallelChordTruss({ panels: 2, a: 3, h: 2 }).reverse();
    await upload(trussId, dxf(reversed), 'v2.dxf').expect(201);
    const v2 = (await engineer.agent.get(`/api/trusses/${trussId}/model`)).body.model;
    expect(v2.members.find((m: { tag: string }) => m.tag === 'AB').group).toBe('other');
    expect(v2.members.find((m: { tag: string }) => m.tag === 'BC').group).toBe('top-chord');
  });

  it('when the truss is drawn as flat 3D polylines, then it imports', async () => {
    const trussId = await newTruss('T43 — 3D polylines');
    const res = await upload(trussId, dxf([polyline([[0, 0, 3], [6, 0, 3], [3, 2, 3], [0, 0, 3]], 'CHORDS'), polyline([[3, 0, 3], [3, 2, 3]], 'WEBS')]), 't43.dxf');
    expect(res.status).toBe(201);
    expect(res.body.status).toBe('imported');
    expect(res.body.result.members).toHaveLength(5);
  });

  it('when a 3D polyline rises in z, then the upload is refused with one sentence giving the entity and z range, and nothing is stored', async () => {
    const trussId = await newTruss('T44 — not flat');
    const before = fs.readdirSync(services.config.uploadsDir).length;
    const res = await upload(trussId, dxf([polyline([[0, 0, 0], [6, 0, 0], [3, 2, 1.2]], 'TRUSS')]), 't44.dxf');
    expect(res.status).toBe(422);
    expect(res.body.error.code).toBe('not-planar');
    expect(res.body.error.message).toMatch(/^The 3D POLYLINE \(handle 2F, layer "TRUSS"\) does not lie flat: its vertices' z runs from 0 mm to 1\.2 m \(1\.2 m apart\)/);
    await nothingStored(trussId, before);
  });

  it('when a unitless file holds no lines at all, then it is told so (not asked for units) and nothing is stored', async () => {
    const trussId = await newTruss('T45 — no lines');
    const before = fs.readdirSync(services.config.uploadsDir).length;
    const res = await upload(trussId, dxfIn(0, [circle(0, 0, 1)]), 't45.dxf');
    expect(res.status).toBe(422);
    expect(res.body.error).toEqual({ code: 'no-lines', message: 'The drawing holds no lines or polylines on any layer (it holds 1 circle). Draw the truss members as lines or polylines and upload again.' });
    await nothingStored(trussId, before);
  });

  it('when a unitless file holds lines, then it is still kept to be re-imported with units', async () => {
    const trussId = await newTruss('T46 — unitless');
    const res = await upload(trussId, dxfIn(0, [line(0, 0, 4000, 0), line(4000, 0, 2000, 1500), line(2000, 1500, 0, 0)]), 't46.dxf');
    expect(res.status).toBe(201);
    expect(res.body.status).toBe('failed');
    expect(res.body.error.code).toBe('units-required');
  });
});
