import { execFile } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Services } from '../../server/bootstrap';
import type { TrussModelView } from '@shared/schemas/drawing.schema';
import type { RunSummaryView, RunView, TakeoffInput } from '@shared/schemas/run.schema';
import type { LoadCase } from '@shared/model/truss';
import { demoEmail, signIn, startTestServices, type Tab } from '../support/test-services';

/**
 * The job file and the app agree on the roof loading's loads (issue 12 item 6): a truss with a
 * roof loading is exported from the app, solved on the command line and compared with the app's
 * run of the same saved model, then imported back and compared with the model. The truss is a
 * 3-4-5 gable of our own drawn as an R12 DXF in metres: L (0, 0), T (4, 3), R (8, 0), post to M (4, 0).
 *
 * The roof loading writes three cases: S (snow) and W (wind) are put in by "Use these loads" and
 * marked as from the roof loading; D (dead) is one it writes too but its loads were detached and
 * entered by hand (-7 kN at T, -2 kN at M), so the roof loading no longer updates them. A run
 * solves the saved loads; the command line must solve the same ones, not the roof loading's D.
 */
function trussDxf(): Buffer {
  const line = (a: [number, number], b: [number, number]) => ['0', 'LINE', '8', 'TRUSS', '10', a[0], '20', a[1], '30', 0, '11', b[0], '21', b[1], '31', 0].join('\n');
  const entities = [line([0, 0], [4, 0]), line([4, 0], [8, 0]), line([0, 0], [4, 3]), line([4, 3], [8, 0]), line([4, 0], [4, 3])];
  return Buffer.from(['0', 'SECTION', '2', 'ENTITIES', ...entities, '0', 'ENDSEC', '0', 'EOF', ''].join('\n'));
}

const root = path.resolve(__dirname, '../..');
const exec = promisify(execFile);
let services: Services;
let engineer: Tab;
let trussId: number;
const J = {} as Record<'L' | 'M' | 'R' | 'T', string>;

const post = (p: string, body: unknown = {}) => engineer.agent.post(p).set('X-CSRF-Token', engineer.csrf).send(body as object);
const current = async (): Promise<TrussModelView> => (await engineer.agent.get(`/api/trusses/${trussId}/model`).expect(200)).body;

const roof = (): TakeoffInput => ({
  topChordJoints: [J.L, J.T, J.R],
  areaLoads: [
    { caseId: 'D', q: 0.6, unit: 'kPa', basis: 'slope' },
    { caseId: 'S', q: 1.1, unit: 'kPa', basis: 'plan', patterns: true },
  ],
  wind: { caseId: 'W', q: 0.8, unit: 'kPa', windward: 'left', cWindward: 0.3, cLeeward: -0.6 },
  spacing: 4,
  trussCount: 3,
  trussIndex: 0,
  method: 'exact',
});

async function solveOnCommandLine(text: string): Promise<{ cases: Record<string, { forces: Record<string, number>; reactions: { rx: number; ry: number }[] }>; combinations: Record<string, { forces: Record<string, number> }> }> {
  const dir = mkdtempSync(path.join(os.tmpdir(), 'panelpoint-roof-job-'));
  const file = path.join(dir, 'truss.job.json');
  writeFileSync(file, text);
  const { stdout } = await exec(process.execPath, ['--import', 'tsx', 'scripts/solve.ts', file], { cwd: root });
  return JSON.parse(stdout);
}

async function runOf(): Promise<RunView> {
  const started = await post(`/api/trusses/${trussId}/runs`);
  expect(started.status).toBe(202);
  for (let i = 0; i < 600; i++) {
    const r = (await engineer.agent.get(`/api/runs/${(started.body as RunSummaryView).id}`).expect(200)).body as RunView;
    if (r.status !== 'queued' && r.status !== 'running') return r;
    await new Promise((ok) => setTimeout(ok, 50));
  }
  throw new Error('run did not finish');
}

beforeAll(async () => {
  services = await startTestServices();
  engineer = await signIn(services.app, demoEmail('engineer'));
  const drafter = await signIn(services.app, demoEmail('drafter'));
  trussId = (await drafter.agent.post('/api/projects/1/trusses').set('X-CSRF-Token', drafter.csrf).send({ name: 'T10 — roof loading in the job file' })).body.id;
  const up = await drafter.agent.post(`/api/trusses/${trussId}/drawings`).set('X-CSRF-Token', drafter.csrf).field('units', 'm').attach('file', trussDxf(), 't10.dxf');
  expect(up.body.status).toBe('imported');
  const { model, version } = await current();
  const at = (x: number, y: number) => model.joints.find((j) => Math.abs(j.x - x) < 1e-9 && Math.abs(j.y - y) < 1e-9)!.id;
  Object.assign(J, { L: at(0, 0), M: at(4, 0), R: at(8, 0), T: at(4, 3) });
  // As "Use these loads" does: the preview's loads go into S and W, marked; D keeps hand loads (detached).
  const computed = (await post(`/api/trusses/${trussId}/takeoff/preview`, roof())).body.result.caseLoads as Record<string, LoadCase['loads']>;
  expect(Object.keys(computed).sort()).toEqual(['D', 'S', 'W']);
  const loadCases: LoadCase[] = [
    { id: 'D', name: 'Roofing, detached', category: 'dead', loads: [{ joint: J.T, fx: 0, fy: -7 }, { joint: J.M, fx: 0, fy: -2, note: 'ceiling' }] },
    { id: 'S', name: 'Snow', category: 'snow', loads: computed.S!, source: 'roof-loading' },
    { id: 'W', name: 'Wind from the left', category: 'wind', loads: computed.W!, source: 'roof-loading' },
  ];
  const saved = await engineer.agent
    .put(`/api/trusses/${trussId}/model`)
    .set('X-CSRF-Token', engineer.csrf)
    .send({
      version,
      supports: [{ joint: J.L, kind: 'pin' }, { joint: J.R, kind: 'roller', angleDeg: 90 }],
      loadCases,
      combinations: [{ name: 'C1', factors: { D: 1.2, S: 1.6, W: 0.5 } }, { name: 'C2', factors: { D: 0.9, W: 1.0 } }],
      members: [],
      takeoff: roof(),
    });
  expect(saved.status).toBe(200);
});
afterAll(async () => {
  await services?.shutdown();
});

describe('job file with a roof loading: the app, the command line and the import agree', () => {
  it('when the exported file is solved on the command line, then every case and combination has the app run\'s forces and reactions (the detached case keeps its hand loads)', async () => {
    const run = await runOf();
    expect(run.status).toBe('solved');
    const text = (await engineer.agent.get(`/api/trusses/${trussId}/job-file`).expect(200)).text;
    const job = JSON.parse(text) as { cases: { id: string; source?: string }[]; loads: { case: string; fy: number }[] };
    // The file says which cases hold the roof loading's loads, and carries every load as saved.
    expect(job.cases.map((c) => [c.id, c.source ?? null])).toEqual([['D', null], ['S', 'roof-loading'], ['W', 'roof-loading']]);
    expect(job.loads.filter((l) => l.case === 'D').map((l) => l.fy)).toEqual([-7, -2]);
    const out = await solveOnCommandLine(text);
    let compared = 0;
    for (const c of run.analysis!.cases) {
      for (const [id, v] of Object.entries(c.forces)) {
        expect(Math.abs(out.cases[c.caseId].forces[id] - v), `${c.caseId} ${id}`).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(v)));
        compared++;
      }
      c.reactions.forEach((r, k) => {
        expect(Math.abs(out.cases[c.caseId].reactions[k].rx - r.rx)).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(r.rx)));
        expect(Math.abs(out.cases[c.caseId].reactions[k].ry - r.ry)).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(r.ry)));
      });
    }
    for (const c of run.analysis!.combinations) for (const [id, v] of Object.entries(c.forces)) expect(Math.abs(out.combinations[c.name].forces[id] - v)).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(v)));
    expect(compared).toBe(15);
    // The hand check of case D: a 3-4-5 gable on a pin and a roller, -7 kN at T and -2 kN at M
    // gives each support 4.5 kN up by symmetry (statics, from memory).
    const d = run.analysis!.cases.find((c) => c.caseId === 'D')!;
    expect(d.reactions.map((r) => r.ry)).toEqual([expect.closeTo(4.5, 12), expect.closeTo(4.5, 12)]);
  });

  it('when the run\'s calc sheet is built, then it prints the roof loading\'s steps of the marked cases (S, W) and none of the detached case D', async () => {
    const run = await runOf();
    const html = (await engineer.agent.get(`/api/runs/${run.id}/sheet`).expect(200)).text;
    const ids = [...html.matchAll(/<article class="step[^"]*" id="(takeoff\/[^"]+)"/g)].map((m) => m[1]);
    expect(ids.some((id) => id.startsWith('takeoff/S/'))).toBe(true);
    expect(ids.some((id) => id.startsWith('takeoff/W/'))).toBe(true);
    expect(ids.filter((id) => id.startsWith('takeoff/D/'))).toEqual([]);
    // The steps every case shares (the purlins' widths) stay.
    expect(ids.some((id) => /^takeoff\/purlin-[^/]+\/width$/.test(id))).toBe(true);
  });

  it('when the exported file is imported back, then the model is the same (marks, loads and roof loading) and only its version moves on', async () => {
    const before = await current();
    const text = (await engineer.agent.get(`/api/trusses/${trussId}/job-file`).expect(200)).text;
    const res = await post(`/api/trusses/${trussId}/job-file`, JSON.parse(text));
    expect(res.status).toBe(200);
    const after = res.body as TrussModelView;
    expect(after.version).toBe(before.version + 1);
    expect(after.model).toEqual(before.model);
    expect(after.takeoff).toEqual(before.takeoff);
  });

  it('when a marked case is written without loads, then the file takes the roof loading\'s loads for it, on the command line and on import alike', async () => {
    const before = await current();
    const job = JSON.parse((await engineer.agent.get(`/api/trusses/${trussId}/job-file`).expect(200)).text) as { loads: { case: string }[] };
    const short = { ...job, loads: job.loads.filter((l) => l.case !== 'S') };
    const run = await runOf();
    const out = await solveOnCommandLine(JSON.stringify(short));
    const s = run.analysis!.cases.find((c) => c.caseId === 'S')!;
    for (const [id, v] of Object.entries(s.forces)) expect(Math.abs(out.cases.S.forces[id] - v)).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(v)));
    const res = await post(`/api/trusses/${trussId}/job-file`, short);
    expect(res.status).toBe(200);
    expect((res.body as TrussModelView).model.loadCases).toEqual(before.model.loadCases);
  });

  it('when a marked case\'s loads differ from the roof loading\'s, then the command line (exit 2) and the import (422) refuse it with one sentence, and nothing is written', async () => {
    const before = await current();
    const job = JSON.parse((await engineer.agent.get(`/api/trusses/${trussId}/job-file`).expect(200)).text) as { loads: { case: string; fy: number }[] };
    const edited = { ...job, loads: job.loads.map((l) => (l.case === 'S' ? { ...l, fy: l.fy * 1.5 } : l)) };
    const res = await post(`/api/trusses/${trussId}/job-file`, edited);
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/Load case "S" is marked as from the roof loading \("source": "roof-loading"\), but its loads differ from what the roof loading computes/);
    expect((await current()).version).toBe(before.version);
    const dir = mkdtempSync(path.join(os.tmpdir(), 'panelpoint-roof-job-'));
    const file = path.join(dir, 'edited.job.json');
    writeFileSync(file, JSON.stringify(edited));
    const failed = await exec(process.execPath, ['--import', 'tsx', 'scripts/solve.ts', file], { cwd: root }).then(
      () => null,
      (e: { code: number; stderr: string }) => e,
    );
    expect(failed?.code).toBe(2);
    expect(failed?.stderr).toMatch(/^solve: bad-job: Load case "S" is marked as from the roof loading \("source": "roof-loading"\), but its loads differ/);
  });

  it('when a case is marked but the roof loading does not write it (or there is none), then it is refused with one sentence', async () => {
    const before = await current();
    const job = JSON.parse((await engineer.agent.get(`/api/trusses/${trussId}/job-file`).expect(200)).text) as Record<string, unknown> & { cases: { id: string }[] };
    const marked = { ...job, cases: job.cases.map((c) => (c.id === 'D' ? { ...c, source: 'roof-loading' } : c)), takeoff: { ...(job.takeoff as TakeoffInput), areaLoads: [] } };
    const res = await post(`/api/trusses/${trussId}/job-file`, marked);
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/Load case "D" is marked as from the roof loading \("source": "roof-loading"\), but the roof loading writes no loads into it/);
    const { takeoff: _t, ...bare } = job;
    void _t;
    const none = await post(`/api/trusses/${trussId}/job-file`, bare);
    expect(none.status).toBe(422);
    expect(none.body.error.message).toMatch(/Load case "S" is marked as from the roof loading \("source": "roof-loading"\), but the job file has no "takeoff"/);
    const bad = await post(`/api/trusses/${trussId}/job-file`, { ...job, cases: job.cases.map((c) => ({ ...c, source: 'drawing' })) });
    expect(bad.status).toBe(422);
    expect(bad.body.error.message).toMatch(/source/);
    expect((await current()).version).toBe(before.version);
  });
});
