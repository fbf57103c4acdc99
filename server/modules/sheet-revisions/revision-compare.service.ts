import { revisionDiff, revisionDiffLines, REVISION_DIFF_TOLERANCES, toleranceSentence, type RevisionSide } from '@shared/compare/revision-diff';
import { stepsDiff, type ComparedStep, type StepsDiff } from '@shared/compare/step-diff';
import { sheetRevisionLabel } from '@shared/schemas/review.schema';
import type { ComparedRevisionRef, RevisionCompareView, RevisionHistoryRow } from '@shared/schemas/revision-compare.schema';
import { runName } from '@shared/text/citations';
import type { UnitSystemId } from '@shared/units';
import { AppError, notFound } from '../../errors/app-error';
import { buildCalcSheetView, type CalcSheetView, type StepView } from '../calc-sheets/calc-sheet-view';
import { loadRunSheet, type RunSheetInput } from '../calc-sheets/run-sheet.service';
import { recordsRepository as records, type RevisionRow } from '../records/records.repository';

/**
 * Revision comparison for the checker (issue 15 item 1): what changed in the model and the
 * results from one sheet revision of a truss to another, and which of the sheet's worked steps
 * changed. Reads only; the runs behind revisions are frozen (migration 0007), so what is worked
 * out from a pair of runs is kept in a small cache.
 */

const CACHE_LIMIT = 24;
const stepCache = new Map<string, { steps: ComparedStep[]; total: number }>();

function remember<V>(cache: Map<string, V>, key: string, value: V): V {
  cache.delete(key);
  cache.set(key, value);
  while (cache.size > CACHE_LIMIT) cache.delete(cache.keys().next().value!);
  return value;
}

const dateOf = (r: RevisionRow) => (r.issuedAt ?? r.submittedAt ?? r.createdAt).toISOString().slice(0, 10);

function refOf(r: RevisionRow, run: RunSheetInput): ComparedRevisionRef {
  return {
    id: r.id,
    label: sheetRevisionLabel(r.number),
    status: r.status,
    runId: r.runId,
    run: run.runNumber !== undefined ? runName(run.runNumber, run.trussName) : `Analysis run ${r.runId}`,
    date: dateOf(r),
  };
}

const systemOf = (run: RunSheetInput): UnitSystemId => (run.project.unitSystem === 'US' ? 'us' : 'si');

const sideOf = (run: RunSheetInput): RevisionSide => ({ model: run.model, analysis: run.analysis });

/** The worked steps of a built sheet in the order it prints them, as the step comparison reads them. */
export function sheetStepsOf(view: CalcSheetView): ComparedStep[] {
  const steps: { s: StepView; caseId: string }[] = [
    { s: view.stability, caseId: '' },
    ...view.takeoff.map((s) => ({ s, caseId: '' })),
    ...view.cases.flatMap((c) =>
      [...c.zeroForce.steps, ...c.reactionSteps, ...c.jointSteps, ...c.simultaneousSteps, ...c.stiffnessSteps, c.check].map((s) => ({ s, caseId: c.caseId })),
    ),
  ];
  return steps
    .filter(({ s }) => s && s.id)
    .map(({ s, caseId }) => ({
      id: s.id,
      ...(s.number ? { number: s.number } : {}),
      title: s.title,
      caseId,
      content: `${s.tex.join('\n')}\n${s.note ?? ''}`,
    }));
}

function stepsOfRun(runId: number, run: RunSheetInput): { steps: ComparedStep[]; total: number } {
  // A run is frozen, but the project's unit system is read fresh and a step's note may depend on it.
  const key = `${runId}:${run.project.unitSystem}`;
  const hit = stepCache.get(key);
  if (hit) return remember(stepCache, key, hit);
  const view = buildCalcSheetView({ ...run, revision: '', generatedAt: new Date(0) });
  const steps = sheetStepsOf(view);
  return remember(stepCache, key, { steps, total: steps.length });
}

async function revisionOr404(id: number): Promise<RevisionRow> {
  const row = await records.findRevision(id);
  if (!row) throw notFound('That sheet revision');
  return row;
}

/** The revision of the same truss numbered just before, or null for the first. */
async function previousOf(row: RevisionRow): Promise<RevisionRow | null> {
  const siblings = await records.listRevisions({ trussId: row.trussId });
  return siblings.filter((r) => r.number < row.number).sort((a, b) => b.number - a.number)[0] ?? null;
}

/**
 * GET /api/sheets/:id/compare: revision `id` against the revision numbered before it, or against
 * `withId`, another revision of the same truss. Differences read from the other revision to
 * `id` (after − before), whichever is numbered first.
 */
export async function compareRevisions(id: number, withId?: number): Promise<RevisionCompareView> {
  const row = await revisionOr404(id);
  let other: RevisionRow;
  if (withId === undefined) {
    const previous = await previousOf(row);
    if (!previous) {
      throw new AppError(
        'no-previous-revision',
        `Revision ${sheetRevisionLabel(row.number)} is the first revision of this truss, so there is no earlier revision to compare it with.`,
        422,
      );
    }
    other = previous;
  } else {
    const found = await records.findRevision(withId);
    if (!found) throw notFound('The sheet revision to compare with');
    if (found.trussId !== row.trussId) {
      throw new AppError('compare-other-truss', `Sheet revision ${withId} belongs to another truss; a revision can only be compared with revisions of its own truss.`, 422);
    }
    if (found.id === row.id) {
      throw new AppError('compare-same-revision', `That is revision ${sheetRevisionLabel(row.number)} itself; choose another revision of this truss to compare it with.`, 422);
    }
    other = found;
  }
  const [after, before] = await Promise.all([loadRunSheet(row.runId), loadRunSheet(other.runId)]);
  const diff = revisionDiff(sideOf(before), sideOf(after));
  const stepsAfter = stepsOfRun(row.runId, after);
  const stepsBefore = stepsOfRun(other.runId, before);
  const steps: StepsDiff = row.runId === other.runId ? { changed: [], removed: [], unchanged: stepsAfter.steps.map((s) => s.id) } : stepsDiff(stepsBefore.steps, stepsAfter.steps);
  return {
    revision: refOf(row, after),
    against: refOf(other, before),
    tolerances: REVISION_DIFF_TOLERANCES,
    toleranceNote: toleranceSentence(),
    diff,
    lines: revisionDiffLines(diff, systemOf(after)),
    unitSystem: systemOf(after),
    steps: { ...steps, total: stepsAfter.total },
  };
}

/**
 * The sheet's revision table for revision `id`: every revision of its truss up to it, each with
 * its date and, against the one before, one line per kind that changed. `issuedAt` dates
 * the revision being issued (its row has no issue date until the issue is written).
 */
export async function revisionHistoryOf(id: number, options: { issuedAt?: string } = {}): Promise<RevisionHistoryRow[]> {
  const row = await revisionOr404(id);
  const revisions = (await records.listRevisions({ trussId: row.trussId })).filter((r) => r.number <= row.number).sort((a, b) => a.number - b.number);
  const runs = new Map<number, RunSheetInput>();
  const runOf = async (runId: number) => runs.get(runId) ?? runs.set(runId, await loadRunSheet(runId)).get(runId)!;
  const out: RevisionHistoryRow[] = [];
  for (let i = 0; i < revisions.length; i++) {
    const r = revisions[i]!;
    const date = r.id === row.id && options.issuedAt ? options.issuedAt.slice(0, 10) : dateOf(r);
    const status = r.id === row.id && options.issuedAt ? 'issued' : r.status;
    if (i === 0) {
      out.push({ revision: sheetRevisionLabel(r.number), date, status, lines: ['First revision of this truss.'] });
      continue;
    }
    const previous = revisions[i - 1]!;
    let diff;
    try {
      diff = revisionDiff(sideOf(await runOf(previous.runId)), sideOf(await runOf(r.runId)));
    } catch (err) {
      // A run that cannot be read (none of a revision's is, but a table row must not stop the sheet).
      if (err instanceof AppError || err instanceof SyntaxError || err instanceof TypeError) {
        out.push({ revision: sheetRevisionLabel(r.number), date, status, lines: [`Not compared with revision ${sheetRevisionLabel(previous.number)}: a run of the two cannot be read.`] });
        continue;
      }
      throw err;
    }
    const changed = revisionDiffLines(diff, systemOf(await runOf(r.runId))).filter((l) => l.changed);
    out.push({
      revision: sheetRevisionLabel(r.number),
      date,
      status,
      lines: changed.length ? changed.map((l) => `${l.label}: ${l.text}.`) : [`No change to the model or results since revision ${sheetRevisionLabel(previous.number)}.`],
    });
  }
  return out;
}
