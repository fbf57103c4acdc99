import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { loadConfig } from '../../server/config';
import { startServices, type Services } from '../../server/bootstrap';
import { User } from '../../server/db/models';
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
    ...loadConfig({ NODE_ENV: 'production', DATA_DIR: dataDir, UPLOADS_DIR: path.join(dataDir, 'uploads'), ...env }),
    bcryptRounds: 4,
  };
  const services = await startServices(config, { log: (m) => lines.push(m) });
  started.push(services);
  return { services, lines };
}

const linkIn = (lines: string[]) => lines.join('\n').match(/https?:\/\/\S+\/invite\/([\w-]+)/)?.[1];

describe('a production start', () => {
  it('loads no demo accounts, prints a one-time link for the first admin and warns that PUBLIC_URL is unset', async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'pp-prod-'));
    const { services, lines } = await start(dir, { FIRST_ADMIN_EMAIL: 'ops@firm.example' });
    expect(await User.findOne({ where: { email: 'admin@demo.panelpoint.test' } })).toBeNull();
    expect(lines.some((l) => l.includes('PUBLIC_URL is not set'))).toBe(true);
    const token = linkIn(lines);
    expect(token).toBeTruthy();

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
    expect(first.lines.some((l) => l.includes('PUBLIC_URL is not set'))).toBe(false);
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

  it('loads the demo only when SEED_DEMO=true says so', async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'pp-prod-'));
    const { lines } = await start(dir, { SEED_DEMO: 'true' });
    expect(await User.findOne({ where: { email: 'admin@demo.panelpoint.test' } })).not.toBeNull();
    expect(linkIn(lines)).toBeUndefined();
  });
});
