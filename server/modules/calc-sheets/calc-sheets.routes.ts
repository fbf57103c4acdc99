import { ANY_ROLE, ApiRoutes, type RouteSpec } from '../../middleware/access';
import { idParam } from '../../middleware/validate';
import type { SheetPrinter } from './sheet-printer';
import type { SheetBuildPool } from './sheet-build-pool';
import type { PrintJobs } from './print-jobs.service';
import { AppError } from '../../errors/app-error';
import { previewsFullMessage, type PreviewHolds } from './preview-holds';
import { runSheetHtml, runSheetPdf } from './run-sheet.service';

/**
 * A run's calc sheet before it is a revision: the HTML preview, the draft PDF at once (a small
 * sheet), and the draft PDF as a background print job with its progress (any sheet; the app
 * uses this one). The HTML is built in the sheet-build worker thread either way.
 */
export function calcSheetsRoutes(registry: RouteSpec[], deps: { printer: SheetPrinter; builder: SheetBuildPool; jobs: PrintJobs; holds: PreviewHolds }) {
  const routes = new ApiRoutes('/api', registry);
  routes.add('get', '/runs/:id/sheet', ANY_ROLE, async (req, res) => {
    res.type('html').send(await runSheetHtml(idParam(req.params.id, 'That analysis run'), new Date(), deps.builder));
  });
  routes.add('get', '/runs/:id/sheet.pdf', ANY_ROLE, async (req, res) => {
    // The print is dropped from the queue (or stopped) when the requester goes before the PDF is sent.
    const gone = new AbortController();
    res.on('close', () => {
      if (!res.writableFinished) gone.abort();
    });
    const runId = idParam(req.params.id, 'That analysis run');
    // Counted across app processes (PostgreSQL): the printer's own count sees this process only.
    const release = await deps.holds.take(req.user!.id);
    if (!release) throw new AppError('print-queue-full', previewsFullMessage(2), 429);
    try {
      const { bytes, fileName } = await runSheetPdf(runId, deps.printer, { priority: 'preview', person: req.user!.id, signal: gone.signal }, new Date(), deps.builder);
      res.attachment(fileName).type('application/pdf').send(bytes);
    } finally {
      await release();
    }
  });
  // Print jobs: the same draft PDF made in the background; 202 with the job, then poll it.
  routes.add('post', '/runs/:id/sheet-jobs', ANY_ROLE, async (req, res) => {
    const job = await deps.jobs.request(idParam(req.params.id, 'That analysis run'), req.user!.id);
    res.status(202).location(`/api/sheet-jobs/${job.id}`).json(job);
  });
  routes.add('get', '/runs/:id/sheet-jobs', ANY_ROLE, async (req, res) => {
    res.json(await deps.jobs.listForRun(idParam(req.params.id, 'That analysis run'), req.user!.id));
  });
  routes.add('get', '/sheet-jobs/:id', ANY_ROLE, async (req, res) => {
    res.json(await deps.jobs.get(idParam(req.params.id, 'That print job'), req.user!.id));
  });
  routes.add('get', '/sheet-jobs/:id/pdf', ANY_ROLE, async (req, res) => {
    const { bytes, fileName } = await deps.jobs.pdf(idParam(req.params.id, 'That print job'), req.user!.id);
    res.attachment(fileName).type('application/pdf').send(bytes);
  });
  return routes.router;
}
