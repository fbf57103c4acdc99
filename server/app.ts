import fs from 'node:fs';
import path from 'node:path';
import express, { type Express } from 'express';
import session from 'express-session';
import helmet from 'helmet';
import ConnectSessionSequelize from 'connect-session-sequelize';
import type { Sequelize } from 'sequelize';
import { readRows } from './db/read-rows';
import type { Config } from './config';
import type { Mailer } from './mail/mailer';
import type { RouteSpec } from './middleware/access';
import { createCsrf } from './middleware/csrf';
import { errorHandler, notFoundHandler } from './middleware/error-handler';
import { createPassport } from './modules/auth/passport';
import { authRoutes } from './modules/auth/auth.routes';
import { signInLimiterCreate } from './modules/auth/signin-limiter';
import { addressLimiterCreate } from './modules/auth/request-limiter';
import { usersRoutes } from './modules/users/users.routes';
import { myWorkRoutes } from './modules/my-work/my-work.routes';
import { firmRoutes } from './modules/firm/firm.routes';
import { outboxRoutes } from './modules/outbox/outbox.routes';
import { projectsRoutes } from './modules/projects/projects.routes';
import { drawingsRoutes } from './modules/drawings/drawings.routes';
import { modelsRoutes } from './modules/models/models.routes';
import { jobFilesRoutes } from './modules/job-files/job-files.routes';
import { takeoffRoutes } from './modules/takeoff/takeoff.routes';
import { runsRoutes } from './modules/runs/runs.routes';
import { importPoolCreate } from './modules/drawings/import-pool';
import type { FileStores } from './storage/stores';
import { createSheetPrinter, type SheetPrinter } from './modules/calc-sheets/sheet-printer';
import { calcSheetsRoutes } from './modules/calc-sheets/calc-sheets.routes';
import { sheetBuildPoolCreate } from './modules/calc-sheets/sheet-build-pool';
import { previewHoldsInProcess, previewHoldsPostgres } from './modules/calc-sheets/preview-holds';
import { JOB_TRIES, printJobsCreate } from './modules/calc-sheets/print-jobs.service';
import { loadRunSheet } from './modules/calc-sheets/run-sheet.service';
import { sheetRevisionsRoutes } from './modules/sheet-revisions/sheet-revisions.routes';
import { analysisRunsTable, type RunSource, type SheetRenderer } from './modules/sheet-revisions/sheet-renderer';
import { calcSheetRenderer } from './modules/sheet-revisions/calc-sheet-renderer';
import { recordsRoutes } from './modules/records/records.routes';
import type { SigningKeys } from './modules/records/signing-keys';
import type { JobQueue } from './workers/job-queue';
import { jobWorkersStart, type JobWorkers } from './job-workers';

export interface AppDeps {
  config: Config;
  sequelize: Sequelize;
  mailer: Mailer;
  sessionSecret: string;
  /** The firm's signing keys, opened at start (bootstrap.ts: signingKeysOpen). */
  signingKeys: SigningKeys;
  /** Where drawings, issued sheets and print jobs' PDFs are kept (bootstrap.ts: fileStoresOpen, as STORAGE_URL says). */
  stores: Pick<FileStores, 'drawings' | 'sheets' | 'printJobs'>;
  /** Where analysis runs and print jobs are queued (bootstrap.ts: in this process, or pg-boss with DATABASE_URL). */
  queue: JobQueue;
  /** Where the built client lives; served when present. */
  clientDir?: string;
  log?: (msg: string, err?: unknown) => void;
  review?: ReviewDeps;
  /** Prints calc sheets; default: one shared Chromium through puppeteer-core. */
  printer?: SheetPrinter;
}

/** What the check-and-issue routes take from outside; each has a default. */
export interface ReviewDeps {
  /** Prints a run's calc sheet; default: the real calc sheet through the app's printer. */
  renderer?: SheetRenderer;
  /** Finds analysis runs; default: the analysis_runs table. */
  runs?: RunSource;
}

export interface CreatedApp {
  app: Express;
  /** Every API route with who may call it. */
  routes: RouteSpec[];
  /** Stops the session sweeper, the solver and import workers and the sheet printer's browser. */
  close(): Promise<void>;
}

/** Builds the Express app without listening, so tests can drive it with supertest. */
export function createApp(deps: AppDeps): CreatedApp {
  const { config } = deps;
  const log = deps.log ?? ((msg, err) => console.error(msg, err));
  const registry: RouteSpec[] = [];
  const app = express();
  app.disable('x-powered-by');
  // No ETag on API answers: express hashes every body it sends (SHA-1 of the whole JSON). A
  // browser revalidating with If-None-Match gets a 304 instead of a few kB on the office network,
  // but the server has built, read and serialised the whole answer by then, so it saves no work
  // here; the hash is pure cost per request (bench:api). Static files keep theirs (serve-static
  // and sendFile make their own from size and time).
  app.set('etag', false);
  // X-Forwarded-For is believed only when the operator says a proxy sits in front (TRUST_PROXY):
  // otherwise anyone on the machine could claim any address to the sign-in limiter.
  app.set('trust proxy', config.trustProxy ?? false);

  // Over plain HTTP (an office server at http://panelpoint.lan) the browser must not be told
  // to upgrade every request to HTTPS, or the app is a blank page; HSTS likewise only on HTTPS.
  const overHttps = Boolean(config.publicUrl?.startsWith('https://'));
  app.use(
    helmet({
      strictTransportSecurity: overHttps,
      contentSecurityPolicy: {
        directives: {
          'upgrade-insecure-requests': overHttps ? [] : null,
          // KaTeX and the calc-sheet preview set inline styles.
          'style-src': ["'self'", "'unsafe-inline'"],
          'img-src': ["'self'", 'data:', 'blob:'],
          'font-src': ["'self'", 'data:'],
          'frame-src': ["'self'"],
        },
      },
    }),
  );

  const SequelizeStore = ConnectSessionSequelize(session.Store);
  const store = new SequelizeStore({ db: deps.sequelize, checkExpirationInterval: 15 * 60 * 1000, expiration: 12 * 3600 * 1000 });
  // express-session touches the stored row on every request it does not save; the expiry is
  // moved on by extendSignedInSession below instead, at most every few minutes.
  (store as unknown as { touch: (sid: string, sess: unknown, cb?: () => void) => void }).touch = (_sid, _sess, cb) => cb?.();
  // Every request reads its session: the data column in one hand-written query, not a model
  // finder (which builds the query, clones its options and, on SQLite, first asks the table's
  // column types in a second round trip), and on SQLite past Sequelize's query path (readRows;
  // bench:api, CPU per request).
  const sessionTable = (store as unknown as { sessionModel: import('sequelize').ModelStatic<import('sequelize').Model> }).sessionModel.getTableName() as string;
  const sessionSql = `SELECT "data" FROM "${sessionTable}" WHERE "sid" = :sid`;
  (store as unknown as { get: (sid: string, cb: (err: unknown, s?: unknown) => void) => void }).get = (sid, cb) => {
    readRows<{ data: string }>(deps.sequelize, sessionSql, { sid }).then((rows) => cb(null, rows[0] ? JSON.parse(rows[0].data) : null), (err) => cb(err));
  };
  const secure = overHttps;
  app.use(
    '/api',
    session({
      name: 'panelpoint.sid',
      secret: deps.sessionSecret,
      store,
      resave: false,
      saveUninitialized: false,
      rolling: false,
      cookie: { httpOnly: true, sameSite: 'lax', secure, maxAge: 12 * 3600 * 1000 },
    }),
  );
  const passport = createPassport();
  // compat: false skips req._passport, which only strategies written for passport 0.4 read.
  app.use('/api', passport.initialize({ compat: false }), passport.session());
  app.use('/api', extendSignedInSession);
  const csrf = createCsrf(deps.sessionSecret, secure);
  app.use('/api', csrf.protection);
  app.use('/api', express.json({ limit: '1mb' }));

  const publicUrl = () => config.publicUrl ?? `http://localhost:${config.port}`;
  const signInLimiter = signInLimiterCreate(deps.sequelize, {
    accountLimit: config.signInAccountLimit,
    addressLimit: config.signInAddressLimit,
    windowMs: config.signInRateWindowMs,
  });
  app.use('/api', authRoutes(registry, passport, config, csrf.tokenFor, signInLimiter, { mailer: deps.mailer, publicUrl, log }));
  app.use('/api', usersRoutes(registry, { mailer: deps.mailer, publicUrl }));
  app.use('/api', myWorkRoutes(registry));
  app.use('/api', firmRoutes(registry));
  app.use('/api', outboxRoutes(registry));
  app.use('/api', projectsRoutes(registry));
  const uploads = deps.stores.drawings;
  // Drawings are parsed and imported in a worker thread with a time limit, so a hostile file
  // cannot hold the main thread (and everyone's requests) while it explodes.
  const importPool = importPoolCreate({ size: config.importWorkers, memoryMb: config.importMemoryMb });
  app.use('/api', drawingsRoutes(registry, { store: uploads, pool: importPool, maxUploadBytes: config.maxUploadBytes }));
  app.use('/api', modelsRoutes(registry));
  app.use('/api', jobFilesRoutes(registry));
  app.use('/api', takeoffRoutes(registry));
  app.use('/api', runsRoutes(registry, { queue: deps.queue, log }));
  // One Chromium for the app, started on the first print and shared by every request.
  const printer = deps.printer ?? createSheetPrinter({ chromiumPath: config.chromiumPath });
  // Calc sheet HTML is built in a worker thread (seconds for a large sheet), never on this one.
  const sheetBuilder = sheetBuildPoolCreate();
  // Draft PDFs as background print jobs, stored like issued sheets (the print-jobs store).
  const printJobs = printJobsCreate({ sequelize: deps.sequelize, queue: deps.queue, files: deps.stores.printJobs, log });
  // This process solves runs and prints jobs: always with the in-process queue; with pg-boss
  // unless WORKERS_IN_APP=false leaves it to `npm run worker` processes.
  const workers: Promise<JobWorkers | null> =
    deps.queue.kind === 'in-process' || config.workersInApp
      ? jobWorkersStart({ queue: deps.queue, printJobs, printer, builder: sheetBuilder, chromiumPath: config.chromiumPath, log }).catch((err) => {
          log('This process could not start taking runs and print jobs from the queue', err);
          return null;
        })
      : Promise.resolve(null);
  printJobs.resume().then(
    ({ requeued, failed }) => {
      if (requeued || failed) log(`Print jobs left unfinished by the last stop: ${requeued} queued again, ${failed} failed after ${JOB_TRIES} tries.`);
    },
    (err) => log('Print jobs could not be resumed', err),
  );
  // Quick draft PDFs per person, counted in PostgreSQL's lock table when app processes share a database.
  const holds = deps.queue.kind === 'pg-boss' && config.databaseUrl ? previewHoldsPostgres(config.databaseUrl) : previewHoldsInProcess();
  app.use('/api', calcSheetsRoutes(registry, { printer, builder: sheetBuilder, jobs: printJobs, holds }));
  const issuedSheets = deps.stores.sheets;
  app.use(
    '/api',
    sheetRevisionsRoutes(registry, {
      mailer: deps.mailer,
      publicUrl,
      renderer: deps.review?.renderer ?? calcSheetRenderer({ printer, loadRunSheet, builder: sheetBuilder }),
      runs: deps.review?.runs ?? analysisRunsTable(deps.sequelize),
      keys: deps.signingKeys,
      sheets: issuedSheets,
      log,
    }),
  );
  const verifyLimiter = addressLimiterCreate(deps.sequelize, {
    prefix: 'verify',
    limit: config.verifyAddressLimit,
    windowMs: config.verifyRateWindowMs,
    what: 'verify requests',
  });
  app.use(
    '/api',
    recordsRoutes(registry, { keys: deps.signingKeys, sheets: issuedSheets, maxVerifyBytes: config.maxUploadBytes, publicLimit: verifyLimiter.middleware }),
  );
  app.use('/api', notFoundHandler);

  if (deps.clientDir && fs.existsSync(path.join(deps.clientDir, 'index.html'))) {
    const clientDir = deps.clientDir;
    app.use(express.static(clientDir, { index: false, maxAge: '1h' }));
    app.get('/{*rest}', (_req, res) => res.sendFile(path.join(clientDir, 'index.html')));
  }
  app.use(errorHandler(log));

  return {
    app,
    routes: registry,
    async close() {
      (store as unknown as { stopExpiringSessions(): void }).stopExpiringSessions();
      await printJobs.close();
      await (await workers)?.close();
      await holds.close();
      await importPool.close();
      await sheetBuilder.close();
      if (!deps.printer) await printer.close();
      await printJobs.idle();
    },
  };
}

declare module 'express-session' {
  interface SessionData {
    /** When the session's expiry was last moved on (ms since epoch). */
    seenAt?: number;
  }
}

const EXTEND_EVERY_MS = 5 * 60 * 1000;

/**
 * A signed-in session stays alive while it is used, but its row is rewritten at most every
 * five minutes (marking it modified saves it and re-sends the cookie with a new expiry), not on
 * every request.
 */
const extendSignedInSession: express.RequestHandler = (req, _res, next) => {
  const s = req.session as (typeof req.session & { passport?: { user?: unknown } }) | undefined;
  if (s?.passport?.user && Date.now() - (s.seenAt ?? 0) > EXTEND_EVERY_MS) {
    s.seenAt = Date.now();
    s.touch();
  }
  next();
};
