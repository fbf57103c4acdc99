import { inviteUserSchema, updateUserSchema } from '@shared/schemas/auth.schema';
import { ANY_ROLE, ApiRoutes, type RouteSpec } from '../../middleware/access';
import { idParam, validateBody } from '../../middleware/validate';
import type { User } from '../../db/models';
import type { Mailer } from '../../mail/mailer';
import { getFirm } from '../firm/firm.service';
import { inviteUser, listUsers, updateUser } from './users.service';
import { adminSendPasswordReset } from '../auth/passwords.service';
import { getEmailSettings, updateEmailSettings } from './email-settings.service';

export function usersRoutes(registry: RouteSpec[], deps: { mailer: Mailer; publicUrl: () => string }) {
  const routes = new ApiRoutes('/api', registry);
  routes.add('get', '/users', ['admin'], async (_req, res) => {
    res.json(await listUsers());
  });
  routes.add('post', '/users/invitations', ['admin'], validateBody(inviteUserSchema), async (req, res) => {
    const firm = await getFirm();
    const result = await inviteUser(req.body, req.user as User, {
      mailer: deps.mailer,
      publicUrl: deps.publicUrl(),
      firmName: firm.name,
    });
    res.status(201).json(result);
  });
  routes.add('patch', '/users/:id', ['admin'], validateBody(updateUserSchema), async (req, res) => {
    res.json(await updateUser(idParam(req.params.id, 'That user'), req.body, req.user as User));
  });
  // The user's password stays until they use the e-mailed link.
  routes.add('post', '/users/:id/password-reset', ['admin'], async (req, res) => {
    const firm = await getFirm();
    const sent = await adminSendPasswordReset(idParam(req.params.id, 'That user'), req.user as User, {
      mailer: deps.mailer,
      publicUrl: deps.publicUrl(),
      firmName: firm.name,
    });
    res.status(202).json(sent);
  });
  // Which review e-mails the signed-in person gets (password and invitation e-mails always go).
  routes.add('get', '/me/email-settings', ANY_ROLE, async (req, res) => {
    res.json(await getEmailSettings((req.user as User).id));
  });
  routes.add('put', '/me/email-settings', ANY_ROLE, async (req, res) => {
    res.json(await updateEmailSettings((req.user as User).id, req.body));
  });
  return routes.router;
}
