import { firmSettingsSchema } from '@shared/schemas/project.schema';
import { ANY_ROLE, ApiRoutes, type RouteSpec } from '../../middleware/access';
import { validateBody } from '../../middleware/validate';
import { importLimitsSchema } from '@shared/schemas/import-limits.schema';
import { getFirm, saveFirm } from './firm.service';
import { getImportLimits, saveImportLimits } from './import-limits.service';

export function firmRoutes(registry: RouteSpec[]) {
  const routes = new ApiRoutes('/api', registry);
  routes.add('get', '/firm', ANY_ROLE, async (_req, res) => {
    res.json(await getFirm());
  });
  routes.add('put', '/firm', ['admin'], validateBody(firmSettingsSchema), async (req, res) => {
    res.json(await saveFirm(req.body));
  });
  // Caps on reading a drawing; anyone may see them (the upload page names them), an admin sets them.
  routes.add('get', '/firm/import-limits', ANY_ROLE, async (_req, res) => {
    res.json(await getImportLimits());
  });
  routes.add('put', '/firm/import-limits', ['admin'], validateBody(importLimitsSchema), async (req, res) => {
    res.json(await saveImportLimits(req.body, req.user!.id));
  });
  return routes.router;
}
