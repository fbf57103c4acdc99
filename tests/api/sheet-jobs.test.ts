import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import http from 'node:http';
import os from 'node:os';
import path from 'node:path';
import type { AddressInfo } from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { PrintJobView } from '@shared/schemas/print-job.schema';
import { trussSolve } from '@shared/solver';
import { modelFromSketch, parallelChordSketch } from '@shared/solver/test-trusses';
import type { Services } from '../../server/bootstrap';
import { AnalysisRun } from '../../server/db/models';
import { demoEmail, openTab, signIn, startTestServices, tempDataDir, type Tab } from '../support/test-services';

/**
 * Calc sheet PDFs as background print jobs, through a listening server with real sessions, a real
 * SQLite file and the real Chromium: a large sheet goes queued → building → printing → done, its
 * PDF's page count agrees with poppler's pdfinfo and with the sheet's own "Sheet 1 of N", other
 * people's requests keep answering while it builds and prints, another person cannot read the
 * job, and a server that stops mid-job queues it again at the next start.
 */
const SLOW = 420_000;

let services: Services;
let server: http.Server;
let base: string;
let engineer: Tab;
let reviewer: Tab;
const store = tempDataDir();
const tmp = fs.mkdtempSync(path.join(os.tmpdir(), 'pp-sheet-jobs-'));

/** A solved run of a parallel-chord Pratt truss on the demo truss T1, solved by the real solver. */
async function runOf(panels: number, cases: string[]): Promise<number> {
  const sketch = parallelChordSketch('pratt', panels, 3, 3, 10);
  const loads = sketch.cases![0].loads;
  sketch.cases = cases.map((id, k) => ({ id, loads: loads.map(([j, , fy]) => [j, k === 1 ? 2 : 0, fy * (1 + k / 2)] as [string, number, number]) }));
  const model = modelFromSketch(sketch);
  const row = await AnalysisRun.create({
    trussId: 1,
    number: (await AnalysisRun.count({ where: { trussId: 1 } })) + 1,
    modelVersion: 1,
    status: 'solved',
    progress: JSON.stringify({ phase: 'done', fraction: 1 }),
    model: JSON.stringify(model),
    takeoff: null,
    analysis: JSON.stringify(trussSolve(model)),
    summary: null,
    error: null,
    ranById: null,
    startedAt: new Date(),
    finishedAt: new Date(),
  });
  return row.id;
}

async function listen(s: Services): Promise<void> {
  services = s;
  server = http.createServer(s.app);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  engineer = await signIn(base, demoEmail('engineer'));
  reviewer = await signIn(base, demoEmail('reviewer'));
}

async function stop(): Promise<void> {
  await new Promise<void>((resolve) => server.close(() => resolve()));
  await services.shutdown();
}

const startOn = () => startTestServices({ ...store, uploadsDir: fs.mkdtempSync(path.join(tmp, 'uploads-')) });

/** Polls a job until it is done or failed, noting every state seen. */
async function follow(tab: Tab, id: number, seen: PrintJobView[] = [], ms = 360_000): Promise<PrintJobView> {
  const end = Date.now() + ms;
  for (;;) {
    const job: PrintJobView = (await tab.agent.get(`/api/sheet-jobs/${id}`).expect(200)).body;
    const last = seen.at(-1);
    if (!last || last.state !== job.state || last.stage !== job.stage || last.percent !== job.percent) seen.push(job);
    if (job.state === 'done' || job.state === 'failed' || Date.now() > end) return job;
    await new Promise((r) => setTimeout(r, 150));
  }
}

function pdfInfoPages(file: string): number {
  return Number(/Pages:\s+(\d+)/.exec(execFileSync('pdfinfo', [file], { encoding: 'utf8' }))![1]);
}

beforeAll(async () => {
  await listen(await startOn());
}, 120_000);

afterAll(async () => {
  if (server?.listening) await stop();
  fs.rmSync(store.dataDir, { recursive: true, force: true });
  fs.rmSync(tmp, { recursive: true, force: true });
});

describe('calc sheet print jobs (real Chromium, SQLite file)', () => {
  it('when a large sheet is asked for, then it answers 202 at once, moves queued → building → printing → done with rising percent, other clients keep answering under 1 s, and the PDF has the pages the job says', async () => {
    const runId = await runOf(30, ['D', 'L']);
    const asked = performance.now();
    const res = await engineer.agent.post(`/api/runs/${runId}/sheet-jobs`).set('X-CSRF-Token', engineer.csrf).expect(202);
    const answeredMs = performance.now() - asked;
    const job: PrintJobView = res.body;
    expect(res.headers.location).toBe(`/api/sheet-jobs/${job.id}`);
    expect(job).toMatchObject({ runId, state: 'queued', percent: 0, pdfUrl: null });
    // Asking again while it is unfinished answers the same job, not a second one.
    const again: PrintJobView = (await engineer.agent.post(`/api/runs/${runId}/sheet-jobs`).set('X-CSRF-Token', engineer.csrf).expect(202)).body;
    expect(again.id).toBe(job.id);

    // Another person reads the project list all the while.
    const latencies: { ms: number; state: string }[] = [];
    const seen: PrintJobView[] = [job];
    let following = true;
    const reader = (async () => {
      while (following) {
        const t = performance.now();
        await reviewer.agent.get('/api/projects').expect(200);
        latencies.push({ ms: performance.now() - t, state: seen.at(-1)!.state });
        await new Promise((r) => setTimeout(r, 100));
      }
    })();
    const finished = await follow(engineer, job.id, seen);
    following = false;
    await reader;

    expect(finished.error).toBeNull();
    expect(finished.state).toBe('done');
    const states = seen.map((j) => j.state).filter((s, i, all) => s !== all[i - 1]);
    expect(states).toEqual(['queued', 'building', 'printing', 'done']);
    const percents = seen.map((j) => j.percent);
    expect(percents).toEqual([...percents].sort((a, b) => a - b));
    expect(percents.at(-1)).toBe(100);
    const during = latencies.filter((l) => l.state === 'building' || l.state === 'printing');
    expect(during.length).toBeGreaterThan(3);
    const worst = Math.max(...during.map((l) => l.ms));
    expect(worst).toBeLessThan(1000);

    const pdf = await engineer.agent.get(finished.pdfUrl!).buffer(true).parse((r, cb) => {
      const parts: Buffer[] = [];
      r.on('data', (c: Buffer) => parts.push(c));
      r.on('end', () => cb(null, Buffer.concat(parts)));
    });
    expect(pdf.status).toBe(200);
    expect(pdf.headers['content-type']).toMatch(/application\/pdf/);
    expect(pdf.headers['content-disposition']).toMatch(/calc-sheet-draft\.pdf/);
    const file = path.join(tmp, 'job.pdf');
    fs.writeFileSync(file, pdf.body as Buffer);
    // Three counts that must agree: poppler's, the job's, and the sheet's own title block.
    const pages = pdfInfoPages(file);
    expect(pages).toBe(finished.pages);
    expect(pages).toBeGreaterThan(20);
    const first = execFileSync('pdftotext', ['-f', '1', '-l', '1', file, '-'], { encoding: 'utf8' });
    expect(first).toMatch(new RegExp(`Sheet 1 of ${pages}\\b`));
    console.log(
      `print job ${job.id}: 202 in ${answeredMs.toFixed(0)} ms; stages ${[...new Set(seen.map((j) => j.stage))].join(' → ')}; ` +
        `${pages} pages, ${(finished.pdfBytes! / 1024).toFixed(0)} KiB; project list while it ran: ${during.length} requests, worst ${worst.toFixed(0)} ms`,
    );
  }, SLOW);

  it('when someone other than the requester, or nobody signed in, asks for a job or its PDF, then it is refused with one sentence and nothing is shown', async () => {
    const runId = await runOf(3, ['D']);
    const job: PrintJobView = (await engineer.agent.post(`/api/runs/${runId}/sheet-jobs`).set('X-CSRF-Token', engineer.csrf).expect(202)).body;
    for (const url of [`/api/sheet-jobs/${job.id}`, `/api/sheet-jobs/${job.id}/pdf`]) {
      const other = await reviewer.agent.get(url).expect(403);
      expect(other.body.error.code).toBe('not-your-print-job');
      expect(other.body.error.message.split(/(?<=\.)\s/)).toHaveLength(1);
      expect(JSON.stringify(other.body)).not.toMatch(/runId|stage|percent/);
      const anon = await openTab(base);
      await anon.agent.get(url).expect(401);
    }
    expect((await reviewer.agent.get(`/api/runs/${runId}/sheet-jobs`).expect(200)).body).toEqual([]);
    expect((await engineer.agent.get(`/api/runs/${runId}/sheet-jobs`).expect(200)).body.map((j: PrintJobView) => j.id)).toEqual([job.id]);
    const anon = await openTab(base);
    await anon.agent.post(`/api/runs/${runId}/sheet-jobs`).set('X-CSRF-Token', anon.csrf).expect(401);
    expect((await follow(engineer, job.id)).state).toBe('done');
  }, SLOW);

  it('when a job is asked for a run that does not exist or is not solved, or a third while two are unfinished, then it answers 404, 409 or 429 with one sentence and stores nothing', async () => {
    const missing = await engineer.agent.post('/api/runs/999999/sheet-jobs').set('X-CSRF-Token', engineer.csrf).expect(404);
    expect(missing.body.error.message).toMatch(/not found/);
    const queued = await AnalysisRun.create({
      trussId: 1, number: (await AnalysisRun.count({ where: { trussId: 1 } })) + 1, modelVersion: 1, status: 'queued', progress: '{}', model: '{}', takeoff: null, analysis: null, summary: null, error: null, ranById: null, startedAt: null, finishedAt: null,
    });
    const notYet = await engineer.agent.post(`/api/runs/${queued.id}/sheet-jobs`).set('X-CSRF-Token', engineer.csrf).expect(409);
    expect(notYet.body.error.message).toMatch(/still waiting to be solved/);
    const a = await runOf(3, ['D']);
    const b = await runOf(4, ['D']);
    const c = await runOf(5, ['D']);
    const ja: PrintJobView = (await engineer.agent.post(`/api/runs/${a}/sheet-jobs`).set('X-CSRF-Token', engineer.csrf).expect(202)).body;
    const jb: PrintJobView = (await engineer.agent.post(`/api/runs/${b}/sheet-jobs`).set('X-CSRF-Token', engineer.csrf).expect(202)).body;
    const full = await engineer.agent.post(`/api/runs/${c}/sheet-jobs`).set('X-CSRF-Token', engineer.csrf);
    // The first may already be done on a quiet machine; then the third is taken.
    if (full.status === 429) {
      expect(full.body.error.code).toBe('print-queue-full');
      expect(full.body.error.message.split(/(?<=\.)\s/)).toHaveLength(1);
      expect((await engineer.agent.get(`/api/runs/${c}/sheet-jobs`).expect(200)).body).toEqual([]);
    } else {
      expect(full.status).toBe(202);
    }
    const early = await engineer.agent.get(`/api/sheet-jobs/${jb.id}/pdf`);
    if (early.status !== 200) expect(early.body.error.code).toBe('print-job-not-done');
    expect((await follow(engineer, ja.id)).state).toBe('done');
    expect((await follow(engineer, jb.id)).state).toBe('done');
  }, SLOW);

  it('when the server stops while a job is printing, then the next start queues it again and it is done; a job that already had its three tries fails with a sentence', async () => {
    const runId = await runOf(4, ['D']);
    const sequelize = services.sequelize;
    const at = new Date().toISOString();
    const insert = async (state: string, attempts: number) => {
      await sequelize.query(
        `INSERT INTO print_jobs ("runId", "requestedById", state, stage, percent, attempts, "startedAt", "createdAt", "updatedAt")
         VALUES (?, (SELECT id FROM users WHERE email = ?), ?, 'laying out and printing the pages', 60, ?, ?, ?, ?)`,
        { replacements: [runId, demoEmail('engineer'), state, attempts, at, at, at] },
      );
      const [rows] = await sequelize.query('SELECT MAX(id) AS id FROM print_jobs');
      return Number((rows as { id: number }[])[0].id);
    };
    const interrupted = await insert('printing', 1);
    const tired = await insert('building', 3);
    await stop();

    await listen(await startOn());
    const back = await follow(engineer, interrupted);
    expect(back.state).toBe('done');
    expect(back.pages).toBeGreaterThan(0);
    const gaveUp: PrintJobView = (await engineer.agent.get(`/api/sheet-jobs/${tired}`).expect(200)).body;
    expect(gaveUp.state).toBe('failed');
    expect(gaveUp.error).toMatch(/stopped 3 times .* ask for it again/);
    expect(gaveUp.error!.split(/(?<=\.)\s/)).toHaveLength(1);
  }, SLOW);
});
