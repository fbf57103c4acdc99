import { firmSettingsSchema } from '@shared/schemas/project.schema';
import { ANY_ROLE, ApiRoutes, type RouteSpec } from '../../middleware/access';
import { validateBody } from '../../middleware/validate';
import { getFirm, saveFirm } from './firm.service';

export function firmRoutes(registry: RouteSpec[]) {
  const routes = new ApiRoutes('/api', registry);
  routes.add('get', '/firm', ANY_ROLE, async (_req, res) => {
    res.json(await getFirm());
  });
  routes.add('put', '/firm', ['admin'], validateBody(firmSettingsSchema), async (req, res) => {
    res.json(await saveFirm(req.body));
  });
  return routes.router;
}
