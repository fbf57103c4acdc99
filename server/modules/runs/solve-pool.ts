import { threadPoolCreate } from '../../workers/thread-pool';
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
export type SolveOutcome =
  | { type: 'solved'; analysisJson: string; summary: SolveSummary }
  | { type: 'failed'; error: { code: string; message: string } };

export type SolveReply = { jobId: number; type: 'started' } | (SolveOutcome & { jobId: number });

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

const WORKER_ENTRY = new URL('./solve-worker-entry.mjs', import.meta.url);

/**
 * A small pool of solver worker threads (default one: the main thread keeps the other core).
 * With `timeLimitMs` a solve still working then is stopped (a failed run with a sentence).
 * Workers start on the first job and stay for the next; a worker that dies fails its job with
 * 'solver-stopped' and is replaced on demand.
 */
export function solvePoolCreate(options: { size?: number; timeLimitMs?: number } = {}): SolvePool {
  const pool = threadPoolCreate<Omit<SolveJob, 'jobId'>, SolveReply>({
    entry: WORKER_ENTRY,
    size: options.size,
    closedError: () => new SolvePoolClosedError(),
  });
  return {
    async solve(model, onStart) {
      const outcome = await pool.run({ model }, { onStart, timeLimitMs: options.timeLimitMs });
      if (outcome.type === 'done' && outcome.reply.type !== 'started') return outcome.reply;
      if (outcome.type === 'timed-out') {
        return {
          type: 'failed',
          error: { code: 'solver-time-limit', message: `The solver was still working after ${outcome.seconds} s, its time limit, and was stopped. Check the model (a very large or badly connected truss), then run it again.` },
        };
      }
      const why = outcome.type === 'stopped' ? outcome.why : outcome.type;
      return {
        type: 'failed',
        error: { code: 'solver-stopped', message: `The solver stopped before finishing (${why}). Run it again; if it keeps happening, tell your admin.` },
      };
    },
    pending: pool.pending,
    close: pool.close,
  };
}
