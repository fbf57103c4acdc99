import type { RunAnalysis } from '@shared/schemas/run.schema';
import type { TrussModel } from '@shared/model/truss';
import type { TrussAnalysis } from '@shared/solver';
import type { RoofTakeoffResult } from '@shared/takeoff';
import { roofLoadsSteps } from '@shared/model/roof-loads';
import { conflict, notFound } from '../../errors/app-error';
import { fileNamePart, modelSaveName, runName } from '@shared/text/citations';
import { Project, Truss } from '../../db/models';
import { getFirm } from '../firm/firm.service';
import * as runsRepo from '../runs/runs.repository';
import { renderCalcSheetPdf, renderCalcSheetPreview } from './calc-sheets.service';
import type { CalcSheetInput } from './calc-sheet-view';
import type { PrintRequest, SheetPrinter } from './sheet-printer';
import type { SheetBuildPool } from './sheet-build-pool';

/** A run's calc-sheet input without what a revision adds (revision, signers, print time). */
export type RunSheetInput = Omit<CalcSheetInput, 'revision' | 'preparedBy' | 'checkedBy' | 'issuedBy' | 'generatedAt'>;

/**
 * A calc sheet is always made from one stored analysis run: its immutable snapshot of the
 * model, its results and its takeoff. Nothing here re-solves or trusts the client.
 */
export async function loadRunSheet(runId: number): Promise<RunSheetInput> {
  const run = await runsRepo.findRun(runId);
  if (!run) throw notFound('That analysis run');
  if (run.status !== 'solved' && run.status !== 'unstable') {
    const why = { queued: 'it is still waiting to be solved', running: 'it is still being solved', failed: 'it failed' }[run.status];
    const t = await Truss.findByPk(run.trussId);
    throw conflict('run-not-finished', `${runName(run.number, t?.name)} has no calc sheet because ${why}. Open the run to see its status.`);
  }
  const truss = await Truss.findByPk(run.trussId);
  const project = truss ? await Project.findByPk(truss.projectId) : null;
  if (!truss || !project) throw notFound('The truss of that run');
  const cited = runName(run.number, truss.name);
  const takeoff = run.takeoff ? (JSON.parse(run.takeoff) as { result?: RoofTakeoffResult } | null) : null;
  const ranOn = run.createdAt.toISOString().slice(0, 10);
  const model = JSON.parse(run.model) as TrussModel;
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
    subject: `${truss.name}: ${takeoff?.result ? 'roof loading, analysis' : 'analysis'}, member forces${run.analysis?.includes('"design":{') ? ' and member design' : ''}`,
    model,
    ...(() => {
      const { design, ...analysis } = JSON.parse(run.analysis!) as RunAnalysis;
      return { analysis: analysis as TrussAnalysis, design: design ?? null };
    })(),
    // The steps of the cases that hold the roof loading's loads (a detached case solves its hand loads).
    takeoffSteps: takeoff?.result?.steps ? roofLoadsSteps(takeoff.result.steps, model.loadCases) : undefined,
    runLabel: `${cited} (${modelSaveName(run.modelVersion)})${run.ranBy ? ` by ${run.ranBy}` : ''}, ${ranOn}`,
    runNumber: run.number,
  };
}

export function draftInput(base: RunSheetInput, now: Date): CalcSheetInput {
  return { ...base, revision: 'draft', generatedAt: now };
}

/** The download name of a run's draft PDF, with the run's number within its truss. */
export function draftFileName(base: Pick<RunSheetInput, 'project' | 'trussName' | 'runNumber'>): string {
  return `${fileNamePart(base.project.jobNumber)}-${fileNamePart(base.trussName)}-run-${base.runNumber ?? 0}-calc-sheet-draft.pdf`;
}

/**
 * The preview of a run's sheet, not yet a revision. With a build pool the HTML is built in its
 * worker thread (a large sheet takes seconds), otherwise here.
 */
export async function runSheetHtml(runId: number, now = new Date(), builder?: SheetBuildPool): Promise<string> {
  const input = draftInput(await loadRunSheet(runId), now);
  return builder ? (await builder.build(input)).html : renderCalcSheetPreview(input);
}

/** The draft PDF of a run's sheet: a preview in the print queue (see sheet-printer.ts). */
export async function runSheetPdf(
  runId: number,
  printer: SheetPrinter,
  request: PrintRequest = {},
  now = new Date(),
  builder?: SheetBuildPool,
): Promise<{ bytes: Buffer; fileName: string }> {
  const base = await loadRunSheet(runId);
  let bytes: Buffer;
  if (builder) {
    const built = await builder.build(draftInput(base, now));
    bytes = await printer.print(built.html, built.paper, request);
  } else {
    bytes = await renderCalcSheetPdf(draftInput(base, now), printer, request);
  }
  return { bytes, fileName: draftFileName(base) };
}
