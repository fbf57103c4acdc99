import { execFile } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Services } from '../../server/bootstrap';
import type { TrussModelView } from '@shared/schemas/drawing.schema';
import type { RunSummaryView, RunView } from '@shared/schemas/run.schema';
import { demoEmail, demoUserId, signIn, startTestServices, type Tab } from '../support/test-services';

/**
 * The job file carries the member design: a two-pin king-post truss (an R12 DXF in metres:
 * L 0,0 — M 4,0 — R 8,0, apex T 4,3; indeterminate to degree 1) with member groups, one member's
 * own EA, a design of three groups (by chord, by "all", by end points) and a deflection request.
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
const exec = promisify(execFile);
let services: Services;
let engineer: Tab;
let drafter: Tab;
let trussId: number;

const post = (tab: Tab, p: string, body: unknown = {}) => tab.agent.post(p).set('X-CSRF-Token', tab.csrf).send(body as object);
const modelOf = async (id: number): Promise<TrussModelView> => (await engineer.agent.get(`/api/trusses/${id}/model`).expect(200)).body;
const exportOf = async (id: number): Promise<string> => (await engineer.agent.get(`/api/trusses/${id}/job-file`).expect(200)).text;

async function newTruss(name: string): Promise<number> {
  const id = (await post(drafter, '/api/projects/1/trusses', { name })).body.id as number;
  const up = await drafter.agent.post(`/api/trusses/${id}/drawings`).set('X-CSRF-Token', drafter.csrf).field('units', 'm').attach('file', trussDxf(), 'kp.dxf');
  expect(up.status).toBe(201);
  return id;
}

async function solveFile(text: string): Promise<{ code: number; stdout: string; stderr: string }> {
  const file = path.join(mkdtempSync(path.join(os.tmpdir(), 'panelpoint-jobd-')), 'truss.job.json');
  writeFileSync(file, text);
  try {
    const { stdout, stderr } = await exec(process.execPath, ['--import', 'tsx', 'scripts/solve.ts', file], { cwd: root });
    return { code: 0, stdout, stderr };
  } catch (e) {
    const err = e as { code: number; stdout: string; stderr: string };
    return { code: err.code, stdout: err.stdout, stderr: err.stderr };
  }
}

beforeAll(async () => {
  services = await startTestServices();
  engineer = await signIn(services.app, demoEmail('engineer'));
  drafter = await signIn(services.app, demoEmail('drafter'));
  trussId = await newTruss('K4 — design job file');
  const { model: m, version } = await modelOf(trussId);
  const at = (x: number, y: number) => m.joints.find((j) => j.x === x && j.y === y)!.id;
  const member = (a: string, b: string) => m.members.find((mb) => (mb.from === a && mb.to === b) || (mb.from === b && mb.to === a))!.id;
  const [L, M, R, T] = [at(0, 0), at(4, 0), at(8, 0), at(4, 3)];
  const groupOf = new Map([
    [member(L, T), 'top-chord'],
    [member(T, R), 'top-chord'],
    [member(L, M), 'bottom-chord'],
    [member(M, R), 'bottom-chord'],
    [member(M, T), 'web'],
  ]);
  const saved = await engineer.agent
    .put(`/api/trusses/${trussId}/model`)
    .set('X-CSRF-Token', engineer.csrf)
    .send({
      version,
      supports: [{ joint: L, kind: 'pin' }, { joint: R, kind: 'pin' }],
      loadCases: [
        { id: 'D', name: 'Roofing and ceiling', category: 'dead', loads: [{ joint: T, fx: 0, fy: -30 }, { joint: M, fx: 0, fy: -5, note: 'ceiling' }] },
        { id: 'S', name: 'Snow', category: 'snow', loads: [{ joint: T, fx: 0, fy: -20 }] },
      ],
      combinations: [
        { name: 'S1', factors: { D: 1 } },
        { name: 'U1', factors: { D: 1.2, S: 1.6 }, clause: 'ASCE/SEI 7-16 2.3.1 (3)' },
        { name: 'U2', factors: { D: 1.4 }, clause: 'ASCE/SEI 7-16 2.3.1 (1)' },
      ],
      // M–R keeps a stiffness of its own; the others take their design section's.
      members: m.members.map((mb) => ({ id: mb.id, group: groupOf.get(mb.id), ...(mb.id === member(M, R) ? { EA: 3e5, section: 'tie, site-welded' } : {}) })),
    });
  expect(saved.status).toBe(200);
  const d = await engineer.agent
    .put(`/api/trusses/${trussId}/design`)
    .set('X-CSRF-Token', engineer.csrf)
    .send({
      version: saved.body.version,
      design: {
        standard: 'aisc360-16-lrfd',
        groups: [
          { name: 'Everything', members: 'all', material: { kind: 'grade', grade: 'A992' }, section: { shape: 'rect-hollow', B: 100, H: 100, t: 4 } },
          { name: 'Rafters', members: 'top-chord', material: { kind: 'steel', Fy: 345, Fu: 450, E: 200_000 }, section: { shape: 'properties', A: 1500, rx: 30, ry: 40 }, Kx: 0.9, Ky: 0.9 },
          { name: 'Post', members: [member(M, T)], material: { kind: 'grade', grade: 'A36' }, section: { shape: 'angle', b: 60, d: 60, t: 6 }, Ly: 2 },
        ],
        deflection: { joints: [T], combinations: ['S1'], limit: 300 },
      },
    });
  expect(d.status).toBe(200);
});
afterAll(async () => {
  await services.shutdown();
});

async function runToEnd(id: number): Promise<RunView> {
  const started = await post(engineer, `/api/trusses/${id}/runs`);
  expect(started.status).toBe(202);
  for (let i = 0; i < 600; i++) {
    const r = (await engineer.agent.get(`/api/runs/${(started.body as RunSummaryView).id}`).expect(200)).body as RunView;
    if (r.status !== 'queued' && r.status !== 'running') return r;
    await new Promise((ok) => setTimeout(ok, 50));
  }
  throw new Error('run did not finish');
}

describe('job file with the member design', () => {
  it('when exported, then "design" and "deflection" are in the job-file shape: members by chord, "all" or end points, K for both axes, deflection joints by coordinates', async () => {
    const job = JSON.parse(await exportOf(trussId));
    expect(job.design).toEqual({
      standard: 'aisc360-16-lrfd',
      groups: [
        { name: 'Everything', members: 'all', material: { grade: 'A992' }, section: { shape: 'rect-hollow', B: 100, H: 100, t: 4 } },
        { name: 'Rafters', members: 'top-chord', material: { Fy: 345, Fu: 450, E: 200_000 }, section: { A: 1500, rx: 30, ry: 40 }, K: 0.9 },
        { name: 'Post', members: [{ from: [4, 3], to: [4, 0] }], material: { grade: 'A36' }, section: { shape: 'angle', b: 60, d: 60, t: 6 }, Ly: 2 },
      ],
    });
    expect(job.deflection).toEqual({ joints: [[4, 3]], combinations: ['S1'], limit: 300 });
    // Only the member's own stiffness is written; the others take their section's on the command line too.
    expect(job.EA).toEqual([{ from: [4, 0], to: [8, 0], EA: 3e5 }]);
    expect(job.members.map((m: { group?: string }) => m.group).sort()).toEqual(['bottom-chord', 'bottom-chord', 'top-chord', 'top-chord', 'web']);
  });

  it('when the export is imported on a new truss of the same drawing, then that truss stores the same model and design, and its export is the same file', async () => {
    const text = await exportOf(trussId);
    const other = await newTruss('K4 copy — design job file');
    const res = await post(engineer, `/api/trusses/${other}/job-file`, JSON.parse(text));
    expect(res.status).toBe(200);
    const a = (await modelOf(trussId)).model;
    const b = (res.body as TrussModelView).model;
    expect(b.design).toEqual(a.design);
    expect(b.members).toEqual(a.members);
    expect(await exportOf(other)).toBe(text);
  });

  it('when the export is solved on the command line, then its design utilisations and deflections equal the app run to 1e-9, and match the hand values', async () => {
    const run = await runToEnd(trussId);
    expect(run.status).toBe('solved');
    const design = run.analysis!.design!;
    expect(design.error).toBeNull();
    const r = await solveFile(await exportOf(trussId));
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout) as {
      design: { member: string; utilisation: number; governing: string; pass: boolean; checks: { clause: string; combination: string; ratio: number }[] }[];
      deflection: { joint: string; combination: string; dx: number; dy: number; ratio: number }[];
    };
    expect(out.design).toHaveLength(5);
    for (const m of design.members) {
      const c = out.design.find((d) => d.member === m.tag)!;
      expect(Math.abs(c.utilisation - m.utilisation)).toBeLessThanOrEqual(1e-9 * Math.max(1, m.utilisation));
      expect(c.governing).toBe(m.governing);
      expect(c.pass).toBe(m.pass);
      expect(c.checks.map((k) => k.ratio)).toEqual(m.checks.map((k) => k.ratio));
    }
    expect(out.deflection).toHaveLength(1);
    expect(Math.abs(out.deflection[0].dy - design.deflection[0].dy)).toBeLessThanOrEqual(1e-9);
    expect(Math.abs(out.deflection[0].ratio - design.deflection[0].ratio)).toBeLessThanOrEqual(1e-9);

    // Hand values, outside the code. Method of joints on the two-pin king post (sin θ = 3/5, rafter
    // 5 m): the pins take the thrust, the post hangs the 5 kN ceiling load, each rafter carries
    // −(P_apex + post)/2 / sin θ. U1 = 1.2D + 1.6S: −(1.2·35 + 1.6·20)·5/6 = −61.67 kN.
    const Nu = ((1.2 * 35 + 1.6 * 20) * 5) / 6;
    // AISC 360-16 E3: KL/r = 0.9·5000/30 = 150 > 4.71√(E/Fy), so Fcr = 0.877 Fe (E3-3), φc = 0.90 (E1).
    const Fe = (Math.PI ** 2 * 200_000) / 150 ** 2;
    const phiPn = (0.9 * 0.877 * Fe * 1500) / 1000;
    const rafter = out.design.find((d) => d.member === design.members.find((m) => m.group === 'Rafters')!.tag)!;
    const e1 = rafter.checks.find((k) => k.clause === 'AISC 360-16 E1' && k.combination === 'U1')!;
    expect(e1.ratio).toBeCloseTo(Nu / phiPn, 9);
    // AISC 360-16 E2 (user note): Lc/r ≤ 200, here 150/200 = 0.75, which governs the utilisation.
    expect(rafter.checks.find((k) => k.clause === 'AISC 360-16 E2')!.ratio).toBeCloseTo(150 / 200, 9);
    expect(rafter.utilisation).toBeCloseTo(Math.max(Nu / phiPn, 150 / 200), 9);
    // Unit-load method (virtual work), S1 = D: n = −5/6 and N = −35·5/6 in each rafter, nothing in
    // the chords or the post under the unit load; AE = 1500 mm² · 200 000 MPa = 300 000 kN.
    const dyHand = -((2 * (5 / 6) * ((35 * 5) / 6) * 5) / 300_000) * 1000;
    expect(out.deflection[0].dy).toBeCloseTo(dyHand, 9);
  }, 60_000);

  it.each([
    ['a design member no member joins', (j: Job) => group(j, 2, { members: [{ from: [0, 0], to: [8, 0] }] }), /names a member from \[0, 0\] to \[8, 0\] m, but no member joins those joints/],
    ['a design end point off every joint', (j: Job) => group(j, 2, { members: [{ from: [4, 0.5], to: [4, 3] }] }), /at \[4, 0\.5\] m is not at a joint within .* m \(nearest is joint/],
    ['a zero section area', (j: Job) => group(j, 1, { section: { A: 0, rx: 30, ry: 40 } }), /The section of design group “Rafters” \(design\.groups\.1\): the area A must be greater than 0\./],
    ['a negative wall', (j: Job) => group(j, 0, { section: { shape: 'rect-hollow', B: 100, H: 100, t: -4 } }), /the wall t must be greater than 0/],
    ['timber values under a steel basis', (j: Job) => group(j, 0, { material: { Ft: 5, Fc: 8, Emin: 4000, E: 9000, c: 0.8 } }), /is timber but AISC 360-16, LRFD \(φ\) is for steel/],
    ['an unknown grade', (j: Job) => group(j, 0, { material: { grade: 'A9999' } }), /A9999/],
    ['an unknown design basis', (j: Job) => ({ ...j, design: { ...(j.design as object), standard: 'bs5950' } }), /Choose the design basis/],
    ['a section key of another shape', (j: Job) => group(j, 0, { section: { shape: 'rect-hollow', B: 100, H: 100, t: 4, D: 48 } }), /take B, H, t .* not "D"/],
    ['a deflection combination the job lacks', (j: Job) => ({ ...j, deflection: { joints: [[4, 3]], combinations: ['SLS9'], limit: 300 } }), /service combination "SLS9", which is neither a combination nor a load case/],
    ['a deflection without a design', (j: Job) => ({ ...j, design: undefined }), /"deflection" needs the members' sections and materials/],
    ['a member left out of every group', (j: Job) => ({ ...j, design: { ...(j.design as object), groups: (j.design as { groups: object[] }).groups.slice(1) } }), /is in no design group|are in no design group/],
  ])('when the imported file has %s, then it is refused with one sentence (422) and nothing is written', async (_what, change, message) => {
    const before = await modelOf(trussId);
    const job = JSON.parse(await exportOf(trussId)) as Job;
    const res = await post(engineer, `/api/trusses/${trussId}/job-file`, JSON.parse(JSON.stringify(change(job))));
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(message);
    expect(res.body.error.message.trim().split(/(?<=[.;])\s+(?=[A-Z])/).length).toBeLessThanOrEqual(2);
    const after = await modelOf(trussId);
    expect(after.version).toBe(before.version);
    expect(after.model).toEqual(before.model);
    // The same file on the command line: exit 2, one line, nothing on stdout.
    const cli = await solveFile(JSON.stringify(change(job)));
    expect(cli.code).toBe(2);
    expect(cli.stdout).toBe('');
    expect(cli.stderr.trim().split('\n')).toHaveLength(1);
    expect(cli.stderr).toMatch(message);
  });

  it('when a job file with new sections is imported behind an issued sheet, then the issued run keeps its sections and checks, and re-checking that run is refused', async () => {
    const run = await runToEnd(trussId);
    const reviewer = await signIn(services.app, demoEmail('reviewer'));
    const sheet = await post(engineer, `/api/trusses/${trussId}/sheets`, { runId: run.id });
    expect(sheet.status).toBe(201);
    await post(engineer, `/api/sheets/${sheet.body.id}/submit`, { checkerId: await demoUserId() }).expect(200);
    await post(reviewer, `/api/sheets/${sheet.body.id}/check`).expect(200);
    expect((await post(engineer, `/api/sheets/${sheet.body.id}/issue`)).status).toBe(200);
    const job = JSON.parse(await exportOf(trussId)) as Job;
    const res = await post(engineer, `/api/trusses/${trussId}/job-file`, group(job, 1, { section: { A: 2000, rx: 35, ry: 45 } }));
    expect(res.status).toBe(200);
    expect((res.body as TrussModelView).model.design!.groups[1].section).toEqual({ shape: 'properties', A: 2000, rx: 35, ry: 45 });
    const kept = (await engineer.agent.get(`/api/runs/${run.id}`).expect(200)).body as RunView;
    expect(kept.model.design!.groups[1].section).toEqual({ shape: 'properties', A: 1500, rx: 30, ry: 40 });
    expect(kept.analysis!.design!.members.map((m) => m.utilisation)).toEqual(run.analysis!.design!.members.map((m) => m.utilisation));
    // The Design tab's rule for a run behind an issued sheet (runs.service.ts recheckDesign).
    const refused = await post(engineer, `/api/runs/${run.id}/design`);
    expect(refused.status).toBe(409);
    expect(refused.body.error.code).toBe('sheet-issued');
    // Back to the sections of the other tests.
    expect((await post(engineer, `/api/trusses/${trussId}/job-file`, job)).status).toBe(200);
  }, 120_000);

  it('when a file without "design" is imported, then the truss is left without one (the file is the whole model), and the design tab can set it again', async () => {
    const other = await newTruss('K4 — no design');
    const job = JSON.parse(await exportOf(trussId)) as Job;
    expect((await post(engineer, `/api/trusses/${other}/job-file`, job)).status).toBe(200);
    expect((await modelOf(other)).model.design).toBeDefined();
    const { design: _d, deflection: _f, ...plain } = job;
    void [_d, _f];
    const res = await post(engineer, `/api/trusses/${other}/job-file`, plain);
    expect(res.status).toBe(200);
    expect((res.body as TrussModelView).model.design).toBeUndefined();
  });
});

type Job = Record<string, unknown>;
/** The job with design group `i` changed. */
function group(j: Job, i: number, change: object): Job {
  const d = j.design as { groups: object[] };
  return { ...j, design: { ...d, groups: d.groups.map((g, k) => (k === i ? { ...g, ...change } : g)) } };
}
