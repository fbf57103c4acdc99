import { designSaveSchema, detachLoadsSchema, modelSaveSchema } from '@shared/schemas/model.schema';
import { ANY_ROLE, ApiRoutes, type RouteSpec } from '../../middleware/access';
import { idParam, validateBody } from '../../middleware/validate';
import { detachRoofLoads, getModel, saveDesign, saveModel } from './models.service';

export function modelsRoutes(registry: RouteSpec[]) {
  const routes = new ApiRoutes('/api', registry);
  routes.add('get', '/trusses/:id/model', ANY_ROLE, async (req, res) => {
    res.json(await getModel(idParam(req.params.id, 'That truss')));
  });
  // Loads, supports and properties are the engineer's; drafters change geometry by drawings.
  routes.add('put', '/trusses/:id/model', ['engineer'], validateBody(modelSaveSchema), async (req, res) => {
    res.json(await saveModel(idParam(req.params.id, 'That truss'), req.body, req.user!.id));
  });
  // "Detach and edit by hand": a roof-takeoff case's loads become hand loads (a new model save).
  routes.add('post', '/trusses/:id/model/detach-loads', ['engineer'], validateBody(detachLoadsSchema), async (req, res) => {
    res.json(await detachRoofLoads(idParam(req.params.id, 'That truss'), req.body, req.user!.id));
  });
  // Member design (basis, groups, sections) is the engineer's, saved as a new model version.
  routes.add('put', '/trusses/:id/design', ['engineer'], validateBody(designSaveSchema), async (req, res) => {
    res.json(await saveDesign(idParam(req.params.id, 'That truss'), req.body, req.user!.id));
  });
  return routes.router;
}
