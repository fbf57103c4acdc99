import { designRecheckSchema, runCreateSchema } from '@shared/schemas/run.schema';
import { ANY_ROLE, ApiRoutes, type RouteSpec } from '../../middleware/access';
import { idParam, validateBody } from '../../middleware/validate';
import * as runs from './runs.service';

export function runsRoutes(registry: RouteSpec[], deps: runs.RunsDeps) {
  const routes = new ApiRoutes('/api', registry);
  routes.add('post', '/trusses/:id/runs', ['engineer'], validateBody(runCreateSchema), async (req, res) => {
    res.status(202).json(await runs.startRun(idParam(req.params.id, 'That truss'), req.body, req.user!.id, deps));
  });
  routes.add('get', '/trusses/:id/runs', ANY_ROLE, async (req, res) => {
    res.json(await runs.listRuns(idParam(req.params.id, 'That truss')));
  });
  routes.add('get', '/runs/:id', ANY_ROLE, async (req, res) => {
    res.type('application/json').send(await runs.getRunJson(idParam(req.params.id, 'That analysis run')));
  });
  routes.add('get', '/runs/:id/forces.csv', ANY_ROLE, async (req, res) => {
    const { csv, fileName } = await runs.getForcesCsv(idParam(req.params.id, 'That analysis run'));
    res.attachment(fileName).type('text/csv; charset=utf-8').send(csv);
  });
  routes.add('get', '/runs/:id/reactions.csv', ANY_ROLE, async (req, res) => {
    const { csv, fileName } = await runs.getReactionsCsv(idParam(req.params.id, 'That analysis run'));
    res.attachment(fileName).type('text/csv; charset=utf-8').send(csv);
  });
  // Re-check a run's members with the saved sections on its stored forces (no new analysis).
  routes.add('post', '/runs/:id/design', ['engineer'], validateBody(designRecheckSchema), async (req, res) => {
    res.json(await runs.recheckDesign(idParam(req.params.id, 'That analysis run'), req.body));
  });
  return routes.router;
}
