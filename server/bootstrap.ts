import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import type { Sequelize } from 'sequelize';
import { publicUrlRequired, type Config } from './config';
import { createApp, type CreatedApp, type ReviewDeps } from './app';
import { openDatabase } from './db/sequelize';
import { migrate } from './db/migrate';
import { Drawing, initModels } from './db/models';
import { createMailer, type Mailer } from './mail/mailer';
import { startSmtpSink, type SmtpSink } from './mail/smtp-sink';
import { chromiumLeftoversSweep, type SheetPrinter } from './modules/calc-sheets/sheet-printer';
import { seedDemo } from './seed/demo';
import { firstAdminLink } from './modules/users/first-admin';
import { runsFailInterrupted } from './modules/runs/runs.service';
import type { FileStore } from './storage/file-store';
import { fileStoresOpen, type FileStores } from './storage/stores';
import { signingKeysOpen, type SigningKeys } from './modules/records/signing-keys';
import { auditChainSealExisting, auditKeyOpen } from './modules/records/audit-chain';
import { sweepOrphans, tightenModes } from './storage/file-hygiene';
import { inProcessQueueCreate, pgBossQueueOpen, type JobQueue } from './workers/job-queue';

/** An unreferenced upload younger than this may be another process's request in flight. */
export const ORPHAN_GRACE_MS = 60 * 60 * 1000;
const SWEEP_EVERY_MS = 60 * 60 * 1000;

/**
 * Removes uploads no drawing row names (left by a request that died between the store's write
 * and the row) and `.part` files of interrupted writes, among the drawings and the issued
 * sheets, in the local folders or the object store alike. Issued sheets are never swept by
 * row: a stored sheet is only ever removed by hand.
 */
export async function sweepLeftovers(stores: Pick<FileStores, 'drawings' | 'sheets'>, say: (m: string) => void, graceMs = ORPHAN_GRACE_MS): Promise<string[]> {
  const drawings = new Set((await Drawing.findAll({ attributes: ['storedName'], raw: true })).map((d) => d.storedName));
  const uploads = await sweepOrphans({ store: stores.drawings, isReferenced: (n) => drawings.has(n), graceMs });
  const sheets = await sweepOrphans({ store: stores.sheets, isReferenced: (n) => !n.endsWith('.part'), graceMs });
  const at = (store: FileStore, key: string) => (store.where.endsWith('/') ? `${store.where}${key}` : path.join(store.where, key));
  const removed = [...uploads.removed.map((n) => at(stores.drawings, n)), ...sheets.removed.map((n) => at(stores.sheets, n))];
  if (removed.length) say(`Removed ${removed.length} file(s) left behind by interrupted uploads or writes: ${removed.join(', ')}`);
  const kept = uploads.kept.length + sheets.kept.length;
  if (kept) say(`Kept ${kept} unreferenced upload(s) younger than ${Math.round(graceMs / 60000)} minutes for now (perhaps another server process's upload in progress); the next sweep looks again.`);
  return removed;
}

export interface Services extends CreatedApp {
  config: Config;
  sequelize: Sequelize;
  mailer: Mailer;
  signingKeys: SigningKeys;
  /** Where drawings and issued sheets are kept. */
  stores: FileStores;
  /** Where runs and print jobs are queued. */
  queue: JobQueue;
  sink?: SmtpSink;
  shutdown(): Promise<void>;
}

/** Kept in the data folder so sessions survive a restart without a configured secret. */
function sessionSecretFor(config: Config): string {
  if (config.sessionSecret) return config.sessionSecret;
  if (config.databaseStorage === ':memory:') return crypto.randomBytes(32).toString('hex');
  const file = path.join(config.dataDir, 'session-secret');
  if (!fs.existsSync(file)) {
    fs.mkdirSync(config.dataDir, { recursive: true });
    fs.writeFileSync(file, crypto.randomBytes(32).toString('hex'), { mode: 0o600 });
  }
  return fs.readFileSync(file, 'utf8').trim();
}

/** Opens the database, runs migrations, seeds the demo, starts the mail route, builds the app. */
export async function startServices(config: Config, options: { clientDir?: string; log?: (m: string, e?: unknown) => void; review?: ReviewDeps; printer?: SheetPrinter } = {}): Promise<Services> {
  const say = options.log ?? ((m: string) => console.log(m));
  // Before anything is opened or written: e-mailed links need the address people use.
  publicUrlRequired(config);
  // tsx turns source maps on; production turns them off again (see SOURCE_MAPS in config.ts).
  process.setSourceMapsEnabled(config.sourceMaps);
  // First, before anything is written: an object store that is not there, or refuses the
  // credentials, stops the start with one sentence naming the variable (HeadBucket).
  const stores = await fileStoresOpen(config);
  let sequelize: Sequelize;
  try {
    sequelize = await openDatabase(config.databaseUrl ?? config.databaseStorage);
  } catch (err) {
    stores.close();
    throw err;
  }
  await migrate(sequelize);
  initModels(sequelize);
  // The local folders (none on an object store): 0700, files 0600, including files an older
  // version wrote with the default mode. The issued-sheets folder is made at its first write.
  if (stores.kind === 'local') fs.mkdirSync(config.uploadsDir, { recursive: true, mode: 0o700 });
  if (config.databaseStorage !== ':memory:') {
    const tightened = await tightenModes([config.dataDir, ...stores.folders]);
    if (tightened) say(`Made ${tightened} file(s) and folder(s) in the data and uploads folders readable by this user only (files 0600, folders 0700).`);
  } else if (stores.kind === 'local') {
    await tightenModes([config.uploadsDir]);
  }
  // The audit key (a file beside the signing key), before anything writes an audit line: a keyed
  // log whose key file is missing or replaced refuses the start with one sentence.
  try {
    await auditKeyOpen(sequelize, { dataDir: config.databaseStorage === ':memory:' ? null : config.dataDir });
  } catch (err) {
    await sequelize.close();
    stores.close();
    throw err;
  }
  // The job queue: pg-boss's schema on the same PostgreSQL server, or this process.
  let queue: JobQueue;
  try {
    queue = config.databaseUrl && config.jobQueue === 'pg-boss'
      ? await pgBossQueueOpen(config.databaseUrl, { log: options.log, application: 'panelpoint-app' })
      : inProcessQueueCreate({ log: options.log });
  } catch (err) {
    await sequelize.close();
    stores.close();
    throw err;
  }
  // Runs left unfinished by a stopped server can never finish with the in-process queue; a
  // durable queue (pg-boss) keeps their jobs, and another process may be solving them now.
  if (!queue.durable) await runsFailInterrupted();
  await sweepLeftovers(stores, say);
  const sweeper = setInterval(() => {
    sweepLeftovers(stores, say).catch((err) => say(`Sweeping left-over uploads failed: ${err instanceof Error ? err.message : String(err)}`));
  }, SWEEP_EVERY_MS);
  sweeper.unref();
  if (config.seedDemo) await seedDemo(config.bcryptRounds, stores.drawings);
  // Refuses to start (one sentence naming the file and how to restore it) when issued sheets
  // exist and the key file is missing or holds another key; never silently makes a new one.
  let signingKeys;
  try {
    signingKeys = await signingKeysOpen(sequelize, { dataDir: config.databaseStorage === ':memory:' ? null : config.dataDir });
  } catch (err) {
    await queue.close();
    await sequelize.close();
    stores.close();
    throw err;
  }
  await auditChainSealExisting(sequelize);
  const firstLink = config.env !== 'production' ? null : await firstAdminLink({
    email: config.firstAdminEmail ?? 'admin@panelpoint.local',
    publicUrl: config.publicUrl ?? `http://localhost:${config.port}`,
  });
  if (firstLink) {
    say(`No account has a password yet. Open this one-time link within 24 hours to choose the first admin's password (it changes at every start until used): ${firstLink}`);
  }

  // Chromium and profile folders left by a server that died without closing its printer (kill -9).
  const swept = chromiumLeftoversSweep();
  if (swept.killed.length || swept.removed.length) {
    say(`Ended ${swept.killed.length} Chromium process(es) and removed ${swept.removed.length} browser profile folder(s) left by an earlier Panelpoint server that did not shut down cleanly.`);
  }

  const sink = config.smtpUrl ? undefined : await startSmtpSink({ sender: config.mailFrom });
  const mailer = createMailer({ smtpUrl: config.smtpUrl, sinkPort: sink?.port, sinkAuth: sink?.auth, from: config.mailFrom });
  const created = createApp({
    config,
    sequelize,
    mailer,
    sessionSecret: sessionSecretFor(config),
    signingKeys,
    stores,
    queue,
    clientDir: options.clientDir,
    log: options.log,
    review: options.review,
    printer: options.printer,
  });
  return {
    ...created,
    config,
    sequelize,
    mailer,
    signingKeys,
    stores,
    queue,
    sink,
    async shutdown() {
      clearInterval(sweeper);
      // First stop taking jobs (pg-boss waits a few seconds for the ones running here), then the rest.
      await queue.close();
      await created.close();
      await sink?.close();
      await sequelize.close();
      stores.close();
    },
  };
}
