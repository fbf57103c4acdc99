import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Services } from '../../server/bootstrap';
import type { TrussModelView } from '@shared/schemas/drawing.schema';
import type { RunSummaryView, RunView } from '@shared/schemas/run.schema';
import type { DesignInput } from '@shared/model/design-input';
import type { LoadCase, Support } from '@shared/model/truss';
import { demoEmail, demoUserId, signIn, startTestServices, type Tab } from '../support/test-services';

/**
 * Member design through the API on a real SQLite file: saving a design basis with groups,
 * the checks made with each run, the re-check without re-analysis for a determinate truss,
 * "re-run needed" for an indeterminate one, and a run behind a sheet revision left alone.
 *
 * The truss (drawn here as R12 DXF LINE entities, metres):
 *
 *              T (4, 3)
 *            /  |  \
 *   L (0, 0) —— M (4, 0) —— R (8, 0)
 *
 * With 10 kN down at M, pin at L, roller at R, by the method of joints (closed form, any
 * statics text): LT = TR = −25/3 kN (C), LM = MR = +20/3 kN (T), MT = +10 kN (T).
 */
function trussDxf(): Buffer {
  const line = (a: [number, number], b: [number, number]) =>
    ['0', 'LINE', '8', 'TRUSS', '10', a[0], '20', a[1], '30', 0, '11', b[0], '21', b[1], '31', 0].join('\n');
  const L: [number, number] = [0, 0];
  const M: [number, number] = [4, 0];
  const R: [number, number] = [8, 0];
  const T: [number, number] = [4, 3];
  const entities = [line(L, M), line(M, R), line(L, T), line(T, R), line(M, T)];
  return Buffer.from(['0', 'SECTION', '2', 'ENTITIES', ...entities, '0', 'ENDSEC', '0', 'EOF', ''].join('\n'));
}

let services: Services;
let engineer: Tab;
let reviewer: Tab;
let drafter: Tab;
let trussId: number;
const J = {} as Record<'L' | 'M' | 'R' | 'T', string>;
const MB = {} as Record<'LM' | 'MR' | 'LT' | 'TR' | 'MT', { id: string; tag: string }>;

const post = (tab: Tab, path: string, body: object = {}) => tab.agent.post(path).set('X-CSRF-Token', tab.csrf).send(body);
const putDesign = (body: object, tab: Tab = engineer) => tab.agent.put(`/api/trusses/${trussId}/design`).set('X-CSRF-Token', tab.csrf).send(body);
const current = async (): Promise<TrussModelView> => (await engineer.agent.get(`/api/trusses/${trussId}/model`).expect(200)).body;

const deadCase = (fy = -10): LoadCase => ({ id: 'D', name: 'Dead', category: 'dead', loads: [{ joint: J.M, fx: 0, fy }] });
async function saveModel(supports: Support[], fy = -10) {
  const { version } = await current();
  const members = [
    { id: MB.LT.id, group: 'top-chord' as const },
    { id: MB.TR.id, group: 'top-chord' as const },
    { id: MB.LM.id, group: 'bottom-chord' as const },
    { id: MB.MR.id, group: 'bottom-chord' as const },
    { id: MB.MT.id, group: 'web' as const },
  ];
  const res = await engineer.agent
    .put(`/api/trusses/${trussId}/model`)
    .set('X-CSRF-Token', engineer.csrf)
    .send({ version, supports, loadCases: [deadCase(fy)], combinations: [{ name: '1.4D', factors: { D: 1.4 } }], members });
  expect(res.status).toBe(200);
}
const pinRoller = (): Support[] => [
  { joint: J.L, kind: 'pin' },
  { joint: J.R, kind: 'roller', angleDeg: 90 },
];

/** Square hollow 60 × 60 × 4 (invented), A992 steel, by AISC 360-16 LRFD. */
const design = (over: Partial<DesignInput> = {}, t = 4): DesignInput => ({
  standard: 'aisc360-16-lrfd',
  groups: [
    { name: 'Chords', members: 'all', material: { kind: 'grade', grade: 'A992' }, section: { shape: 'rect-hollow', B: 100, H: 100, t } },
    { name: 'Post', members: 'web', material: { kind: 'grade', grade: 'A992' }, section: { shape: 'round-hollow', D: 48, t: 3 } },
  ],
  deflection: { joints: [J.M], combinations: ['D'], limit: 240 },
  ...over,
});

async function runToEnd(): Promise<RunView> {
  const started = await post(engineer, `/api/trusses/${trussId}/runs`);
  expect(started.status).toBe(202);
  for (let i = 0; i < 600; i++) {
    const run = (await engineer.agent.get(`/api/runs/${started.body.id}`).expect(200)).body as RunView;
    if (run.status !== 'queued' && run.status !== 'running') return run;
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error('run did not finish');
}

/** MPa per ksi from the exact pound-force and inch (NIST SP 811): A992 is 50 ksi, E 29 000 ksi. */
const KSI = 4448.2216152605 / 645.16;
/** AISC 360-16 E3 (E3-1 to E3-4), φc = 0.90 (E1), written out here from the standard's text. */
function aiscPhiPn(A: number, r: number, L: number, Fy = 50 * KSI, E = 29_000 * KSI): number {
  const lr = L / r;
  const Fe = (Math.PI ** 2 * E) / lr ** 2;
  const Fcr = lr <= 4.71 * Math.sqrt(E / Fy) ? 0.658 ** (Fy / Fe) * Fy : 0.877 * Fe;
  return (0.9 * Fcr * A) / 1000;
}
/** Square hollow section with square corners: A and r by the parallel-axis rule (closed form). */
function shs(B: number, t: number) {
  const bi = B - 2 * t;
  const A = B * B - bi * bi;
  const I = (B ** 4 - bi ** 4) / 12;
  return { A, r: Math.sqrt(I / A) };
}

beforeAll(async () => {
  services = await startTestServices({}, { realFile: true });
  engineer = await signIn(services.app, demoEmail('engineer'));
  reviewer = await signIn(services.app, demoEmail('reviewer'));
  drafter = await signIn(services.app, demoEmail('drafter'));
  const truss = await post(drafter, '/api/projects/1/trusses', { name: 'T9 — design test truss' });
  trussId = truss.body.id;
  const upload = await drafter.agent.post(`/api/trusses/${trussId}/drawings`).set('X-CSRF-Token', drafter.csrf).field('units', 'm').attach('file', trussDxf(), 't9.dxf');
  expect(upload.status).toBe(201);
  const { model } = await current();
  const at = (x: number, y: number) => model.joints.find((j) => Math.abs(j.x - x) < 1e-9 && Math.abs(j.y - y) < 1e-9)!.id;
  Object.assign(J, { L: at(0, 0), M: at(4, 0), R: at(8, 0), T: at(4, 3) });
  for (const name of ['LM', 'MR', 'LT', 'TR', 'MT'] as const) {
    const [a, b] = [J[name[0] as keyof typeof J], J[name[1] as keyof typeof J]];
    const m = model.members.find((mm) => (mm.from === a && mm.to === b) || (mm.from === b && mm.to === a))!;
    MB[name] = { id: m.id, tag: m.tag };
  }
  await saveModel(pinRoller());
});
afterAll(async () => {
  await services.shutdown();
});

describe('member design saved with the model', () => {
  it('bad input gets one sentence and writes nothing', async () => {
    const before = await current();
    const cases: [object, number, RegExp][] = [
      [{ version: before.version, design: design({ groups: [{ name: 'All', members: 'all', material: { kind: 'grade', grade: 'A992' }, section: { shape: 'properties', A: 0, rx: 20, ry: 20 } }] }) }, 400, /area A must be greater than 0/],
      [{ version: before.version, design: design({ groups: [{ name: 'All', members: 'all', material: { kind: 'grade', grade: 'A992' }, section: { shape: 'properties', A: -5, rx: 20, ry: 20 } }] }) }, 400, /greater than 0/],
      [{ version: before.version, design: design({ groups: [{ name: 'Top', members: 'top-chord', material: { kind: 'grade', grade: 'A992' }, section: { shape: 'properties', A: 900, rx: 20, ry: 20 } }] }) }, 422, /in no design group/],
      [{ version: before.version, design: design({ groups: [{ name: 'All', members: 'all', material: { kind: 'grade', grade: 'A9' }, section: { shape: 'properties', A: 900, rx: 20, ry: 20 } }] }) }, 422, /not preset/],
      [{ version: before.version, design: design({ groups: [{ name: 'All', members: 'all', material: { kind: 'steel', Fy: 345, Fu: 300, E: 200_000 }, section: { shape: 'properties', A: 900, rx: 20, ry: 20 } }] }) }, 422, /below Fy/],
      [{ version: before.version, design: design({ groups: [{ name: 'All', members: 'all', material: { kind: 'timber', Ft: 5, Fc: 8, Emin: 4000, E: 9000, c: 0.8 }, section: { shape: 'rectangle', b: 38, d: 140 } }] }) }, 422, /is for steel/],
      [{ version: before.version, design: design({ standard: 'nds-2018-asd', groups: [{ name: 'All', members: 'all', material: { kind: 'timber', Ft: 5, Fc: 8, Emin: 4000, E: 9000, c: 1.2 }, section: { shape: 'rectangle', b: 38, d: 140 } }] }) }, 422, /between 0 and 1/],
      [{ version: before.version, design: design({ groups: [{ name: 'All', members: 'all', material: { kind: 'grade', grade: 'S355' }, section: { shape: 'round-hollow', D: 20, t: 12 } }] }) }, 422, /more than half its diameter/],
      [{ version: before.version, design: design({ deflection: { joints: ['nope'], combinations: ['D'], limit: 240 } }) }, 422, /not in this truss/],
      [{ version: before.version, design: design({ deflection: { joints: [J.M], combinations: ['Service'], limit: 240 } }) }, 422, /neither a combination nor a load case/],
      [{ version: before.version, design: { ...design(), groups: [{ ...design().groups[0], members: ['ghost'] }] } }, 422, /does not have/],
      [{ version: before.version + 7, design: design() }, 409, /Someone else saved/],
      [{ version: before.version, design: { standard: 'bs5950', groups: [] } }, 400, /Choose the design basis/],
    ];
    for (const [body, status, message] of cases) {
      const res = await putDesign(body);
      expect(res.status, JSON.stringify(body)).toBe(status);
      expect(res.body.error.message).toMatch(message);
      // One sentence: a capital, one full stop or semicolon-joined clauses, no stack.
      expect(res.body.error.message.split(/\.\s/).length).toBeLessThanOrEqual(2);
    }
    expect((await putDesign({ version: before.version, design: design() }, reviewer)).status).toBe(403);
    const after = await current();
    expect(after.version).toBe(before.version);
    expect(after.model.design).toBeUndefined();
  });

  it('a saved design is a new model version, kept by a later model save', async () => {
    const before = await current();
    const res = await putDesign({ version: before.version, design: design() });
    expect(res.status).toBe(200);
    expect(res.body.version).toBe(before.version + 1);
    expect(res.body.model.design.groups.map((g: { name: string }) => g.name)).toEqual(['Chords', 'Post']);
    await saveModel(pinRoller());
    expect((await current()).model.design?.standard).toBe('aisc360-16-lrfd');
  });
});

describe('design checks with each run', () => {
  let run: RunView;

  it('each run checks every member: rafters in compression by AISC 360-16 E3, the tie by D2', async () => {
    run = await runToEnd();
    expect(run.status).toBe('solved');
    const d = run.analysis!.design!;
    expect(d.error).toBeNull();
    const byTag = new Map(d.members.map((m) => [m.tag, m]));
    const { A, r } = shs(100, 4);
    // Rafter LT: −1.4 × 25/3 kN, L = 5 m; the largest ratio is the force over φPn or the E2 slenderness Lc/r / 200.
    const lt = byTag.get(MB.LT.tag)!;
    const ratio = Math.max((1.4 * 25) / 3 / aiscPhiPn(A, r, 5000), 5000 / r / 200);
    expect(lt.utilisation).toBeCloseTo(ratio, 9);
    expect(lt.governing).toBe('1.4D');
    expect(lt.group).toBe('Chords');
    // Tie LM: +1.4 × 20/3 kN; yielding φ·Fy·A = 0.9 × 50 ksi × A (AISC 360-16 D2(a)) vs the D1 slenderness L/r / 300.
    const lm = byTag.get(MB.LM.tag)!;
    expect(lm.utilisation).toBeCloseTo(Math.max((1.4 * 20) / 3 / ((0.9 * 50 * KSI * A) / 1000), 4000 / r / 300), 9);
    // The post is the web group's round hollow section.
    expect(byTag.get(MB.MT.tag)!.group).toBe('Post');
    expect(run.design).toMatchObject({ members: 5, failing: 0 });
    expect(run.design!.maxUtilisation).toBeCloseTo(Math.max(...d.members.map((m) => m.utilisation)), 12);
    // Deflection at M under D by the unit-load method (one row per member).
    expect(d.deflection).toHaveLength(1);
    expect(d.deflection[0].tableY).toHaveLength(5);
    expect(d.deflection[0].dy).toBeLessThan(0);
  });

  it('a new section on a determinate truss re-checks at once on the stored forces, no new analysis', async () => {
    const { version } = await current();
    expect((await putDesign({ version, design: design({}, 2.5) })).status).toBe(200);
    const runs = (await engineer.agent.get(`/api/trusses/${trussId}/runs`).expect(200)).body as RunSummaryView[];
    expect(runs.find((x) => x.id === run.id)!.stale).toBe(true);
    const res = await post(engineer, `/api/runs/${run.id}/design`, { modelVersion: version + 1 });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.stale).toBe(false);
    expect(res.body.design.recheckedAt).not.toBeNull();
    const again = (await engineer.agent.get(`/api/runs/${run.id}`).expect(200)).body as RunView;
    // Same forces (the analysis is the stored one), the thinner wall's ratio.
    expect(again.analysis!.cases).toEqual(run.analysis!.cases);
    const { A, r } = shs(100, 2.5);
    const lt = again.analysis!.design!.members.find((m) => m.tag === MB.LT.tag)!;
    expect(lt.utilisation).toBeCloseTo(Math.max((1.4 * 25) / 3 / aiscPhiPn(A, r, 5000), 5000 / r / 200), 9);
    expect(again.model.design!.groups[0].section).toEqual({ shape: 'rect-hollow', B: 100, H: 100, t: 2.5 });
  });

  it('a changed load is not a re-check: the forces no longer fit, so a run is needed (nothing written)', async () => {
    await saveModel(pinRoller(), -12);
    const res = await post(engineer, `/api/runs/${run.id}/design`);
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('model-changed-since-run');
    expect(res.body.error.message).toMatch(/run the analysis again/);
    await saveModel(pinRoller(), -10);
  });

  it('an indeterminate truss analyses with the sections’ stiffness and asks for a re-run when a section changes', async () => {
    // Pins at L and R: m + r = 5 + 4 = 9 > 2j = 8, indeterminate to the first degree.
    await saveModel([{ joint: J.L, kind: 'pin' }, { joint: J.R, kind: 'pin' }]);
    const ind = await runToEnd();
    // Without the design's A and E the stiffness method would refuse members without EA.
    expect(ind.status).toBe('solved');
    expect(ind.classification!.kind).toBe('indeterminate');
    expect(ind.model.members.find((m) => m.id === MB.LT.id)?.A).toBeCloseTo(shs(100, 2.5).A * 1e-6, 15);
    expect(ind.analysis!.design!.members).toHaveLength(5);
    const { version } = await current();
    expect((await putDesign({ version, design: design({}, 5) })).status).toBe(200);
    const res = await post(engineer, `/api/runs/${ind.id}/design`);
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('re-run-needed');
    expect(res.body.error.message).toMatch(/indeterminate \(degree 1\).*run the analysis again/);
    await saveModel(pinRoller());
  });

  it('a pair of angles in compression is refused as failing (AISC 360-16 E6 not applied); in tension it is checked', async () => {
    const { version } = await current();
    const angles = design({
      groups: [
        { name: 'Chords', members: 'all', material: { kind: 'grade', grade: 'A36' }, section: { shape: 'double-angle', b: 50, d: 50, t: 6, s: 10 } },
        { name: 'Post', members: 'web', material: { kind: 'grade', grade: 'A36' }, section: { shape: 'round-hollow', D: 48, t: 3 } },
      ],
    });
    expect((await putDesign({ version, design: angles })).status).toBe(200);
    const r = await runToEnd();
    const byTag = new Map(r.analysis!.design!.members.map((m) => [m.tag, m]));
    expect(byTag.get(MB.LT.tag)!.pass).toBe(false);
    expect(byTag.get(MB.LT.tag)!.refused).toMatch(/E6/);
    expect(byTag.get(MB.LM.tag)!.refused).toBeUndefined();
    expect(byTag.get(MB.LM.tag)!.pass).toBe(true);
    const v2 = (await current()).version;
    expect((await putDesign({ version: v2, design: design() })).status).toBe(200);
  });

  it('a run with a sheet revision keeps its checks; behind an issued sheet a section change is refused', async () => {
    const r = await runToEnd();
    const sheet = await post(engineer, `/api/trusses/${trussId}/sheets`, { runId: r.id });
    expect(sheet.status).toBe(201);
    const { version } = await current();
    expect((await putDesign({ version, design: design({}, 3) })).status).toBe(200);
    const draft = await post(engineer, `/api/runs/${r.id}/design`);
    expect(draft.status).toBe(409);
    expect(draft.body.error.code).toBe('run-has-sheet');
    await post(engineer, `/api/sheets/${sheet.body.id}/submit`, { checkerId: await demoUserId() }).expect(200);
    await post(reviewer, `/api/sheets/${sheet.body.id}/check`).expect(200);
    const issued = await post(engineer, `/api/sheets/${sheet.body.id}/issue`);
    expect(issued.status).toBe(200);
    const refused = await post(engineer, `/api/runs/${r.id}/design`);
    expect(refused.status).toBe(409);
    expect(refused.body.error.code).toBe('sheet-issued');
    expect(refused.body.error.message).toMatch(/behind issued sheet revision/);
    const kept = (await engineer.agent.get(`/api/runs/${r.id}`).expect(200)).body as RunView;
    expect(kept.model.design!.groups[0].section).toEqual({ shape: 'rect-hollow', B: 100, H: 100, t: 4 });
  }, 60_000);
});
