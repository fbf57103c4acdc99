import { takeoffInputSchema } from '@shared/schemas/run.schema';
import { ApiRoutes, type RouteSpec } from '../../middleware/access';
import { idParam, validateBody } from '../../middleware/validate';
import { previewTakeoff } from './takeoff.service';

export function takeoffRoutes(registry: RouteSpec[]) {
  const routes = new ApiRoutes('/api', registry);
  // A preview computes and writes nothing, but it is part of editing loads: engineers only.
  routes.add('post', '/trusses/:id/takeoff/preview', ['engineer'], validateBody(takeoffInputSchema), async (req, res) => {
    res.json(await previewTakeoff(idParam(req.params.id, 'That truss'), req.body));
  });
  return routes.router;
}
