import { Worker, type Transferable } from 'node:worker_threads';

/**
 * One pool of worker threads for every kind of off-thread work (solving, reading drawings,
 * judging passwords), so a time limit, a memory cap, a queue cap and a clean shutdown are
 * written once.
 *
 * The protocol with a worker module: the pool posts the job with a `jobId` added; the worker
 * posts `{ jobId, type: 'started' }` when it begins (the time limit runs from then, so a worker
 * still loading its code or dictionaries is not charged for it), any number of
 * `{ jobId, type: 'progress', … }` messages (passed to `onProgress`), then exactly one more
 * message carrying the same `jobId`: its reply.
 */
export type PoolOutcome<R> =
  | { type: 'done'; reply: R }
  /** Still working when its time limit was up: the worker was terminated (the only way to stop synchronous work). */
  | { type: 'timed-out'; seconds: number }
  /** The worker ran out of its heap (`memoryMb`). */
  | { type: 'out-of-memory'; megabytes: number }
  /** The worker died for another reason. */
  | { type: 'stopped'; why: string };

export interface RunOptions {
  /** Stop the job this long after the worker starts it; none when absent. */
  timeLimitMs?: number;
  /** Called when a worker picks the job up. */
  onStart?: () => void;
  /** Called with each `type: 'progress'` message the worker posts before its reply. */
  onProgress?: (message: Record<string, unknown>) => void;
  /** Buffers moved to the worker rather than copied. */
  transfer?: Transferable[];
}

export interface ThreadPool<J, R> {
  /** Queues a job; rejects with the pool's closed error when the pool is (or gets) closed, or its busy error when the queue is full. */
  run(job: J, options?: RunOptions): Promise<PoolOutcome<R>>;
  /** Jobs waiting plus jobs being worked on. */
  pending(): number;
  /** Terminates the workers; queued and running jobs are rejected with the closed error. */
  close(): Promise<void>;
}

export interface ThreadPoolOptions {
  /** The worker's entry module (an .mjs that registers tsx and imports the TypeScript worker). */
  entry: URL;
  /** Worker threads at most (default one: the main thread keeps the other core). */
  size?: number;
  /** Old-generation heap of each worker, in MB (Node's default when absent). */
  memoryMb?: number;
  /** Jobs allowed to wait for a worker; beyond it `run` rejects with `busyError()` (default no cap). */
  maxWaiting?: number;
  closedError: () => Error;
  busyError?: () => Error;
}

type Reply = { jobId: number; type?: string };

interface Task<J, R> {
  job: J & { jobId: number };
  options: RunOptions;
  timer?: NodeJS.Timeout;
  resolve(outcome: PoolOutcome<R>): void;
  reject(err: Error): void;
}

interface Slot<J, R> {
  worker: Worker;
  task: Task<J, R> | null;
}

/**
 * Workers start on demand and stay for the next job; an idle worker does not keep the process
 * alive (tests, scripts), a busy one does, so a result is not lost. A worker that times out,
 * runs out of memory or dies gives its job an outcome saying so and is replaced on demand.
 */
export function threadPoolCreate<J extends object, R extends Reply>(options: ThreadPoolOptions): ThreadPool<J, R> {
  const size = Math.max(1, options.size ?? 1);
  const queue: Task<J, R>[] = [];
  const slots: Slot<J, R>[] = [];
  let nextId = 1;
  let closed = false;

  function settle(slot: Slot<J, R>, outcome: PoolOutcome<R>): void {
    const task = slot.task;
    if (!task) return;
    clearTimeout(task.timer);
    slot.task = null;
    task.resolve(outcome);
  }

  function drop(slot: Slot<J, R>): void {
    const index = slots.indexOf(slot);
    if (index >= 0) slots.splice(index, 1);
  }

  function startWorker(): Slot<J, R> {
    const worker = new Worker(options.entry, options.memoryMb ? { resourceLimits: { maxOldGenerationSizeMb: options.memoryMb } } : {});
    worker.unref();
    const slot: Slot<J, R> = { worker, task: null };
    worker.on('message', (reply: R) => {
      const task = slot.task;
      if (!task || task.job.jobId !== reply.jobId) return;
      if (reply.type === 'started') {
        task.options.onStart?.();
        const limit = task.options.timeLimitMs;
        if (limit !== undefined) {
          task.timer = setTimeout(() => {
            drop(slot);
            settle(slot, { type: 'timed-out', seconds: limit / 1000 });
            void worker.terminate();
            pump();
          }, limit);
        }
        return;
      }
      if (reply.type === 'progress') {
        task.options.onProgress?.(reply as unknown as Record<string, unknown>);
        return;
      }
      settle(slot, { type: 'done', reply });
      worker.unref();
      pump();
    });
    let lostOnce = false;
    const lost = (err: Error | null, code: number | null) => {
      if (lostOnce) return;
      lostOnce = true;
      drop(slot);
      const task = slot.task;
      if (task) {
        if (closed) {
          clearTimeout(task.timer);
          slot.task = null;
          task.reject(options.closedError());
        } else if ((err as { code?: string } | null)?.code === 'ERR_WORKER_OUT_OF_MEMORY') {
          settle(slot, { type: 'out-of-memory', megabytes: options.memoryMb ?? 0 });
        } else {
          settle(slot, { type: 'stopped', why: err ? err.message : `worker exit code ${code}` });
        }
      }
      if (!closed) pump();
    };
    worker.on('error', (err) => lost(err, null));
    worker.on('exit', (code) => lost(null, code));
    slots.push(slot);
    return slot;
  }

  function pump(): void {
    while (!closed && queue.length) {
      const slot = slots.find((s) => s.task === null) ?? (slots.length < size ? startWorker() : null);
      if (!slot) return;
      const task = queue.shift()!;
      slot.task = task;
      slot.worker.ref();
      slot.worker.postMessage(task.job, task.options.transfer ?? []);
    }
  }

  return {
    run(job, runOptions = {}) {
      if (closed) return Promise.reject(options.closedError());
      if (options.maxWaiting !== undefined && queue.length >= options.maxWaiting) {
        return Promise.reject((options.busyError ?? options.closedError)());
      }
      return new Promise<PoolOutcome<R>>((resolve, reject) => {
        queue.push({ job: { ...job, jobId: nextId++ }, options: runOptions, resolve, reject });
        pump();
      });
    },
    pending: () => queue.length + slots.filter((s) => s.task).length,
    async close() {
      closed = true;
      for (const task of queue.splice(0)) task.reject(options.closedError());
      await Promise.all(slots.map((s) => s.worker.terminate()));
    },
  };
}
