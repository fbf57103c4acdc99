import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import type { Sequelize } from 'sequelize';
import type { Config } from './config';
import { createApp, type CreatedApp, type ReviewDeps } from './app';
import { openDatabase } from './db/sequelize';
import { migrate } from './db/migrate';
import { initModels } from './db/models';
import { createMailer, type Mailer } from './mail/mailer';
import { startSmtpSink, type SmtpSink } from './mail/smtp-sink';
import { chromiumLeftoversSweep, type SheetPrinter } from './modules/calc-sheets/sheet-printer';
import { seedDemo } from './seed/demo';
import { firstAdminLink } from './modules/users/first-admin';
import { runsFailInterrupted } from './modules/runs/runs.service';
import { localFileStore } from './storage/file-store';

export interface Services extends CreatedApp {
  config: Config;
  sequelize: Sequelize;
  mailer: Mailer;
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
  if (config.env === 'production' && !config.publicUrl) {
    say('Warning: PUBLIC_URL is not set, so links in e-mails (invitations, review notices) point at http://localhost. Set PUBLIC_URL to the address people use, e.g. https://panelpoint.example.com.');
  }
  const sequelize = await openDatabase(config.databaseStorage);
  await migrate(sequelize);
  initModels(sequelize);
  fs.mkdirSync(config.uploadsDir, { recursive: true });
  await runsFailInterrupted();
  if (config.seedDemo) await seedDemo(config.bcryptRounds, localFileStore(config.uploadsDir));
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

  const sink = config.smtpUrl ? undefined : await startSmtpSink();
  const mailer = createMailer({ smtpUrl: config.smtpUrl, sinkPort: sink?.port, from: config.mailFrom });
  const created = createApp({
    config,
    sequelize,
    mailer,
    sessionSecret: sessionSecretFor(config),
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
    sink,
    async shutdown() {
      await created.close();
      await sink?.close();
      await sequelize.close();
    },
  };
}
