import type { TrussModel } from '@shared/model/truss';
import type { RunCreateInput, RunProgress, RunSummaryView } from '@shared/schemas/run.schema';
import type { TrussAnalysis } from '@shared/solver';
import { AppError, conflict, notFound } from '../../errors/app-error';
import { TrussModelRecord } from '../../db/models';
import { getTruss } from '../projects/projects.service';
import { assertTakeoffCases, computeTakeoff, takeoffApply, takeoffParseStored } from '../takeoff/takeoff-compute';
import { forcesCsv } from './forces-csv';
import { reactionsCsv } from './reactions-csv';
import * as repo from './runs.repository';
import type { RunRow } from './runs.repository';
import { SolvePoolClosedError, type SolvePool, type SolveSummary } from './solve-pool';

export interface RunsDeps {
  pool: SolvePool;
  log: (msg: string, err?: unknown) => void;
}

const progress = (phase: RunProgress['phase'], fraction: number): string => JSON.stringify({ phase, fraction } satisfies RunProgress);

function summaryView(row: RunRow, currentVersion: number | null): RunSummaryView {
  const summary = row.summary ? (JSON.parse(row.summary) as SolveSummary) : null;
  return {
    id: row.id,
    trussId: row.trussId,
    modelVersion: row.modelVersion,
    stale: currentVersion !== null && currentVersion > row.modelVersion,
    status: row.status,
    progress: JSON.parse(row.progress) as RunProgress,
    ranById: row.ranById,
    ranBy: row.ranBy,
    createdAt: row.createdAt.toISOString(),
    startedAt: row.startedAt ? new Date(row.startedAt).toISOString() : null,
    finishedAt: row.finishedAt ? new Date(row.finishedAt).toISOString() : null,
    classification: summary?.classification ?? null,
    error: row.error ? (JSON.parse(row.error) as { code: string; message: string }) : null,
    maxResidual: summary?.maxResidual ?? null,
    caseCount: summary?.caseCount ?? 0,
    combinationCount: summary?.combinationCount ?? 0,
    usedTakeoff: row.takeoff !== null,
  };
}

/**
 * Takes an immutable snapshot of the truss's saved model, recomputes the roof takeoff from the
 * saved inputs (its load cases replace the model's cases of the same id) and queues the solve
 * in a worker. A takeoff that no longer fits the truss gives a run that failed at once.
 */
export async function startRun(trussId: number, input: RunCreateInput, userId: number, deps: RunsDeps): Promise<RunSummaryView> {
  await getTruss(trussId);
  const record = await TrussModelRecord.findByPk(trussId);
  if (!record) throw new AppError('no-model-yet', 'This truss has no model yet: upload its DXF drawing first.', 404);
  if (input.modelVersion !== undefined && input.modelVersion !== record.version) {
    throw conflict(
      'model-changed',
      `The model was saved again since you opened it (you have version ${input.modelVersion}, it is now ${record.version}). Reload it, check the changes, then run.`,
    );
  }
  const saved = JSON.parse(record.model) as TrussModel;
  let model = saved;
  let takeoff: string | null = null;
  let error: { code: string; message: string } | null = null;
  try {
    const takeoffInput = takeoffParseStored(record.takeoff);
    if (takeoffInput) {
      assertTakeoffCases(takeoffInput, saved.loadCases);
      const result = computeTakeoff(saved, takeoffInput);
      model = takeoffApply(saved, result);
      takeoff = JSON.stringify({ input: takeoffInput, result });
    }
  } catch (err) {
    if (!(err instanceof AppError)) throw err;
    error = { code: err.code, message: `The roof takeoff could not be computed: ${err.message}` };
  }
  const now = new Date();
  const row = await repo.insertRun({
    trussId,
    modelVersion: record.version,
    status: error ? 'failed' : 'queued',
    progress: error ? progress('done', 1) : progress('queued', 0),
    model: JSON.stringify(model),
    takeoff,
    analysis: null,
    summary: null,
    error: error ? JSON.stringify(error) : null,
    ranById: userId,
    startedAt: null,
    finishedAt: error ? now : null,
  });
  if (!error) void solveRun(row.id, model, deps);
  return summaryView(row, record.version);
}

/** Runs the solve in the pool and records each change of status; never throws. */
async function solveRun(runId: number, model: TrussModel, deps: RunsDeps): Promise<void> {
  let started: Promise<void> = Promise.resolve();
  try {
    const outcome = await deps.pool.solve(model, () => {
      started = repo.updateRun(runId, { status: 'running', startedAt: new Date(), progress: progress('solving', 0.1) });
    });
    await started;
    if (outcome.type === 'failed') {
      await repo.updateRun(runId, { status: 'failed', error: JSON.stringify(outcome.error), finishedAt: new Date(), progress: progress('done', 1) });
      return;
    }
    await repo.updateRun(runId, { progress: progress('storing', 0.9) });
    await repo.updateRun(runId, {
      status: outcome.summary.classification.kind === 'unstable' ? 'unstable' : 'solved',
      analysis: outcome.analysisJson,
      summary: JSON.stringify(outcome.summary),
      finishedAt: new Date(),
      progress: progress('done', 1),
    });
  } catch (err) {
    // Shutting down: the run stays queued/running in the table and can be run again.
    if (err instanceof SolvePoolClosedError) return;
    try {
      await started;
      await repo.updateRun(runId, {
        status: 'failed',
        error: JSON.stringify({ code: 'run-not-stored', message: 'The server could not store this run. Run it again; if it keeps happening, tell your admin.' }),
        finishedAt: new Date(),
        progress: progress('done', 1),
      });
    } catch {
      // The database itself is gone (shutdown); nothing more to record.
    }
    deps.log(`Analysis run ${runId} could not be completed`, err);
  }
}

/** A truss's runs, newest first, each marked stale when the model was saved after it. */
export async function listRuns(trussId: number): Promise<RunSummaryView[]> {
  await getTruss(trussId);
  const [rows, version] = await Promise.all([repo.listRuns(trussId), repo.currentModelVersion(trussId)]);
  return rows.map((row) => summaryView(row, version));
}

async function findRunOr404(runId: number): Promise<RunRow> {
  const row = await repo.findRun(runId);
  if (!row) throw notFound('That analysis run');
  return row;
}

/**
 * A run as the JSON text of a RunView. The snapshot and results are spliced in as stored, so a
 * big truss's results are not parsed and re-serialised on the main thread.
 */
export async function getRunJson(runId: number): Promise<string> {
  const row = await findRunOr404(runId);
  const summary = JSON.stringify(summaryView(row, await repo.currentModelVersion(row.trussId)));
  return `${summary.slice(0, -1)},"model":${row.model},"takeoff":${row.takeoff ?? 'null'},"analysis":${row.analysis ?? 'null'}}`;
}

/** A solved run's row, or 409 'run-not-solved' saying why it has no results table yet. */
async function solvedRunOr409(runId: number, table: string): Promise<RunRow & { analysis: string }> {
  const row = await findRunOr404(runId);
  if (row.status !== 'solved' || !row.analysis) {
    const why: Record<RunRow['status'], string> = {
      queued: 'it is still waiting to be solved',
      running: 'it is still being solved',
      unstable: `the truss is unstable, so it has no ${table === 'member force table' ? 'member forces' : 'reactions'}`,
      failed: 'it failed',
      solved: '',
    };
    throw conflict('run-not-solved', `Run ${runId} has no ${table}: ${why[row.status]}. Open the run to see its status.`);
  }
  return row as RunRow & { analysis: string };
}

/** The member force table of a solved run as CSV, with a file name for the download. */
export async function getForcesCsv(runId: number): Promise<{ csv: string; fileName: string }> {
  const row = await solvedRunOr409(runId, 'member force table');
  const csv = forcesCsv(JSON.parse(row.model) as TrussModel, JSON.parse(row.analysis) as TrussAnalysis);
  return { csv, fileName: `truss-${row.trussId}-run-${row.id}-member-forces.csv` };
}

/** The support reactions of a solved run (cases, combinations, envelope) as CSV, with a file name. */
export async function getReactionsCsv(runId: number): Promise<{ csv: string; fileName: string }> {
  const row = await solvedRunOr409(runId, 'reaction table');
  const csv = reactionsCsv(JSON.parse(row.model) as TrussModel, JSON.parse(row.analysis) as TrussAnalysis);
  return { csv, fileName: `truss-${row.trussId}-run-${row.id}-reactions.csv` };
}

/**
 * Runs that were queued or solving when the server last stopped can never finish: their worker
 * went with the process. Called once at start-up (one server process per SQLite file), it marks
 * them failed with a message that says to run again, so no run spins forever in the list.
 */
export async function runsFailInterrupted(now = new Date()): Promise<number> {
  const error = JSON.stringify({
    code: 'server-restarted',
    message: 'The server stopped before this run finished. Run the analysis again.',
  });
  return repo.failUnfinishedRuns({ error, finishedAt: now, progress: progress('done', 1) });
}
