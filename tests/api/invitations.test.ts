import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Services } from '../../server/bootstrap';
import { OutboxMessage, User } from '../../server/db/models';
import { demoEmail, openTab, signIn, startTestServices } from '../support/test-services';

let services: Services;
beforeAll(async () => {
  services = await startTestServices();
});
afterAll(async () => {
  await services.shutdown();
});

describe('inviting a user through the local SMTP sink', () => {
  it('when an admin invites an engineer, then the e-mail reaches the sink and its link sets a password exactly once', async () => {
    const admin = await signIn(services.app, demoEmail('admin'));
    const invited = await admin.agent
      .post('/api/users/invitations')
      .set('X-CSRF-Token', admin.csrf)
      .send({ email: 'New.Engineer@Example.com', name: 'Noor Patel', role: 'engineer' });
    expect(invited.status).toBe(201);
    expect(invited.body.invitation).toMatchObject({ email: 'new.engineer@example.com', role: 'engineer' });

    // The message went over a real SMTP exchange to the sink, which filed it in the outbox.
    const outbox = await admin.agent.get('/api/outbox').expect(200);
    const mail = outbox.body.find((m: { to: string[] }) => m.to.includes('new.engineer@example.com'));
    expect(mail).toBeTruthy();
    expect(mail.subject).toMatch(/invited to Panelpoint/);
    const link = /http:\/\/panelpoint\.test\/invite\/([A-Za-z0-9_-]+)/.exec(mail.text);
    expect(link).not.toBeNull();
    const token = link![1];
    expect(invited.body.link).toBe(`http://panelpoint.test/invite/${token}`);

    // Invited but without a password: cannot sign in yet.
    const early = await openTab(services.app);
    const refused = await early.agent.post('/api/session').set('X-CSRF-Token', early.csrf).send({ email: 'new.engineer@example.com', password: 'anything-at-all' });
    expect(refused.status).toBe(401);

    const guest = await openTab(services.app);
    const shown = await guest.agent.get(`/api/invitations/${token}`).expect(200);
    expect(shown.body).toMatchObject({ email: 'new.engineer@example.com', role: 'engineer' });

    const accepted = await guest.agent
      .post('/api/invitations/accept')
      .set('X-CSRF-Token', guest.csrf)
      .send({ token, name: 'Noor Patel', password: 'a-long-enough-password' });
    expect(accepted.status).toBe(200);
    expect(accepted.body.user).toMatchObject({ email: 'new.engineer@example.com', role: 'engineer', pending: false });

    // Signed in by accepting, and the password works from a new tab.
    await guest.agent.get('/api/projects').expect(200);
    await signIn(services.app, 'new.engineer@example.com', 'a-long-enough-password');

    // The same link a second time: refused, and the password is unchanged.
    const other = await openTab(services.app);
    const again = await other.agent
      .post('/api/invitations/accept')
      .set('X-CSRF-Token', other.csrf)
      .send({ token, name: 'Mallory', password: 'another-password-123' });
    expect(again.status).toBe(410);
    expect(again.body.error.code).toBe('invitation-used');
    await signIn(services.app, 'new.engineer@example.com', 'a-long-enough-password');
    expect((await User.findOne({ where: { email: 'new.engineer@example.com' } }))!.name).toBe('Noor Patel');
  });

  it('when the invited address already has an account, then 409 and no e-mail is sent', async () => {
    const admin = await signIn(services.app, demoEmail('admin'));
    const before = await OutboxMessage.count();
    const res = await admin.agent.post('/api/users/invitations').set('X-CSRF-Token', admin.csrf).send({ email: demoEmail('engineer'), name: 'X', role: 'drafter' });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('user-exists');
    expect(await OutboxMessage.count()).toBe(before);
  });

  it('when the password is too short, then 400 and the invitation stays usable', async () => {
    const admin = await signIn(services.app, demoEmail('admin'));
    const invited = await admin.agent.post('/api/users/invitations').set('X-CSRF-Token', admin.csrf).send({ email: 'short@example.com', name: 'Sam Short', role: 'drafter' });
    const token = invited.body.link.split('/').pop();
    const guest = await openTab(services.app);
    const res = await guest.agent.post('/api/invitations/accept').set('X-CSRF-Token', guest.csrf).send({ token, name: 'Sam', password: 'short' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.password).toMatch(/at least 12/);
    await guest.agent.get(`/api/invitations/${token}`).expect(200);
  });

  it('when an admin changes a role, then the user has the new role on their next request', async () => {
    const admin = await signIn(services.app, demoEmail('admin'));
    const reviewerTab = await signIn(services.app, demoEmail('reviewer'));
    expect((await reviewerTab.agent.post('/api/projects').set('X-CSRF-Token', reviewerTab.csrf).send({ name: 'P', jobNumber: 'J' })).status).toBe(403);
    const reviewer = await User.findOne({ where: { email: demoEmail('reviewer') } });
    const changed = await admin.agent.patch(`/api/users/${reviewer!.id}`).set('X-CSRF-Token', admin.csrf).send({ role: 'engineer' });
    expect(changed.body.role).toBe('engineer');
    expect((await reviewerTab.agent.post('/api/projects').set('X-CSRF-Token', reviewerTab.csrf).send({ name: 'P', jobNumber: 'J' })).status).toBe(201);
    await admin.agent.patch(`/api/users/${reviewer!.id}`).set('X-CSRF-Token', admin.csrf).send({ role: 'reviewer' }).expect(200);
  });

  it('when an admin tries to disable themself, then 409 and nothing changes', async () => {
    const admin = await signIn(services.app, demoEmail('admin'));
    const me = await User.findOne({ where: { email: demoEmail('admin') } });
    const res = await admin.agent.patch(`/api/users/${me!.id}`).set('X-CSRF-Token', admin.csrf).send({ disabled: true });
    expect(res.status).toBe(409);
    expect((await User.findByPk(me!.id))!.disabled).toBe(false);
  });
});
