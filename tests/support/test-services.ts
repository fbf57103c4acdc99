import { User } from '../../server/db/models';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import type { Express } from 'express';
import type { Sequelize } from 'sequelize';
import { loadConfig, type Config } from '../../server/config';
import { startServices, type Services } from '../../server/bootstrap';
import type { ReviewDeps } from '../../server/app';
import type { SheetPrinter } from '../../server/modules/calc-sheets/sheet-printer';
import { DEMO_PASSWORD } from '../../server/seed/demo';
import { pgTestDatabaseCreate, pgTestsOn } from './pg';

/** A temp data folder with a real SQLite file in it, for tests of concurrency and restarts. */
export function tempDataDir(): { dataDir: string; databaseStorage: string } {
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'panelpoint-data-'));
  return { dataDir, databaseStorage: path.join(dataDir, 'panelpoint.sqlite') };
}

/** The PostgreSQL database of each test server's data folder, so a restart reopens it. */
const pgDatabaseOf = new Map<string, string>();

/**
 * A full server with the demo data and a real SMTP sink: on an in-memory SQLite database, or
 * with `realFile: true` on a SQLite file in a fresh temp folder (pass `dataDir` and
 * `databaseStorage` in overrides to reopen the same file, as after a restart).
 *
 * In the PostgreSQL run of the suite (tests/support/pg.ts) every fresh server gets a new
 * database of its own and a temp data folder instead; passing the `dataDir` of an earlier
 * server reopens that server's database, as a restart would.
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
  if (pgTestsOn() && !overrides.databaseUrl) {
    const reopen = overrides.dataDir ? pgDatabaseOf.get(overrides.dataDir) : undefined;
    Object.assign(config, overrides.dataDir ? {} : tempDataDir(), overrides, { databaseUrl: reopen ?? (await pgTestDatabaseCreate()) });
    pgDatabaseOf.set(config.dataDir, config.databaseUrl!);
  }
  return startServices(config, { log: () => {}, review: options.review, printer: options.printer });
}

/** DATABASE_URL for a child process (a command or a real server) that must open the same database. */
export function databaseEnv(services: Services): { DATABASE_URL?: string } {
  return services.config.databaseUrl ? { DATABASE_URL: services.config.databaseUrl } : {};
}

/**
 * Removes one of the issued-record guards, as someone with raw database access could, named by
 * its SQLite trigger. PostgreSQL holds each table's rules in one PL/pgSQL trigger (migration
 * 0007), which goes instead.
 */
export async function dropGuard(sequelize: Sequelize, sqliteTrigger: 'sheet_revision_events_no_update' | 'sheet_revisions_frozen_update'): Promise<void> {
  if (sequelize.getDialect() !== 'postgres') {
    await sequelize.query(`DROP TRIGGER ${sqliteTrigger}`);
    return;
  }
  const pg = { sheet_revision_events_no_update: 'pp_sheet_revision_events_guard ON sheet_revision_events', sheet_revisions_frozen_update: 'pp_sheet_revisions_guard ON sheet_revisions' };
  await sequelize.query(`DROP TRIGGER ${pg[sqliteTrigger]}`);
}

export const demoEmail = (role: 'drafter' | 'engineer' | 'reviewer' | 'admin') => `${role}@demo.panelpoint.test`;

/** The id of a demo account in the current test database (the checker tests choose on submitting is the demo reviewer). */
export async function demoUserId(role: 'drafter' | 'engineer' | 'reviewer' | 'admin' = 'reviewer'): Promise<number> {
  const user = await User.findOne({ attributes: ['id'], where: { email: demoEmail(role) } });
  if (!user) throw new Error(`no demo ${role} in the test database`);
  return user.id;
}

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
