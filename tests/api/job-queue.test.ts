import pg from 'pg';
import { afterAll, describe, expect, it } from 'vitest';
import { inProcessQueueCreate, pgBossQueueOpen, type JobAttempt, type JobQueue } from '../../server/workers/job-queue';
import { pgTestDatabaseCreate, pgTestDatabasesDrop, pgTestsOn } from '../support/pg';
import { demoEmail, signIn, startTestServices } from '../support/test-services';
import { solvedDemoRun } from '../support/fixtures';

/**
 * The job queue's two implementations behind one interface: the in-process queue (SQLite) and
 * pg-boss 10 on a PostgreSQL database of the test server (PostgreSQL project only). Priorities
 * (issuing first, draft PDFs last), retries with the attempt number and the last try marked,
 * the time limit of a try, and the dead-letter hand-off when the queue gives up.
 */

const until = async (ok: () => boolean, ms = 20_000) => {
  const end = Date.now() + ms;
  while (!ok() && Date.now() < end) await new Promise((r) => setTimeout(r, 50));
  return ok();
};

describe('the in-process queue', () => {
  it('when jobs of each priority wait, then they are taken issue → run → preview → background, oldest first within one, one at a time', async () => {
    const q = inProcessQueueCreate({ log: () => {} });
    const taken: number[] = [];
    let running = 0;
    let most = 0;
    await q.send('print-sheet', { id: 1 }, { priority: 'background' });
    await q.send('print-sheet', { id: 2 }, { priority: 'preview' });
    await q.send('print-sheet', { id: 3 }, { priority: 'background' });
    await q.send('print-sheet', { id: 4 }, { priority: 'issue' });
    await q.send('print-sheet', { id: 5 }, { priority: 'run' });
    await q.work('print-sheet', async ({ id }) => {
      running++;
      most = Math.max(most, running);
      await new Promise((r) => setTimeout(r, 5));
      taken.push(id);
      running--;
    });
    await q.idle();
    expect(taken).toEqual([4, 5, 2, 1, 3]);
    expect(most).toBe(1);
    await q.close();
  });

  it('when a handler throws, then the error is logged once and the next job still runs (one try: the service records the failure itself)', async () => {
    const logged: string[] = [];
    const q = inProcessQueueCreate({ log: (m) => logged.push(m) });
    const attempts: JobAttempt[] = [];
    await q.work('solve-run', async ({ id }, attempt) => {
      attempts.push(attempt);
      if (id === 1) throw new Error('boom');
    });
    await q.send('solve-run', { id: 1 }, { priority: 'run' });
    await q.send('solve-run', { id: 2 }, { priority: 'run' });
    await q.idle();
    expect(attempts).toEqual([{ attempt: 1, last: true }, { attempt: 1, last: true }]);
    expect(logged).toEqual(['A solve-run job (row 1) failed']);
    await q.close();
  });
});

const on = pgTestsOn();
if (!on) console.log('pg-boss queue tests skipped: they run in the PostgreSQL project only (PANELPOINT_TEST_PGHOST names the server).');

describe.skipIf(!on)('the pg-boss queue (PostgreSQL)', () => {
  const opened: JobQueue[] = [];
  afterAll(async () => {
    for (const q of opened) await q.close();
    await pgTestDatabasesDrop();
  }, 60_000);

  const open = async (url: string, policy?: NonNullable<Parameters<typeof pgBossQueueOpen>[1]>['policy']) => {
    const q = await pgBossQueueOpen(url, { log: () => {}, pollingIntervalSeconds: 0.5, policy });
    opened.push(q);
    return q;
  };

  it('when jobs wait before any process works the queue, then they are kept in the database and taken by priority, oldest first within one', async () => {
    const url = await pgTestDatabaseCreate();
    const sender = await open(url);
    expect(sender.durable).toBe(true);
    for (const [id, priority] of [[1, 'background'], [2, 'preview'], [3, 'background'], [4, 'issue'], [5, 'run']] as const) {
      await sender.send('print-sheet', { id }, { priority });
    }
    // The jobs are rows of pg-boss's schema, not this process's memory.
    const c = new pg.Client({ connectionString: url });
    await c.connect();
    const rows = (await c.query(`SELECT (data->>'id')::int AS id, priority, state FROM pgboss.job WHERE name = 'print-sheet' ORDER BY (data->>'id')::int`)).rows;
    await c.end();
    expect(rows).toEqual([
      { id: 1, priority: 0, state: 'created' },
      { id: 2, priority: 10, state: 'created' },
      { id: 3, priority: 0, state: 'created' },
      { id: 4, priority: 30, state: 'created' },
      { id: 5, priority: 20, state: 'created' },
    ]);
    // Another queue object (as another process would open it) takes them.
    const taker = await open(url);
    const taken: number[] = [];
    await taker.work('print-sheet', async ({ id }) => {
      taken.push(id);
    });
    expect(await until(() => taken.length === 5)).toBe(true);
    expect(taken).toEqual([4, 5, 2, 1, 3]);
  }, 60_000);

  it('when a try throws, then pg-boss tries again with the attempt number, marks the last try, and stops after retryLimit', async () => {
    const url = await pgTestDatabaseCreate();
    const q = await open(url, { 'solve-run': { retryLimit: 2, retryDelay: 0 } });
    const attempts: JobAttempt[] = [];
    const givenUp: number[] = [];
    await q.work(
      'solve-run',
      async (_data, attempt) => {
        attempts.push(attempt);
        throw new Error('the database went away');
      },
      async ({ id }) => {
        givenUp.push(id);
      },
    );
    await q.send('solve-run', { id: 7 }, { priority: 'run' });
    expect(await until(() => givenUp.length === 1, 40_000)).toBe(true);
    expect(attempts).toEqual([
      { attempt: 1, last: false },
      { attempt: 2, last: false },
      { attempt: 3, last: true },
    ]);
    expect(givenUp).toEqual([7]);
  }, 60_000);

  it('when a try runs past the time limit (expireInSeconds), then it fails and is tried again, and the dead-letter handler is told when the tries are spent', async () => {
    const url = await pgTestDatabaseCreate();
    const q = await open(url, { 'solve-run': { retryLimit: 1, retryDelay: 0, expireInSeconds: 1 } });
    const starts: number[] = [];
    const givenUp: number[] = [];
    await q.work(
      'solve-run',
      async () => {
        starts.push(Date.now());
        await new Promise((r) => setTimeout(r, 3_000));
      },
      async ({ id }) => {
        givenUp.push(id);
      },
    );
    await q.send('solve-run', { id: 9 }, { priority: 'run' });
    expect(await until(() => givenUp.length === 1, 40_000)).toBe(true);
    expect(starts).toHaveLength(2);
    // The second try began about when the first one's 1 s limit ran out, not after its 3 s.
    expect(starts[1] - starts[0]).toBeLessThan(2_900);
    expect(starts[1] - starts[0]).toBeGreaterThanOrEqual(900);
  }, 60_000);
});

describe.skipIf(!on)('one app process on PostgreSQL with the pg-boss queue and no worker (WORKERS_IN_APP left at true)', () => {
  it('when the engineer runs the demo truss, then the app takes the job from pg-boss itself and the run is solved with the closed-form forces', async () => {
    const services = await startTestServices({ jobQueue: 'pg-boss' });
    try {
      expect(services.queue.kind).toBe('pg-boss');
      expect(services.config.workersInApp).toBe(true);
      const engineer = await signIn(services.app, demoEmail('engineer'));
      const run = await solvedDemoRun(engineer);
      // Closed form (method of joints, from memory; see loadDemoTruss): the end bottom chord +2R = +50 kN.
      const full = (await engineer.agent.get(`/api/runs/${run.id}`).expect(200)).body;
      const at = (x: number, y: number) => full.model.joints.find((j: { x: number; y: number }) => Math.abs(j.x - x) < 1e-6 && Math.abs(j.y - y) < 1e-6).id;
      const chord = full.model.members.find((m: { from: string; to: string }) => [m.from, m.to].sort().join() === [at(0, 0), at(2, 0)].sort().join()).id;
      expect(full.analysis.cases[0].forces[chord]).toBeCloseTo(50, 6);
      const [rows] = await services.sequelize.query(`SELECT state, data FROM pgboss.job WHERE name = 'solve-run'`);
      expect(rows).toEqual([{ state: 'completed', data: { id: run.id } }]);
    } finally {
      await services.shutdown();
    }
  }, 90_000);
});
