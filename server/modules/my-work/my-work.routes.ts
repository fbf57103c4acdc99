import { ANY_ROLE, ApiRoutes, type RouteSpec } from '../../middleware/access';
import { myWork } from './my-work.service';

/** GET /api/me/work: what waits for the signed-in person (MyWorkView, shared/schemas/review.schema.ts). */
export function myWorkRoutes(registry: RouteSpec[]) {
  const routes = new ApiRoutes('/api', registry);
  routes.add('get', '/me/work', ANY_ROLE, async (req, res) => {
    res.json(await myWork({ id: req.user!.id, role: req.user!.role }));
  });
  return routes.router;
}
