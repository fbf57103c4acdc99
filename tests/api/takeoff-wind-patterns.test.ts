import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Services } from '../../server/bootstrap';
import type { TrussModelView } from '@shared/schemas/drawing.schema';
import type { RunSummaryView, RunView, TakeoffInput } from '@shared/schemas/run.schema';
import type { LoadCase } from '@shared/model/truss';
import { TrussModelRecord } from '../../server/db/models';
import { demoEmail, signIn, startTestServices, type Tab } from '../support/test-services';

/**
 * The roof loading's wind normal to the slopes and span patterns through the API, on a real
 * SQLite file and real sessions. The truss is drawn here as an R12 DXF (LINE entities, group
 * codes 10/20 and 11/21), in metres: a 3-4-5 gable L (0, 0), T (4, 3), R (8, 0) with a post to
 * M (4, 0). Every sine and cosine of its slopes is exact: sin θ = 0.6, cos θ = 0.8.
 */
function trussDxf(): Buffer {
  const line = (a: [number, number], b: [number, number]) =>
    ['0', 'LINE', '8', 'TRUSS', '10', a[0], '20', a[1], '30', 0, '11', b[0], '21', b[1], '31', 0].join('\n');
  const entities = [line([0, 0], [4, 0]), line([4, 0], [8, 0]), line([0, 0], [4, 3]), line([4, 3], [8, 0]), line([4, 0], [4, 3])];
  return Buffer.from(['0', 'SECTION', '2', 'ENTITIES', ...entities, '0', 'ENDSEC', '0', 'EOF', ''].join('\n'));
}

let services: Services;
let engineer: Tab;
let trussId: number;
const J = {} as Record<'L' | 'M' | 'R' | 'T', string>;

const post = (path: string, body: object | string) => {
  const req = engineer.agent.post(path).set('X-CSRF-Token', engineer.csrf);
  return typeof body === 'string' ? req.set('Content-Type', 'application/json').send(body) : req.send(body);
};
const preview = (body: object | string) => post(`/api/trusses/${trussId}/takeoff/preview`, body);
const currentModel = async (): Promise<TrussModelView> => (await engineer.agent.get(`/api/trusses/${trussId}/model`).expect(200)).body;

const cases: LoadCase[] = [
  { id: 'D', name: 'Dead', category: 'dead', loads: [] },
  { id: 'S', name: 'Snow', category: 'snow', loads: [] },
  { id: 'W', name: 'Wind from the left', category: 'wind', loads: [] },
];

async function save(takeoff: unknown, loadCases: LoadCase[] = cases) {
  const { version } = await currentModel();
  return engineer.agent
    .put(`/api/trusses/${trussId}/model`)
    .set('X-CSRF-Token', engineer.csrf)
    .send({
      version,
      supports: [
        { joint: J.L, kind: 'pin' },
        { joint: J.R, kind: 'roller', angleDeg: 90 },
      ],
      loadCases,
      combinations: [],
      members: [],
      takeoff,
    });
}

const takeoff = (over: Partial<TakeoffInput> = {}): TakeoffInput => ({
  topChordJoints: [J.L, J.T, J.R],
  areaLoads: [],
  wind: { caseId: 'W', q: 0.8, unit: 'kPa', windward: 'left', cWindward: 0.3, cLeeward: -0.6 },
  spacing: 4,
  trussCount: 3,
  trussIndex: 1,
  method: 'exact',
  ...over,
});

beforeAll(async () => {
  services = await startTestServices();
  engineer = await signIn(services.app, demoEmail('engineer'));
  const drafter = await signIn(services.app, demoEmail('drafter'));
  const truss = await drafter.agent.post('/api/projects/1/trusses').set('X-CSRF-Token', drafter.csrf).send({ name: 'T8 — wind and span patterns' });
  trussId = truss.body.id;
  const upload = await drafter.agent.post(`/api/trusses/${trussId}/drawings`).set('X-CSRF-Token', drafter.csrf).field('units', 'm').attach('file', trussDxf(), 't8.dxf');
  expect(upload.body.status).toBe('imported');
  const { model } = await currentModel();
  const at = (x: number, y: number) => model.joints.find((j) => Math.abs(j.x - x) < 1e-9 && Math.abs(j.y - y) < 1e-9)!.id;
  Object.assign(J, { L: at(0, 0), M: at(4, 0), R: at(8, 0), T: at(4, 3) });
  expect((await save(null)).status).toBe(200);
});
afterAll(async () => {
  await services?.shutdown();
});

describe('roof loading: wind normal to the slopes', () => {
  it('when the engineer previews wind on a 3-4-5 gable, then every joint load is the hand resolution p·½s·(sin θ, −cos θ) times the purlin factor', async () => {
    const res = await preview(takeoff());
    expect(res.status).toBe(200);
    // Purlin factor 1.25 × 4 m = 5 m (two equal spans, interior support: AISC Manual Table 3-23, from memory).
    // Windward L–T: p = 0.8 × 0.3 = 0.24 kPa, ½s = 2.5 m, w_n = 0.6 kN/m; leeward T–R: w_n = −1.2 kN/m.
    // Pressure p > 0 pushes on the surface; F = w_n (sin θ, −cos θ), θ signed from +x (statics, from memory).
    const c = 5;
    const want = {
      [J.L]: { fx: c * 0.6 * 0.6, fy: c * -0.6 * 0.8 },
      [J.T]: { fx: c * (0.36 + -1.2 * -0.6), fy: c * (-0.48 + 1.2 * 0.8) },
      [J.R]: { fx: c * (-1.2 * -0.6), fy: c * (1.2 * 0.8) },
    };
    const loads = res.body.result.caseLoads.W as { joint: string; fx: number; fy: number }[];
    expect(loads).toHaveLength(3);
    for (const l of loads) {
      expect(l.fx).toBeCloseTo(want[l.joint].fx, 10);
      expect(l.fy).toBeCloseTo(want[l.joint].fy, 10);
    }
  });

  it('when the velocity pressure is given in psf, then it is converted to kPa first', async () => {
    // 1 psf = 0.047880259 kPa (exact definitions of lbf and ft; NIST SP 811 Appendix B, from memory).
    const res = await preview(takeoff({ wind: { caseId: 'W', q: 20, unit: 'psf', windward: 'left', cWindward: 0.3, cLeeward: -0.6 } }));
    expect(res.status).toBe(200);
    expect(res.body.result.wind.q).toBeCloseTo((20 * 4.4482216152605) / (0.3048 * 0.3048) / 1000, 12);
  });

  it('when wind and pattern-loaded snow are saved and the truss is run, then the run uses both, and the wind case has sideways loads', async () => {
    const input = takeoff({ areaLoads: [{ caseId: 'S', q: 1, unit: 'kPa', basis: 'plan', patterns: true }], trussIndex: 0 });
    // As "Use these loads" does: the preview's loads go into their cases, marked as from the roof loading (a run solves the saved loads).
    const computed = (await preview(input)).body.result.caseLoads as Record<string, LoadCase['loads']>;
    const saved = await save(input, cases.map((c) => (computed[c.id] ? { ...c, loads: computed[c.id]!, source: 'roof-loading' as const } : c)));
    expect(saved.status).toBe(200);
    const started = await post(`/api/trusses/${trussId}/runs`, {});
    expect(started.status).toBe(202);
    let run: RunView | null = null;
    for (let i = 0; i < 600; i++) {
      run = (await engineer.agent.get(`/api/runs/${(started.body as RunSummaryView).id}`).expect(200)).body as RunView;
      if (run.status !== 'queued' && run.status !== 'running') break;
      await new Promise((r) => setTimeout(r, 50));
    }
    expect(run!.status).toBe('solved');
    const wind = run!.model.loadCases.find((c) => c.id === 'W')!;
    expect(wind.loads.some((l) => Math.abs(l.fx) > 0.1)).toBe(true);
    // End truss of two equal spans: snow on span 1 only governs, 7/16 wL (AISC Manual Table 3-23, from memory);
    // the apex purlin carries w = 1 kPa × 4 m of plan.
    const snow = run!.takeoff!.result.cases.find((c) => c.caseId === 'S')!;
    expect(snow.pattern?.label).toBe('span 1 loaded');
    expect(run!.model.loadCases.find((c) => c.id === 'S')!.loads.find((l) => l.joint === J.T)!.fy).toBeCloseTo(-(7 / 16) * 4 * 4, 10);
  });
});

describe('roof loading: bad wind and pattern input is refused with 422 and one sentence, nothing written', () => {
  const refusals: [string, object | string, string, RegExp][] = [
    ['a coefficient without a velocity pressure', { wind: { caseId: 'W', q: null, unit: 'kPa', windward: 'left', cWindward: 0.3, cLeeward: -0.6 } }, 'wind-without-pressure', /without a velocity pressure q/],
    ['a velocity pressure above 50 kPa', { wind: { caseId: 'W', q: 60, unit: 'kPa', windward: 'left', cWindward: 0.3, cLeeward: -0.6 } }, 'wind-pressure-out-of-range', /at most 50 kPa/],
    ['a negative velocity pressure', { wind: { caseId: 'W', q: -1, unit: 'kPa', windward: 'left', cWindward: 0.3, cLeeward: -0.6 } }, 'wind-pressure-out-of-range', /greater than 0/],
    ['a coefficient of −7', { wind: { caseId: 'W', q: 0.8, unit: 'kPa', windward: 'left', cWindward: 0.3, cLeeward: -7 } }, 'wind-coefficient-out-of-range', /between −5 and 5/],
    ['a pattern request for the dead case', { areaLoads: [{ caseId: 'D', q: 1, unit: 'kPa', basis: 'plan', patterns: true }] }, 'pattern-not-allowed', /dead case/],
    ['wind put into the snow case', { wind: { caseId: 'S', q: 0.8, unit: 'kPa', windward: 'left', cWindward: 0.3, cLeeward: -0.6 } }, 'wind-case-not-wind', /snow case/],
  ];

  it.each(refusals)('when the takeoff has %s, then preview and save answer 422 and the model is unchanged', async (_what, change, code, message) => {
    const body = { ...takeoff(), ...(change as object) };
    const pre = await preview(body);
    expect(pre.status).toBe(422);
    expect(pre.body.error.code).toBe(code);
    expect(pre.body.error.message).toMatch(message);
    // One sentence: a single full stop, at the end.
    expect(pre.body.error.message.replace(/\d\.\d|e\.g\./g, '').split('. ').length).toBe(1);

    const before = await TrussModelRecord.findByPk(trussId);
    const res = await save(body);
    expect(res.status).toBe(422);
    expect(res.body.error.code).toBe(code);
    const after = await TrussModelRecord.findByPk(trussId);
    expect(after!.version).toBe(before!.version);
    expect(after!.takeoff).toBe(before!.takeoff);
  });

  it('when the velocity pressure is not finite (1e999 in the JSON), then 422 and nothing is written', async () => {
    const text = JSON.stringify(takeoff()).replace('"q":0.8', '"q":1e999');
    expect(text).toContain('1e999');
    const pre = await preview(text);
    expect(pre.status).toBe(422);
    expect(pre.body.error.code).toBe('wind-value-not-finite');
    const before = await TrussModelRecord.findByPk(trussId);
    const { version } = await currentModel();
    const body = `{"version":${version},"supports":[],"loadCases":${JSON.stringify(cases)},"combinations":[],"members":[],"takeoff":${text}}`;
    const res = await engineer.agent.put(`/api/trusses/${trussId}/model`).set('X-CSRF-Token', engineer.csrf).set('Content-Type', 'application/json').send(body);
    expect(res.status).toBe(422);
    expect((await TrussModelRecord.findByPk(trussId))!.version).toBe(before!.version);
  });
});
