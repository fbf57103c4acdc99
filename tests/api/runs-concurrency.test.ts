import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { TrussModel } from '@shared/model/truss';
import type { RunSummaryView } from '@shared/schemas/run.schema';
import type { Services } from '../../server/bootstrap';
import { TrussModelRecord } from '../../server/db/models';
import { demoEmail, signIn, startTestServices, type Tab } from '../support/test-services';

/**
 * A parallel-chord truss of n panels (1 m × 1 m): bottom joints L0…Ln, top joints U0…Un,
 * chords, posts and one diagonal per panel, pin at L0, roller at Ln, 1 kN down at every inner
 * bottom joint. m + r = (2n + (n + 1) + n) + 3 = 2(2n + 2) = 2j: determinate.
 */
function bigTruss(n: number): TrussModel {
  const joints: TrussModel['joints'] = [];
  const members: TrussModel['members'] = [];
  for (let i = 0; i <= n; i++) joints.push({ id: `L${i}`, tag: `L${i}`, x: i, y: 0 }, { id: `U${i}`, tag: `U${i}`, x: i, y: 1 });
  const member = (a: string, b: string) => members.push({ id: `${a}-${b}`, tag: `${a}${b}`, from: a, to: b });
  for (let i = 0; i < n; i++) {
    member(`L${i}`, `L${i + 1}`);
    member(`U${i}`, `U${i + 1}`);
    member(`U${i}`, `L${i + 1}`);
  }
  for (let i = 0; i <= n; i++) member(`L${i}`, `U${i}`);
  const loads = [];
  for (let i = 1; i < n; i++) loads.push({ joint: `L${i}`, fx: 0, fy: -1 });
  return {
    joints,
    members,
    supports: [
      { joint: 'L0', kind: 'pin' },
      { joint: `L${n}`, kind: 'roller', angleDeg: 90 },
    ],
    loadCases: [{ id: 'D', name: 'Dead', category: 'dead', loads }],
    combinations: [],
  };
}

let services: Services;
let engineer: Tab;
let trussId: number;
const PANELS = 10_000; // 20 002 joints, 40 001 members

beforeAll(async () => {
  services = await startTestServices();
  engineer = await signIn(services.app, demoEmail('engineer'));
  const truss = await engineer.agent.post('/api/projects/1/trusses').set('X-CSRF-Token', engineer.csrf).send({ name: 'T99 — long roof, generated' });
  trussId = truss.body.id;
  // Geometry normally comes from a drawing; a truss this size is written straight into the
  // working-model table, the way an import would leave it.
  await TrussModelRecord.create({ trussId, drawingId: null, model: JSON.stringify(bigTruss(PANELS)), takeoff: null, updatedById: null });
});
afterAll(async () => {
  await services.shutdown();
});

async function runStatus(id: number): Promise<RunSummaryView> {
  const list = await engineer.agent.get(`/api/trusses/${trussId}/runs`).expect(200);
  return (list.body as RunSummaryView[]).find((r) => r.id === id)!;
}

describe('solving off the main thread', () => {
  it('when a truss of 20 000 joints is solving, then another request is answered before the run finishes', { timeout: 240_000 }, async () => {
    const started = await engineer.agent.post(`/api/trusses/${trussId}/runs`).set('X-CSRF-Token', engineer.csrf).send({});
    expect(started.status).toBe(202);
    const id = (started.body as RunSummaryView).id;
    // Wait until a worker has picked the run up.
    let status = await runStatus(id);
    while (status.status === 'queued') {
      await new Promise((r) => setTimeout(r, 20));
      status = await runStatus(id);
    }
    expect(status.status).toBe('running');
    expect(status.progress.phase).toBe('solving');

    const session = await engineer.agent.get('/api/session');
    expect(session.status).toBe(200);
    const answeredAt = Date.now();
    // Ordering, not timing: the run was still going when the session read came back.
    expect((await runStatus(id)).status).toBe('running');

    while (status.status === 'queued' || status.status === 'running') {
      await new Promise((r) => setTimeout(r, 200));
      status = await runStatus(id);
    }
    expect(status.status).toBe('solved');
    expect(status.classification!.kind).toBe('determinate');
    expect(Date.parse(status.finishedAt!)).toBeGreaterThan(answeredAt);
    // The independent residual of equilibrium stays small on the big truss.
    expect(status.maxResidual!).toBeLessThan(1e-6);
  });
});
