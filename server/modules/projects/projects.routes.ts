import { projectInputSchema, projectUpdateSchema, trussInputSchema } from '@shared/schemas/project.schema';
import { ANY_ROLE, ApiRoutes, type RouteSpec } from '../../middleware/access';
import { idParam, validateBody } from '../../middleware/validate';
import * as projects from './projects.service';

export function projectsRoutes(registry: RouteSpec[]) {
  const routes = new ApiRoutes('/api', registry);
  routes.add('get', '/projects', ANY_ROLE, async (req, res) => {
    res.json(await projects.listProjects(req.query.archived === 'include'));
  });
  routes.add('post', '/projects', ['engineer', 'admin'], validateBody(projectInputSchema), async (req, res) => {
    res.status(201).json(await projects.createProject(req.body, req.user!.id));
  });
  routes.add('get', '/projects/:id', ANY_ROLE, async (req, res) => {
    res.json(await projects.getProject(idParam(req.params.id, 'That project')));
  });
  routes.add('patch', '/projects/:id', ['engineer', 'admin'], validateBody(projectUpdateSchema), async (req, res) => {
    res.json(await projects.updateProject(idParam(req.params.id, 'That project'), req.body));
  });
  routes.add('get', '/projects/:id/trusses', ANY_ROLE, async (req, res) => {
    res.json(await projects.listTrusses(idParam(req.params.id, 'That project')));
  });
  routes.add('post', '/projects/:id/trusses', ['drafter', 'engineer', 'admin'], validateBody(trussInputSchema), async (req, res) => {
    res.status(201).json(await projects.createTruss(idParam(req.params.id, 'That project'), req.body));
  });
  routes.add('get', '/trusses/:id', ANY_ROLE, async (req, res) => {
    res.json(await projects.getTruss(idParam(req.params.id, 'That truss')));
  });
  return routes.router;
}
