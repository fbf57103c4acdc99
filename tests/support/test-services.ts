import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import type { Express } from 'express';
import { loadConfig, type Config } from '../../server/config';
import { startServices, type Services } from '../../server/bootstrap';
import type { ReviewDeps } from '../../server/app';
import { DEMO_PASSWORD } from '../../server/seed/demo';

/** A full server on an in-memory SQLite database with the demo data and a real SMTP sink. */
export async function startTestServices(overrides: Partial<Config> = {}, options: { review?: ReviewDeps } = {}): Promise<Services> {
  const config: Config = {
    ...loadConfig({ NODE_ENV: 'test' }),
    databaseStorage: ':memory:',
    bcryptRounds: 4,
    publicUrl: 'http://panelpoint.test',
    uploadsDir: fs.mkdtempSync(path.join(os.tmpdir(), 'panelpoint-uploads-')),
    ...overrides,
  };
  return startServices(config, { log: () => {}, review: options.review });
}

export const demoEmail = (role: 'drafter' | 'engineer' | 'reviewer' | 'admin') => `${role}@demo.panelpoint.test`;

/** A cookie-keeping client with its CSRF token, like a browser tab. */
export interface Tab {
  agent: request.Agent;
  csrf: string;
}

export async function openTab(app: Express): Promise<Tab> {
  const agent = request.agent(app);
  const res = await agent.get('/api/session').expect(200);
  return { agent, csrf: res.body.csrfToken };
}

export async function signIn(app: Express, email: string, password = DEMO_PASSWORD): Promise<Tab> {
  const tab = await openTab(app);
  const res = await tab.agent.post('/api/session').set('X-CSRF-Token', tab.csrf).send({ email, password });
  if (res.status !== 200) throw new Error(`sign-in as ${email} failed: ${res.status} ${JSON.stringify(res.body)}`);
  return { agent: tab.agent, csrf: res.body.csrfToken };
}
