import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Services } from '../../server/bootstrap';
import { demoEmail, signIn, startTestServices } from '../support/test-services';

let services: Services;
beforeAll(async () => {
  services = await startTestServices();
});
afterAll(async () => {
  await services.shutdown();
});

describe('projects', () => {
  it('when an engineer creates, renames and archives a project, then the list follows', async () => {
    const eng = await signIn(services.app, demoEmail('engineer'));
    const created = await eng.agent
      .post('/api/projects')
      .set('X-CSRF-Token', eng.csrf)
      .send({ name: 'Orchard Barn conversion', jobNumber: 'HV-2502', client: 'M. Ostler', site: 'Orchard Lane', unitSystem: 'US' });
    expect(created.status).toBe(201);
    expect(created.body).toMatchObject({ name: 'Orchard Barn conversion', unitSystem: 'US', archived: false, trussCount: 0 });
    const id = created.body.id;

    const renamed = await eng.agent.patch(`/api/projects/${id}`).set('X-CSRF-Token', eng.csrf).send({ name: 'Orchard Barn — loft conversion' });
    expect(renamed.body.name).toBe('Orchard Barn — loft conversion');

    await eng.agent.patch(`/api/projects/${id}`).set('X-CSRF-Token', eng.csrf).send({ archived: true }).expect(200);
    const active = await eng.agent.get('/api/projects').expect(200);
    expect(active.body.map((p: { id: number }) => p.id)).not.toContain(id);
    const all = await eng.agent.get('/api/projects?archived=include').expect(200);
    expect(all.body.find((p: { id: number }) => p.id === id).archived).toBe(true);
  });

  it('when a drafter adds a truss to the demo project, then the project counts it', async () => {
    const drafter = await signIn(services.app, demoEmail('drafter'));
    const before = (await drafter.agent.get('/api/projects/1')).body.trussCount;
    const truss = await drafter.agent.post('/api/projects/1/trusses').set('X-CSRF-Token', drafter.csrf).send({ name: 'T3 — canopy truss' });
    expect(truss.status).toBe(201);
    expect((await drafter.agent.get('/api/projects/1')).body.trussCount).toBe(before + 1);
    const list = await drafter.agent.get('/api/projects/1/trusses');
    expect(list.body.map((t: { name: string }) => t.name)).toContain('T3 — canopy truss');
    await drafter.agent.get(`/api/trusses/${truss.body.id}`).expect(200);
  });

  it('when a project or truss id does not exist or is not a number, then 404', async () => {
    const eng = await signIn(services.app, demoEmail('engineer'));
    expect((await eng.agent.get('/api/projects/4242')).status).toBe(404);
    expect((await eng.agent.get('/api/projects/abc')).status).toBe(404);
    expect((await eng.agent.get('/api/trusses/0')).status).toBe(404);
  });

  it('when an empty patch is sent, then 400 and nothing changes', async () => {
    const eng = await signIn(services.app, demoEmail('engineer'));
    const before = (await eng.agent.get('/api/projects/1')).body;
    const res = await eng.agent.patch('/api/projects/1').set('X-CSRF-Token', eng.csrf).send({});
    expect(res.status).toBe(400);
    expect((await eng.agent.get('/api/projects/1')).body.updatedAt).toBe(before.updatedAt);
  });

  it('when a truss is added to an archived project, then 409', async () => {
    const eng = await signIn(services.app, demoEmail('engineer'));
    const p = await eng.agent.post('/api/projects').set('X-CSRF-Token', eng.csrf).send({ name: 'Old shed', jobNumber: 'HV-1999' });
    await eng.agent.patch(`/api/projects/${p.body.id}`).set('X-CSRF-Token', eng.csrf).send({ archived: true }).expect(200);
    const res = await eng.agent.post(`/api/projects/${p.body.id}/trusses`).set('X-CSRF-Token', eng.csrf).send({ name: 'T1' });
    expect(res.status).toBe(409);
  });
});

describe('project updates change only what is sent', () => {
  it('when only the name is patched, then client, site and design basis keep their values', async () => {
    const eng = await signIn(services.app, demoEmail('engineer'));
    const before = (await eng.agent.get('/api/projects/1')).body;
    const res = await eng.agent.patch('/api/projects/1').set('X-CSRF-Token', eng.csrf).send({ name: 'Kestrel Logistics — roof (rev)' });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ client: before.client, site: before.site, designBasis: before.designBasis, unitSystem: before.unitSystem });
  });
});
