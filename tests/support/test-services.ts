import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import type { Express } from 'express';
import { loadConfig, type Config } from '../../server/config';
import { startServices, type Services } from '../../server/bootstrap';
import type { ReviewDeps } from '../../server/app';
import type { SheetPrinter } from '../../server/modules/calc-sheets/sheet-printer';
import { DEMO_PASSWORD } from '../../server/seed/demo';

/** A temp data folder with a real SQLite file in it, for tests of concurrency and restarts. */
export function tempDataDir(): { dataDir: string; databaseStorage: string } {
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'panelpoint-data-'));
  return { dataDir, databaseStorage: path.join(dataDir, 'panelpoint.sqlite') };
}

/**
 * A full server with the demo data and a real SMTP sink: on an in-memory SQLite database, or
 * with `realFile: true` on a SQLite file in a fresh temp folder (pass `dataDir` and
 * `databaseStorage` in overrides to reopen the same file, as after a restart).
 */
export async function startTestServices(
  overrides: Partial<Config> = {},
  options: { review?: ReviewDeps; realFile?: boolean; printer?: SheetPrinter } = {},
): Promise<Services> {
  const config: Config = {
    ...loadConfig({ NODE_ENV: 'test' }),
    databaseStorage: ':memory:',
    ...(options.realFile ? tempDataDir() : {}),
    bcryptRounds: 4,
    publicUrl: 'http://panelpoint.test',
    uploadsDir: fs.mkdtempSync(path.join(os.tmpdir(), 'panelpoint-uploads-')),
    ...overrides,
  };
  return startServices(config, { log: () => {}, review: options.review, printer: options.printer });
}

export const demoEmail = (role: 'drafter' | 'engineer' | 'reviewer' | 'admin') => `${role}@demo.panelpoint.test`;

/** A cookie-keeping client with its CSRF token, like a browser tab. */
export interface Tab {
  agent: request.Agent;
  csrf: string;
}

/** `app` is the Express app, or the base URL of a listening server. */
export async function openTab(app: Express | string): Promise<Tab> {
  const agent = request.agent(app);
  const res = await agent.get('/api/session').expect(200);
  return { agent, csrf: res.body.csrfToken };
}

export async function signIn(app: Express | string, email: string, password = DEMO_PASSWORD): Promise<Tab> {
  const tab = await openTab(app);
  const res = await tab.agent.post('/api/session').set('X-CSRF-Token', tab.csrf).send({ email, password });
  if (res.status !== 200) throw new Error(`sign-in as ${email} failed: ${res.status} ${JSON.stringify(res.body)}`);
  return { agent: tab.agent, csrf: res.body.csrfToken };
}
