import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Services } from '../../server/bootstrap';
import type { RunSummaryView } from '@shared/schemas/run.schema';
import { demoEmail, signIn, startTestServices, type Tab } from '../support/test-services';

/**
 * Runs numbered per truss (1, 2, … within each truss), on the real SQLite file of the test
 * services. The truss is a two-member triangle as an R12 DXF (DXF Reference, Autodesk: LINE with
 * group codes 10/20, 11/21); whether it solves does not matter here, only the numbers.
 */
function triangleDxf(): Buffer {
  const line = (a: [number, number], b: [number, number]) =>
    ['0', 'LINE', '8', 'TRUSS', '10', a[0], '20', a[1], '30', 0, '11', b[0], '21', b[1], '31', 0].join('\n');
  const entities = [line([0, 0], [6, 0]), line([6, 0], [3, 2]), line([3, 2], [0, 0])];
  return Buffer.from(['0', 'SECTION', '2', 'ENTITIES', ...entities, '0', 'ENDSEC', '0', 'EOF', ''].join('\n'));
}

let services: Services;
let engineer: Tab;
let drafter: Tab;
const post = (tab: Tab, path: string, body: object = {}) => tab.agent.post(path).set('X-CSRF-Token', tab.csrf).send(body);

async function trussWithModel(name: string): Promise<number> {
  const truss = await post(drafter, '/api/projects/1/trusses', { name });
  expect(truss.status).toBe(201);
  const upload = await drafter.agent
    .post(`/api/trusses/${truss.body.id}/drawings`)
    .set('X-CSRF-Token', drafter.csrf)
    .field('units', 'm')
    .attach('file', triangleDxf(), 'tri.dxf');
  expect(upload.status).toBe(201);
  return truss.body.id as number;
}

async function startRun(trussId: number): Promise<RunSummaryView> {
  const res = await post(engineer, `/api/trusses/${trussId}/runs`);
  expect(res.status).toBe(202);
  return res.body as RunSummaryView;
}

beforeAll(async () => {
  services = await startTestServices();
  engineer = await signIn(services.app, demoEmail('engineer'));
  drafter = await signIn(services.app, demoEmail('drafter'));
});
afterAll(async () => {
  await services.shutdown();
});

describe('runs numbered per truss', () => {
  it('when runs of two trusses are started in turn, then each truss counts its own from 1', async () => {
    const a = await trussWithModel('T21 — numbering A');
    const b = await trussWithModel('T22 — numbering B');
    const a1 = await startRun(a);
    const b1 = await startRun(b);
    const a2 = await startRun(a);
    expect([a1.number, a2.number, b1.number]).toEqual([1, 2, 1]);
    // The row ids run across the firm; the numbers do not.
    expect(b1.id).toBeGreaterThan(a1.id);
    const list = (await engineer.agent.get(`/api/trusses/${a}/runs`).expect(200)).body as RunSummaryView[];
    expect(list.map((r) => r.number)).toEqual([2, 1]);
  });

  it('when two runs of one truss are started at the same moment, then they get 1 and 2, never the same', async () => {
    const t = await trussWithModel('T23 — numbering at once');
    const [x, y] = await Promise.all([startRun(t), startRun(t)]);
    expect([x.number, y.number].sort()).toEqual([1, 2]);
    const [p, q, r] = await Promise.all([startRun(t), startRun(t), startRun(t)]);
    expect([p.number, q.number, r.number].sort()).toEqual([3, 4, 5]);
  });

});
