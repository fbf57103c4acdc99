import { Worker } from 'node:worker_threads';
import type { TrussModel } from '@shared/model/truss';
import type { RunSummaryView } from '@shared/schemas/run.schema';

/** What the worker reports about a solved model, besides the full analysis. */
export type SolveSummary = Pick<RunSummaryView, 'maxResidual' | 'caseCount' | 'combinationCount'> & {
  design?: RunSummaryView['design'];
  classification: NonNullable<RunSummaryView['classification']>;
};

/** A job sent to a worker. */
export interface SolveJob {
  jobId: number;
  model: TrussModel;
}

/** Messages a worker sends back: 'started' once, then 'solved' or 'failed'. */
export type SolveReply =
  | { jobId: number; type: 'started' }
  | { jobId: number; type: 'solved'; analysisJson: string; summary: SolveSummary }
  | { jobId: number; type: 'failed'; error: { code: string; message: string } };

export type SolveOutcome = Extract<SolveReply, { type: 'solved' | 'failed' }>;

/** Solves truss models off the main thread, so the server keeps answering while a big truss solves. */
export interface SolvePool {
  /** Queues a model; `onStart` is called when a worker picks it up. */
  solve(model: TrussModel, onStart?: () => void): Promise<SolveOutcome>;
  /** Jobs waiting plus jobs being solved. */
  pending(): number;
  /** Terminates the workers; queued and running jobs are rejected with {@link SolvePoolClosedError}. */
  close(): Promise<void>;
}

export class SolvePoolClosedError extends Error {
  constructor() {
    super('The solver pool was closed (the server is shutting down).');
    this.name = 'SolvePoolClosedError';
  }
}

interface Task {
  job: SolveJob;
  onStart?: () => void;
  resolve(outcome: SolveOutcome): void;
  reject(err: Error): void;
}

interface Slot {
  worker: Worker;
  task: Task | null;
}

const WORKER_ENTRY = new URL('./solve-worker-entry.mjs', import.meta.url);

/**
 * A small pool of solver worker threads (default one: the main thread keeps the other core).
 * Workers start on the first job and stay for the next; a worker that dies fails its job with
 * 'solver-stopped' and is replaced on demand.
 */
export function solvePoolCreate(options: { size?: number } = {}): SolvePool {
  const size = Math.max(1, options.size ?? 1);
  const queue: Task[] = [];
  const slots: Slot[] = [];
  let nextId = 1;
  let closed = false;

  function startWorker(): Slot {
    const worker = new Worker(WORKER_ENTRY);
    // An idle worker must not keep the process alive (tests, scripts).
    worker.unref();
    const slot: Slot = { worker, task: null };
    worker.on('message', (reply: SolveReply) => {
      const task = slot.task;
      if (!task || task.job.jobId !== reply.jobId) return;
      if (reply.type === 'started') {
        task.onStart?.();
        return;
      }
      slot.task = null;
      worker.unref();
      task.resolve(reply);
      pump();
    });
    const lost = (why: string) => {
      const index = slots.indexOf(slot);
      if (index >= 0) slots.splice(index, 1);
      const task = slot.task;
      slot.task = null;
      if (task) {
        if (closed) task.reject(new SolvePoolClosedError());
        else
          task.resolve({
            jobId: task.job.jobId,
            type: 'failed',
            error: { code: 'solver-stopped', message: `The solver stopped before finishing (${why}). Run it again; if it keeps happening, tell your admin.` },
          });
      }
      if (!closed) pump();
    };
    worker.on('error', (err) => lost(err.message));
    worker.on('exit', (code) => lost(`worker exit code ${code}`));
    slots.push(slot);
    return slot;
  }

  function pump(): void {
    while (!closed && queue.length) {
      const slot = slots.find((s) => s.task === null) ?? (slots.length < size ? startWorker() : null);
      if (!slot) return;
      const task = queue.shift()!;
      slot.task = task;
      // While it works, the worker keeps the process alive so the result is not lost.
      slot.worker.ref();
      slot.worker.postMessage(task.job);
    }
  }

  return {
    solve(model, onStart) {
      if (closed) return Promise.reject(new SolvePoolClosedError());
      return new Promise<SolveOutcome>((resolve, reject) => {
        queue.push({ job: { jobId: nextId++, model }, onStart, resolve, reject });
        pump();
      });
    },
    pending: () => queue.length + slots.filter((s) => s.task).length,
    async close() {
      closed = true;
      for (const task of queue.splice(0)) task.reject(new SolvePoolClosedError());
      await Promise.all(slots.map((s) => s.worker.terminate()));
    },
  };
}
