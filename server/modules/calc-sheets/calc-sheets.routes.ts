import { ANY_ROLE, ApiRoutes, type RouteSpec } from '../../middleware/access';
import { idParam } from '../../middleware/validate';
import type { SheetPrinter } from './sheet-printer';
import { runSheetHtml, runSheetPdf } from './run-sheet.service';

/** A run's calc sheet before it is a revision: the HTML preview and the draft PDF. */
export function calcSheetsRoutes(registry: RouteSpec[], deps: { printer: SheetPrinter }) {
  const routes = new ApiRoutes('/api', registry);
  routes.add('get', '/runs/:id/sheet', ANY_ROLE, async (req, res) => {
    res.type('html').send(await runSheetHtml(idParam(req.params.id, 'That analysis run')));
  });
  routes.add('get', '/runs/:id/sheet.pdf', ANY_ROLE, async (req, res) => {
    // The print is dropped from the queue (or stopped) when the requester goes before the PDF is sent.
    const gone = new AbortController();
    res.on('close', () => {
      if (!res.writableFinished) gone.abort();
    });
    const { bytes, fileName } = await runSheetPdf(idParam(req.params.id, 'That analysis run'), deps.printer, {
      priority: 'preview',
      person: req.user!.id,
      signal: gone.signal,
    });
    res.attachment(fileName).type('application/pdf').send(bytes);
  });
  return routes.router;
}
