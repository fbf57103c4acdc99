import fs from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { User } from '../../server/db/models';
import type { Services } from '../../server/bootstrap';
import { SESSION_USER_TTL_MS } from '../../server/modules/auth/session-user';
import { demoEmail, signIn, startTestServices } from '../support/test-services';

// The signed-in user is read through a short per-process cache (session-user.ts). Revocation
// must still hold: at once for writes made through this process, and within the cache's time
// for writes made by another process sharing the database file (simulated here by SQL that
// bypasses the models, as a second server process's write would).
let services: Services;
beforeAll(async () => {
  services = await startTestServices({}, { realFile: true });
});
afterAll(async () => {
  await services.shutdown();
  fs.rmSync(services.config.dataDir, { recursive: true, force: true });
});

const idOf = async (email: string) => (await User.findOne({ where: { email } }))!.id;

/** Polls GET /api/projects until it is refused; returns how long that took (ms). */
async function msUntilRefused(agent: Awaited<ReturnType<typeof signIn>>['agent'], limitMs: number): Promise<number> {
  const start = Date.now();
  for (;;) {
    const res = await agent.get('/api/projects');
    if (res.status === 401) return Date.now() - start;
    expect(res.status).toBe(200);
    if (Date.now() - start > limitMs) return Infinity;
    await new Promise((r) => setTimeout(r, 50));
  }
}

describe('the signed-in user cache', () => {
  it('when an admin changes a signed-in user’s role, then the next request already has the new role', async () => {
    const admin = await signIn(services.app, demoEmail('admin'));
    const reviewer = await signIn(services.app, demoEmail('reviewer'));
    const id = await idOf(demoEmail('reviewer'));
    expect((await reviewer.agent.get('/api/session')).body.user.role).toBe('reviewer');
    await admin.agent.patch(`/api/users/${id}`).set('X-CSRF-Token', admin.csrf).send({ role: 'drafter' }).expect(200);
    expect((await reviewer.agent.get('/api/session')).body.user.role).toBe('drafter');
    await admin.agent.patch(`/api/users/${id}`).set('X-CSRF-Token', admin.csrf).send({ role: 'reviewer' }).expect(200);
    expect((await reviewer.agent.get('/api/session')).body.user.role).toBe('reviewer');
  });

  it('when another process disables a signed-in user, then their requests are refused within the cache time', async () => {
    const drafter = await signIn(services.app, demoEmail('drafter'));
    const id = await idOf(demoEmail('drafter'));
    await drafter.agent.get('/api/projects').expect(200); // now cached
    await services.sequelize.query('UPDATE "users" SET "disabled" = :on WHERE "id" = :id', { replacements: { id, on: true } });
    try {
      const ms = await msUntilRefused(drafter.agent, SESSION_USER_TTL_MS + 1500);
      // Bound: the cache time, plus one poll step and a request on a loaded machine.
      expect(ms).toBeLessThanOrEqual(SESSION_USER_TTL_MS + 1000);
    } finally {
      await services.sequelize.query('UPDATE "users" SET "disabled" = :on WHERE "id" = :id', { replacements: { id, on: false } });
    }
  });

  it('when another process changes a user’s password (raising the session epoch), then older sessions are refused within the cache time', async () => {
    const engineer = await signIn(services.app, demoEmail('engineer'));
    const id = await idOf(demoEmail('engineer'));
    await engineer.agent.get('/api/projects').expect(200);
    await services.sequelize.query('UPDATE "users" SET "sessionEpoch" = "sessionEpoch" + 1 WHERE "id" = :id', { replacements: { id } });
    const ms = await msUntilRefused(engineer.agent, SESSION_USER_TTL_MS + 1500);
    expect(ms).toBeLessThanOrEqual(SESSION_USER_TTL_MS + 1000);
    // A fresh sign-in carries the new epoch and works.
    const again = await signIn(services.app, demoEmail('engineer'));
    await again.agent.get('/api/projects').expect(200);
  });

  it('when a write through this process disables a user, then the very next request is refused (no cache time)', async () => {
    const admin = await signIn(services.app, demoEmail('admin'));
    const drafter = await signIn(services.app, demoEmail('drafter'));
    const id = await idOf(demoEmail('drafter'));
    await drafter.agent.get('/api/projects').expect(200);
    await admin.agent.patch(`/api/users/${id}`).set('X-CSRF-Token', admin.csrf).send({ disabled: true }).expect(200);
    await drafter.agent.get('/api/projects').expect(401);
    await admin.agent.patch(`/api/users/${id}`).set('X-CSRF-Token', admin.csrf).send({ disabled: false }).expect(200);
  });
});
