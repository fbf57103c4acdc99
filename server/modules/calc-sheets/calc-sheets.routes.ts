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
    const { bytes, fileName } = await runSheetPdf(idParam(req.params.id, 'That analysis run'), deps.printer);
    res.attachment(fileName).type('application/pdf').send(bytes);
  });
  return routes.router;
}
