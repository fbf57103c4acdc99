import PgBoss from 'pg-boss';
import { redactedUrl } from '../db/sequelize';

/**
 * The one queue the app hands background work to: analysis runs ('solve-run') and calc sheet
 * PDFs ('print-sheet'). Services call `send` and register handlers with `work` the same way
 * whichever queue is behind it:
 *
 * - in-process (SQLite, the default): the handler runs in this process at once, up to the
 *   queue's concurrency, waiting jobs ordered by priority then age; nothing survives a restart
 *   (the services mark or re-queue what a stopped server left unfinished, from their tables);
 * - pg-boss (DATABASE_URL=postgres…): the job is a row of pg-boss's schema on the same
 *   PostgreSQL server, taken by whichever process works that queue (`npm run worker`, or the
 *   app itself with WORKERS_IN_APP=true); retries, time limits and priorities are pg-boss's
 *   (retryLimit, expireInSeconds, priority), so any number of app and worker processes share it.
 */

export type QueueName = 'solve-run' | 'print-sheet';

/** Issued sheets print ahead of runs, runs ahead of previews, previews ahead of draft PDFs. */
export type JobPriority = 'issue' | 'run' | 'preview' | 'background';
export const PRIORITY_NUMBER: Record<JobPriority, number> = { issue: 30, run: 20, preview: 10, background: 0 };

/** Per queue: tries after the first, and how long one try may take before the queue gives up on it. */
export const QUEUE_POLICY: Record<QueueName, { retryLimit: number; expireInSeconds: number; retryDelay: number; concurrency: number }> = {
  // A solve of the largest truss the app takes is seconds (bench:solve); five minutes is a stuck worker.
  'solve-run': { retryLimit: 2, expireInSeconds: 300, retryDelay: 2, concurrency: 1 },
  // A 19 MiB sheet prints in about 100 s on two cores (bench:sheet); the printer's own budget grows with size.
  'print-sheet': { retryLimit: 2, expireInSeconds: 900, retryDelay: 5, concurrency: 1 },
};

export interface JobData {
  /** The row the job is about: the analysis run or the print job. */
  id: number;
}

export interface JobAttempt {
  /** 1 for the first try. */
  attempt: number;
  /** True when the queue will not try again after this one. */
  last: boolean;
}

/**
 * A handler records its outcome in its own table (the run or print job row) and returns; it
 * throws only for a fault worth another try (the database went away), which the queue retries
 * until `last`.
 */
export type JobHandler = (data: JobData, attempt: JobAttempt) => Promise<void>;

export interface JobQueue {
  readonly kind: 'in-process' | 'pg-boss';
  /** True when queued jobs outlive this process (pg-boss): nothing to re-queue or fail at start. */
  readonly durable: boolean;
  send(name: QueueName, data: JobData, options?: { priority?: JobPriority }): Promise<void>;
  /**
   * Takes jobs of this queue in this process, until `close`. `givenUp` is called (pg-boss: from
   * the queue's dead-letter queue) for a job the queue stopped trying, e.g. because every try
   * ran out of time, so its row can say so instead of staying unfinished.
   */
  work(name: QueueName, handler: JobHandler, givenUp?: (data: JobData) => Promise<void>): Promise<void>;
  /** Jobs of this process waiting or running (in-process); tests and shutdown. */
  idle(): Promise<void>;
  /** Stops taking jobs; waits for the ones running here, up to a few seconds. */
  close(): Promise<void>;
}

/** The in-process queue: FIFO within a priority, `concurrency` jobs at a time per queue. */
export function inProcessQueueCreate(options: { log?: (m: string, e?: unknown) => void } = {}): JobQueue {
  const log = options.log ?? ((m, e) => console.error(m, e));
  type Waiting = { data: JobData; priority: number; seq: number };
  const lanes = new Map<QueueName, { handler?: JobHandler; waiting: Waiting[]; running: number }>();
  const runningAll = new Set<Promise<void>>();
  let seq = 0;
  let closed = false;
  const lane = (name: QueueName) => {
    let l = lanes.get(name);
    if (!l) lanes.set(name, (l = { waiting: [], running: 0 }));
    return l;
  };
  const pump = (name: QueueName) => {
    const l = lane(name);
    while (!closed && l.handler && l.running < QUEUE_POLICY[name].concurrency && l.waiting.length) {
      const next = l.waiting.shift()!;
      l.running += 1;
      const p = (async () => {
        try {
          await l.handler!(next.data, { attempt: 1, last: true });
        } catch (err) {
          log(`A ${name} job (row ${next.data.id}) failed`, err);
        } finally {
          l.running -= 1;
        }
      })();
      runningAll.add(p);
      void p.finally(() => {
        runningAll.delete(p);
        pump(name);
      });
    }
  };
  return {
    kind: 'in-process',
    durable: false,
    async send(name, data, opts = {}) {
      if (closed) return;
      const l = lane(name);
      const item = { data, priority: PRIORITY_NUMBER[opts.priority ?? 'background'], seq: seq++ };
      const at = l.waiting.findIndex((w) => w.priority < item.priority);
      if (at < 0) l.waiting.push(item);
      else l.waiting.splice(at, 0, item);
      pump(name);
    },
    async work(name, handler) {
      lane(name).handler = handler;
      pump(name);
    },
    async idle() {
      while (runningAll.size || [...lanes.values()].some((l) => l.waiting.length && l.handler)) {
        await Promise.all([...runningAll]);
        await new Promise((r) => setImmediate(r));
      }
    },
    async close() {
      closed = true;
      for (const l of lanes.values()) l.waiting.length = 0;
    },
  };
}

/** Where pg-boss moves a job of `name` it stopped trying (its dead-letter queue). */
const givenUpQueue = (name: QueueName) => `${name}-given-up`;

/** pg-boss's tables live in a schema of their own beside Panelpoint's tables. */
export const PG_BOSS_SCHEMA = 'pgboss';

/**
 * Opens pg-boss on DATABASE_URL (it makes or migrates its schema) and creates the two queues
 * with their retry and time-limit policy. A server that cannot be reached fails here with one
 * sentence naming DATABASE_URL.
 */
export async function pgBossQueueOpen(
  url: string,
  options: {
    log?: (m: string, e?: unknown) => void;
    pollingIntervalSeconds?: number;
    application?: string;
    /** Tests only: other limits than QUEUE_POLICY's (short time limits, no retry delay). */
    policy?: Partial<Record<QueueName, Partial<(typeof QUEUE_POLICY)[QueueName]>>>;
  } = {},
): Promise<JobQueue> {
  const policyOf = (name: QueueName) => ({ ...QUEUE_POLICY[name], ...options.policy?.[name] });
  const log = options.log ?? ((m, e) => console.error(m, e));
  const boss = new PgBoss({
    connectionString: url,
    schema: PG_BOSS_SCHEMA,
    application_name: options.application ?? 'panelpoint-queue',
    max: 4,
    // Finished jobs are kept a week for looking into, then pg-boss's maintenance removes them.
    deleteAfterDays: 7,
    // Maintenance (expiring stuck jobs, archiving) in whichever process gets to it first.
    supervise: true,
    schedule: false,
  });
  boss.on('error', (err) => log('The job queue reported an error', err));
  try {
    await boss.start();
  } catch (err) {
    await boss.stop({ graceful: false, wait: false }).catch(() => {});
    const why = (err instanceof Error ? err.message : String(err)).replace(/\s+/g, ' ').replace(/\.$/, '');
    throw new Error(`DATABASE_URL names a PostgreSQL server the job queue could not be opened on (${why}, at ${redactedUrl(url)}); check the host, port, database name, user and password in DATABASE_URL.`);
  }
  try {
    for (const name of Object.keys(QUEUE_POLICY) as QueueName[]) {
      const p = policyOf(name);
      const deadLetter = givenUpQueue(name);
      const policy = { retryLimit: p.retryLimit, retryDelay: p.retryDelay, expireInSeconds: p.expireInSeconds };
      // createQueue keeps an existing queue (and its policy): updateQueue applies this release's limits.
      await boss.createQueue(deadLetter, { name: deadLetter, retryLimit: 2, expireInSeconds: 60 });
      await boss.createQueue(name, { name, ...policy, deadLetter });
      await boss.updateQueue(name, { name, ...policy, deadLetter });
    }
  } catch (err) {
    await boss.stop({ graceful: false, wait: false }).catch(() => {});
    throw err;
  }
  const running = new Set<Promise<void>>();
  const loops: Promise<void>[] = [];
  let closed = false;
  const sleepers = new Set<() => void>();
  const poll = (options.pollingIntervalSeconds ?? 1) * 1000;
  const pause = (ms: number) =>
    new Promise<void>((resolve) => {
      const wake = () => {
        clearTimeout(t);
        sleepers.delete(wake);
        resolve();
      };
      const t = setTimeout(wake, ms);
      sleepers.add(wake);
    });

  /**
   * One taker: fetches one job (pg-boss marks it active, highest priority first, then oldest),
   * runs the handler within the job's time limit, and completes or fails it (a failed job is
   * retried by pg-boss up to its retryLimit, then moved to the dead-letter queue). After a job
   * it fetches again at once; with the queue empty it looks again every `poll` ms. (pg-boss's own
   * `work` waits the polling interval after every job, which caps a taker at one job a second.)
   */
  async function takeLoop(name: string, run: (job: PgBoss.JobWithMetadata<JobData>) => Promise<void>): Promise<void> {
    while (!closed) {
      let job: PgBoss.JobWithMetadata<JobData> | undefined;
      try {
        [job] = await boss.fetch<JobData>(name, { includeMetadata: true, batchSize: 1 });
      } catch (err) {
        if (closed) return;
        log(`The job queue could not be read (${name}); trying again`, err);
        await pause(poll * 5);
        continue;
      }
      if (!job) {
        await pause(poll);
        continue;
      }
      const done = (async () => {
        let timer: NodeJS.Timeout | undefined;
        try {
          const limit = new Promise<never>((_, reject) => {
            timer = setTimeout(() => reject(new Error(`the job ran past its time limit of ${job.expireInSeconds} s`)), job.expireInSeconds * 1000);
          });
          await Promise.race([run(job), limit]);
          await boss.complete(name, job.id);
        } catch (err) {
          await boss.fail(name, job.id, { message: err instanceof Error ? err.message : String(err) }).catch((e) => log(`The job queue could not record a failed ${name} job`, e));
        } finally {
          clearTimeout(timer);
        }
      })();
      running.add(done);
      await done;
      running.delete(done);
    }
  }

  return {
    kind: 'pg-boss',
    durable: true,
    async send(name, data, opts = {}) {
      await boss.send(name, data, { priority: PRIORITY_NUMBER[opts.priority ?? 'background'] });
    },
    async work(name, handler, givenUp) {
      const p = policyOf(name);
      if (givenUp) loops.push(takeLoop(givenUpQueue(name), async (job) => givenUp(job.data)));
      for (let i = 0; i < p.concurrency; i++) {
        loops.push(
          takeLoop(name, (job) => handler(job.data, { attempt: job.retryCount + 1, last: job.retryCount >= job.retryLimit })),
        );
      }
    },
    async idle() {
      await Promise.all([...running]);
    },
    async close() {
      if (closed) return;
      closed = true;
      for (const wake of [...sleepers]) wake();
      // The jobs running here get up to 10 s to finish; one still running then is left active
      // and pg-boss retries it in another process when its time limit runs out.
      await Promise.race([Promise.all(loops), new Promise((r) => setTimeout(r, 10_000).unref())]);
      await boss.stop({ graceful: false, wait: true, close: true }).catch((err) => log('The job queue did not stop cleanly', err));
    },
  };
}
