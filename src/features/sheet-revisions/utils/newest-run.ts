import type { RunSummaryView } from '@shared/schemas/run.schema';

/** The run a new sheet revision is made from: the most recently created solved run, or null. */
export function newestSolvedRun(runs: readonly RunSummaryView[]): RunSummaryView | null {
  let best: RunSummaryView | null = null;
  for (const run of runs) {
    if (run.status !== 'solved') continue;
    if (!best || run.createdAt > best.createdAt || (run.createdAt === best.createdAt && run.id > best.id)) best = run;
  }
  return best;
}
