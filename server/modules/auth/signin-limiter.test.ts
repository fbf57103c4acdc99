import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Sequelize } from 'sequelize';
import { openDatabase } from '../../db/sequelize';
import { migrate } from '../../db/migrate';
import { PRUNE_IDLE_MS, addressKey, refusalMessage, signInLimiterCreate, type Attempt, type Refusal } from './signin-limiter';

// The limiter against a real SQLite file (WAL, IMMEDIATE transactions), with a clock the test
// moves on. Two Sequelize instances on one file stand for two server processes.
const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'panelpoint-limits-'));
const file = path.join(dir, 'panelpoint.sqlite');
let a: Sequelize;
let b: Sequelize;
let clock = Date.UTC(2026, 0, 5, 9, 0, 0);
const now = () => clock;
const MIN = 60_000;
const WINDOW = 15 * MIN;
const limits = { accountLimit: 5, addressLimit: 50, windowMs: WINDOW, now };

beforeAll(async () => {
  a = await openDatabase(file);
  await migrate(a);
  b = await openDatabase(file);
});
afterAll(async () => {
  await a.close();
  await b.close();
  fs.rmSync(dir, { recursive: true, force: true });
});

const isRefusal = (x: Refusal | Attempt): x is Refusal => x.refused;
async function fail(limiter: ReturnType<typeof signInLimiterCreate>, email: string, address: string) {
  const attempt = await limiter.begin(email, address);
  if (isRefusal(attempt)) return attempt;
  await attempt.failed();
  return null;
}

describe('sign-in limiter on a SQLite file', () => {
  it('locks an account after 5 failures for one window, then doubles the lock each time (backoff) up to the cap', async () => {
    const limiter = signInLimiterCreate(a, { ...limits, maxLockMs: 4 * WINDOW });
    const email = 'backoff@firm.test';
    // Lock lengths expected: window × 2^(n−1), capped at 4 windows — our own rule, worked by hand.
    for (const expectedLockMs of [WINDOW, 2 * WINDOW, 4 * WINDOW, 4 * WINDOW]) {
      for (let i = 0; i < 5; i++) expect(await fail(limiter, email, '192.0.2.10')).toBeNull();
      const refused = await limiter.begin(email, '192.0.2.10');
      expect(refused).toMatchObject({ refused: true, kind: 'account', retryAt: clock + expectedLockMs, retryAfterSeconds: expectedLockMs / 1000 });
      clock += expectedLockMs - 1000;
      expect((await limiter.begin(email, '192.0.2.10')).refused).toBe(true);
      clock += 1000;
    }
    // A success clears the count and the backoff.
    const ok = await limiter.begin(email, '192.0.2.10');
    expect(ok.refused).toBe(false);
    await (ok as Attempt).succeeded();
    for (let i = 0; i < 5; i++) expect(await fail(limiter, email, '192.0.2.10')).toBeNull();
    expect(await limiter.begin(email, '192.0.2.10')).toMatchObject({ kind: 'account', retryAfterSeconds: WINDOW / 1000 });
    clock += WINDOW;
  });

  it('counts in a window: failures older than 15 minutes no longer count', async () => {
    const limiter = signInLimiterCreate(a, limits);
    for (let i = 0; i < 4; i++) await fail(limiter, 'window@firm.test', '192.0.2.11');
    clock += WINDOW;
    for (let i = 0; i < 4; i++) expect(await fail(limiter, 'window@firm.test', '192.0.2.11')).toBeNull();
    expect((await limiter.begin('window@firm.test', '192.0.2.11')).refused).toBe(false);
  });

  it('a success resets the account count: 4 failures, success, 4 failures, success never locks', async () => {
    const limiter = signInLimiterCreate(a, limits);
    for (let round = 0; round < 3; round++) {
      for (let i = 0; i < 4; i++) expect(await fail(limiter, 'reset@firm.test', '192.0.2.12')).toBeNull();
      const ok = await limiter.begin('reset@firm.test', '192.0.2.12');
      expect(ok.refused).toBe(false);
      await (ok as Attempt).succeeded();
    }
  });

  it('locks an address after 50 failures over many accounts, and leaves every other address alone', async () => {
    const limiter = signInLimiterCreate(a, limits);
    for (let i = 0; i < 50; i++) expect(await fail(limiter, `spray-${i}@firm.test`, '198.51.100.20')).toBeNull();
    const refused = await limiter.begin('owner@firm.test', '198.51.100.20');
    expect(refused).toMatchObject({ refused: true, kind: 'address', retryAfterSeconds: WINDOW / 1000 });
    expect(refusalMessage(refused as Refusal)).toMatch(/network address: try again in 15 minutes \(after \d{4}-\d\d-\d\d \d\d:\d\d UTC\)\.$/);
    // The owner of an account the sprayer never tried signs in from another address.
    expect((await limiter.begin('owner@firm.test', '198.51.100.21')).refused).toBe(false);
  });

  it('counts from two processes on one file add up, and a burst of parallel attempts gets exactly the limit through', async () => {
    const one = signInLimiterCreate(a, limits);
    const two = signInLimiterCreate(b, limits);
    for (let i = 0; i < 3; i++) await fail(one, 'shared@firm.test', '192.0.2.30');
    for (let i = 0; i < 2; i++) await fail(two, 'shared@firm.test', '192.0.2.31');
    expect(await one.begin('shared@firm.test', '192.0.2.32')).toMatchObject({ refused: true, kind: 'account' });
    expect(await two.begin('shared@firm.test', '192.0.2.33')).toMatchObject({ refused: true, kind: 'account' });

    const burst = await Promise.all(Array.from({ length: 20 }, (_, i) => (i % 2 ? one : two).begin('burst@firm.test', `192.0.2.${40 + i}`)));
    expect(burst.filter((x) => !x.refused)).toHaveLength(5);
    await Promise.all(burst.filter((x): x is Attempt => !x.refused).map((x) => x.failed()));
    expect(await one.begin('burst@firm.test', '192.0.2.99')).toMatchObject({ refused: true, retryAfterSeconds: WINDOW / 1000 });
  });

  it('prunes rows idle for a day, keeping rows that are still locked', async () => {
    const limiter = signInLimiterCreate(a, { ...limits, maxLockMs: 2 * PRUNE_IDLE_MS });
    // Walk 'locked@' into a lock longer than a day (window × 2^(n−1) = 32 h at the 8th lock).
    for (let n = 0; n < 8; n++) {
      for (let i = 0; i < 5; i++) await fail(limiter, 'locked@firm.test', '192.0.2.51');
      const r = (await limiter.begin('locked@firm.test', '192.0.2.51')) as Refusal;
      if (n < 7) clock = r.retryAt;
    }
    await fail(limiter, 'idle@firm.test', '192.0.2.50');
    const count = async (key: string) => ((await a.query('SELECT COUNT(*) AS n FROM signin_limits WHERE key = ?', { replacements: [key], plain: true })) as { n: number }).n;
    expect(await count('account:idle@firm.test')).toBe(1);
    clock += PRUNE_IDLE_MS + 1;
    expect(await limiter.prune()).toBeGreaterThan(0);
    expect(await count('account:idle@firm.test')).toBe(0);
    expect(await count('account:locked@firm.test')).toBe(1);
    clock += 2 * PRUNE_IDLE_MS;
  });
});

describe('the address a limit counts on', () => {
  it('IPv4 and IPv4-mapped IPv6 are the same address', () => {
    expect(addressKey('::ffff:203.0.113.9')).toBe(addressKey('203.0.113.9'));
  });

  it('IPv6 addresses count by their /64 (membership checked with node:net BlockList)', () => {
    const samples = ['2001:db8:1:2::1', '2001:db8:1:2:a:b:c:d', '2001:0db8:0001:0002:ffff::9', '2001:db8:1:3::1', '2001:db8::1', 'fe80::1%eth0', '::1'];
    for (const x of samples) {
      for (const y of samples) {
        const subnet = new net.BlockList();
        subnet.addSubnet(x.split('%')[0], 64, 'ipv6');
        expect(addressKey(x) === addressKey(y), `${x} vs ${y}`).toBe(subnet.check(y.split('%')[0], 'ipv6'));
      }
    }
  });
});
