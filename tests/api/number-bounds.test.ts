import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Services } from '../../server/bootstrap';
import { demoEmail, signIn, startTestServices, type Tab } from '../support/test-services';
import { dxf, line } from '../support/hostile-dxf';

// Numbers out of all physical sense (−1e308 kN, a factor of 1e308) are refused with a sentence
// naming the value and its unit, and nothing is written. Before, they were saved, the run said
// "solved" with null forces, and the sheet and CSV gave 500.
let services: Services;
let engineer: Tab;
let trussId: number;

beforeAll(async () => {
  services = await startTestServices({ maxUploadBytes: 200_000 });
  engineer = await signIn(services.app, demoEmail('engineer'));
  trussId = (await engineer.agent.post('/api/projects/1/trusses').set('X-CSRF-Token', engineer.csrf).send({ name: 'T40 — numbers' })).body.id;
  const up = await engineer.agent
    .post(`/api/trusses/${trussId}/drawings`)
    .set('X-CSRF-Token', engineer.csrf)
    .attach('file', dxf([line(0, 0, 4000, 0), line(4000, 0, 2000, 1500), line(2000, 1500, 0, 0)]), 'triangle.dxf');
  expect(up.body.status).toBe('imported');
});
afterAll(async () => {
  await services.shutdown();
});

async function model() {
  return (await engineer.agent.get(`/api/trusses/${trussId}/model`).expect(200)).body;
}

function save(body: Record<string, unknown>) {
  return engineer.agent.put(`/api/trusses/${trussId}/model`).set('X-CSRF-Token', engineer.csrf).send(body);
}

describe('numbers out of physical sense', () => {
  const cases: [string, (joint: string) => Record<string, unknown>, RegExp][] = [
    ['a joint load of −1e308 kN', (j) => ({ loadCases: [{ id: 'D', name: 'Dead', category: 'dead', loads: [{ joint: j, fx: 0, fy: -1e308 }] }] }), /fy is below −1 × 10⁶ kN/],
    ['a combination factor of 1e308', () => ({ loadCases: [{ id: 'D', name: 'Dead', category: 'dead', loads: [] }], combinations: [{ name: 'C1', factors: { D: 1e308 } }] }), /combination factor is above 10/],
    ['a roller at 1e9 degrees', (j) => ({ supports: [{ joint: j, kind: 'roller', angleDeg: 1e9 }] }), /angle is above 360°/],
  ];
  for (const [what, change, message] of cases) {
    it(`${what}: refused (400, the API's answer to a bad field) with a sentence naming the value's limit and unit, nothing saved`, async () => {
      const before = await model();
      const joint = before.model.joints[0].id as string;
      const res = await save({ version: before.version, supports: [], loadCases: [], combinations: [], members: [], ...change(joint) });
      expect(res.status).toBe(400);
      const text = [res.body.error.message, ...Object.values(res.body.error.fields ?? {})].join(' ');
      expect(text).toMatch(message);
      expect((await model()).version).toBe(before.version);
    });
  }

  it('a member area of 1e-20 m² is refused, as is an area load of 1e308 kPa in the takeoff preview', async () => {
    const before = await model();
    const m = before.model.members[0].id as string;
    const res = await save({ version: before.version, supports: [], loadCases: [], combinations: [], members: [{ id: m, A: 1e-20 }] });
    expect(res.status).toBe(400);
    expect(JSON.stringify(res.body.error)).toMatch(/area A is below 1 × 10⁻⁸ m²/);
    const top = before.model.joints.map((j: { id: string }) => j.id);
    const preview = await engineer.agent
      .post(`/api/trusses/${trussId}/takeoff/preview`)
      .set('X-CSRF-Token', engineer.csrf)
      .send({ topChordJoints: top, areaLoads: [{ caseId: 'D', q: 1e308, unit: 'kPa', basis: 'plan' }], spacing: 4, trussCount: 3, trussIndex: 1, method: 'tributary' });
    expect(preview.status).toBe(400);
    expect(JSON.stringify(preview.body.error)).toMatch(/area load q is above 10,000 kPa/);
  });
});
