import type { TrussModel } from '@shared/model/truss';
import type { TrussAnalysis } from '@shared/solver';
import type { RoofTakeoffResult } from '@shared/takeoff';
import { conflict, notFound } from '../../errors/app-error';
import { Project, Truss } from '../../db/models';
import { getFirm } from '../firm/firm.service';
import * as runsRepo from '../runs/runs.repository';
import { renderCalcSheetPdf, renderCalcSheetPreview } from './calc-sheets.service';
import type { CalcSheetInput } from './calc-sheet-view';
import type { SheetPrinter } from './sheet-printer';
import type { RunSheetInput } from '../sheet-revisions/calc-sheet-renderer';
import { getRevision } from '../sheet-revisions/sheet-revisions.service';

/**
 * A calc sheet is always made from one stored analysis run: its immutable snapshot of the
 * model, its results and its takeoff. Nothing here re-solves or trusts the client.
 */
export async function loadRunSheet(runId: number): Promise<RunSheetInput> {
  const run = await runsRepo.findRun(runId);
  if (!run) throw notFound('That analysis run');
  if (run.status !== 'solved' && run.status !== 'unstable') {
    const why = { queued: 'it is still waiting to be solved', running: 'it is still being solved', failed: 'it failed' }[run.status];
    throw conflict('run-not-finished', `Run ${runId} has no calc sheet because ${why}. Open the run to see its status.`);
  }
  const truss = await Truss.findByPk(run.trussId);
  const project = truss ? await Project.findByPk(truss.projectId) : null;
  if (!truss || !project) throw notFound('The truss of that run');
  const takeoff = run.takeoff ? (JSON.parse(run.takeoff) as { result?: RoofTakeoffResult } | null) : null;
  const ranOn = run.createdAt.toISOString().slice(0, 10);
  return {
    firm: await getFirm(),
    project: {
      name: project.name,
      jobNumber: project.jobNumber,
      client: project.client,
      site: project.site,
      designBasis: project.designBasis,
      unitSystem: project.unitSystem,
    },
    trussName: truss.name,
    subject: `${truss.name}: ${takeoff?.result ? 'load takeoff, analysis' : 'analysis'} and member forces`,
    model: JSON.parse(run.model) as TrussModel,
    analysis: JSON.parse(run.analysis!) as TrussAnalysis,
    takeoffSteps: takeoff?.result?.steps,
    runLabel: `Run ${run.id}${run.ranBy ? ` by ${run.ranBy}` : ''}, ${ranOn}`,
  };
}

function draftInput(base: RunSheetInput, now: Date): CalcSheetInput {
  return { ...base, revision: 'draft', generatedAt: now };
}

/** The preview of a run's sheet, not yet a revision. */
export async function runSheetHtml(runId: number, now = new Date()): Promise<string> {
  return renderCalcSheetPreview(draftInput(await loadRunSheet(runId), now));
}

export async function runSheetPdf(runId: number, printer: SheetPrinter, now = new Date()): Promise<{ bytes: Buffer; fileName: string }> {
  const base = await loadRunSheet(runId);
  const bytes = await renderCalcSheetPdf(draftInput(base, now), printer);
  return { bytes, fileName: `${base.project.jobNumber}-run-${runId}-calc-sheet-draft.pdf`.replace(/[^A-Za-z0-9._-]+/g, '-') };
}

/** The preview of a sheet revision: its label and whoever has signed so far. */
export async function revisionSheetHtml(sheetId: number, publicUrl: () => string, now = new Date()): Promise<string> {
  const revision = await getRevision(sheetId, { publicUrl });
  const base = await loadRunSheet(revision.runId);
  const signedAt = (event: string) => revision.events.find((e) => e.to === event)?.at.slice(0, 10);
  return renderCalcSheetPreview({
    ...base,
    revision: revision.label,
    preparedBy: { name: revision.preparedBy.name, date: signedAt('in-check') },
    checkedBy: revision.checkedBy ? { name: revision.checkedBy.name, date: signedAt('checked') } : undefined,
    generatedAt: now,
  });
}
