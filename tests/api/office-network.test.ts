import { afterEach, describe, expect, it } from 'vitest';
import type { Services } from '../../server/bootstrap';
import { openTab, startTestServices } from '../support/test-services';

const started: Services[] = [];
afterEach(async () => {
  while (started.length) await started.pop()!.shutdown();
});
async function start(overrides: Parameters<typeof startTestServices>[0]) {
  const s = await startTestServices(overrides);
  started.push(s);
  return s;
}

describe('on an office network', () => {
  it('over plain HTTP the pages are not told to upgrade to HTTPS (no upgrade-insecure-requests, no HSTS)', async () => {
    const { app } = await start({ publicUrl: 'http://panelpoint.lan' });
    const tab = await openTab(app);
    const res = await tab.agent.get('/api/session').expect(200);
    expect(res.headers['content-security-policy']).toBeDefined();
    expect(res.headers['content-security-policy']).not.toContain('upgrade-insecure-requests');
    expect(res.headers['strict-transport-security']).toBeUndefined();
  });

  it('over HTTPS both are sent', async () => {
    const { app } = await start({ publicUrl: 'https://panelpoint.example.com' });
    const tab = await openTab(app);
    const res = await tab.agent.get('/api/session').expect(200);
    expect(res.headers['content-security-policy']).toContain('upgrade-insecure-requests');
    expect(res.headers['strict-transport-security']).toContain('max-age=');
  });

  // Each guess names a different account, so only the per-address limit is in play.
  let n = 0;
  const guess = (tab: Awaited<ReturnType<typeof openTab>>, forwardedFor: string) =>
    tab.agent
      .post('/api/session')
      .set('X-CSRF-Token', tab.csrf)
      .set('X-Forwarded-For', forwardedFor)
      .send({ email: `nobody-${++n}@demo.panelpoint.test`, password: 'not the password at all' });

  it('without TRUST_PROXY a made-up X-Forwarded-For does not buy fresh sign-in attempts', async () => {
    const { app } = await start({ signInAddressLimit: 3 });
    const tab = await openTab(app);
    const statuses: number[] = [];
    for (let i = 0; i < 5; i++) statuses.push((await guess(tab, `203.0.113.${i + 1}`)).status);
    expect(statuses).toEqual([401, 401, 401, 429, 429]);
  });

  it('with TRUST_PROXY set, the forwarded address is the one counted', async () => {
    const { app } = await start({ signInAddressLimit: 3, trustProxy: 'loopback' });
    const tab = await openTab(app);
    const statuses: number[] = [];
    for (let i = 0; i < 5; i++) statuses.push((await guess(tab, `203.0.113.${i + 1}`)).status);
    expect(statuses).toEqual([401, 401, 401, 401, 401]);
    for (let i = 0; i < 3; i++) await guess(tab, '198.51.100.7');
    expect((await guess(tab, '198.51.100.7')).status).toBe(429);
  });
});
