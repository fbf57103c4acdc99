import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Services } from '../../server/bootstrap';
import type { TrussModelView } from '@shared/schemas/drawing.schema';
import { FORCES_CSV_COLUMNS, REACTIONS_CSV_COLUMNS, type RunSummaryView, type RunView, type TakeoffInput } from '@shared/schemas/run.schema';
import type { LoadCase, Support } from '@shared/model/truss';
import { TrussModelRecord } from '../../server/db/models';
import { csvField } from '../../server/modules/runs/forces-csv';
import { demoEmail, demoUserId, signIn, startTestServices, type Tab } from '../support/test-services';

/**
 * The truss of these tests, drawn in the test as an R12 DXF (DXF Reference, Autodesk: LINE
 * entities, group codes 10/20 and 11/21 for the ends), in metres:
 *
 *              T (4, 3)
 *            /  |  \
 *   L (0, 0) —— M (4, 0) —— R (8, 0)
 *
 * Members LM, MR (bottom chord), LT, TR (top chord), MT (post). Pin at L, roller at R.
 * m + r = 5 + 3 = 8 = 2j: stable and determinate. The 3-4-5 triangles make every cosine exact.
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
let engineer2: Tab;
let drafter: Tab;
let reviewer: Tab;
let admin: Tab;
let trussId: number;
/** Joint ids by our letters, found from the imported coordinates. */
const J = {} as Record<'L' | 'M' | 'R' | 'T', string>;
/** Member ids and tags by our names. */
const MB = {} as Record<'LM' | 'MR' | 'LT' | 'TR' | 'MT', { id: string; tag: string }>;
const tagOf = {} as Record<string, string>;

const put = (tab: Tab, body: object) => tab.agent.put(`/api/trusses/${trussId}/model`).set('X-CSRF-Token', tab.csrf).send(body);
const post = (tab: Tab, path: string, body: object = {}) => tab.agent.post(path).set('X-CSRF-Token', tab.csrf).send(body);

async function currentModel(tab: Tab = engineer): Promise<TrussModelView> {
  return (await tab.agent.get(`/api/trusses/${trussId}/model`).expect(200)).body;
}

const pinRoller: Support[] = [
  { joint: 'L', kind: 'pin' },
  { joint: 'R', kind: 'roller', angleDeg: 90 },
];
const supportsOn = (list: Support[]) => list.map((s) => ({ ...s, joint: J[s.joint as keyof typeof J] }));

/** Dead load: 10 kN down at M. */
const deadCase = (): LoadCase => ({ id: 'D', name: 'Dead', category: 'dead', loads: [{ joint: J.M, fx: 0, fy: -10 }] });

async function saveModel(body: Record<string, unknown>, tab: Tab = engineer) {
  const { version } = await currentModel(tab);
  return put(tab, { version, supports: supportsOn(pinRoller), loadCases: [deadCase()], combinations: [], members: [], ...body });
}

async function runToEnd(tab: Tab = engineer): Promise<RunView> {
  const started = await post(tab, `/api/trusses/${trussId}/runs`);
  expect(started.status).toBe(202);
  const summary = started.body as RunSummaryView;
  for (let i = 0; i < 600; i++) {
    const res = await tab.agent.get(`/api/runs/${summary.id}`).expect(200);
    const run = res.body as RunView;
    if (run.status !== 'queued' && run.status !== 'running') return run;
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error(`run ${summary.id} did not finish`);
}

beforeAll(async () => {
  services = await startTestServices();
  engineer = await signIn(services.app, demoEmail('engineer'));
  engineer2 = await signIn(services.app, demoEmail('engineer'));
  drafter = await signIn(services.app, demoEmail('drafter'));
  reviewer = await signIn(services.app, demoEmail('reviewer'));
  admin = await signIn(services.app, demoEmail('admin'));
  const truss = await post(drafter, '/api/projects/1/trusses', { name: 'T7 — runs test truss' });
  trussId = truss.body.id;
  const upload = await drafter.agent
    .post(`/api/trusses/${trussId}/drawings`)
    .set('X-CSRF-Token', drafter.csrf)
    .field('units', 'm')
    .attach('file', trussDxf(), 't7.dxf');
  expect(upload.status).toBe(201);
  expect(upload.body.status).toBe('imported');
  const { model } = await currentModel();
  const at = (x: number, y: number) => model.joints.find((j) => Math.abs(j.x - x) < 1e-9 && Math.abs(j.y - y) < 1e-9)!.id;
  Object.assign(J, { L: at(0, 0), M: at(4, 0), R: at(8, 0), T: at(4, 3) });
  for (const j of model.joints) tagOf[j.id] = j.tag;
  for (const name of ['LM', 'MR', 'LT', 'TR', 'MT'] as const) {
    const [a, b] = [J[name[0] as keyof typeof J], J[name[1] as keyof typeof J]];
    const m = model.members.find((mm) => (mm.from === a && mm.to === b) || (mm.from === b && mm.to === a))!;
    MB[name] = { id: m.id, tag: m.tag };
  }
});
afterAll(async () => {
  await services.shutdown();
});

describe('analysis runs', () => {
  let solved: RunView;

  it('when the engineer loads the truss and runs it, then the run is solved with the closed-form member forces', async () => {
    const saved = await saveModel({
      combinations: [{ name: 'Strength, 1.4 "D"', factors: { D: 1.4 } }],
    });
    expect(saved.status).toBe(200);
    solved = await runToEnd();
    expect(solved.status).toBe('solved');
    expect(solved.ranBy).toBe('Eli Marsh');
    expect(solved.modelVersion).toBe(saved.body.version);
    expect(solved.progress).toEqual({ phase: 'done', fraction: 1 });
    expect(solved.startedAt).not.toBeNull();
    expect(Date.parse(solved.finishedAt!)).toBeGreaterThanOrEqual(Date.parse(solved.startedAt!));
    expect(solved.classification!.kind).toBe('determinate');
    const forces = solved.analysis!.cases[0].forces;
    // Closed forms (method of joints / method of sections, from memory; any statics text):
    // reactions 5 kN up at L and R by symmetry. Section through LM and LT's neighbour,
    // moments about T of the left part: 5·4 − F_LM·3 = 0 → F_LM = 20/3 kN (T).
    expect(forces[MB.LM.id]).toBeCloseTo(20 / 3, 9);
    // Joint L, ΣFy: F_LT·(3/5) + 5 = 0 → F_LT = −25/3 kN (C).
    expect(forces[MB.LT.id]).toBeCloseTo(-25 / 3, 9);
    // Joint M, ΣFy: F_MT − 10 = 0 → F_MT = 10 kN (T).
    expect(forces[MB.MT.id]).toBeCloseTo(10, 9);
    // Superposition: the combination is 1.4 × the case.
    expect(solved.analysis!.combinations[0].forces[MB.LM.id]).toBeCloseTo(1.4 * (20 / 3), 9);
    expect(solved.analysis!.envelope.find((e) => e.member === MB.LT.id)!.governing).toBe('Strength, 1.4 "D"');
    // The snapshot is the model as solved.
    expect(solved.model.loadCases).toEqual([deadCase()]);
    expect(solved.takeoff).toBeNull();
  });

  it('when the model is saved after a run, then the list marks that run stale and a later run fresh, newest first', async () => {
    const before = (await reviewer.agent.get(`/api/trusses/${trussId}/runs`).expect(200)).body as RunSummaryView[];
    expect(before[0]).toMatchObject({ id: solved.id, stale: false });
    const edit = await saveModel({ loadCases: [{ ...deadCase(), loads: [{ joint: J.M, fx: 0, fy: -12 }] }] });
    expect(edit.status).toBe(200);
    const after = (await admin.agent.get(`/api/trusses/${trussId}/runs`).expect(200)).body as RunSummaryView[];
    expect(after.find((r) => r.id === solved.id)!.stale).toBe(true);
    const fresh = await runToEnd();
    const list = (await reviewer.agent.get(`/api/trusses/${trussId}/runs`).expect(200)).body as RunSummaryView[];
    expect(list.map((r) => r.id)).toEqual([...list.map((r) => r.id)].sort((a, b) => b - a));
    expect(list[0]).toMatchObject({ id: fresh.id, stale: false });
    // The old run's snapshot is unchanged by the edit.
    const old = (await reviewer.agent.get(`/api/runs/${solved.id}`).expect(200)).body as RunView;
    expect(old.model.loadCases[0].loads[0].fy).toBe(-10);
    expect(old.analysis!.cases[0].forces[MB.MT.id]).toBeCloseTo(10, 9);
  });

  it('when the member forces are downloaded, then the CSV has every case, combination and envelope row, quoted where needed', async () => {
    const res = await reviewer.agent.get(`/api/runs/${solved.id}/forces.csv`).expect(200);
    expect(res.headers['content-type']).toMatch(/^text\/csv/);
    expect(res.headers['content-disposition']).toMatch(/^attachment; filename="?T7-runs-test-truss-run-\d+-member-forces\.csv"?$/);
    const lines = res.text.split('\r\n');
    expect(lines.at(-1)).toBe('');
    expect(lines[0]).toBe(FORCES_CSV_COLUMNS.join(','));
    // 5 members × (1 case + 1 combination + 3 envelope lines) + header + trailing ''.
    expect(lines).toHaveLength(5 * 5 + 2);
    const lm = MB.LM;
    const ends = `${tagOf[J.L]},${tagOf[J.M]}`;
    const endsLM = lines.find((l) => l.startsWith(`case,D,${lm.tag},`))!;
    // 20/3 = 6.667 kN (T) to three decimals; LT −25/3 = −8.333 (C).
    // L–M lies along the lower edge of the outline: the import grouped it as bottom chord.
    expect([`case,D,${lm.tag},bottom-chord,${ends},6.667,T,`, `case,D,${lm.tag},bottom-chord,${tagOf[J.M]},${tagOf[J.L]},6.667,T,`]).toContain(endsLM);
    expect(lines.find((l) => l.startsWith(`case,D,${MB.LT.tag},`))).toMatch(/,-8\.333,C,$/);
    // RFC 4180: a field with a comma or quote is quoted, inner quotes doubled. 1.4 × 20/3 = 9.333.
    expect(lines.find((l) => l.startsWith('combination,') && l.includes(`,${lm.tag},`))).toMatch(
      new RegExp(`^combination,"Strength, 1\\.4 ""D""",${lm.tag},.*,9\\.333,T,$`),
    );
    expect(lines.find((l) => l.startsWith(`envelope,governing,${MB.LT.tag},`))).toMatch(/,-11\.667,C,"Strength, 1\.4 ""D"""$/);
  });

  it('when a CSV text field could run as a spreadsheet formula, then it is defused; numbers stay numbers', () => {
    // RFC 4180 quoting, plus the formula-injection rule of the OWASP "CSV Injection" page (from memory).
    expect(csvField('=1+2')).toBe("'=1+2");
    expect(csvField('@SUM(A1)')).toBe("'@SUM(A1)");
    expect(csvField('-2+3, "x"')).toBe(`"'-2+3, ""x"""`);
    expect(csvField('line\nbreak')).toBe('"line\nbreak"');
    expect(csvField(-8.333)).toBe('-8.333');
    expect(csvField('plain')).toBe('plain');
  });

  it('when the reactions are downloaded, then the CSV has each support under every case and combination and the envelope with uplift, as statics by hand', async () => {
    // Wind W: 20 kN to the right at T (4, 3). Moments about L: R_Ry·8 − 20·3 = 0 → R_Ry = 7.5 up,
    // so L_y = −7.5 (down) and L_x = −20; dead D: 5 kN up at each support by symmetry (statics,
    // from memory). ASD 7 (0.6D + 0.6W, ASCE/SEI 7-16 §2.4.1 (7)): L_y = 0.6·5 − 0.6·7.5 = −1.5 (uplift).
    const wind: LoadCase = { id: 'W', name: 'Wind from the left', category: 'wind', loads: [{ joint: J.T, fx: 20, fy: 0 }] };
    const saved = await saveModel({
      loadCases: [deadCase(), wind],
      combinations: [
        { name: 'LRFD 1: 1.4D', factors: { D: 1.4 } },
        { name: 'ASD 7: 0.6D + 0.6W', factors: { D: 0.6, W: 0.6 } },
      ],
    });
    expect(saved.status).toBe(200);
    const run = await runToEnd();
    expect(run.status).toBe('solved');
    const res = await reviewer.agent.get(`/api/runs/${run.id}/reactions.csv`).expect(200);
    expect(res.headers['content-type']).toMatch(/^text\/csv/);
    expect(res.headers['content-disposition']).toMatch(/^attachment; filename="?T7-runs-test-truss-run-\d+-reactions\.csv"?$/);
    const lines = res.text.split('\r\n');
    expect(lines[0]).toBe(REACTIONS_CSV_COLUMNS.join(','));
    const [L, R] = [tagOf[J.L], tagOf[J.R]];
    expect(lines.slice(1)).toEqual([
      `case,D,${L},pin,0,5,,no`,
      `case,D,${R},roller 90°,0,5,,no`,
      `case,W,${L},pin,-20,-7.5,,yes`,
      `case,W,${R},roller 90°,0,7.5,,no`,
      `combination,LRFD 1: 1.4D,${L},pin,0,7,,no`,
      `combination,LRFD 1: 1.4D,${R},roller 90°,0,7,,no`,
      `combination,ASD 7: 0.6D + 0.6W,${L},pin,-12,-1.5,,yes`,
      `combination,ASD 7: 0.6D + 0.6W,${R},roller 90°,0,7.5,,no`,
      `envelope,rx max,${L},pin,0,,LRFD 1: 1.4D,`,
      `envelope,rx min,${L},pin,-12,,ASD 7: 0.6D + 0.6W,`,
      `envelope,ry max,${L},pin,,7,LRFD 1: 1.4D,no`,
      `envelope,ry min,${L},pin,,-1.5,ASD 7: 0.6D + 0.6W,yes`,
      `envelope,rx max,${R},roller 90°,0,,LRFD 1: 1.4D,`,
      `envelope,rx min,${R},roller 90°,0,,LRFD 1: 1.4D,`,
      `envelope,ry max,${R},roller 90°,,7.5,ASD 7: 0.6D + 0.6W,no`,
      `envelope,ry min,${R},roller 90°,,7,LRFD 1: 1.4D,no`,
      '',
    ]);
    // The run's own envelope says the uplift in words.
    const uplift = run.analysis!.reactionEnvelope!.find((e) => e.joint === J.L)!.uplift;
    expect(uplift).toMatch(/lifted under ASD 7: 0\.6D \+ 0\.6W: it must hold the truss down with 1\.50 kN/);
  });

  it('when the supports let the truss slide (two rollers), then the run is stored unstable with the finding and no forces', async () => {
    const saved = await saveModel({
      supports: supportsOn([
        { joint: 'L', kind: 'roller', angleDeg: 90 },
        { joint: 'R', kind: 'roller', angleDeg: 90 },
      ]),
    });
    expect(saved.status).toBe(200);
    const run = await runToEnd();
    expect(run.status).toBe('unstable');
    expect(run.classification!.kind).toBe('unstable');
    // m + r = 5 + 2 = 7 < 2j = 8: one degree of freedom short (a rigid slide along x).
    expect(run.classification!.degree).toBe(-1);
    expect(run.classification!.mechanismJoints.length).toBeGreaterThan(0);
    expect(run.classification!.message.length).toBeGreaterThan(20);
    expect(run.analysis!.cases).toEqual([]);
    expect(run.analysis!.envelope).toEqual([]);
    const csv = await engineer.agent.get(`/api/runs/${run.id}/forces.csv`);
    expect(csv.status).toBe(409);
    expect(csv.body.error.code).toBe('run-not-solved');
    expect(csv.body.error.message).toMatch(/unstable/);
    const reactions = await engineer.agent.get(`/api/runs/${run.id}/reactions.csv`);
    expect(reactions.status).toBe(409);
    expect(reactions.body.error).toMatchObject({ code: 'run-not-solved', message: `Run ${run.number} of T7 — runs test truss has no reaction table: the truss is unstable, so it has no reactions. Open the run to see its status.` });
  });

  it('when the truss is indeterminate and a member has no EA, then the run fails with the solver message', async () => {
    const saved = await saveModel({
      supports: supportsOn([
        { joint: 'L', kind: 'pin' },
        { joint: 'R', kind: 'pin' },
      ]),
    });
    expect(saved.status).toBe(200);
    const run = await runToEnd();
    expect(run.status).toBe('failed');
    expect(run.error!.code).toBe('missing-stiffness');
    expect(run.error!.message).toMatch(/EA|E and A/);
    expect(run.analysis).toBeNull();
    expect(run.finishedAt).not.toBeNull();
  });

  it('when a run is asked for with a model version that is no longer current, then 409 and no run is stored', async () => {
    const { version } = await currentModel();
    const count = (await engineer.agent.get(`/api/trusses/${trussId}/runs`)).body.length;
    const res = await post(engineer, `/api/trusses/${trussId}/runs`, { modelVersion: version - 1 });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('model-changed');
    expect((await engineer.agent.get(`/api/trusses/${trussId}/runs`)).body).toHaveLength(count);
  });
});

describe('roof loading', () => {
  /** Purlins at the eaves L, R and the apex T; the top chord is L–T–R. */
  const takeoff = (over: Partial<TakeoffInput> = {}): TakeoffInput => ({
    topChordJoints: [J.L, J.T, J.R],
    areaLoads: [{ caseId: 'S', q: 1, unit: 'kPa', basis: 'plan' }],
    spacing: 4.5,
    trussCount: 6,
    trussIndex: 1,
    method: 'exact',
    ...over,
  });
  const snowCase = (loads: LoadCase['loads'] = []): LoadCase => ({ id: 'S', name: 'Snow', category: 'snow', loads });
  const preview = (body: unknown, tab: Tab = engineer) => post(tab, `/api/trusses/${trussId}/takeoff/preview`, body as object);

  it('when the engineer previews a takeoff over 5 equal spans, then the reactions are the handbook fractions beside the tributary ones', async () => {
    const { version } = await currentModel();
    const L = 4.5;
    const byIndex = async (trussIndex: number) => {
      const res = await preview(takeoff({ trussIndex }));
      expect(res.status).toBe(200);
      return res.body;
    };
    const second = await byIndex(1);
    expect(second.modelVersion).toBe(version);
    // Tributary widths on plan: half of 4 m at each eave, two halves at the apex; along the
    // slope half of the 5 m rafter (3-4-5 triangle).
    const widths = Object.fromEntries(second.result.purlins.map((p: { joint: string; widthPlan: number; widthSlope: number }) => [p.joint, p]));
    expect(widths[J.L]).toMatchObject({ widthPlan: 2, widthSlope: 2.5 });
    expect(widths[J.T]).toMatchObject({ widthPlan: 4, widthSlope: 5 });
    const apex = second.result.cases[0].purlins.find((p: { joint: string }) => p.joint === J.T);
    // w = q × b = 1 kPa × 4 m.
    expect(apex.w).toBeCloseTo(4, 12);
    // Hicks, Civil Engineering Formulas, Table 2.1 (continuous beam, 5 equal spans, uniform
    // load): reactions 15/38, 43/38 (= 20/38 + 23/38), 37/38 × wL. Truss 1 is the first interior support.
    expect(apex.exact).toBeCloseTo((43 / 38) * 4 * L, 9);
    // Tributary length: half of each adjacent span = L.
    expect(apex.tributary).toBeCloseTo(4 * L, 9);
    expect(apex.differencePct).toBeCloseTo(((1 - 43 / 38) / (43 / 38)) * 100, 9);
    expect(second.result.cases[0].loads.find((l: { joint: string }) => l.joint === J.T).fy).toBeCloseTo(-(43 / 38) * 4 * L, 9);
    expect(second.result.steps.length).toBeGreaterThan(5);

    const end = (await byIndex(0)).result.cases[0].purlins.find((p: { joint: string }) => p.joint === J.T);
    expect(end.exact).toBeCloseTo((15 / 38) * 4 * L, 9);
    expect(end.tributary).toBeCloseTo(0.5 * 4 * L, 9);
    const middle = (await byIndex(2)).result.cases[0].purlins.find((p: { joint: string }) => p.joint === J.T);
    expect(middle.exact).toBeCloseTo((37 / 38) * 4 * L, 9);
    // Nothing was written.
    expect((await currentModel()).version).toBe(version);
  });

  it('when an area load is given in psf, then it is converted to kPa before the takeoff', async () => {
    const res = await preview(takeoff({ areaLoads: [{ caseId: 'S', q: 20, unit: 'psf', basis: 'plan' }] }));
    expect(res.status).toBe(200);
    // 1 psf = 1 lbf/ft² = 4.4482216152605 N / 0.09290304 m² = 47.880259 Pa (exact definitions
    // of the pound-force and the foot; NIST SP 811 Appendix B, from memory).
    expect(res.body.result.cases[0].q).toBeCloseTo((20 * 4.4482216152605) / (0.3048 * 0.3048) / 1000, 12);
  });

  /** The takeoff's loads for the snow case as the preview gives them ("Use these loads" sends exactly these). */
  async function takeoffSnowLoads(t: TakeoffInput = takeoff({ method: 'exact' })) {
    const res = await preview(t);
    expect(res.status).toBe(200);
    return res.body.result.caseLoads.S as LoadCase['loads'];
  }
  const markedSnow = (loads: LoadCase['loads']): LoadCase => ({ ...snowCase(loads), source: 'roof-loading' });
  const modelRow = async () => {
    const row = (await TrussModelRecord.findByPk(trussId))!;
    return { version: row.version, model: row.model, takeoff: row.takeoff };
  };

  it('when the takeoff is saved but its case holds loads entered by hand, then the run solves exactly the loads the table shows', async () => {
    // Issue 15: a run used to overwrite such a case with the roof loading's loads (−99 kN shown, −10.27 kN used).
    const saved = await saveModel({ loadCases: [deadCase(), snowCase([{ joint: J.M, fx: 0, fy: -99 }])], takeoff: takeoff({ method: 'exact' }) });
    expect(saved.status).toBe(200);
    const run = await runToEnd();
    expect(run.status).toBe('solved');
    expect(run.usedTakeoff).toBe(false);
    expect(run.model.loadCases.find((c) => c.id === 'S')!.loads).toEqual([{ joint: J.M, fx: 0, fy: -99 }]);
    // 99 kN down at M: as the 10 kN dead case above, scaled (method of joints at M: F_MT = P).
    expect(run.analysis!.cases.find((c) => c.caseId === 'S')!.forces[MB.MT.id]).toBeCloseTo(99, 9);
  });

  it('when "Use these loads" saves the takeoff\'s loads marked as from the roof loading, then the run solves them and prints the takeoff', async () => {
    const loads = await takeoffSnowLoads();
    const saved = await saveModel({ loadCases: [deadCase(), markedSnow(loads)], takeoff: takeoff({ method: 'exact' }) });
    expect(saved.status).toBe(200);
    expect(saved.body.model.loadCases.find((c: LoadCase) => c.id === 'S').source).toBe('roof-loading');
    const run = await runToEnd();
    expect(run.status).toBe('solved');
    expect(run.usedTakeoff).toBe(true);
    const snow = run.model.loadCases.find((c) => c.id === 'S')!;
    expect(snow.loads).toEqual(loads);
    expect(snow.loads.map((l) => l.joint).sort()).toEqual([J.L, J.T, J.R].sort());
    // Apex load P = (43/38) × 4 kN/m × 4.5 m (Hicks, Table 2.1, as above). Eave loads go straight
    // into the supports, so by the method of sections about T: F_LM = (P/2)·4/3 = 2P/3 (T).
    const P = (43 / 38) * 4 * 4.5;
    expect(run.analysis!.cases.find((c) => c.caseId === 'S')!.forces[MB.LM.id]).toBeCloseTo((2 * P) / 3, 9);
    expect(run.analysis!.cases.find((c) => c.caseId === 'D')!.forces[MB.MT.id]).toBeCloseTo(10, 9);
  });

  it('when a save changes, unmarks or invents a roof-takeoff load, then 422 with one sentence and nothing is written', async () => {
    const loads = await takeoffSnowLoads();
    const edited = loads.map((l) => (l.joint === J.T ? { ...l, fy: -99 } : l));
    const cases: [string, Record<string, unknown>, string][] = [
      ['an edited load', { loadCases: [deadCase(), markedSnow(edited)] }, 'roof-loads-edited'],
      ['an added load', { loadCases: [deadCase(), markedSnow([...loads, { joint: J.M, fx: 0, fy: -1 }])] }, 'roof-loads-edited'],
      ['the mark dropped without detaching', { loadCases: [deadCase(), snowCase(edited)] }, 'roof-loads-detach-first'],
      ['a marked case the takeoff does not write', { loadCases: [{ ...deadCase(), source: 'roof-loading' }, markedSnow(loads)] }, 'roof-loads-without-takeoff'],
    ];
    for (const [what, body, code] of cases) {
      const before = await modelRow();
      const res = await saveModel(body);
      expect(res.status, what).toBe(422);
      expect(res.body.error.code, what).toBe(code);
      expect(res.body.error.message, what).toMatch(/[Ll]oad case "(S|D)"/);
      expect(res.body.error.message.split(/\.\s/), what).toHaveLength(1);
      expect(await modelRow(), what).toEqual(before);
    }
  });

  it('when the engineer detaches the roof-takeoff case, then its loads stay, are no longer marked, and can be edited by hand', async () => {
    const before = await currentModel();
    const loads = before.model.loadCases.find((c) => c.id === 'S')!.loads;
    const res = await post(engineer, `/api/trusses/${trussId}/model/detach-loads`, { version: before.version, caseId: 'S' });
    expect(res.status).toBe(200);
    expect(res.body.version).toBe(before.version + 1);
    const snow = (res.body as TrussModelView).model.loadCases.find((c) => c.id === 'S')!;
    expect(snow.source).toBeUndefined();
    expect(snow.loads).toEqual(loads);
    const edited = await saveModel({ loadCases: [deadCase(), snowCase([{ joint: J.T, fx: 0, fy: -99 }])] });
    expect(edited.status).toBe(200);
    const run = await runToEnd();
    expect(run.model.loadCases.find((c) => c.id === 'S')!.loads).toEqual([{ joint: J.T, fx: 0, fy: -99 }]);
  });

  it('when a detach names a case that is not from the takeoff, a missing case, an old model save or a drafter, then it is refused with one sentence and nothing is written', async () => {
    const { version } = await currentModel();
    const cases: [Tab, object, number, string][] = [
      [engineer, { version, caseId: 'S' }, 422, 'not-from-roof-loading'],
      [engineer, { version, caseId: 'nowhere' }, 422, 'unknown-load-case'],
      [engineer, { version: version - 1, caseId: 'S' }, 409, 'edit-conflict'],
      [engineer, { version: 'x', caseId: 'S' }, 400, 'validation-failed'],
      [drafter, { version, caseId: 'S' }, 403, 'forbidden'],
    ];
    for (const [tab, body, status, code] of cases) {
      const before = await modelRow();
      const res = await post(tab, `/api/trusses/${trussId}/model/detach-loads`, body);
      expect(res.status, JSON.stringify(body)).toBe(status);
      expect(res.body.error.code, JSON.stringify(body)).toBe(code);
      expect(await modelRow()).toEqual(before);
    }
  });

  it('when the current model save is the one an issued sheet revision was made from, then detaching is refused 409 with one sentence and nothing is written', async () => {
    const loads = await takeoffSnowLoads();
    expect((await saveModel({ loadCases: [deadCase(), markedSnow(loads)], takeoff: takeoff({ method: 'exact' }) })).status).toBe(200);
    const run = await runToEnd();
    expect(run.status).toBe('solved');
    const sheet = (await post(engineer, `/api/trusses/${trussId}/sheets`, { runId: run.id })).body as { id: number; number: number };
    await post(engineer, `/api/sheets/${sheet.id}/submit`, { checkerId: await demoUserId() }).expect(200);
    await post(reviewer, `/api/sheets/${sheet.id}/check`).expect(200);
    expect((await post(engineer, `/api/sheets/${sheet.id}/issue`)).status).toBe(200);
    const before = await modelRow();
    const res = await post(engineer, `/api/trusses/${trussId}/model/detach-loads`, { version: before.version, caseId: 'S' });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('model-issued');
    expect(res.body.error.message).toMatch(new RegExp(`^Model save ${before.version} is the one issued sheet revision [A-Z]+ was made from`));
    expect(res.body.error.message.split(/\.\s/)).toHaveLength(1);
    expect(await modelRow()).toEqual(before);
    // Removing the takeoff is allowed and leaves its cases as hand loads (the later tests start from these).
    const removed = await saveModel({ loadCases: [deadCase(), snowCase(loads)], takeoff: null });
    expect(removed.status).toBe(200);
    expect(removed.body.model.loadCases.find((c: LoadCase) => c.id === 'S').source).toBeUndefined();
  }, 90_000);

  const refusals: [string, Partial<TakeoffInput> | ((t: TakeoffInput) => unknown), string, RegExp][] = [
    ['a negative truss spacing', { spacing: -4.5 }, 'validation-failed', /spacing: The truss spacing must be greater than 0 m/],
    ['a zero spacing in a list', { spacing: [4.5, 4.5, 0, 4.5, 4.5] }, 'validation-failed', /spacing\.2: The truss spacing must be greater than 0 m/],
    ['a negative truss count', { trussCount: -3 }, 'validation-failed', /trussCount: The truss count must be at least 2/],
    ['a truss index past the last truss', { trussIndex: 6 }, 'validation-failed', /0 to 5/],
    ['a purlin on a bottom-chord joint', (t) => ({ ...t, purlinJoints: [t.topChordJoints[0], 'M', t.topChordJoints[2]] }), 'purlin-not-on-top-chord', /top-chord/],
    ['a purlin on a joint the truss does not have', (t) => ({ ...t, purlinJoints: [t.topChordJoints[0], 'nowhere'] }), 'unknown-joint', /nowhere/],
  ];

  it.each(refusals)('when the takeoff has %s, then preview and save answer 400 and nothing is written', async (_what, change, code, message) => {
    const base = takeoff();
    let body = typeof change === 'function' ? change(base) : { ...base, ...change };
    body = JSON.parse(JSON.stringify(body).replace('"M"', JSON.stringify(J.M)));
    const pre = await preview(body);
    expect(pre.status).toBe(400);
    expect(pre.body.error.code).toBe(code);
    expect(pre.body.error.message).toMatch(message);

    const before = await TrussModelRecord.findByPk(trussId);
    const res = await saveModel({ loadCases: [deadCase(), snowCase()], takeoff: body });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe(code);
    const after = await TrussModelRecord.findByPk(trussId);
    expect(after!.version).toBe(before!.version);
    expect(after!.takeoff).toBe(before!.takeoff);
  });

  it('when the roof loading writes a load case the model does not have, then the save is refused naming it', async () => {
    const res = await saveModel({ loadCases: [deadCase()], takeoff: takeoff({ areaLoads: [{ caseId: 'W9', q: 1, unit: 'kPa', basis: 'slope' }] }) });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('unknown-load-case');
    expect(res.body.error.message).toMatch(/W9/);
  });

  it('when a reviewer or a drafter asks for a takeoff preview, then 403', async () => {
    expect((await preview(takeoff(), reviewer)).status).toBe(403);
    expect((await preview(takeoff(), drafter)).status).toBe(403);
  });
});

describe('model edits', () => {
  it('when a load is put on a joint the truss does not have, then 400 naming the joint and nothing is written', async () => {
    const before = await currentModel();
    const res = await saveModel({ loadCases: [{ ...deadCase(), loads: [{ joint: 'J-404', fx: 0, fy: -5 }] }] });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('unknown-joint');
    expect(res.body.error.message).toMatch(/J-404/);
    expect((await currentModel()).version).toBe(before.version);
  });

  it('when two engineers save from the same version, then the second is refused with a conflict and the first save is kept', async () => {
    const start = await currentModel();
    const first = await put(engineer, { version: start.version, supports: supportsOn(pinRoller), loadCases: [{ ...deadCase(), loads: [{ joint: J.M, fx: 0, fy: -7 }] }], combinations: [], members: [], takeoff: null });
    expect(first.status).toBe(200);
    const second = await put(engineer2, { version: start.version, supports: supportsOn(pinRoller), loadCases: [{ ...deadCase(), loads: [{ joint: J.M, fx: 0, fy: -3 }] }], combinations: [], members: [], takeoff: null });
    expect(second.status).toBe(409);
    expect(second.body.error.code).toBe('edit-conflict');
    expect(second.body.error.message).toMatch(/Reload/);
    const now = await currentModel();
    expect(now.version).toBe(start.version + 1);
    expect(now.model.loadCases[0].loads[0].fy).toBe(-7);
  });

  it('when a drafter tries to change loads or run, then 403 and the model is unchanged', async () => {
    const before = await currentModel(drafter);
    const res = await put(drafter, { version: before.version, supports: [], loadCases: [], combinations: [], members: [] });
    expect(res.status).toBe(403);
    expect((await post(drafter, `/api/trusses/${trussId}/runs`)).status).toBe(403);
    expect((await currentModel()).version).toBe(before.version);
  });

  it('when a reviewer or admin reads runs, then they see them but cannot start one', async () => {
    const list = await reviewer.agent.get(`/api/trusses/${trussId}/runs`).expect(200);
    expect(list.body.length).toBeGreaterThan(0);
    await admin.agent.get(`/api/runs/${list.body[0].id}`).expect(200);
    expect((await post(reviewer, `/api/trusses/${trussId}/runs`)).status).toBe(403);
    expect((await post(admin, `/api/trusses/${trussId}/runs`)).status).toBe(403);
  });

  it('when a run id does not exist, then 404', async () => {
    const res = await reviewer.agent.get('/api/runs/987654');
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe('not-found');
  });
});
