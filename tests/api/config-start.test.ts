import { execFile } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import { afterAll, describe, expect, it } from 'vitest';

/**
 * More bad configuration on a real server start (`tsx server/index.ts`): a PORT another
 * program holds (Express 5's listen hands the error to its callback, which printed "is running"
 * and left a process serving nothing) and a TRUST_PROXY Express cannot read (it stopped with
 * "invalid IP address: …", naming nothing). Each stops with exit 1 and one sentence naming the
 * variable, no stack trace, and nothing else listening.
 */
const run = promisify(execFile);
const root = path.resolve(import.meta.dirname, '../..');
const tsx = path.join(root, 'node_modules', '.bin', 'tsx');
const dirs: string[] = [];
afterAll(() => {
  for (const d of dirs) fs.rmSync(d, { recursive: true, force: true });
});

async function start(env: Record<string, string>) {
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'pp-config-start-'));
  dirs.push(dataDir);
  const base: NodeJS.ProcessEnv = {};
  for (const [k, v] of Object.entries(process.env)) if (!/^(STORAGE_URL|S3_|AWS_|DATABASE_URL|TRUST_PROXY|PORT|VITEST|PANELPOINT_TEST)/.test(k)) base[k] = v;
  return run(tsx, [path.join(root, 'server', 'index.ts')], {
    cwd: root,
    timeout: 90_000,
    env: { ...base, NODE_ENV: 'test', BCRYPT_ROUNDS: '4', DATA_DIR: dataDir, UPLOADS_DIR: path.join(dataDir, 'uploads'), ...env },
  }).then(
    (r) => ({ code: 0, stdout: r.stdout, stderr: r.stderr, dataDir }),
    (err: { code: number; stdout: string; stderr: string }) => ({ code: err.code, stdout: err.stdout, stderr: err.stderr, dataDir }),
  );
}

function expectOneSentence(r: { code: number; stdout: string; stderr: string }, sentence: string) {
  expect(r.code).toBe(1);
  expect(r.stderr.trim().split('\n')).toEqual([sentence]);
  expect(r.stdout).not.toMatch(/is running/);
}

describe('bad configuration at start', () => {
  it('when PORT is held by another program, then the start stops with one sentence naming PORT instead of claiming to run', async () => {
    const holder = net.createServer();
    await new Promise<void>((resolve) => holder.listen(0, resolve));
    const port = (holder.address() as net.AddressInfo).port;
    try {
      const r = await start({ PORT: String(port) });
      expectOneSentence(r, `Panelpoint could not start: Configuration: PORT ${port} is already in use by another program (perhaps another Panelpoint); stop it or give this process another PORT.`);
      // Its mail sink and everything else were closed before it exited: the only listener left is ours.
      expect(r.stdout).not.toMatch(/Local mail sink/);
    } finally {
      await new Promise((resolve) => holder.close(resolve));
    }
  }, 120_000);

  it('when TRUST_PROXY is not an address, subnet, hop count or true/false, then the start stops with one sentence naming TRUST_PROXY, before anything is written', async () => {
    const r = await start({ PORT: '0', TRUST_PROXY: 'nginx-box' });
    expectOneSentence(
      r,
      'Panelpoint could not start: Configuration: TRUST_PROXY must be true, false, a number of proxy hops, or addresses and subnets separated by commas (such as loopback or 10.0.0.0/8); "nginx-box" is not (invalid IP address: nginx-box).',
    );
    expect(fs.readdirSync(r.dataDir)).toEqual([]);
  }, 120_000);
});
