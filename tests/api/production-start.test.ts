import { spawn } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { loadConfig, PUBLIC_URL_MISSING } from '../../server/config';
import { startServices, type Services } from '../../server/bootstrap';
import { User } from '../../server/db/models';
import { FIRST_ADMIN_FRESH_MS } from '../../server/modules/users/first-admin';
import { DEMO_PASSWORD } from '../../server/seed/demo';
import { openTab } from '../support/test-services';

// A production install on a real SQLite file: no demo accounts unless asked for by name,
// the first admin by a one-time link printed at start (issue: production defaults).
const started: Services[] = [];
afterEach(async () => {
  while (started.length) await started.pop()!.shutdown();
});

async function start(dataDir: string, env: Record<string, string>) {
  const lines: string[] = [];
  const config = {
    ...loadConfig({ NODE_ENV: 'production', DATA_DIR: dataDir, UPLOADS_DIR: path.join(dataDir, 'uploads'), PUBLIC_URL: 'http://panelpoint.office.lan', ...env }),
    bcryptRounds: 4,
  };
  const services = await startServices(config, { log: (m) => lines.push(m) });
  started.push(services);
  return { services, lines };
}

const linkIn = (lines: string[]) => lines.join('\n').match(/https?:\/\/\S+\/invite\/([\w-]+)/)?.[1];

describe('a production start', () => {
  it('loads no demo accounts and prints a one-time link for the first admin, on PUBLIC_URL', async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'pp-prod-'));
    const { services, lines } = await start(dir, { FIRST_ADMIN_EMAIL: 'ops@firm.example' });
    expect(await User.findOne({ where: { email: 'admin@demo.panelpoint.test' } })).toBeNull();
    const token = linkIn(lines);
    expect(token).toBeTruthy();
    expect(lines.join('\n')).toContain(`http://panelpoint.office.lan/invite/${token}`);
    expect(lines.join('\n')).not.toContain('localhost');

    // The demo password signs nobody in.
    const tab = await openTab(services.app);
    await tab.agent.post('/api/session').set('X-CSRF-Token', tab.csrf).send({ email: 'admin@demo.panelpoint.test', password: DEMO_PASSWORD }).expect(401);

    // The link lets the person running the server choose the admin's password, once.
    const invitation = await tab.agent.get(`/api/invitations/${token}`).expect(200);
    expect(invitation.body.email).toBe('ops@firm.example');
    const accepted = await tab.agent
      .post('/api/invitations/accept')
      .set('X-CSRF-Token', tab.csrf)
      .send({ token, name: 'Office admin', password: 'a long office passphrase 42' })
      .expect(200);
    expect(accepted.body.user.role).toBe('admin');
    await tab.agent.get(`/api/invitations/${token}`).expect(410);
  });

  it('prints a fresh link at each start until it is used (the old one stops working), and none once an admin exists', async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'pp-prod-'));
    const first = await start(dir, { PUBLIC_URL: 'http://panelpoint.lan' });
    const oldToken = linkIn(first.lines);
    // Older than FIRST_ADMIN_FRESH_MS: not another process's link of a moment ago.
    await first.services.sequelize.query(`UPDATE "invitations" SET "createdAt" = :at`, { replacements: { at: new Date(Date.now() - FIRST_ADMIN_FRESH_MS - 1000) } });
    await started.pop()!.shutdown();

    const second = await start(dir, { PUBLIC_URL: 'http://panelpoint.lan' });
    const newToken = linkIn(second.lines);
    expect(newToken).toBeTruthy();
    expect(newToken).not.toBe(oldToken);
    const tab = await openTab(second.services.app);
    await tab.agent.get(`/api/invitations/${oldToken}`).expect(404);
    await tab.agent.post('/api/invitations/accept').set('X-CSRF-Token', tab.csrf).send({ token: newToken, name: 'Office admin', password: 'a long office passphrase 42' }).expect(200);
    await started.pop()!.shutdown();

    const third = await start(dir, { PUBLIC_URL: 'http://panelpoint.lan' });
    expect(linkIn(third.lines)).toBeUndefined();
  });

  it('a start within two minutes of another (two app processes started together) keeps the link the first printed and says where it is', async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'pp-prod-'));
    const first = await start(dir, { PUBLIC_URL: 'http://panelpoint.lan' });
    const token = linkIn(first.lines);
    await started.pop()!.shutdown();
    const second = await start(dir, { PUBLIC_URL: 'http://panelpoint.lan' });
    expect(linkIn(second.lines)).toBeUndefined();
    expect(second.lines.join('\n')).toMatch(/Another server process printed the first admin's one-time link at \d{4}-\d\d-\d\dT[\d:.]+Z \(in its log\); this start made no new one, so that link still works\./);
    const tab = await openTab(second.services.app);
    await tab.agent.post('/api/invitations/accept').set('X-CSRF-Token', tab.csrf).send({ token, name: 'Office admin', password: 'a long office passphrase 42' }).expect(200);
  });

  it('loads the demo only when SEED_DEMO=true says so', async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'pp-prod-'));
    const { lines } = await start(dir, { SEED_DEMO: 'true' });
    expect(await User.findOne({ where: { email: 'admin@demo.panelpoint.test' } })).not.toBeNull();
    expect(linkIn(lines)).toBeUndefined();
  });

  it('without PUBLIC_URL, stops before anything is written: loadConfig and startServices each with the one sentence', async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'pp-prod-'));
    const env = { NODE_ENV: 'production', DATA_DIR: dir, UPLOADS_DIR: path.join(dir, 'uploads') };
    expect(() => loadConfig(env)).toThrow(PUBLIC_URL_MISSING);
    expect(() => loadConfig({ ...env, PUBLIC_URL: '  ' })).toThrow(/PUBLIC_URL/);
    expect(() => loadConfig({ ...env, PUBLIC_URL: 'panelpoint.example.com' })).toThrow(/PUBLIC_URL must be an http:\/\/ or https:\/\/ address/);
    // A config made otherwise (as a test or another entry point would) is refused at start too.
    const config = { ...loadConfig({ ...env, NODE_ENV: 'test' }), env: 'production' as const, publicUrl: undefined };
    await expect(startServices(config, { log: () => {} })).rejects.toThrow(PUBLIC_URL_MISSING);
    expect(fs.readdirSync(dir)).toEqual([]);
  });

  it('without PUBLIC_URL, the real server process (tsx server/index.ts) exits 1 with the sentence naming PUBLIC_URL', async () => {
    const root = path.resolve(import.meta.dirname, '../..');
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'pp-prod-'));
    const env: NodeJS.ProcessEnv = {};
    for (const [k, v] of Object.entries(process.env)) if (!/^(PUBLIC_URL|DATA_DIR|UPLOADS_DIR|PORT|NODE_ENV|STORAGE_URL)$/.test(k)) env[k] = v;
    Object.assign(env, { NODE_ENV: 'production', DATA_DIR: dir, UPLOADS_DIR: path.join(dir, 'uploads'), PORT: '0' });
    const result = await new Promise<{ code: number | null; out: string }>((resolve, reject) => {
      const child = spawn(path.join(root, 'node_modules', '.bin', 'tsx'), [path.join(root, 'server', 'index.ts')], { cwd: root, env, stdio: ['ignore', 'pipe', 'pipe'] });
      let out = '';
      const timer = setTimeout(() => child.kill('SIGKILL'), 60_000);
      child.stdout.on('data', (c: Buffer) => (out += c.toString()));
      child.stderr.on('data', (c: Buffer) => (out += c.toString()));
      child.on('error', reject);
      child.on('exit', (code) => {
        clearTimeout(timer);
        resolve({ code, out });
      });
    });
    expect(result.code).toBe(1);
    expect(result.out.trim()).toBe(`Panelpoint could not start: ${PUBLIC_URL_MISSING}`);
    expect(fs.readdirSync(dir)).toEqual([]);
  }, 90_000);
});
