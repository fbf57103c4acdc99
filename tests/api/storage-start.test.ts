import { spawn } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { ListObjectsV2Command } from '@aws-sdk/client-s3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closedPort, fakeS3Start, type FakeS3 } from '../support/s3-fake';

/**
 * The real server process (`tsx server/index.ts`, as `npm start` runs it) started with object
 * storage settings: a bad setting stops it at start with one sentence naming the variable and
 * nothing written to its data folder; a good one serves the app with the demo drawing in the
 * bucket. The S3 store is s3rver on a free loopback port, started here.
 */

const root = path.resolve(import.meta.dirname, '../..');
const tsx = path.join(root, 'node_modules', '.bin', 'tsx');
let s3: FakeS3;
const dirs: string[] = [];

beforeAll(async () => {
  s3 = await fakeS3Start('panelpoint-start');
});
afterAll(async () => {
  await s3?.close();
  for (const d of dirs) fs.rmSync(d, { recursive: true, force: true });
});

/** The server's environment: ours without any storage or AWS setting that happens to be set. */
function baseEnv(dataDir: string, port: number): NodeJS.ProcessEnv {
  const env: NodeJS.ProcessEnv = {};
  for (const [k, v] of Object.entries(process.env)) if (!/^(STORAGE_URL|S3_|AWS_|DATA_DIR|UPLOADS_DIR|PORT|NODE_ENV)/.test(k)) env[k] = v;
  return {
    ...env,
    NODE_ENV: 'production',
    SEED_DEMO: 'true',
    BCRYPT_ROUNDS: '4',
    PUBLIC_URL: 'http://panelpoint.test',
    DATA_DIR: dataDir,
    UPLOADS_DIR: path.join(dataDir, 'uploads'),
    PORT: String(port),
  };
}

interface Started {
  code: number | null;
  stdout: string;
  stderr: string;
}

/** Runs the server until it exits, or until `until` appears on stdout (then it is sent SIGTERM). */
function runServer(env: NodeJS.ProcessEnv, until?: RegExp, whileUp?: () => Promise<void>): Promise<Started> {
  return new Promise((resolve, reject) => {
    const child = spawn(tsx, [path.join(root, 'server', 'index.ts')], { cwd: root, env, stdio: ['ignore', 'pipe', 'pipe'] });
    let stdout = '';
    let stderr = '';
    let asked = false;
    const timer = setTimeout(() => child.kill('SIGKILL'), 90_000);
    child.stdout.on('data', (c: Buffer) => {
      stdout += c.toString();
      if (until && !asked && until.test(stdout)) {
        asked = true;
        (whileUp ?? (async () => {}))()
          .catch((err) => (stderr += `\n[test] ${String(err)}`))
          .finally(() => child.kill('SIGTERM'));
      }
    });
    child.stderr.on('data', (c: Buffer) => (stderr += c.toString()));
    child.on('error', reject);
    child.on('exit', (code) => {
      clearTimeout(timer);
      resolve({ code, stdout, stderr });
    });
  });
}

function freshDataDir(): string {
  const d = fs.mkdtempSync(path.join(os.tmpdir(), 'pp-s3-start-'));
  dirs.push(d);
  return d;
}

/** The one line the server prints when it cannot start. */
const refusal = (r: Started) => r.stderr.split('\n').filter((l) => l.startsWith('Panelpoint could not start:'));

describe('a server start with object storage', () => {
  const cases: [string, (s3: FakeS3) => Promise<Record<string, string>>, RegExp, string][] = [
    [
      'a bucket that does not exist',
      async (s) => ({ ...s.env(), STORAGE_URL: 's3://no-such-bucket' }),
      /^Panelpoint could not start: Object storage: the bucket "no-such-bucket" named in STORAGE_URL does not exist at S3_ENDPOINT \(http:\/\/127\.0\.0\.1:\d+\); create it or correct STORAGE_URL\.$/,
      'STORAGE_URL',
    ],
    [
      'credentials the store does not know',
      async (s) => ({ ...s.env(), AWS_ACCESS_KEY_ID: 'NOT-A-KEY-OF-THIS-STORE' }),
      /^Panelpoint could not start: Object storage: S3_ENDPOINT \(http:\/\/127\.0\.0\.1:\d+\) refused the credentials for bucket "panelpoint-start" \(HTTP 403\); check AWS_ACCESS_KEY_ID and AWS_SECRET_ACCESS_KEY, and that they may read and write that bucket\.$/,
      'AWS_ACCESS_KEY_ID',
    ],
    [
      'an endpoint nothing answers on',
      async (s) => ({ ...s.env(), S3_ENDPOINT: `http://127.0.0.1:${await closedPort()}` }),
      /^Panelpoint could not start: Object storage: could not reach S3_ENDPOINT \(http:\/\/127\.0\.0\.1:\d+\): connection refused; check the address in S3_ENDPOINT and that the store is running\.$/,
      'S3_ENDPOINT',
    ],
    [
      'a STORAGE_URL that is not s3://',
      async (s) => ({ ...s.env(), STORAGE_URL: 'https://panelpoint-start.example.com' }),
      /^Panelpoint could not start: Configuration: STORAGE_URL must look like s3:\/\/bucket or s3:\/\/bucket\/prefix \(or be unset for the local folders\), not "https:\/\/panelpoint-start\.example\.com"\.$/,
      'STORAGE_URL',
    ],
    [
      'a key id without its secret',
      async (s) => {
        const env = s.env();
        delete (env as Record<string, string | undefined>).AWS_SECRET_ACCESS_KEY;
        return env;
      },
      /^Panelpoint could not start: Configuration: AWS_ACCESS_KEY_ID is set but AWS_SECRET_ACCESS_KEY is not; set both, or neither to use the SDK's own credential sources\.$/,
      'AWS_SECRET_ACCESS_KEY',
    ],
  ];

  it.each(cases)('with %s, it stops at start with one sentence naming the variable, and writes nothing', async (_what, envOf, sentence, variable) => {
    const dataDir = freshDataDir();
    const r = await runServer({ ...baseEnv(dataDir, await closedPort()), ...(await envOf(s3)) });
    expect(r.code).toBe(1);
    const lines = refusal(r);
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatch(sentence);
    expect(lines[0]).toContain(variable);
    expect(r.stdout).not.toMatch(/is running/);
    // Stopped before the database was opened: the data folder is as it was made, empty.
    expect(fs.readdirSync(dataDir)).toEqual([]);
  }, 120_000);

  it('with a good bucket, it starts, serves the API and keeps the demo drawing in the bucket, not in the uploads folder', async () => {
    const dataDir = freshDataDir();
    const port = await closedPort();
    let session = 0;
    const r = await runServer({ ...baseEnv(dataDir, port), ...s3.env('office-1') }, /is running on/, async () => {
      session = (await fetch(`http://127.0.0.1:${port}/api/session`)).status;
    });
    expect([r.code, refusal(r)]).toEqual([0, []]);
    expect(session).toBe(200);
    const objects = await s3.client.send(new ListObjectsV2Command({ Bucket: s3.bucket, Prefix: 'office-1/' }));
    expect((objects.Contents ?? []).map((o) => o.Key)).toEqual([expect.stringMatching(/^office-1\/drawings\/[0-9a-f]{32}\.dxf$/)]);
    expect(fs.existsSync(path.join(dataDir, 'panelpoint.sqlite'))).toBe(true);
    expect(fs.existsSync(path.join(dataDir, 'uploads'))).toBe(false);
  }, 120_000);
});
