import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { Project, User } from '../../server/db/models';
import type { Services } from '../../server/bootstrap';
import { demoEmail, openTab, signIn, startTestServices } from '../support/test-services';

let services: Services;
beforeAll(async () => {
  services = await startTestServices();
});
afterAll(async () => {
  await services.shutdown();
});

describe('sign-in and sign-out', () => {
  it('when the demo engineer signs in, then the session names them and the cookie is replaced', async () => {
    const tab = await openTab(services.app);
    const before = await tab.agent.get('/api/session');
    const cookieBefore = before.headers['set-cookie']?.[0] ?? '';
    const res = await tab.agent.post('/api/session').set('X-CSRF-Token', tab.csrf).send({ email: demoEmail('engineer'), password: 'panelpoint-demo' });
    expect(res.status).toBe(200);
    expect(res.body.user).toMatchObject({ email: demoEmail('engineer'), role: 'engineer' });
    expect(res.body.user.passwordHash).toBeUndefined();
    // Session fixation: a new session id and a new CSRF token after sign-in.
    const cookieAfter = res.headers['set-cookie']?.[0] ?? '';
    expect(cookieAfter).toMatch(/^panelpoint\.sid=/);
    expect(cookieAfter.split(';')[0]).not.toBe(cookieBefore.split(';')[0]);
    expect(res.body.csrfToken).not.toBe(tab.csrf);
    const session = await tab.agent.get('/api/session');
    expect(session.body.user.email).toBe(demoEmail('engineer'));
  });

  it('when a signed-in user signs out, then the session is gone and reads are refused', async () => {
    const tab = await signIn(services.app, demoEmail('reviewer'));
    await tab.agent.get('/api/projects').expect(200);
    await tab.agent.delete('/api/session').set('X-CSRF-Token', tab.csrf).expect(204);
    const res = await tab.agent.get('/api/projects');
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe('not-signed-in');
  });

  it('when the password is wrong, then 401 with a clear message and no session user', async () => {
    const tab = await openTab(services.app);
    const res = await tab.agent.post('/api/session').set('X-CSRF-Token', tab.csrf).send({ email: demoEmail('engineer'), password: 'wrong-password' });
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe('bad-credentials');
    expect(res.body.error.message).toMatch(/do not match/);
    expect((await tab.agent.get('/api/session')).body.user).toBeNull();
  });

  it('when the e-mail is unknown, then the same 401 as a wrong password', async () => {
    const tab = await openTab(services.app);
    const res = await tab.agent.post('/api/session').set('X-CSRF-Token', tab.csrf).send({ email: 'nobody@demo.panelpoint.test', password: 'x' });
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe('bad-credentials');
  });

  it('when a disabled user signs in with the right password, then 403 account-disabled', async () => {
    const admin = await signIn(services.app, demoEmail('admin'));
    const drafter = await User.findOne({ where: { email: demoEmail('drafter') } });
    await admin.agent.patch(`/api/users/${drafter!.id}`).set('X-CSRF-Token', admin.csrf).send({ disabled: true }).expect(200);
    const tab = await openTab(services.app);
    const res = await tab.agent.post('/api/session').set('X-CSRF-Token', tab.csrf).send({ email: demoEmail('drafter'), password: 'panelpoint-demo' });
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('account-disabled');
    await admin.agent.patch(`/api/users/${drafter!.id}`).set('X-CSRF-Token', admin.csrf).send({ disabled: false }).expect(200);
  });

  it('when an already signed-in user is disabled, then their next request is refused', async () => {
    const admin = await signIn(services.app, demoEmail('admin'));
    const drafterTab = await signIn(services.app, demoEmail('drafter'));
    const drafter = await User.findOne({ where: { email: demoEmail('drafter') } });
    await admin.agent.patch(`/api/users/${drafter!.id}`).set('X-CSRF-Token', admin.csrf).send({ disabled: true }).expect(200);
    expect((await drafterTab.agent.get('/api/projects')).status).toBe(401);
    await admin.agent.patch(`/api/users/${drafter!.id}`).set('X-CSRF-Token', admin.csrf).send({ disabled: false }).expect(200);
  });
});

// The sign-in limits (per account, per address, in the database) are tested in signin-limits.test.ts.

describe('CSRF protection', () => {
  it('when a signed-in write comes without the CSRF token, then 403 and nothing is written', async () => {
    const tab = await signIn(services.app, demoEmail('engineer'));
    const count = await Project.count();
    const res = await tab.agent.post('/api/projects').send({ name: 'Forged', jobNumber: 'X-1' });
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('csrf-token-invalid');
    const wrong = await tab.agent.post('/api/projects').set('X-CSRF-Token', 'not-the-token').send({ name: 'Forged', jobNumber: 'X-1' });
    expect(wrong.status).toBe(403);
    expect(await Project.count()).toBe(count);
  });

  it('when sign-in is posted without a token, then it is refused (login CSRF)', async () => {
    const res = await request(services.app).post('/api/session').send({ email: demoEmail('engineer'), password: 'panelpoint-demo' });
    expect(res.status).toBe(403);
  });
});

describe('bad input gets a clear JSON error and writes nothing', () => {
  it('when the route does not exist, then 404 route-not-found', async () => {
    const tab = await signIn(services.app, demoEmail('engineer'));
    const res = await tab.agent.get('/api/no-such-thing');
    expect(res.status).toBe(404);
    expect(res.body.error).toMatchObject({ code: 'route-not-found' });
  });

  it('when the JSON body is malformed, then 400 malformed-json', async () => {
    const tab = await signIn(services.app, demoEmail('engineer'));
    const count = await Project.count();
    const res = await tab.agent.post('/api/projects').set('X-CSRF-Token', tab.csrf).set('Content-Type', 'application/json').send('{"name": "Half');
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('malformed-json');
    expect(res.text).not.toMatch(/at .*\.(ts|js):\d+/);
    expect(await Project.count()).toBe(count);
  });

  it('when a required field is missing, then 400 naming the field', async () => {
    const tab = await signIn(services.app, demoEmail('engineer'));
    const count = await Project.count();
    const res = await tab.agent.post('/api/projects').set('X-CSRF-Token', tab.csrf).send({ name: 'Roof over loading bay' });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation-failed');
    expect(res.body.error.fields.jobNumber).toBeTruthy();
    expect(await Project.count()).toBe(count);
  });

  it('when the body is larger than the limit, then 413 body-too-large', async () => {
    const tab = await signIn(services.app, demoEmail('engineer'));
    const count = await Project.count();
    const res = await tab.agent
      .post('/api/projects')
      .set('X-CSRF-Token', tab.csrf)
      .send({ name: 'Big', jobNumber: 'B-1', designBasis: 'x'.repeat(1_200_000) });
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('body-too-large');
    expect(await Project.count()).toBe(count);
  });

  it('when the role may not do it, then 403 forbidden naming the roles that may', async () => {
    const tab = await signIn(services.app, demoEmail('reviewer'));
    const count = await Project.count();
    const res = await tab.agent.post('/api/projects').set('X-CSRF-Token', tab.csrf).send({ name: 'No', jobNumber: 'N-1' });
    expect(res.status).toBe(403);
    expect(res.body.error.message).toMatch(/engineer or admin/);
    expect(await Project.count()).toBe(count);
  });
});
