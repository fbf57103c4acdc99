import crypto from 'node:crypto';
import pg from 'pg';

/**
 * PostgreSQL for the API tests. The PostgreSQL project of vitest.config.ts sets
 * PANELPOINT_TEST_DATABASE=postgres; the server it names is PANELPOINT_TEST_PGHOST (a host name,
 * or a socket folder starting with /), PANELPOINT_TEST_PGPORT (5432) and PANELPOINT_TEST_PGUSER
 * (postgres), with PANELPOINT_TEST_PGPASSWORD when the server asks for one. Every fresh test
 * server gets a database of its own (CREATE DATABASE), dropped when its test file ends.
 */

export const pgTestsOn = (): boolean => process.env.PANELPOINT_TEST_DATABASE === 'postgres' && !!process.env.PANELPOINT_TEST_PGHOST;

function server() {
  const host = process.env.PANELPOINT_TEST_PGHOST;
  if (!host) throw new Error('PANELPOINT_TEST_PGHOST is not set: name the PostgreSQL server the tests may make databases on.');
  return {
    host,
    port: Number(process.env.PANELPOINT_TEST_PGPORT ?? 5432),
    user: process.env.PANELPOINT_TEST_PGUSER ?? 'postgres',
    password: process.env.PANELPOINT_TEST_PGPASSWORD,
  };
}

/** The postgres:// URL of a database on the test server (a socket folder goes in ?host=). */
export function pgTestUrl(database: string): string {
  const s = server();
  const auth = encodeURIComponent(s.user) + (s.password ? `:${encodeURIComponent(s.password)}` : '');
  return s.host.startsWith('/')
    ? `postgres://${auth}@localhost:${s.port}/${database}?host=${encodeURIComponent(s.host)}`
    : `postgres://${auth}@${s.host}:${s.port}/${database}`;
}

async function admin<T>(fn: (client: pg.Client) => Promise<T>): Promise<T> {
  const client = new pg.Client({ ...server(), database: 'postgres' });
  await client.connect();
  try {
    return await fn(client);
  } finally {
    await client.end();
  }
}

const made: string[] = [];

/** A new empty database on the test server; its URL. */
export async function pgTestDatabaseCreate(): Promise<string> {
  const name = `pp_test_${process.pid}_${crypto.randomBytes(4).toString('hex')}`;
  await admin((c) => c.query(`CREATE DATABASE ${name}`));
  made.push(name);
  return pgTestUrl(name);
}

/** Drops every database this test file made (FORCE ends connections a failed test left open). */
export async function pgTestDatabasesDrop(): Promise<void> {
  const names = made.splice(0);
  if (!names.length) return;
  await admin(async (c) => {
    for (const name of names) await c.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
  });
}
