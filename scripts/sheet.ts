/**
 * `npm run -s sheet -- JOB.json OUT.pdf`: writes the calc sheet of a job file (the solve
 * command's format, see scripts/job.ts) as a PDF, with a demo firm and project in the title block.
 *
 * Exit 0 when the PDF was written (also for an unstable truss: its short sheet states the
 * finding); exit 2 with one line on stderr for bad input or a missing Chromium; exit 1 for an
 * unexpected failure. The PDF is written to a temporary name and renamed, so a failed print
 * leaves no file behind.
 */
import path from 'node:path';
import { DxfImportError } from '@shared/dxf-import/index';
import { SolverError, trussSolve } from '@shared/solver/index';
import { runDesign } from '@shared/design/basis';
import { buildCalcSheetView } from '../server/modules/calc-sheets/calc-sheet-view';
import { renderCalcSheetHtml } from '../server/modules/calc-sheets/calc-sheet-html';
import { createSheetPrinter, SheetPrintError } from '../server/modules/calc-sheets/sheet-printer';
import { computeTakeoff } from '../server/modules/takeoff/takeoff-compute';
import { roofLoadsSteps } from '@shared/model/roof-loads';
import { JobError, jobLoad } from './job';

const USAGE = 'Usage: npm run -s sheet -- JOB.json OUT.pdf';

function oneLine(message: string): string {
  return message.replace(/\s*\n\s*/g, ' ').trim();
}

async function main(args: string[]): Promise<void> {
  const [jobPath, outPath] = args;
  if (!jobPath || !outPath || args.length > 2) throw new JobError(USAGE);
  if (!/\.pdf$/i.test(outPath)) throw new JobError(`The output ${outPath} should end in .pdf. ${USAGE}`);
  const { model, saved, takeoff } = jobLoad(jobPath);
  const analysis = trussSolve(model);
  // The job's "design" and "deflection" give the design pages the app's sheet has (same run code).
  const design = runDesign(model, analysis);
  const paper = process.env.SHEET_PAPER === 'Letter' ? 'Letter' : 'A4';
  const view = buildCalcSheetView({
    firm: { name: 'Harrow & Vale Structural (demo)', address: '4 Tanner’s Yard, Northgate', paperSize: paper },
    project: {
      name: 'Kestrel Logistics — warehouse roof',
      jobNumber: 'HV-2417',
      client: 'Kestrel Logistics (demo)',
      site: 'Unit 7, Furlong Park (demo)',
      designBasis: `Demo project for the calc sheet command. Loads and combinations as given in the job file; ${design ? 'member design and deflection as given in the job file' : 'member design is outside this sheet (the job file has no "design")'}.`,
      unitSystem: 'SI',
    },
    trussName: path.basename(jobPath, path.extname(jobPath)),
    subject: `Truss ${path.basename(jobPath, path.extname(jobPath))} — member forces${design ? ' and design' : ''}`,
    revision: 'P1',
    model,
    analysis,
    design,
    // As the app's run: the roof loading's steps are printed when some case holds its loads (is marked).
    // Only the steps of the marked cases (and those they share), as the app's sheet (roofLoadsSteps).
    ...(takeoff && saved.loadCases.some((c) => c.source === 'roof-loading') ? { takeoffSteps: roofLoadsSteps(computeTakeoff(saved, takeoff).steps, saved.loadCases) } : {}),
    preparedBy: { name: 'Panelpoint sheet command' },
    runLabel: path.basename(jobPath),
    generatedAt: new Date(),
  });
  const html = renderCalcSheetHtml(view);
  const printer = createSheetPrinter({ chromiumPath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium' });
  try {
    await printer.printToFile(html, paper, outPath);
  } finally {
    await printer.close();
  }
}

main(process.argv.slice(2)).catch((e: unknown) => {
  if (e instanceof JobError || e instanceof SolverError || e instanceof DxfImportError) {
    const code = e instanceof JobError ? 'bad-job' : e.code;
    process.stderr.write(`sheet: ${code}: ${oneLine(e.message)}\n`);
    process.exitCode = 2;
  } else if (e instanceof SheetPrintError) {
    process.stderr.write(`sheet: ${e.code}: ${oneLine(e.message)}\n`);
    process.exitCode = e.code === 'chromium-missing' ? 2 : 1;
  } else {
    process.stderr.write(`sheet: unexpected failure: ${oneLine(e instanceof Error ? e.message : String(e))}\n`);
    process.exitCode = 1;
  }
});
