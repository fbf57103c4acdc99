import type { OutboxMessageView } from '@shared/schemas/auth.schema';
import { ApiRoutes, type RouteSpec } from '../../middleware/access';
import { OutboxMessage } from '../../db/models';

/** What the local SMTP sink received, newest first (admins only: invitations carry links). */
export async function listOutbox(limit = 200): Promise<OutboxMessageView[]> {
  const rows = await OutboxMessage.findAll({ order: [['id', 'DESC']], limit });
  return rows.map((m) => ({
    id: m.id,
    from: m.from,
    to: JSON.parse(m.to) as string[],
    subject: m.subject,
    text: m.text,
    receivedAt: new Date(m.receivedAt).toISOString(),
  }));
}

export function outboxRoutes(registry: RouteSpec[]) {
  const routes = new ApiRoutes('/api', registry);
  routes.add('get', '/outbox', ['admin'], async (_req, res) => {
    res.json(await listOutbox());
  });
  return routes.router;
}
