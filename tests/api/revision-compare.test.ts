import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { RunView } from '@shared/schemas/run.schema';
import type { RevisionCompareView } from '@shared/schemas/revision-compare.schema';
import { trussSolve } from '@shared/solver';
import type { Services } from '../../server/bootstrap';
import { AnalysisRun, SheetRevision, SheetRevisionEvent } from '../../server/db/models';
import { binaryBody, fixtureRun, loadDemoTruss, runToEnd } from '../support/fixtures';
import { demoEmail, demoUserId, signIn, startTestServices, type Tab } from '../support/test-services';

/**
 * Revision comparison through the API, on a real database file (SQLite, or PostgreSQL under the
 * postgres project) with real runs of the demo truss T1 (12 m span, 3 m rise, six 2 m panels,
 * pin at the left bearing, roller at the right). Revision A: 10 kN down at each of the five upper
 * panel points. Revision B: the same but 16 kN at the apex (x = 6 m), ΔP = 6 kN.
 *
 * Expected differences by hand (method of joints, from memory; superposition holds for a linear
 * truss, so B − A is the truss under ΔP alone): ΔR = ΔP/2 = 3 kN at each bearing (symmetry,
 * ΣFy = 0); at a bearing the top chord rises 1 in 2, so ΔN_top = −ΔR·√5 = −6.708 kN and the bottom
 * chord ΔN_bottom = +2·ΔR = +6.000 kN.
 */
let services: Services;
let engineer: Tab;
let reviewer: Tab;
let runA: RunView;
let runB: RunView;
let sheetA: number;
let sheetB: number;
let otherTrussSheet: number;

const newSheet = async (trussId: number, runId: number) => {
  const res = await engineer.agent.post(`/api/trusses/${trussId}/sheets`).set('X-CSRF-Token', engineer.csrf).send({ runId });
  expect(res.status).toBe(201);
  return res.body.id as number;
};

const counts = async () => ({
  revisions: await SheetRevision.count(),
  events: await SheetRevisionEvent.count(),
  runs: await AnalysisRun.count(),
});

beforeAll(async () => {
  services = await startTestServices();
  engineer = await signIn(services.app, demoEmail('engineer'));
  reviewer = await signIn(services.app, demoEmail('reviewer'));
  await loadDemoTruss(engineer, 10);
  runA = await runToEnd(engineer);
  expect(runA.status).toBe('solved');
  sheetA = await newSheet(1, runA.id);
  await loadDemoTruss(engineer, 16);
  runB = await runToEnd(engineer);
  expect(runB.status).toBe('solved');
  sheetB = await newSheet(1, runB.id);
  otherTrussSheet = await newSheet(2, await fixtureRun(2));
}, 90_000);

afterAll(async () => {
  await services.shutdown();
});

describe('GET /api/sheets/:id/compare', () => {
  it('when the checker compares revision B with A, then the changed load and the force differences match the hand calculation and superposition', async () => {
    const res = await reviewer.agent.get(`/api/sheets/${sheetB}/compare`);
    expect(res.status).toBe(200);
    const view = res.body as RevisionCompareView;
    expect(view.revision).toMatchObject({ id: sheetB, label: 'B', runId: runB.id, run: expect.stringMatching(new RegExp(`^Run ${runB.number} of T1`)) });
    expect(view.against).toMatchObject({ id: sheetA, label: 'A', runId: runA.id });
    expect(view.diff.geometry.jointsMoved).toEqual([]);
    expect(view.diff.supports).toEqual({ added: [], removed: [], changed: [] });

    const model = (await reviewer.agent.get(`/api/runs/${runB.id}`).expect(200)).body.model as RunView['model'];
    const tagAt = (x: number, y: number) => model.joints.find((j) => Math.abs(j.x - x) < 1e-6 && Math.abs(j.y - y) < 1e-6)!.tag;
    expect(view.diff.loadCases.changed).toEqual([
      expect.objectContaining({ id: 'D', loads: [{ joint: tagAt(6, 3), before: { fx: 0, fy: -10 }, after: { fx: 0, fy: -16 }, dfx: 0, dfy: -6 }], dTotalFy: -6 }),
    ]);

    const d = view.diff.results.find((r) => r.kind === 'case' && r.name === 'D')!;
    expect(d.presence).toBe('both');
    const reaction = (x: number, c: 'rx' | 'ry') => d.reactions.find((r) => r.at === tagAt(x, 0) && r.component === c);
    expect(reaction(0, 'ry')!.difference).toBeCloseTo(3, 9);
    expect(reaction(12, 'ry')!.difference).toBeCloseTo(3, 9);
    expect(reaction(0, 'rx')).toBeUndefined();
    const memberBetween = (a: [number, number], b: [number, number]) => {
      const ja = tagAt(...a);
      const jb = tagAt(...b);
      const byTag = new Map(model.joints.map((j) => [j.id, j.tag]));
      return model.members.find((m) => [byTag.get(m.from), byTag.get(m.to)].sort().join() === [ja, jb].sort().join())!.tag;
    };
    const force = (tag: string) => d.forces.find((f) => f.at === tag)!;
    expect(force(memberBetween([0, 0], [2, 1])).difference).toBeCloseTo(-3 * Math.sqrt(5), 6);
    expect(force(memberBetween([0, 0], [2, 0])).difference).toBeCloseTo(6, 6);
    expect(force(memberBetween([0, 0], [2, 0])).before).toBeCloseTo(50, 6);

    // Superposition: every difference is the force under ΔP = 6 kN at the apex alone.
    const alone = trussSolve({
      ...model,
      loadCases: [{ id: 'dP', name: 'dP', category: 'dead', loads: [{ joint: model.joints.find((j) => j.tag === tagAt(6, 3))!.id, fx: 0, fy: -6 }] }],
      combinations: [],
    }).cases[0]!;
    const tagOf = new Map(model.members.map((m) => [m.id, m.tag]));
    for (const [id, f] of Object.entries(alone.forces)) {
      const row = d.forces.find((x) => x.at === tagOf.get(id));
      if (Math.abs(f) < 1e-6) expect(row).toBeUndefined();
      else expect(row!.difference).toBeCloseTo(f, 6);
    }

    const lines = Object.fromEntries(view.lines.map((l) => [l.kind, l.text]));
    expect(lines.loads).toBe('case D changed at 1 joint (total Fy \u22126.00\u202fkN)');
    expect(lines.geometry).toBe('no change');
    expect(view.toleranceNote).toMatch(/0\.01 % of the larger value/);

    // The sheet's steps: case D's worked steps changed, the stability step did not.
    expect(view.steps.total).toBe(view.steps.changed.length + view.steps.unchanged.length);
    expect(view.steps.unchanged).toContain(view.steps.unchanged.find((id) => !id.startsWith('case-')));
    expect(view.steps.changed.length).toBeGreaterThan(0);
    for (const s of view.steps.changed) {
      expect(s.caseId).toBe('D');
      expect(s.number).toMatch(/^\d+\.\d+$/);
    }
    expect(view.steps.removed).toEqual([]);
  });

  it('when asked with ?with= the earlier revision, then the answer is the default one', async () => {
    const byDefault = (await reviewer.agent.get(`/api/sheets/${sheetB}/compare`).expect(200)).body as RevisionCompareView;
    const asked = (await reviewer.agent.get(`/api/sheets/${sheetB}/compare?with=${sheetA}`).expect(200)).body as RevisionCompareView;
    expect(asked.diff).toEqual(byDefault.diff);
    // A against B reads the other way: the load went from −16 back to −10.
    const back = (await reviewer.agent.get(`/api/sheets/${sheetA}/compare?with=${sheetB}`).expect(200)).body as RevisionCompareView;
    expect(back.diff.loadCases.changed[0]!.loads[0]!.dfy).toBe(6);
  });

  it('when revision B is previewed, then its cover carries the revision table: A first, B with the changed load and forces in one line per kind', async () => {
    const res = await reviewer.agent.get(`/api/sheets/${sheetB}/preview`);
    expect(res.status).toBe(200);
    const table = /<table class="signoff revision-table"[\s\S]*?<\/table>/.exec(res.text)?.[0] ?? '';
    expect(table).toMatch(/<th>A<\/th><td class="num">\d{4}-\d\d-\d\d<\/td><td>draft<\/td><td><div class="rev-line">First revision of this truss.<\/div>/);
    expect(table).toContain('<div class="rev-line">Loads: case D changed at 1 joint (total Fy \u22126.00\u202fkN).</div>');
    expect(table).toMatch(/Forces and reactions: forces of \d+ members changed, by up to 6\.71\u202fkN \(case D\); reactions changed\./);
    expect(table).not.toContain('Geometry:');
    // Revision A's own sheet lists only itself.
    const a = await reviewer.agent.get(`/api/sheets/${sheetA}/preview`);
    expect(a.text.match(/<th>[A-Z]<\/th><td class="num">/g)).toEqual(['<th>A</th><td class="num">']);
  });

  it('when revision B is issued, then the issued PDF prints the revision table with B dated as issued and the load line', async () => {
    const post = (t: Tab, url: string, body: object = {}) => t.agent.post(url).set('X-CSRF-Token', t.csrf).send(body);
    await post(engineer, `/api/sheets/${sheetB}/submit`, { checkerId: await demoUserId() }).expect(200);
    await post(reviewer, `/api/sheets/${sheetB}/check`).expect(200);
    const issued = await post(engineer, `/api/sheets/${sheetB}/issue`);
    expect(issued.status).toBe(200);
    const pdf = (await binaryBody(reviewer.agent.get(`/api/sheets/${sheetB}/pdf`))).body as Buffer;
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'pp-compare-'));
    try {
      fs.writeFileSync(path.join(dir, 'b.pdf'), pdf);
      const text = execFileSync('pdftotext', ['-f', '1', '-l', '3', path.join(dir, 'b.pdf'), '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
      expect(text).toContain('Revisions');
      expect(text).toContain('First revision of this truss.');
      expect(text).toMatch(new RegExp(`B ${issued.body.issue.issuedAt.slice(0, 10)} issued`));
      expect(text).toContain('Loads: case D changed at 1 joint (total Fy −6.00 kN).');
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  }, 120_000);

  it('when revision C is started from the same run as B, then nothing differs, every step is unchanged and the table says so', async () => {
    const sheetC = await newSheet(1, runB.id);
    const view = (await reviewer.agent.get(`/api/sheets/${sheetC}/compare`).expect(200)).body as RevisionCompareView;
    expect(view.against.label).toBe('B');
    expect(view.diff.unchanged).toBe(true);
    expect(view.diff.results).toEqual([]);
    expect(view.lines.every((l) => !l.changed && l.text === 'no change')).toBe(true);
    expect(view.steps.changed).toEqual([]);
    expect(view.steps.unchanged).toHaveLength(view.steps.total);
    const preview = await reviewer.agent.get(`/api/sheets/${sheetC}/preview`).expect(200);
    expect(preview.text).toContain('No change to the model or results since revision B.');
  });

  it('when the input is bad, then one sentence each and nothing written', async () => {
    const before = await counts();
    const refused = [
      [`/api/sheets/${sheetB}/compare?with=${otherTrussSheet}`, 422, /belongs to another truss/],
      [`/api/sheets/${sheetA}/compare`, 422, /first revision of this truss/],
      [`/api/sheets/99999/compare`, 404, /was not found/],
      [`/api/sheets/${sheetB}/compare?with=99999`, 404, /to compare with was not found/],
      [`/api/sheets/${sheetB}/compare?with=abc`, 422, /whole number/],
      [`/api/sheets/${sheetB}/compare?with=1.5`, 422, /whole number/],
      [`/api/sheets/${sheetB}/compare?with=${sheetB}`, 422, /itself/],
      [`/api/sheets/abc/compare`, 404, /was not found/],
    ] as const;
    for (const [url, status, message] of refused) {
      const res = await reviewer.agent.get(url);
      expect(res.status, url).toBe(status);
      expect(res.body.error.message, url).toMatch(message);
      expect(res.body.error.message.split(/\.\s/).length, url).toBeLessThanOrEqual(2);
    }
    expect(await counts()).toEqual(before);
  });

  it('when the reader is not signed in, then 401', async () => {
    const { default: request } = await import('supertest');
    expect((await request(services.app).get(`/api/sheets/${sheetB}/compare`)).status).toBe(401);
  });
});
