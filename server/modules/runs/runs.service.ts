import type { TrussModel } from '@shared/model/truss';
import type { DesignRecheckInput, RunAnalysis, RunCreateInput, RunProgress, RunSummaryView } from '@shared/schemas/run.schema';
import type { TrussAnalysis } from '@shared/solver';
import { AppError, conflict, notFound } from '../../errors/app-error';
import { TrussModelRecord } from '../../db/models';
import { getTruss } from '../projects/projects.service';
import { assertTakeoffCases, computeTakeoff, takeoffParseStored } from '../takeoff/takeoff-compute';
import { sameJointLoads } from '@shared/model/roof-loads';
import { designJson, designSummaryOf, runDesign, withDesignStiffness } from '@shared/design/basis';
import { sheetRevisionLabel } from '@shared/schemas/review.schema';
import { fileNamePart, modelSaveName, runName } from '@shared/text/citations';
import { forcesCsv } from './forces-csv';
import { reactionsCsv } from './reactions-csv';
import * as repo from './runs.repository';
import type { RunRow } from './runs.repository';
import { SolvePoolClosedError, type SolvePool, type SolveSummary } from './solve-pool';
import type { JobAttempt, JobQueue } from '../../workers/job-queue';

/** What the routes need: the queue a new run is handed to (in this process or pg-boss's). */
export interface RunsDeps {
  queue: Pick<JobQueue, 'send'>;
  log: (msg: string, err?: unknown) => void;
}

/** What the process that solves needs (the app with the in-process queue, or `npm run worker`). */
export interface RunSolveDeps {
  pool: SolvePool;
  log: (msg: string, err?: unknown) => void;
}

const progress = (phase: RunProgress['phase'], fraction: number): string => JSON.stringify({ phase, fraction } satisfies RunProgress);

function summaryView(row: RunRow, currentVersion: number | null): RunSummaryView {
  const summary = row.summary ? (JSON.parse(row.summary) as SolveSummary) : null;
  return {
    id: row.id,
    trussId: row.trussId,
    number: row.number,
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
    design: summary?.design ?? null,
  };
}

/**
 * Takes an immutable snapshot of the truss's saved model, recomputes the roof loading from the
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
      `The model was saved again since you opened it (you have ${modelSaveName(input.modelVersion)}, it is now ${modelSaveName(record.version)}). Reload it, check the changes, then run.`,
    );
  }
  const { model, takeoff, error } = snapshotOf(record);
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
  if (!error) {
    try {
      await deps.queue.send('solve-run', { id: row.id }, { priority: 'run' });
    } catch (err) {
      deps.log(`Analysis run ${row.id} (row id) could not be queued`, err);
      const message = 'The run could not be handed to the solver queue. Run it again; if it keeps happening, tell your admin.';
      await repo.updateRun(row.id, { status: 'failed', error: JSON.stringify({ code: 'run-not-queued', message }), finishedAt: new Date(), progress: progress('done', 1) }).catch(() => {});
      throw new AppError('run-not-queued', message, 503);
    }
  }
  return summaryView(row, record.version);
}

/**
 * The model a run solves: the saved model exactly as the loads table shows it (the roof loading
 * never overwrites a case at run time), with members without stiffness of their own given their
 * design section's (an indeterminate truss's forces depend on it). The takeoff is recomputed
 * only to check that the cases marked as from it still hold its loads (the drawing or the
 * takeoff may have changed since they were put in) and to print its steps; a takeoff that no
 * longer fits, or a marked case that no longer matches, gives the error the run fails with.
 */
function snapshotOf(record: TrussModelRecord): { model: TrussModel; takeoff: string | null; error: { code: string; message: string } | null } {
  const saved = JSON.parse(record.model) as TrussModel;
  const model = saved;
  let takeoff: string | null = null;
  let error: { code: string; message: string } | null = null;
  try {
    const takeoffInput = takeoffParseStored(record.takeoff);
    const marked = saved.loadCases.filter((c) => c.source === 'roof-loading');
    if (takeoffInput && marked.length) {
      assertTakeoffCases(takeoffInput, saved.loadCases);
      const result = computeTakeoff(saved, takeoffInput);
      const stale = marked.find((c) => !result.caseLoads[c.id] || !sameJointLoads(c.loads, result.caseLoads[c.id]!));
      if (stale) {
        error = {
          code: 'roof-loads-stale',
          message: `The loads of load case "${stale.id}" no longer match the roof loading (the drawing or the roof loading changed since they were put in); open the roof loading and use its loads again, or detach them, then run.`,
        };
      } else {
        takeoff = JSON.stringify({ input: takeoffInput, result });
      }
    }
  } catch (err) {
    if (!(err instanceof AppError)) throw err;
    error = { code: err.code, message: `The roof loading could not be computed: ${err.message}` };
  }
  return { model: withDesignStiffness(model), takeoff, error };
}

/** What the analysis reads of a model: everything but the design, and for a determinate truss not the stiffness either. */
function analysisInputs(model: TrussModel, withStiffness: boolean): string {
  const { design: _d, ...rest } = model;
  void _d;
  const members = withStiffness ? rest.members : rest.members.map(({ E: _e, A: _a, EA: _ea, ...m }) => m);
  return JSON.stringify({ ...rest, members });
}

/**
 * Re-checks a solved run's members with the sections saved since, on the forces it stored: no
 * new analysis. Allowed when nothing the forces depend on changed — for a determinate truss the
 * geometry, supports and loads; for an indeterminate one also every member's stiffness, which
 * a new section changes (then a re-run is needed, 409 're-run-needed'). A run that has a sheet
 * revision keeps its checks: the sheet under check or issued must not change (409).
 */
export async function recheckDesign(runId: number, input: DesignRecheckInput): Promise<RunSummaryView> {
  const row = await findRunOr404(runId);
  const cited = await citeRun(row);
  if (row.status !== 'solved' || !row.analysis) {
    throw conflict('run-not-solved', `${cited} has no member forces to check (it is ${row.status}); run the analysis first.`);
  }
  const revs = await repo.revisionsOfRun(runId);
  if (revs.length) {
    const r = revs[0];
    const issued = revs.find((x) => x.status === 'issued' || x.status === 'superseded');
    if (issued) {
      throw conflict('sheet-issued', `${cited} is behind issued sheet revision ${sheetRevisionLabel(issued.number)}, so its sections and checks cannot change; run the analysis again for a new run and start a new revision from it.`);
    }
    throw conflict('run-has-sheet', `${cited} has sheet revision ${sheetRevisionLabel(r.number)} (${r.status}), whose checks must not change under it; run the analysis again for a new run with the new sections.`);
  }
  const record = await TrussModelRecord.findByPk(row.trussId);
  if (!record) throw new AppError('no-model-yet', 'This truss has no model yet: upload its DXF drawing first.', 404);
  if (input.modelVersion !== undefined && input.modelVersion !== record.version) {
    throw conflict('model-changed', `The model was saved again since you opened it (you have ${modelSaveName(input.modelVersion)}, it is now ${modelSaveName(record.version)}). Reload it, check the changes, then re-check.`);
  }
  const snap = snapshotOf(record);
  if (snap.error) throw new AppError(snap.error.code, snap.error.message, 422);
  const next = snap.model;
  if (!next.design) throw new AppError('no-design', 'The truss has no member design saved; add a design basis and groups with their sections first.', 422);
  const stored = JSON.parse(row.model) as TrussModel;
  const analysis = JSON.parse(row.analysis) as RunAnalysis;
  const indeterminate = analysis.classification.kind === 'indeterminate';
  if (analysisInputs(stored, false) !== analysisInputs(next, false)) {
    throw conflict('model-changed-since-run', `The geometry, supports, loads or combinations changed since ${cited}, so its forces no longer fit the model; run the analysis again.`);
  }
  if (indeterminate && analysisInputs(stored, true) !== analysisInputs(next, true)) {
    throw conflict(
      're-run-needed',
      `The truss is statically indeterminate (degree ${analysis.classification.degree}), so its member forces depend on the members' stiffness, which the new sections change; run the analysis again.`,
    );
  }
  const design = runDesign(next, analysis);
  if (!design) throw new AppError('no-design', 'The truss has no member design saved; add a design basis and groups with their sections first.', 422);
  design.modelVersion = record.version;
  design.recheckedAt = new Date().toISOString();
  const { design: _old, ...plain } = analysis;
  void _old;
  const analysisJson = `${JSON.stringify(plain).slice(0, -1)},"design":${designJson(design)}}`;
  const summary = { ...(JSON.parse(row.summary!) as SolveSummary), design: designSummaryOf(design) };
  // The run now stands for the current model version: same forces, the saved sections.
  const written = await repo.updateRunDesign(runId, { model: JSON.stringify(next), analysis: analysisJson, summary: JSON.stringify(summary), modelVersion: record.version });
  if (!written) throw conflict('run-has-sheet', `A sheet revision was just started from ${cited}, so its checks must not change; run the analysis again for a new run with the new sections.`);
  return summaryView({ ...row, modelVersion: record.version, summary: JSON.stringify(summary) }, record.version);
}

/**
 * The queue's handler for 'solve-run': solves the run's stored snapshot in this process's pool
 * and records each change of status, progress and the outcome on the run's row (which every app
 * process reads). A run already finished (a retry after its result was stored) or removed is
 * left alone. A model the solver refuses or that stops the solver is a failed run with its
 * sentence, never retried; a fault of the database or a shutdown is thrown for the queue to try
 * again, and on the queue's last try the run is marked failed instead.
 */
export async function solveRunJob(runId: number, attempt: JobAttempt, deps: RunSolveDeps): Promise<void> {
  const row = await repo.findRun(runId);
  if (!row || (row.status !== 'queued' && row.status !== 'running')) return;
  const model = JSON.parse(row.model) as TrussModel;
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
    // Shutting down: the run stays queued/running; a durable queue tries again in another
    // process, the in-process queue leaves it to the next start (runsFailInterrupted).
    if (err instanceof SolvePoolClosedError) {
      if (attempt.last) return;
      throw err;
    }
    if (!attempt.last) {
      deps.log(`Analysis run ${runId} (row id) could not be completed on try ${attempt.attempt}; the queue tries again`, err);
      throw err;
    }
    await runFailedNotStored(runId, started);
    deps.log(`Analysis run ${runId} (row id) could not be completed`, err);
  }
}

async function runFailedNotStored(runId: number, started: Promise<void> = Promise.resolve()): Promise<void> {
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
}

/**
 * The queue gave up on a run (every try ran out of time or its process died): the run, if it is
 * still unfinished, fails with a sentence instead of spinning in the list.
 */
export async function solveRunGivenUp(runId: number): Promise<void> {
  const row = await repo.findRun(runId);
  if (!row || (row.status !== 'queued' && row.status !== 'running')) return;
  await repo.updateRun(runId, {
    status: 'failed',
    error: JSON.stringify({ code: 'run-given-up', message: 'The solver did not finish this run in its time limit after three tries. Run it again; if it keeps happening, tell your admin.' }),
    finishedAt: new Date(),
    progress: progress('done', 1),
  });
}

/** A truss's runs, newest first, each marked stale when the model was saved after it. */
export async function listRuns(trussId: number): Promise<RunSummaryView[]> {
  await getTruss(trussId);
  const [rows, version] = await Promise.all([repo.listRuns(trussId), repo.currentModelVersion(trussId)]);
  return rows.map((row) => summaryView(row, version));
}

/** "Run 2 of T7": the run's number within its truss and the truss's name, as people cite it. */
async function citeRun(row: RunRow): Promise<string> {
  return runName(row.number, (await trussNameOf(row.trussId)) ?? undefined);
}

async function trussNameOf(trussId: number): Promise<string | null> {
  try {
    return (await getTruss(trussId)).name;
  } catch {
    return null;
  }
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
    throw conflict('run-not-solved', `${await citeRun(row)} has no ${table}: ${why[row.status]}. Open the run to see its status.`);
  }
  return row as RunRow & { analysis: string };
}

/** The member force table of a solved run as CSV, with a file name for the download. */
export async function getForcesCsv(runId: number): Promise<{ csv: string; fileName: string }> {
  const row = await solvedRunOr409(runId, 'member force table');
  const csv = forcesCsv(JSON.parse(row.model) as TrussModel, JSON.parse(row.analysis) as TrussAnalysis);
  return { csv, fileName: `${fileNamePart((await trussNameOf(row.trussId)) ?? `truss-${row.trussId}`)}-run-${row.number}-member-forces.csv` };
}

/** The support reactions of a solved run (cases, combinations, envelope) as CSV, with a file name. */
export async function getReactionsCsv(runId: number): Promise<{ csv: string; fileName: string }> {
  const row = await solvedRunOr409(runId, 'reaction table');
  const csv = reactionsCsv(JSON.parse(row.model) as TrussModel, JSON.parse(row.analysis) as TrussAnalysis);
  return { csv, fileName: `${fileNamePart((await trussNameOf(row.trussId)) ?? `truss-${row.trussId}`)}-run-${row.number}-reactions.csv` };
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
