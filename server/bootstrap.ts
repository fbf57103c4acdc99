import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import type { Sequelize } from 'sequelize';
import { publicUrlRequired, type Config } from './config';
import { createApp, type CreatedApp, type ReviewDeps } from './app';
import { openDatabase } from './db/sequelize';
import { migrate } from './db/migrate';
import { withStartLock } from './db/start-lock';
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

/**
 * The secret that signs session cookies and derives signed-out visitors' CSRF tokens
 * (middleware/csrf.ts). Every server process behind one address must hold the same one, or a
 * cookie set by one is refused by the other: SESSION_SECRET when given (the same value for
 * every process), else the file `session-secret` in DATA_DIR, made once by whichever process
 * starts first and read by every later start (processes sharing DATA_DIR share it). A random
 * secret per start is used only for a :memory: database, which no second process can share.
 * The file is written under a temporary name and hard-linked into place, so a process starting
 * at the same moment either makes it or reads the complete file the other made, never a half
 * written or second secret.
 */
export function sessionSecretFor(config: Pick<Config, 'sessionSecret' | 'databaseStorage' | 'dataDir'>): string {
  if (config.sessionSecret) return config.sessionSecret;
  if (config.databaseStorage === ':memory:') return crypto.randomBytes(32).toString('hex');
  const file = path.join(config.dataDir, 'session-secret');
  if (!fs.existsSync(file)) {
    fs.mkdirSync(config.dataDir, { recursive: true, mode: 0o700 });
    const temp = `${file}.${process.pid}.${crypto.randomBytes(4).toString('hex')}.part`;
    fs.writeFileSync(temp, crypto.randomBytes(32).toString('hex'), { mode: 0o600, flag: 'wx' });
    try {
      fs.linkSync(temp, file);
    } catch (err) {
      // Another process made it first: use theirs.
      if ((err as NodeJS.ErrnoException).code !== 'EEXIST') throw err;
    } finally {
      fs.rmSync(temp, { force: true });
    }
  }
  const secret = fs.readFileSync(file, 'utf8').trim();
  if (secret.length < 16) throw new Error(`Configuration: the session secret file ${file} holds fewer than 16 characters; delete it to have a new one made (everyone is signed out), or set SESSION_SECRET.`);
  return secret;
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
  const dataDirOrMemory = config.databaseStorage === ':memory:' ? null : config.dataDir;
  // Everything from the migrations to the first admin's link runs under the start lock, so
  // processes started together on one PostgreSQL database take turns (db/start-lock.ts). Any
  // failure closes the database and the store before it is passed on: nothing half-started.
  let signingKeys: SigningKeys;
  let sessionSecret: string;
  let queue: JobQueue | undefined;
  try {
    ({ signingKeys, sessionSecret } = await withStartLock(sequelize, async () => {
      await migrate(sequelize);
      initModels(sequelize);
      // The local folders (none on an object store): 0700, files 0600, including files an older
      // version wrote with the default mode. The issued-sheets folder is made at its first write.
      if (stores.kind === 'local') fs.mkdirSync(config.uploadsDir, { recursive: true, mode: 0o700 });
      if (dataDirOrMemory) {
        const tightened = await tightenModes([config.dataDir, ...stores.folders]);
        if (tightened) say(`Made ${tightened} file(s) and folder(s) in the data and uploads folders readable by this user only (files 0600, folders 0700).`);
      } else if (stores.kind === 'local') {
        await tightenModes([config.uploadsDir]);
      }
      // The audit key (a file beside the signing key), before anything writes an audit line: a keyed
      // log whose key file is missing or replaced refuses the start with one sentence.
      await auditKeyOpen(sequelize, { dataDir: dataDirOrMemory });
      // The job queue: pg-boss's schema on the same PostgreSQL server, or this process.
      queue = config.databaseUrl && config.jobQueue === 'pg-boss'
        ? await pgBossQueueOpen(config.databaseUrl, { log: options.log, application: 'panelpoint-app' })
        : inProcessQueueCreate({ log: options.log });
      // Runs left unfinished by a stopped server can never finish with the in-process queue; a
      // durable queue (pg-boss) keeps their jobs, and another process may be solving them now.
      if (!queue.durable) await runsFailInterrupted();
      await sweepLeftovers(stores, say);
      if (config.seedDemo) await seedDemo(config.bcryptRounds, stores.drawings);
      // Refuses to start (one sentence naming the file and how to restore it) when issued sheets
      // exist and the key file is missing or holds another key; never silently makes a new one.
      const keys = await signingKeysOpen(sequelize, { dataDir: dataDirOrMemory });
      await auditChainSealExisting(sequelize);
      const firstLink = config.env !== 'production' ? null : await firstAdminLink({
        email: config.firstAdminEmail ?? 'admin@panelpoint.local',
        publicUrl: config.publicUrl ?? `http://localhost:${config.port}`,
      });
      if (firstLink?.kind === 'made') {
        say(
          `No account has a password yet. Open this one-time link within 24 hours to choose the first admin's password (a later start of any server process on this database makes a new one and this one stops working, unless it is under two minutes old): ${firstLink.link}`,
        );
      } else if (firstLink?.kind === 'recent') {
        say(
          `No account has a password yet. Another server process printed the first admin's one-time link at ${firstLink.madeAt.toISOString()} (in its log); this start made no new one, so that link still works.`,
        );
      }
      return { signingKeys: keys, sessionSecret: sessionSecretFor(config) };
    }));
  } catch (err) {
    await queue?.close().catch(() => {});
    await sequelize.close().catch(() => {});
    stores.close();
    throw err;
  }
  const jobQueue: JobQueue = queue!;
  const sweeper = setInterval(() => {
    sweepLeftovers(stores, say).catch((err) => say(`Sweeping left-over uploads failed: ${err instanceof Error ? err.message : String(err)}`));
  }, SWEEP_EVERY_MS);
  sweeper.unref();

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
    sessionSecret,
    signingKeys,
    stores,
    queue: jobQueue,
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
    queue: jobQueue,
    sink,
    async shutdown() {
      clearInterval(sweeper);
      // First stop taking jobs (pg-boss waits a few seconds for the ones running here), then the rest.
      await jobQueue.close();
      await created.close();
      await sink?.close();
      await sequelize.close();
      stores.close();
    },
  };
}
