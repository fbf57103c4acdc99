import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Services } from '../../server/bootstrap';
import { DEMO_PASSWORD } from '../../server/seed/demo';
import { demoEmail, openTab, signIn, startTestServices } from '../support/test-services';

// Sessions on a real SQLite file: a row only for someone signed in, rewritten only when it changes.
let services: Services;
let dataDir: string;

beforeAll(async () => {
  dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'pp-sessions-'));
  services = await startTestServices({ dataDir, databaseStorage: path.join(dataDir, 'panelpoint.sqlite'), uploadsDir: path.join(dataDir, 'uploads') });
});
afterAll(async () => {
  await services.shutdown();
  fs.rmSync(dataDir, { recursive: true, force: true });
});

const rows = async () =>
  services.sequelize.query<{ sid: string; expires: string; updatedAt: string }>('SELECT sid, expires, "updatedAt" FROM "Sessions"', { type: QueryTypes.SELECT });

describe('sessions', () => {
  it('a visitor who is not signed in stores no session, however often the page is loaded', async () => {
    const before = (await rows()).length;
    for (let i = 0; i < 40; i++) await request(services.app).get('/api/session').expect(200);
    const tab = await openTab(services.app);
    for (let i = 0; i < 10; i++) await tab.agent.get('/api/session').expect(200);
    expect((await rows()).length).toBe(before);
  });

  it('the visitor token works for signing in, and only with the visitor cookie it came from', async () => {
    const a = await openTab(services.app);
    const b = await openTab(services.app);
    expect(a.csrf).not.toBe(b.csrf);
    // b's token with a's cookie: refused, nothing stored.
    await a.agent.post('/api/session').set('X-CSRF-Token', b.csrf).send({ email: demoEmail('engineer'), password: DEMO_PASSWORD }).expect(403);
    await request(services.app).post('/api/session').set('X-CSRF-Token', a.csrf).send({ email: demoEmail('engineer'), password: DEMO_PASSWORD }).expect(403);
    const before = (await rows()).length;
    const res = await a.agent.post('/api/session').set('X-CSRF-Token', a.csrf).send({ email: demoEmail('engineer'), password: DEMO_PASSWORD }).expect(200);
    expect(res.body.user.role).toBe('engineer');
    expect((await rows()).length).toBe(before + 1);
    // The signed-in token from the answer is the one writes need now.
    await a.agent.post('/api/projects').set('X-CSRF-Token', res.body.csrfToken).send({ jobNumber: 'S-1', name: 'Session test', client: 'Invented' }).expect(201);
  });

  it('a signed-in person reading pages does not rewrite their session row on every request', async () => {
    const tab = await signIn(services.app, demoEmail('reviewer'));
    await tab.agent.get('/api/projects').expect(200); // the first request after sign-in may move the expiry on
    const snapshot = JSON.stringify(await rows());
    for (let i = 0; i < 30; i++) await tab.agent.get('/api/projects').expect(200);
    expect(JSON.stringify(await rows())).toBe(snapshot);
  });
});
