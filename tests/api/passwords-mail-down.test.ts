import net from 'node:net';
import type { AddressInfo } from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import bcrypt from 'bcryptjs';
import type { Services } from '../../server/bootstrap';
import { PasswordReset, User } from '../../server/db/models';
import { demoEmail, openTab, signIn, startTestServices } from '../support/test-services';

// Reset links when the firm's mail server is down: a real SMTP client (nodemailer) against a
// port that refuses connections. Nothing is left behind that nobody received.

let services: Services;
let deadPort: number;
beforeAll(async () => {
  // A port that was free a moment ago and is now closed: connections to it are refused.
  const probe = net.createServer();
  await new Promise<void>((r) => probe.listen(0, '127.0.0.1', () => r()));
  deadPort = (probe.address() as AddressInfo).port;
  await new Promise((r) => probe.close(r));
  services = await startTestServices({ smtpUrl: `smtp://127.0.0.1:${deadPort}` });
});
afterAll(async () => {
  await services.shutdown();
});

describe('reset links with the mail server down', () => {
  it('when an admin sends a reset link and the mail cannot go, then 502 with one sentence, the older link still works and no new row stays', async () => {
    const user = await User.create({ email: 'mail.down@example.com', name: 'Gita Rao', role: 'drafter', passwordHash: await bcrypt.hash('kiln mortise ladder fern 71', 4) });
    // An older link, made before the mail server went down.
    await PasswordReset.create({ tokenHash: 'a'.repeat(64), userId: user.id, requestedById: null, expiresAt: new Date(Date.now() + 3600_000), usedAt: null });
    const admin = await signIn(services.app, demoEmail('admin'));
    const res = await admin.agent.post(`/api/users/${user.id}/password-reset`).set('X-CSRF-Token', admin.csrf).send({});
    expect(res.status).toBe(502);
    expect(res.body.error.code).toBe('mail-not-sent');
    expect(res.body.error.message).toMatch(/could not be sent .*: check the mail settings \(SMTP_URL\) and try again\.$/);
    const rows = await PasswordReset.findAll({ where: { userId: user.id } });
    expect(rows.map((r) => r.tokenHash)).toEqual(['a'.repeat(64)]);
  });

  it('when someone asks for a link and the mail cannot go, then still the one answer (the failure is logged, not shown)', async () => {
    const guest = await openTab(services.app);
    const res = await guest.agent.post('/api/password-resets').set('X-CSRF-Token', guest.csrf).send({ email: demoEmail('engineer') });
    expect(res.status).toBe(202);
    expect(res.body.message).toMatch(/^If that address belongs to an account here/);
  });
});
