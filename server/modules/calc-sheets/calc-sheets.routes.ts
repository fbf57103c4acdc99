import { ANY_ROLE, ApiRoutes, type RouteSpec } from '../../middleware/access';
import { idParam } from '../../middleware/validate';
import type { SheetPrinter } from './sheet-printer';
import { revisionSheetHtml, runSheetHtml, runSheetPdf } from './run-sheet.service';

export function runSheetsRoutes(registry: RouteSpec[], deps: { printer: SheetPrinter; publicUrl: () => string }) {
  const routes = new ApiRoutes('/api', registry);
  routes.add('get', '/runs/:id/sheet', ANY_ROLE, async (req, res) => {
    res.type('html').send(await runSheetHtml(idParam(req.params.id, 'That analysis run')));
  });
  routes.add('get', '/runs/:id/sheet.pdf', ANY_ROLE, async (req, res) => {
    const { bytes, fileName } = await runSheetPdf(idParam(req.params.id, 'That analysis run'), deps.printer);
    res.attachment(fileName).type('application/pdf').send(bytes);
  });
  routes.add('get', '/sheets/:id/preview', ANY_ROLE, async (req, res) => {
    res.type('html').send(await revisionSheetHtml(idParam(req.params.id, 'That sheet revision'), deps.publicUrl));
  });
  return routes.router;
}
