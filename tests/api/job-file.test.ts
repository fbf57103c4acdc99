import { execFile } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Services } from '../../server/bootstrap';
import type { TrussModelView } from '@shared/schemas/drawing.schema';
import type { RunSummaryView, RunView } from '@shared/schemas/run.schema';
import { demoEmail, signIn, startTestServices, type Tab } from '../support/test-services';

/**
 * A two-pin king-post truss drawn as an R12 DXF in metres (L 0,0 — M 4,0 — R 8,0, apex T 4,3):
 * two pins make it indeterminate to degree 1, so the forces depend on EA and the command line
 * must get every member's stiffness from the export to give the run's forces.
 */
function trussDxf(): Buffer {
  const line = (a: [number, number], b: [number, number]) => ['0', 'LINE', '8', 'TRUSS', '10', a[0], '20', a[1], '30', 0, '11', b[0], '21', b[1], '31', 0].join('\n');
  const L: [number, number] = [0, 0];
  const M: [number, number] = [4, 0];
  const R: [number, number] = [8, 0];
  const T: [number, number] = [4, 3];
  return Buffer.from(['0', 'SECTION', '2', 'ENTITIES', line(L, M), line(M, R), line(L, T), line(T, R), line(M, T), '0', 'ENDSEC', '0', 'EOF', ''].join('\n'));
}

const root = path.resolve(__dirname, '../..');
const run = promisify(execFile);
let services: Services;
let engineer: Tab;
let reviewer: Tab;
let trussId: number;

const post = (tab: Tab, p: string, body: unknown = {}) => tab.agent.post(p).set('X-CSRF-Token', tab.csrf).send(body as object);
const model = async (): Promise<TrussModelView> => (await engineer.agent.get(`/api/trusses/${trussId}/model`).expect(200)).body;

beforeAll(async () => {
  services = await startTestServices();
  engineer = await signIn(services.app, demoEmail('engineer'));
  reviewer = await signIn(services.app, demoEmail('reviewer'));
  const drafter = await signIn(services.app, demoEmail('drafter'));
  trussId = (await post(drafter, '/api/projects/1/trusses', { name: 'T9 — job file truss' })).body.id;
  const up = await drafter.agent.post(`/api/trusses/${trussId}/drawings`).set('X-CSRF-Token', drafter.csrf).field('units', 'm').attach('file', trussDxf(), 't9.dxf');
  expect(up.status).toBe(201);
  const { model: m, version } = await model();
  const at = (x: number, y: number) => m.joints.find((j) => j.x === x && j.y === y)!.id;
  // Different EA per member, two cases with categories and a code set's combinations.
  const saved = await engineer.agent
    .put(`/api/trusses/${trussId}/model`)
    .set('X-CSRF-Token', engineer.csrf)
    .send({
      version,
      supports: [{ joint: at(0, 0), kind: 'pin' }, { joint: at(8, 0), kind: 'pin' }],
      loadCases: [
        { id: 'D', name: 'Roofing', category: 'dead', loads: [{ joint: at(4, 3), fx: 0, fy: -30, note: 'apex' }, { joint: at(4, 0), fx: 0, fy: -5 }] },
        { id: 'W', name: 'Wind from the left', category: 'wind', loads: [{ joint: at(4, 3), fx: 12, fy: 4 }] },
      ],
      combinations: [
        { name: 'C1', factors: { D: 1.2, W: 1.0 }, clause: 'by hand' },
        { name: 'C2', factors: { D: 0.9, W: 1.0 } },
      ],
      members: m.members.map((mb, k) => ({ id: mb.id, EA: 1e5 * (k + 1) })),
    });
  expect(saved.status).toBe(200);
});
afterAll(async () => {
  await services.shutdown();
});

describe('job file export and import', () => {
  it('when a reviewer exports the model, and the engineer imports it back, then the model is the same and only its version moves on', async () => {
    const before = await model();
    const res = await reviewer.agent.get(`/api/trusses/${trussId}/job-file`).expect(200);
    expect(res.headers['content-disposition']).toMatch(/^attachment; filename="?T9-job-file-truss\.job\.json"?$/);
    const job = JSON.parse(res.text);
    expect(job.cases).toEqual([
      { id: 'D', name: 'Roofing', category: 'dead' },
      { id: 'W', name: 'Wind from the left', category: 'wind' },
    ]);
    expect(job.EA).toHaveLength(5);
    const imported = await post(engineer, `/api/trusses/${trussId}/job-file`, job);
    expect(imported.status).toBe(200);
    const after = imported.body as TrussModelView;
    expect(after.version).toBe(before.version + 1);
    expect(after.model).toEqual(before.model);
    expect(after.takeoff).toEqual(before.takeoff);
  });

  it('when the exported file is solved on the command line, then its forces and reactions equal the app run to 1e-12', async () => {
    const started = await post(engineer, `/api/trusses/${trussId}/runs`);
    expect(started.status).toBe(202);
    let runView: RunView | null = null;
    for (let i = 0; i < 600 && !runView; i++) {
      const r = (await engineer.agent.get(`/api/runs/${(started.body as RunSummaryView).id}`).expect(200)).body as RunView;
      if (r.status !== 'queued' && r.status !== 'running') runView = r;
      else await new Promise((ok) => setTimeout(ok, 50));
    }
    expect(runView!.status).toBe('solved');
    const analysis = runView!.analysis!;
    expect(analysis.classification.kind).toBe('indeterminate');
    const text = (await engineer.agent.get(`/api/trusses/${trussId}/job-file`).expect(200)).text;
    const dir = mkdtempSync(path.join(os.tmpdir(), 'panelpoint-job-'));
    const file = path.join(dir, 'truss.job.json');
    writeFileSync(file, text);
    const { stdout } = await run(process.execPath, ['--import', 'tsx', 'scripts/solve.ts', file], { cwd: root });
    const out = JSON.parse(stdout) as { cases: Record<string, { forces: Record<string, number>; reactions: { rx: number; ry: number }[] }>; combinations: Record<string, { forces: Record<string, number> }> };
    let compared = 0;
    for (const c of analysis.cases) {
      for (const [id, v] of Object.entries(c.forces)) {
        expect(Math.abs(out.cases[c.caseId].forces[id] - v)).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(v)));
        compared++;
      }
      c.reactions.forEach((r, k) => {
        expect(Math.abs(out.cases[c.caseId].reactions[k].ry - r.ry)).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(r.ry)));
      });
    }
    for (const c of analysis.combinations) for (const [id, v] of Object.entries(c.forces)) expect(Math.abs(out.combinations[c.name].forces[id] - v)).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(v)));
    expect(compared).toBe(10);
  });

  it.each([
    ['a case used in loads but not declared', (j: Record<string, unknown>) => ({ ...j, cases: [{ id: 'D', name: 'Roofing', category: 'dead' }] }), /load case "W", which "cases" does not declare/],
    ['a case declared twice', (j: Record<string, unknown>) => ({ ...j, cases: [...(j.cases as object[]), { id: 'D', name: 'Again', category: 'dead' }] }), /declares load case "D" twice/],
    ['an unknown category', (j: Record<string, unknown>) => ({ ...j, cases: [{ id: 'D', name: 'Roofing', category: 'deadish' }, { id: 'W', name: 'W', category: 'wind' }] }), /category "deadish"; use one of dead, live, roof-live, snow, wind, other/],
    ['an unknown set id', (j: Record<string, unknown>) => ({ ...j, combinationSet: 'asce7-22' }), /"combinationSet" is "asce7-22", which is not a combination set; use one of asce7-16-strength/],
    ['a combination naming a missing case', (j: Record<string, unknown>) => ({ ...j, combinations: [{ name: 'X', factors: { S: 1.6 } }] }), /Combination "X" has a factor on load case "S", which the job does not have/],
    ['an EA entry that is no member', (j: Record<string, unknown>) => ({ ...j, EA: [{ from: [0, 0], to: [8, 0], EA: 1e5 }] }), /no member joins those joints/],
    ['a wind coefficient without a velocity pressure', (j: Record<string, unknown>) => ({ ...j, takeoff: { ...roof(j), areaLoads: [], wind: { caseId: 'W', windward: 'left', cWindward: -0.9, cLeeward: -0.5 } } }), /A wind pressure coefficient is given without a velocity pressure q/],
    ['a partial-loading request for a dead case', (j: Record<string, unknown>) => ({ ...j, takeoff: { ...roof(j), areaLoads: [{ caseId: 'D', q: 1, basis: 'plan', patterns: true }] } }), /Load case "D" is a dead case, and span patterns are checked only for roof live, live and snow load/],
  ])('when the imported file has %s, then it is refused with one sentence (422) and nothing is written', async (_what, change, message) => {
    const before = await model();
    const job = JSON.parse((await engineer.agent.get(`/api/trusses/${trussId}/job-file`).expect(200)).text) as Record<string, unknown>;
    const res = await post(engineer, `/api/trusses/${trussId}/job-file`, change(job));
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(message);
    expect(res.body.error.message.trim().split(/(?<=[.;])\s+(?=[A-Z])/).length).toBeLessThanOrEqual(2);
    expect((await model()).version).toBe(before.version);
  });

  it('when a combination set is named with declared cases, then the import forms its combinations with their clauses', async () => {
    const job = JSON.parse((await engineer.agent.get(`/api/trusses/${trussId}/job-file`).expect(200)).text) as Record<string, unknown>;
    const res = await post(engineer, `/api/trusses/${trussId}/job-file`, { ...job, combinations: [], combinationSet: 'asce7-16-strength' });
    expect(res.status).toBe(200);
    const combos = (res.body as TrussModelView).model.combinations;
    // ASCE/SEI 7-16 §2.3.1 (1): 1.4D is always formed; (4)/(6) give 0.9D + 1.0W (wind present, counteracting dead).
    expect(combos.find((c) => c.factors.D === 1.4 && Object.keys(c.factors).length === 1)?.clause).toMatch(/2\.3\.1 \(1\)/);
    expect(combos.some((c) => c.factors.D === 0.9 && c.factors.W === 1)).toBe(true);
  });
});

/** A roof loading over the top chord L–T–R of the exported job (joints by their job ids). */
function roof(j: Record<string, unknown>) {
  const id = (x: number, y: number) => (j.joints as { id: string; at: [number, number] }[]).find((p) => p.at[0] === x && p.at[1] === y)!.id;
  return { topChordJoints: [id(0, 0), id(4, 3), id(8, 0)], spacing: 5, trussCount: 3, trussIndex: 1, method: 'exact' };
}
