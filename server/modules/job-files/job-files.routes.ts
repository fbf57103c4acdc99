import { ANY_ROLE, ApiRoutes, type RouteSpec } from '../../middleware/access';
import { idParam } from '../../middleware/validate';
import { exportJobFile, importJobFile } from './job-files.service';

/** The whole model of a truss as a job file (the command line's format): export and import. */
export function jobFilesRoutes(registry: RouteSpec[]) {
  const routes = new ApiRoutes('/api', registry);
  routes.add('get', '/trusses/:id/job-file', ANY_ROLE, async (req, res) => {
    const { json, fileName } = await exportJobFile(idParam(req.params.id, 'That truss'));
    res.attachment(fileName).type('application/json; charset=utf-8').send(json);
  });
  // The body is the job file itself; it becomes the next model version (422 with one sentence when it is bad).
  routes.add('post', '/trusses/:id/job-file', ['engineer'], async (req, res) => {
    res.json(await importJobFile(idParam(req.params.id, 'That truss'), req.body, req.user!.id));
  });
  return routes.router;
}
