import { Umzug, SequelizeStorage } from 'umzug';
import type { Sequelize } from 'sequelize';
import * as m0001 from './migrations/0001-initial';
import * as m0002 from './migrations/0002-drawings-and-models';
import * as m0003 from './migrations/0003-analysis-runs';
import * as m0004 from './migrations/0004-sheet-revisions';
import * as m0005 from './migrations/0005-password-resets';
import * as m0006 from './migrations/0006-signin-limits';
import * as m0007 from './migrations/0007-signing-keys-and-record-guards';
import * as m0008 from './migrations/0008-import-limits';
import * as m0011 from './migrations/0011-print-jobs';
import * as m0014 from './migrations/0014-run-numbers';
import * as m0015 from './migrations/0015-email-settings';
import * as m0016 from './migrations/0016-audit-chain-head';
import * as m0017 from './migrations/0017-sheet-checker';

/** Every migration, in order. Add new ones at the end; never edit one that has shipped. */
const MIGRATIONS = [
  { name: '0001-initial', ...m0001 },
  { name: '0002-drawings-and-models', ...m0002 },
  { name: '0003-analysis-runs', ...m0003 },
  { name: '0004-sheet-revisions', ...m0004 },
  { name: '0005-password-resets', ...m0005 },
  { name: '0006-signin-limits', ...m0006 },
  { name: '0007-signing-keys-and-record-guards', ...m0007 },
  { name: '0008-import-limits', ...m0008 },
  { name: '0011-print-jobs', ...m0011 },
  { name: '0014-run-numbers', ...m0014 },
  { name: '0015-email-settings', ...m0015 },
  { name: '0016-audit-chain-head', ...m0016 },
  { name: '0017-sheet-checker', ...m0017 },
];

/** The migrations' names, in the order they run. */
export const MIGRATION_NAMES: readonly string[] = MIGRATIONS.map((m) => m.name);

/**
 * Runs the migrations not yet run. `to` stops after the named one (tests build a database as an
 * older release left it, then run the rest).
 */
export async function migrate(sequelize: Sequelize, options: { to?: string } = {}): Promise<void> {
  const umzug = new Umzug({
    migrations: MIGRATIONS.map(({ name, up, down }) => ({ name, up, down })),
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize }),
    logger: undefined,
  });
  await umzug.up(options.to ? { to: options.to } : {});
}
