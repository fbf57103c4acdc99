import fs from 'node:fs';
import { afterAll, describe, expect, it } from 'vitest';
import type { Config } from '../../server/config';
import type { Services } from '../../server/bootstrap';
import { demoEmail, openTab, startTestServices, tempDataDir, type Tab } from '../support/test-services';
import { DEMO_PASSWORD } from '../../server/seed/demo';

// Sign-in limits through the real app on a real SQLite file: two app instances on one file
// (as two server processes), a restart, and the proxy setting. Windows and limits are the
// defaults (5 per account, 50 per address, 15 minutes) unless a test says otherwise.
const WINDOW_S = 15 * 60;
const started: Services[] = [];
const dirs = new Set<string>();
afterAll(async () => {
  while (started.length) await started.pop()!.shutdown();
  for (const dir of dirs) fs.rmSync(dir, { recursive: true, force: true });
});

async function start(file: ReturnType<typeof tempDataDir>, overrides: Partial<Config> = {}) {
  const s = await startTestServices({ ...file, ...overrides });
  started.push(s);
  dirs.add(file.dataDir).add(s.config.uploadsDir);
  return s;
}

function attempt(tab: Tab, email: string, password: string, forwardedFor?: string) {
  const req = tab.agent.post('/api/session').set('X-CSRF-Token', tab.csrf);
  if (forwardedFor) req.set('X-Forwarded-For', forwardedFor);
  return req.send({ email, password });
}

describe('sign-in limits on a SQLite file', () => {
  it('failures on two app instances on one file add up; the lock survives a restart; Retry-After says how long', async () => {
    const file = tempDataDir();
    const one = await start(file);
    const two = await start(file);
    const tabOne = await openTab(one.app);
    const tabTwo = await openTab(two.app);
    const email = demoEmail('drafter');
    const statuses: number[] = [];
    for (let i = 0; i < 3; i++) statuses.push((await attempt(tabOne, email, 'not-my-password')).status);
    const beforeLock = Date.now();
    for (let i = 0; i < 2; i++) statuses.push((await attempt(tabTwo, email, 'not-my-password')).status);
    expect(statuses).toEqual([401, 401, 401, 401, 401]);

    // The right password is refused while the account is locked (the conservative reading).
    const refused = await attempt(tabOne, email, DEMO_PASSWORD);
    expect(refused.status).toBe(429);
    expect(refused.body.error.code).toBe('too-many-attempts');
    // The lock began at the fifth failure, so what is left is the window less the time since.
    const left = Number(refused.headers['retry-after']);
    const elapsed = Math.ceil((Date.now() - beforeLock) / 1000);
    expect(left).toBeLessThanOrEqual(WINDOW_S);
    expect(left).toBeGreaterThanOrEqual(WINDOW_S - elapsed);
    expect(refused.body.error.message).toMatch(/^Too many failed sign-ins for this account: try again in 15 minutes \(after \d{4}-\d\d-\d\d \d\d:\d\d UTC\)/);
    const named = /after (\d{4}-\d\d-\d\d \d\d:\d\d) UTC/.exec(refused.body.error.message)![1];
    const namedMs = Date.parse(`${named.replace(' ', 'T')}:00Z`);
    expect(namedMs).toBeGreaterThanOrEqual(Date.now() + (left - 1) * 1000);
    expect(namedMs).toBeLessThan(Date.now() + (left + 61) * 1000);

    // Restart both: the count is in the file, not in memory.
    await started.pop()!.shutdown();
    await started.pop()!.shutdown();
    const again = await start(file);
    const after = await attempt(await openTab(again.app), email, DEMO_PASSWORD);
    expect(after.status).toBe(429);
    expect(Number(after.headers['retry-after'])).toBeLessThanOrEqual(left);
    expect(Number(after.headers['retry-after'])).toBeGreaterThan(WINDOW_S - 120);
    // Another account from the same address is not held by this account's lock.
    expect((await attempt(await openTab(again.app), demoEmail('reviewer'), DEMO_PASSWORD)).status).toBe(200);
    await started.pop()!.shutdown();
  });

  it('a success clears the count: 4 wrong, right, 4 wrong, right is never locked', async () => {
    const file = tempDataDir();
    const s = await start(file);
    const tab = await openTab(s.app);
    const statuses: number[] = [];
    for (let round = 0; round < 2; round++) {
      for (let i = 0; i < 4; i++) statuses.push((await attempt(tab, demoEmail('engineer'), 'wrong-password')).status);
      statuses.push((await attempt(await openTab(s.app), demoEmail('engineer'), DEMO_PASSWORD)).status);
    }
    expect(statuses).toEqual([401, 401, 401, 401, 200, 401, 401, 401, 401, 200]);
    await started.pop()!.shutdown();
  });

  it("someone guessing at other accounts does not keep X's owner out: not below the address limit, and not from another address once it is reached", async () => {
    const file = tempDataDir();
    const s = await start(file, { trustProxy: 'loopback', signInAddressLimit: 20 });
    const office = '198.51.100.40';
    const tab = await openTab(s.app);
    // A colleague behind the same office address mistypes on other accounts, 19 times.
    for (let i = 0; i < 19; i++) expect((await attempt(tab, `someone-${i}@demo.panelpoint.test`, 'guess', office)).status).toBe(401);
    expect((await attempt(await openTab(s.app), demoEmail('admin'), DEMO_PASSWORD, office)).status).toBe(200);
    // One more and the address is locked, for everyone behind it, with its own sentence.
    expect((await attempt(tab, 'someone-19@demo.panelpoint.test', 'guess', office)).status).toBe(401);
    const locked = await attempt(await openTab(s.app), demoEmail('admin'), DEMO_PASSWORD, office);
    expect(locked.status).toBe(429);
    expect(locked.body.error.message).toMatch(/from your network address: try again in 15 minutes/);
    expect(Number(locked.headers['retry-after'])).toBeGreaterThan(WINDOW_S - 60);
    // The admin's account itself is not locked: from any other address the password works.
    expect((await attempt(await openTab(s.app), demoEmail('admin'), DEMO_PASSWORD, '203.0.113.77')).status).toBe(200);
    await started.pop()!.shutdown();
  });

  it('without TRUST_PROXY, X-Forwarded-For is ignored: every guess counts on the socket address', async () => {
    const file = tempDataDir();
    const s = await start(file, { signInAddressLimit: 4 });
    const tab = await openTab(s.app);
    const statuses: number[] = [];
    for (let i = 0; i < 6; i++) statuses.push((await attempt(tab, `nobody-${i}@demo.panelpoint.test`, 'guess', `203.0.113.${i + 1}`)).status);
    expect(statuses).toEqual([401, 401, 401, 401, 429, 429]);
    await started.pop()!.shutdown();
  });

  it('unknown e-mails are counted like known ones, so the answers do not tell which accounts exist', async () => {
    const file = tempDataDir();
    const s = await start(file);
    const tab = await openTab(s.app);
    const known: number[] = [];
    const unknown: number[] = [];
    for (let i = 0; i < 6; i++) known.push((await attempt(tab, demoEmail('reviewer'), 'guess')).status);
    for (let i = 0; i < 6; i++) unknown.push((await attempt(tab, 'no-such-person@demo.panelpoint.test', 'guess')).status);
    expect(known).toEqual([401, 401, 401, 401, 401, 429]);
    expect(unknown).toEqual(known);
    await started.pop()!.shutdown();
  });
});
