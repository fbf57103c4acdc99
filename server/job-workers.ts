import { solvePoolCreate } from './modules/runs/solve-pool';
import { solveRunGivenUp, solveRunJob } from './modules/runs/runs.service';
import type { PrintJobs } from './modules/calc-sheets/print-jobs.service';
import { createSheetPrinter, type SheetPrinter } from './modules/calc-sheets/sheet-printer';
import { sheetBuildPoolCreate, type SheetBuildPool } from './modules/calc-sheets/sheet-build-pool';
import { QUEUE_POLICY, type JobQueue } from './workers/job-queue';

export interface JobWorkers {
  /** Stops the solver threads and, when made here, the sheet builder and the printer. */
  close(): Promise<void>;
}

/**
 * Takes analysis runs and print jobs from the queue in this process: the app (in-process queue,
 * or pg-boss with WORKERS_IN_APP=true) or `npm run worker` (server/worker.ts). The app passes its
 * own printer and sheet builder (shared with previews and issuing); a worker makes its own.
 * A solve is stopped 10 s before the queue's time limit for it, so the run fails with the
 * solver's sentence rather than the queue giving up on a job that is still working.
 */
export async function jobWorkersStart(deps: {
  queue: JobQueue;
  printJobs: PrintJobs;
  printer?: SheetPrinter;
  builder?: SheetBuildPool;
  chromiumPath: string;
  log: (msg: string, err?: unknown) => void;
}): Promise<JobWorkers> {
  const pool = solvePoolCreate({ timeLimitMs: (QUEUE_POLICY['solve-run'].expireInSeconds - 10) * 1000 });
  const printer = deps.printer ?? createSheetPrinter({ chromiumPath: deps.chromiumPath });
  const builder = deps.builder ?? sheetBuildPoolCreate();
  const log = deps.log;
  await deps.queue.work('solve-run', (data, attempt) => solveRunJob(data.id, attempt, { pool, log }), (data) => solveRunGivenUp(data.id));
  await deps.queue.work('print-sheet', (data, attempt) => deps.printJobs.work(data.id, attempt, { printer, builder }), (data) => deps.printJobs.givenUp(data.id));
  return {
    async close() {
      await pool.close();
      if (!deps.builder) await builder.close();
      if (!deps.printer) await printer.close();
    },
  };
}
