import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_PASSWORD } from '../../server/seed/demo';
import { SESSION_USER_TTL_MS } from '../../server/modules/auth/session-user';
import { closedPort } from '../support/s3-fake';
import { pgTestDatabaseCreate, pgTestsOn } from '../support/pg';

/**
 * Two real server processes (`tsx server/index.ts`, as `npm start` runs them), started at the
 * same moment on one fresh database and one DATA_DIR, as two app processes behind one proxy
 * would be: on a real SQLite file in the SQLite run, on a new PostgreSQL database in the
 * PostgreSQL run. Nothing a person's requests depend on may live in one process's memory: a
 * visitor's CSRF token, a session, a sign-in lock and a password change made through one must
 * hold on the other. Separate processes, not two createApp() in this one: the models and the
 * signed-in-user cache are module-level, so two apps in one process would share them and hide
 * exactly what this test is for.
 */

const root = path.resolve(import.meta.dirname, '../..');
const tsx = path.join(root, 'node_modules', '.bin', 'tsx');
const email = (role: string) => `${role}@demo.panelpoint.test`;

interface Server {
  url: string;
  child: ChildProcess;
  output: () => string;
}

let dataDir: string;
const servers: Server[] = [];

function serverEnv(port: number, databaseUrl: string | undefined): NodeJS.ProcessEnv {
  const env: NodeJS.ProcessEnv = {};
  for (const [k, v] of Object.entries(process.env)) if (!/^(STORAGE_URL|S3_|AWS_|DATA_DIR|UPLOADS_DIR|PORT|NODE_ENV|DATABASE_URL|SESSION_SECRET|VITEST|PANELPOINT_TEST)/.test(k)) env[k] = v;
  return {
    ...env,
    NODE_ENV: 'test',
    SEED_DEMO: 'true',
    BCRYPT_ROUNDS: '4',
    VERIFY_ADDRESS_LIMIT: '10',
    PUBLIC_URL: 'http://panelpoint.test',
    DATA_DIR: dataDir,
    UPLOADS_DIR: path.join(dataDir, 'uploads'),
    PORT: String(port),
    ...(databaseUrl ? { DATABASE_URL: databaseUrl } : {}),
  };
}

/** Starts a server and resolves when it says it is running (rejects if it exits first). */
function serverStart(port: number, databaseUrl: string | undefined): Promise<Server> {
  return new Promise((resolve, reject) => {
    const child = spawn(tsx, [path.join(root, 'server', 'index.ts')], { cwd: root, env: serverEnv(port, databaseUrl), stdio: ['ignore', 'pipe', 'pipe'] });
    let out = '';
    const server: Server = { url: `http://127.0.0.1:${port}`, child, output: () => out };
    servers.push(server);
    child.stdout!.on('data', (c: Buffer) => {
      out += c.toString();
      if (/is running on/.test(out)) resolve(server);
    });
    child.stderr!.on('data', (c: Buffer) => (out += c.toString()));
    child.on('exit', (code) => reject(new Error(`server on ${port} exited (${code}) before it was running: ${out}`)));
  });
}

/** One browser: a cookie jar shared by whichever process answers, as behind one address. */
class Browser {
  private cookies = new Map<string, string>();
  csrf = '';

  async call(server: Server, method: string, url: string, body?: unknown): Promise<{ status: number; body: any }> {
    const headers: Record<string, string> = { cookie: [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ') };
    if (body !== undefined) headers['content-type'] = 'application/json';
    if (method !== 'GET') headers['x-csrf-token'] = this.csrf;
    const res = await fetch(server.url + url, { method, headers, body: body === undefined ? undefined : JSON.stringify(body) });
    for (const line of res.headers.getSetCookie()) {
      const [pair] = line.split(';');
      const eq = pair.indexOf('=');
      this.cookies.set(pair.slice(0, eq), pair.slice(eq + 1));
    }
    const text = await res.text();
    const parsed = text && res.headers.get('content-type')?.includes('json') ? JSON.parse(text) : text;
    if (parsed && typeof parsed === 'object' && typeof parsed.csrfToken === 'string') this.csrf = parsed.csrfToken;
    return { status: res.status, body: parsed };
  }
}

let a: Server;
let b: Server;

beforeAll(async () => {
  dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'pp-two-apps-'));
  const databaseUrl = pgTestsOn() ? await pgTestDatabaseCreate() : undefined;
  // Both at once on the empty database: the start lock lets one migrate and seed, the other
  // waits and finds the work done (neither fails on a table or a user the other just made).
  [a, b] = await Promise.all([serverStart(await closedPort(), databaseUrl), serverStart(await closedPort(), databaseUrl)]);
}, 180_000);

afterAll(async () => {
  await Promise.all(
    servers.map(
      (s) =>
        new Promise<void>((resolve) => {
          if (s.child.exitCode !== null) return resolve();
          s.child.once('exit', () => resolve());
          s.child.kill('SIGTERM');
        }),
    ),
  );
  fs.rmSync(dataDir, { recursive: true, force: true });
});

describe('two server processes on one database and one data folder', () => {
  it('both started together and use one session secret, the file made once in DATA_DIR', () => {
    expect(fs.readFileSync(path.join(dataDir, 'session-secret'), 'utf8').trim()).toMatch(/^[0-9a-f]{64}$/);
    expect(fs.readdirSync(dataDir).filter((n) => n.endsWith('.part'))).toEqual([]);
    // One demo firm: the second start found the seeded database and did not seed again.
    expect(a.output() + b.output()).not.toMatch(/could not start|Error/);
  });

  it("a signed-out visitor's CSRF token from one process signs in on the other, and the session then works on both", async () => {
    const tab = new Browser();
    expect((await tab.call(a, 'GET', '/api/session')).status).toBe(200);
    const signedIn = await tab.call(b, 'POST', '/api/session', { email: email('engineer'), password: DEMO_PASSWORD });
    expect(signedIn.status).toBe(200);
    const onA = await tab.call(a, 'GET', '/api/session');
    expect(onA.body.user?.email).toBe(email('engineer'));
    // A write through A with the signed-in token B handed out.
    const made = await tab.call(a, 'POST', '/api/projects', { jobNumber: 'TWO-1', name: 'Two processes', client: 'Invented Co' });
    expect(made.status).toBe(201);
    const list = await tab.call(b, 'GET', '/api/projects');
    expect(JSON.stringify(list.body)).toContain('Two processes');
    // Signing out through B ends the session on A too.
    expect((await tab.call(b, 'DELETE', '/api/session')).status).toBe(204);
    expect((await tab.call(a, 'GET', '/api/session')).body.user ?? null).toBeNull();
  });

  it('a CSRF token is still refused on the other process when it belongs to another visitor', async () => {
    const one = new Browser();
    const two = new Browser();
    await one.call(a, 'GET', '/api/session');
    await two.call(a, 'GET', '/api/session');
    one.csrf = two.csrf;
    const r = await one.call(b, 'POST', '/api/session', { email: email('engineer'), password: DEMO_PASSWORD });
    expect([r.status, r.body.error?.code]).toEqual([403, 'csrf-token-invalid']);
  });

  it('an account locked by failed sign-ins through one process is locked on the other, the right password included', async () => {
    const tab = new Browser();
    await tab.call(a, 'GET', '/api/session');
    for (let i = 0; i < 5; i++) {
      const r = await tab.call(i % 2 ? b : a, 'POST', '/api/session', { email: email('drafter'), password: 'not-the-password' });
      expect(r.status).toBe(401);
    }
    const other = new Browser();
    await other.call(b, 'GET', '/api/session');
    const r = await other.call(b, 'POST', '/api/session', { email: email('drafter'), password: DEMO_PASSWORD });
    expect(r.status).toBe(429);
    expect(r.body.error.code).toBe('too-many-attempts');
  });

  it('the public verify limit per address counts the requests of both processes together, also when they arrive at once', async () => {
    const statuses = await Promise.all(
      Array.from({ length: 20 }, (_, i) => fetch(`${(i % 2 ? b : a).url}/api/public/verify/no-such-record`).then((r) => r.status)),
    );
    // VERIFY_ADDRESS_LIMIT=10 for both: exactly 10 are let through to the lookup, 10 refused.
    expect(statuses.filter((s) => s === 429)).toHaveLength(10);
    expect(statuses.filter((s) => s !== 429)).toHaveLength(10);
  });

  it("a password changed through one process is the only one the other accepts, and the user's other sessions end there", async () => {
    const here = new Browser();
    const there = new Browser();
    await here.call(a, 'GET', '/api/session');
    await there.call(b, 'GET', '/api/session');
    expect((await here.call(a, 'POST', '/api/session', { email: email('reviewer'), password: DEMO_PASSWORD })).status).toBe(200);
    expect((await there.call(b, 'POST', '/api/session', { email: email('reviewer'), password: DEMO_PASSWORD })).status).toBe(200);
    expect((await there.call(b, 'GET', '/api/projects')).status).toBe(200);
    const newPassword = 'quartz lantern meadow 4417';
    const changed = await here.call(a, 'POST', '/api/account/password', { currentPassword: DEMO_PASSWORD, newPassword });
    expect(changed.status).toBe(200);
    // The other session, on the other process: its row went with the change, so it is signed
    // out at once (its user row may be cached there for SESSION_USER_TTL_MS, its session is not).
    expect((await there.call(b, 'GET', '/api/projects')).status).toBe(401);
    // The old password no longer signs in on B; the new one does.
    const fresh = new Browser();
    await fresh.call(b, 'GET', '/api/session');
    expect((await fresh.call(b, 'POST', '/api/session', { email: email('reviewer'), password: DEMO_PASSWORD })).status).toBe(401);
    expect((await fresh.call(b, 'POST', '/api/session', { email: email('reviewer'), password: newPassword })).status).toBe(200);
    // The session that made the change keeps working on both.
    expect((await here.call(b, 'GET', '/api/projects')).status).toBe(200);
    expect(SESSION_USER_TTL_MS).toBeLessThanOrEqual(2000);
  });
});
