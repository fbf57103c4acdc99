import type { Test } from 'supertest';
import { expect } from 'vitest';
import type { TrussModelView } from '@shared/schemas/drawing.schema';
import type { RunView } from '@shared/schemas/run.schema';
import { AnalysisRun } from '../../server/db/models';
import type { Tab } from './test-services';

/**
 * The demo truss T1 (12 m span, 3 m rise, six 2 m panels) pinned at the left bearing, on a
 * roller at the right, with one dead case of 10 kN down at each of the five upper panel points,
 * saved through the API by `tab` (an engineer). By hand (method of joints, tension positive):
 * R = 5 × 10 / 2 = 25 kN at each bearing; the end top chord N = −R·√5 = −55.90 kN and the end
 * bottom chord +2R = +50.00 kN. `apexLoad` (kN) changes the load at the apex (6, 3) alone.
 */
export async function loadDemoTruss(tab: Tab, apexLoad = 10): Promise<void> {
  const current: TrussModelView = (await tab.agent.get('/api/trusses/1/model').expect(200)).body;
  const at = (x: number, y: number) => current.model.joints.find((j) => Math.abs(j.x - x) < 1e-6 && Math.abs(j.y - y) < 1e-6)!.id;
  const saved = await tab.agent
    .put('/api/trusses/1/model')
    .set('X-CSRF-Token', tab.csrf)
    .send({
      version: current.version,
      supports: [
        { joint: at(0, 0), kind: 'pin' },
        { joint: at(12, 0), kind: 'roller', angleDeg: 90 },
      ],
      loadCases: [{ id: 'D', name: 'Roof dead load', category: 'dead', loads: [[2, 1], [4, 2], [6, 3], [8, 2], [10, 1]].map(([x, y]) => ({ joint: at(x, y), fx: 0, fy: x === 6 ? -apexLoad : -10 })) }],
      combinations: [],
      members: [],
    });
  expect(saved.status).toBe(200);
}

/** Starts a run of truss `trussId` through the API and waits (at most 20 s) until it is no longer queued or running. */
export async function runToEnd(tab: Tab, trussId = 1): Promise<RunView> {
  const started = await tab.agent.post(`/api/trusses/${trussId}/runs`).set('X-CSRF-Token', tab.csrf).send({});
  expect(started.status).toBe(202);
  let run: RunView = started.body;
  for (let i = 0; i < 400 && (run.status === 'queued' || run.status === 'running' || !run.status); i++) {
    await new Promise((r) => setTimeout(r, 50));
    run = (await tab.agent.get(`/api/runs/${started.body.id}`)).body;
  }
  return run;
}

/** `loadDemoTruss`, then a run of it, which must solve. */
export async function solvedDemoRun(tab: Tab): Promise<RunView> {
  await loadDemoTruss(tab);
  const run = await runToEnd(tab);
  expect(run.status).toBe('solved');
  return run;
}

/** A run row said to be solved, written straight to the database, for tests of what happens behind a sheet (not of the solve). */
export async function fixtureRun(trussId: number): Promise<number> {
  const r = await AnalysisRun.create({
    trussId,
    // 1, 2, … within the truss (migration 0014); these fixtures are written one at a time.
    number: (await AnalysisRun.count({ where: { trussId } })) + 1,
    modelVersion: 1,
    status: 'solved',
    progress: '{}',
    model: '{}',
    takeoff: null,
    analysis: null,
    summary: '{"note":"fixture run"}',
    error: null,
    ranById: null,
    startedAt: new Date(),
    finishedAt: new Date(),
  });
  return r.id;
}

/** A response body as bytes (PDFs and other binary downloads). */
export const binaryBody = (req: Test) =>
  req.buffer(true).parse((r, cb) => {
    const chunks: Buffer[] = [];
    r.on('data', (c: Buffer) => chunks.push(c));
    r.on('end', () => cb(null, Buffer.concat(chunks)));
  });
