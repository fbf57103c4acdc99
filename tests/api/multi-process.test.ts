import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { fakeS3Start, closedPort, type FakeS3 } from '../support/s3-fake';
import { pgTestDatabaseCreate, pgTestDatabasesDrop, pgTestsOn } from '../support/pg';
import { demoEmail } from '../support/test-services';
import { DEMO_PASSWORD } from '../../server/seed/demo';
import { FIRM_KEY_FILE } from '../../server/modules/records/firm-key';
import { AUDIT_KEY_FILE } from '../../server/modules/records/audit-chain';

/**
 * Two app processes and one worker process on one PostgreSQL database and one object store, as
 * a firm would run them behind one address: real `tsx server/index.ts` and `tsx server/worker.ts`
 * child processes, the dev or CI PostgreSQL server (a database of its own, dropped after) and
 * s3rver started here. The app processes run with WORKERS_IN_APP=false, so only the worker can
 * solve runs and print draft PDFs. Only in the PostgreSQL project: SQLite has one process.
 *
 * Every child leads its own process group; afterAll ends the groups (SIGTERM, then SIGKILL), and
 * so does an exit handler if the test process itself goes down first.
 */

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', '..');
const tsx = path.join(root, 'node_modules', '.bin', 'tsx');
const on = pgTestsOn();
if (!on) console.log('Multi-process test skipped: it runs in the PostgreSQL project only (PANELPOINT_TEST_PGHOST names the server).');

interface Child {
  name: string;
  proc: ChildProcess;
  out: string[];
}
const children: Child[] = [];
const killAll = (signal: NodeJS.Signals) => {
  for (const c of children) {
    if (c.proc.exitCode === null && c.proc.signalCode === null && c.proc.pid) {
      try {
        process.kill(-c.proc.pid, signal);
      } catch {
        // already gone
      }
    }
  }
};
const onExit = () => killAll('SIGKILL');
process.on('exit', onExit);

async function stopChild(c: Child): Promise<void> {
  if (c.proc.exitCode !== null || c.proc.signalCode !== null || !c.proc.pid) return;
  const gone = new Promise<void>((resolve) => c.proc.once('exit', () => resolve()));
  try {
    process.kill(-c.proc.pid, 'SIGTERM');
  } catch {
    return;
  }
  const timer = setTimeout(() => {
    try {
      process.kill(-c.proc.pid!, 'SIGKILL');
    } catch {
      // gone meanwhile
    }
  }, 15_000);
  await gone;
  clearTimeout(timer);
}

/** Starts a child and resolves when a line of its output matches `ready`; rejects when it exits first or after 120 s. */
function startChild(name: string, script: string, env: Record<string, string>, ready: RegExp): Promise<Child> {
  const proc = spawn(tsx, [path.join(root, script)], { cwd: root, env: { ...process.env, ...env }, detached: true, stdio: ['ignore', 'pipe', 'pipe'] });
  const child: Child = { name, proc, out: [] };
  children.push(child);
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`${name} did not start in 120 s: ${child.out.join('')}`)), 120_000);
    const seen = (chunk: Buffer) => {
      child.out.push(chunk.toString());
      if (ready.test(child.out.join(''))) {
        clearTimeout(timer);
        resolve(child);
      }
    };
    proc.stdout!.on('data', seen);
    proc.stderr!.on('data', (chunk: Buffer) => child.out.push(chunk.toString()));
    proc.once('exit', (code) => {
      clearTimeout(timer);
      reject(new Error(`${name} exited (${code}) before it was ready: ${child.out.join('')}`));
    });
  });
}

/** A browser-like client of one app: its cookies are kept by hand so the same ones can go to the other app. */
class Client {
  constructor(
    public base: string,
    public jar = new Map<string, string>(),
    public csrf = '',
  ) {}
  get cookie() {
    return [...this.jar.values()].join('; ');
  }
  /** The same cookies and token, sent to the other app (they share one address behind a proxy). */
  to(base: string) {
    return new Client(base, this.jar, this.csrf);
  }
  async call(method: string, url: string, body?: object | FormData): Promise<{ status: number; json: any; bytes: Buffer; headers: Headers }> {
    const headers: Record<string, string> = {};
    if (this.cookie) headers.cookie = this.cookie;
    if (method !== 'GET') headers['x-csrf-token'] = this.csrf;
    let payload: BodyInit | undefined;
    if (body instanceof FormData) payload = body;
    else if (body) {
      headers['content-type'] = 'application/json';
      payload = JSON.stringify(body);
    }
    const res = await fetch(`${this.base}${url}`, { method, headers, body: payload });
    for (const set of res.headers.getSetCookie()) {
      const pair = set.split(';')[0];
      this.jar.set(pair.split('=')[0], pair);
    }
    const bytes = Buffer.from(await res.arrayBuffer());
    let json: any = null;
    if ((res.headers.get('content-type') ?? '').includes('json')) json = JSON.parse(bytes.toString('utf8'));
    return { status: res.status, json, bytes, headers: res.headers };
  }
  get = (url: string) => this.call('GET', url);
  post = (url: string, body: object | FormData = {}) => this.call('POST', url, body);
}

async function signIn(base: string, email: string): Promise<Client> {
  const c = new Client(base);
  c.csrf = (await c.get('/api/session')).json.csrfToken;
  const res = await c.post('/api/session', { email, password: DEMO_PASSWORD });
  if (res.status !== 200) throw new Error(`sign-in as ${email}: ${res.status} ${JSON.stringify(res.json)}`);
  c.csrf = res.json.csrfToken;
  return c;
}

async function until<T>(what: string, read: () => Promise<T>, done: (v: T) => boolean, ms = 60_000): Promise<T> {
  const end = Date.now() + ms;
  for (;;) {
    const v = await read();
    if (done(v)) return v;
    if (Date.now() > end) throw new Error(`${what}: still ${JSON.stringify(v).slice(0, 300)} after ${ms / 1000} s`);
    await new Promise((r) => setTimeout(r, 200));
  }
}

let s3: FakeS3;
let databaseUrl: string;
let app1: string;
let app2: string;
let workerEnv: Record<string, string>;
const dirs: string[] = [];
const tempDir = () => {
  const d = fs.mkdtempSync(path.join(os.tmpdir(), 'pp-multi-'));
  dirs.push(d);
  return d;
};

describe.skipIf(!on)('two app processes and a worker on one PostgreSQL and one object store', () => {
  beforeAll(async () => {
    s3 = await fakeS3Start();
    databaseUrl = await pgTestDatabaseCreate();
    const common = {
      ...s3.env('multi'),
      DATABASE_URL: databaseUrl,
      NODE_ENV: 'test',
      SEED_DEMO: 'true',
      BCRYPT_ROUNDS: '4',
      PUBLIC_URL: 'http://panelpoint.test',
      // Both app processes sign the same cookies (behind one address a session may land on either).
      SESSION_SECRET: 'multi-process-test-session-secret-0123456789',
      WORKERS_IN_APP: 'false',
      AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED: 'true',
    };
    const [p1, p2] = [await closedPort(), await closedPort()];
    const data1 = tempDir();
    await startChild('app 1', 'server/index.ts', { ...common, PORT: String(p1), DATA_DIR: data1, UPLOADS_DIR: path.join(data1, 'uploads') }, /is running on/);
    // The second app holds the same firm signing key and audit key as the first (copied, as an
    // operator copies them to a second machine); the database and the store are shared.
    const data2 = tempDir();
    for (const f of [FIRM_KEY_FILE, AUDIT_KEY_FILE]) fs.copyFileSync(path.join(data1, f), path.join(data2, f));
    await startChild('app 2', 'server/index.ts', { ...common, PORT: String(p2), DATA_DIR: data2, UPLOADS_DIR: path.join(data2, 'uploads') }, /is running on/);
    app1 = `http://127.0.0.1:${p1}`;
    app2 = `http://127.0.0.1:${p2}`;
    const data3 = tempDir();
    workerEnv = { ...common, DATA_DIR: data3, UPLOADS_DIR: path.join(data3, 'uploads') };
  }, 300_000);

  afterAll(async () => {
    await Promise.all(children.map(stopChild));
    killAll('SIGKILL');
    process.off('exit', onExit);
    await s3?.close();
    await pgTestDatabasesDrop();
    for (const d of dirs) fs.rmSync(d, { recursive: true, force: true });
  }, 60_000);

  it('when someone signs in through app 1, then the same session cookie is signed in on app 2 and signing out on app 2 ends it on app 1', async () => {
    const one = await signIn(app1, demoEmail('drafter'));
    const two = one.to(app2);
    const seen = await two.get('/api/session');
    expect(seen.status).toBe(200);
    expect(seen.json.user.email).toBe(demoEmail('drafter'));
    // A write on app 2 with the CSRF token app 1 gave: accepted (the token is the session's, not the process's).
    const made = await two.post('/api/projects/1/trusses', { name: 'T-multi session' });
    expect(made.status).toBe(201);
    const out = await two.call('DELETE', '/api/session');
    expect([200, 204]).toContain(out.status);
    expect((await one.get('/api/session')).json.user ?? null).toBeNull();
  });

  it('when a drawing is uploaded through app 1, then app 2 serves the same bytes from the store', async () => {
    const engineer = await signIn(app1, demoEmail('engineer'));
    const bytes = fs.readFileSync(path.join(root, 'tests', 'fixtures', 'dxf', 'r2000-faults-mm.dxf'));
    const truss = await engineer.post('/api/projects/1/trusses', { name: 'T-multi upload' });
    expect(truss.status).toBe(201);
    const form = new FormData();
    form.append('file', new Blob([new Uint8Array(bytes)]), 'roof.dxf');
    const up = await engineer.post(`/api/trusses/${truss.json.id}/drawings`, form);
    expect(up.status).toBe(201);
    const back = await engineer.to(app2).get(`/api/drawings/${up.json.id}/file`);
    expect(back.status).toBe(200);
    expect(Buffer.compare(back.bytes, bytes)).toBe(0);
  });

  let runId: number;

  it('when a run is started on app 1 with no worker running, then it waits queued; once the worker starts it is solved and app 2 reads the forces', async () => {
    const engineer = await signIn(app1, demoEmail('engineer'));
    // The demo truss T1 loaded as in tests/support/fixtures.ts loadDemoTruss.
    const current = (await engineer.get('/api/trusses/1/model')).json;
    const at = (x: number, y: number) => current.model.joints.find((j: { x: number; y: number }) => Math.abs(j.x - x) < 1e-6 && Math.abs(j.y - y) < 1e-6).id as string;
    const saved = await engineer.call('PUT', '/api/trusses/1/model', {
      version: current.version,
      supports: [
        { joint: at(0, 0), kind: 'pin' },
        { joint: at(12, 0), kind: 'roller', angleDeg: 90 },
      ],
      loadCases: [{ id: 'D', name: 'Roof dead load', category: 'dead', loads: [[2, 1], [4, 2], [6, 3], [8, 2], [10, 1]].map(([x, y]) => ({ joint: at(x, y), fx: 0, fy: -10 })) }],
      combinations: [],
      members: [],
    });
    expect(saved.status).toBe(200);
    const started = await engineer.post('/api/trusses/1/runs', {});
    expect(started.status).toBe(202);
    runId = started.json.id;
    // Neither app process solves (WORKERS_IN_APP=false): after 3 s the run is still queued.
    await new Promise((r) => setTimeout(r, 3_000));
    expect((await engineer.to(app2).get(`/api/runs/${runId}`)).json.status).toBe('queued');

    await startChild('worker', 'server/worker.ts', workerEnv, /worker is taking/);
    const run = await until('the run', async () => (await engineer.to(app2).get(`/api/runs/${runId}`)).json, (r) => r.status !== 'queued' && r.status !== 'running');
    expect(run.status).toBe('solved');
    expect(run.progress).toEqual({ phase: 'done', fraction: 1 });
    // Closed form (method of joints, from memory; see loadDemoTruss): R = 25 kN at each bearing,
    // the end bottom chord carries +2R = +50 kN and the end top chord −R·√5 = −55.90 kN.
    const members = run.model.members as { id: string; from: string; to: string }[];
    const between = (a: string, b: string) => members.find((m) => (m.from === a && m.to === b) || (m.from === b && m.to === a))!.id;
    const forces = run.analysis.cases[0].forces as Record<string, number>;
    expect(forces[between(at(0, 0), at(2, 0))]).toBeCloseTo(50, 6);
    expect(forces[between(at(0, 0), at(2, 1))]).toBeCloseTo(-25 * Math.sqrt(5), 6);
    // The job went through pg-boss's queue, and it is finished there.
    const client = new pg.Client({ connectionString: databaseUrl });
    await client.connect();
    try {
      const jobs = await client.query(`SELECT state, data FROM pgboss.job WHERE name = 'solve-run'`);
      expect(jobs.rows).toEqual([{ state: 'completed', data: { id: runId } }]);
    } finally {
      await client.end();
    }
  }, 180_000);

  it('when a sheet is issued through app 1, then app 2 serves its PDF and verifies it as signed and intact', async () => {
    const engineer = await signIn(app1, demoEmail('engineer'));
    const reviewer = await signIn(app2, demoEmail('reviewer'));
    const sheet = await engineer.post('/api/trusses/1/sheets', { runId });
    expect(sheet.status).toBe(201);
    const checkers = (await engineer.get('/api/checkers')).json as { id: number; email: string }[];
    const checkerId = checkers.find((c) => c.email === demoEmail('reviewer'))!.id;
    expect((await engineer.post(`/api/sheets/${sheet.json.id}/submit`, { checkerId })).status).toBe(200);
    expect((await reviewer.post(`/api/sheets/${sheet.json.id}/check`)).status).toBe(200);
    const issued = await engineer.post(`/api/sheets/${sheet.json.id}/issue`);
    expect(issued.status).toBe(200);
    const pdf = await reviewer.get(`/api/sheets/${sheet.json.id}/pdf`);
    expect(pdf.status).toBe(200);
    expect(pdf.bytes.subarray(0, 5).toString()).toBe('%PDF-');
    const form = new FormData();
    form.append('file', new Blob([new Uint8Array(pdf.bytes)]), 'sheet.pdf');
    const verdict = await reviewer.post('/api/archive/verify', form);
    expect(verdict.status).toBe(200);
    expect(verdict.json).toMatchObject({ signature: 'valid', archivedFile: 'intact' });
  }, 180_000);

  it('when draft PDFs are asked for on both apps, then the per-person limit counts both and the worker prints them; either app serves the PDF', async () => {
    const engineer = await signIn(app1, demoEmail('engineer'));
    const more: number[] = [];
    for (let i = 0; i < 2; i++) {
      const started = await engineer.post('/api/trusses/1/runs', {});
      expect(started.status).toBe(202);
      more.push(started.json.id);
    }
    for (const id of more) await until(`run ${id}`, async () => (await engineer.get(`/api/runs/${id}`)).json.status, (s) => s === 'solved');
    const a = await engineer.post(`/api/runs/${runId}/sheet-jobs`);
    const b = await engineer.to(app2).post(`/api/runs/${more[0]}/sheet-jobs`);
    expect([a.status, b.status]).toEqual([202, 202]);
    // Two unfinished jobs across the two processes: the third, on app 1, is refused with its sentence.
    const c = await engineer.post(`/api/runs/${more[1]}/sheet-jobs`);
    expect(c.status).toBe(429);
    expect(c.json.error.message).toBe('You already have 2 calc sheet PDFs being made; wait until one of them is done, then ask again.');
    for (const job of [a.json, b.json]) {
      const done = await until(`print job ${job.id}`, async () => (await engineer.to(app2).get(`/api/sheet-jobs/${job.id}`)).json, (j) => j.state === 'done' || j.state === 'failed', 170_000);
      expect(done.state).toBe('done');
      const file = await engineer.get(`/api/sheet-jobs/${job.id}/pdf`);
      expect(file.status).toBe(200);
      expect(file.bytes.subarray(0, 5).toString()).toBe('%PDF-');
      expect(file.bytes.length).toBe(done.pdfBytes);
    }
  }, 400_000);
});
