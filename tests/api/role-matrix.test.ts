import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import type { Services } from '../../server/bootstrap';
import { demoEmail, openTab, signIn, startTestServices, type Tab } from '../support/test-services';

/**
 * Who may call each route, written out from the role table of the product design
 * (drafter uploads, engineer models/runs/issues, reviewer checks, admin manages users and
 * the firm; everyone in the firm reads projects). 'public' routes need no session.
 * Every route the app registers must appear here, and every row here must exist.
 */
type Who = 'anon' | 'drafter' | 'engineer' | 'reviewer' | 'admin';
const ALL = ['drafter', 'engineer', 'reviewer', 'admin'] as const;
const EXPECTED: Record<string, 'public' | readonly Who[]> = {
  'GET /api/session': 'public',
  'POST /api/session': 'public',
  'DELETE /api/session': 'public',
  'GET /api/invitations/:token': 'public',
  'POST /api/invitations/accept': 'public',
  'POST /api/account/password': ALL,
  'POST /api/password-resets': 'public',
  'GET /api/password-resets/:token': 'public',
  'POST /api/password-resets/complete': 'public',
  'GET /api/users': ['admin'],
  'POST /api/users/invitations': ['admin'],
  'PATCH /api/users/:id': ['admin'],
  'POST /api/users/:id/password-reset': ['admin'],
  'GET /api/me/email-settings': ALL,
  'PUT /api/me/email-settings': ALL,
  'GET /api/me/work': ALL,
  'GET /api/outbox': ['admin'],
  'GET /api/firm': ALL,
  'PUT /api/firm': ['admin'],
  'GET /api/firm/import-limits': ALL,
  'PUT /api/firm/import-limits': ['admin'],
  'GET /api/projects': ALL,
  'POST /api/projects': ['engineer', 'admin'],
  'GET /api/projects/:id': ALL,
  'PATCH /api/projects/:id': ['engineer', 'admin'],
  'GET /api/projects/:id/trusses': ALL,
  'POST /api/projects/:id/trusses': ['drafter', 'engineer', 'admin'],
  'GET /api/trusses/:id': ALL,
  'GET /api/trusses/:id/drawings': ALL,
  'POST /api/trusses/:id/drawings': ['drafter', 'engineer'],
  'GET /api/drawings/:id': ALL,
  'POST /api/drawings/:id/reimport': ['drafter', 'engineer'],
  'GET /api/drawings/:id/file': ALL,
  'GET /api/trusses/:id/model': ALL,
  'PUT /api/trusses/:id/model': ['engineer'],
  'POST /api/trusses/:id/model/detach-loads': ['engineer'],
  'PUT /api/trusses/:id/design': ['engineer'],
  'GET /api/trusses/:id/sheets': ALL,
  'POST /api/trusses/:id/sheets': ['engineer'],
  'GET /api/sheets/:id': ALL,
  'GET /api/checkers': ['engineer', 'admin'],
  'GET /api/sheets/:id/compare': ALL,
  'POST /api/sheets/:id/submit': ['engineer'],
  'POST /api/sheets/:id/checker': ['admin'],
  'POST /api/sheets/:id/return': ['reviewer'],
  'POST /api/sheets/:id/check': ['reviewer'],
  'POST /api/sheets/:id/issue': ['engineer'],
  'GET /api/sheets/:id/pdf': ALL,
  'POST /api/sheets/:id/comments': ['engineer', 'reviewer'],
  'PATCH /api/sheet-comments/:id': ['engineer', 'reviewer'],
  'GET /api/archive': ALL,
  'POST /api/archive/verify': ALL,
  'GET /api/public/verify/:id': 'public',
  'POST /api/public/verify': 'public',
  'GET /api/firm/signing-key': ['admin'],
  'GET /api/firm/signing-keys': ['admin'],
  'POST /api/firm/signing-keys/rotate': ['admin'],
  'GET /api/admin/audit-chain': ['admin'],
  'POST /api/trusses/:id/takeoff/preview': ['engineer'],
  'GET /api/trusses/:id/job-file': ALL,
  'POST /api/trusses/:id/job-file': ['engineer'],
  'POST /api/trusses/:id/runs': ['engineer'],
  'GET /api/trusses/:id/runs': ALL,
  'GET /api/runs/:id': ALL,
  'GET /api/runs/:id/forces.csv': ALL,
  'GET /api/runs/:id/reactions.csv': ALL,
  'POST /api/runs/:id/design': ['engineer'],
  'GET /api/runs/:id/sheet': ALL,
  'GET /api/runs/:id/sheet.pdf': ALL,
  'POST /api/runs/:id/sheet-jobs': ALL,
  'GET /api/runs/:id/sheet-jobs': ALL,
  'GET /api/sheet-jobs/:id': ALL,
  'GET /api/sheet-jobs/:id/pdf': ALL,
  'GET /api/sheets/:id/preview': ALL,
};

let services: Services;
const tabs = {} as Record<Who, Tab>;

beforeAll(async () => {
  services = await startTestServices();
  tabs.anon = await openTab(services.app);
  for (const role of ALL) tabs[role] = await signIn(services.app, demoEmail(role));
});
afterAll(async () => {
  await services.shutdown();
});

/** A concrete path for a route pattern: ids of the demo project (1) and an unknown token. */
const concrete = (pattern: string) => pattern.replace(':id', '999999').replace(':token', 'no-such-invitation-token-000');

describe('role matrix', () => {
  it('when the app lists its routes, then each is in the expected matrix and each row exists', () => {
    const registered = services.routes.map((r) => `${r.method.toUpperCase()} ${r.path}`).sort();
    expect(registered).toEqual(Object.keys(EXPECTED).sort());
  });

  const cases: [string, Who, boolean][] = [];
  for (const [route, allowed] of Object.entries(EXPECTED)) {
    for (const who of ['anon', ...ALL] as Who[]) {
      cases.push([route, who, allowed === 'public' || allowed.includes(who)]);
    }
  }

  it.each(cases)('%s as %s → allowed: %s', async (route, who, allowed) => {
    const [method, pattern] = route.split(' ');
    // Signing out would end the shared tab's session, so that row gets a tab of its own.
    const tab =
      route === 'DELETE /api/session'
        ? who === 'anon'
          ? await openTab(services.app)
          : await signIn(services.app, demoEmail(who))
        : tabs[who];
    const path = concrete(pattern);
    const call = tab.agent[method.toLowerCase() as 'get' | 'post' | 'patch' | 'put' | 'delete'](path).set('X-CSRF-Token', tab.csrf);
    // An empty body: allowed calls then fail validation or find nothing, never reach a write.
    const res = method === 'GET' ? await call : await call.send({});
    if (allowed) {
      expect([401, 403]).not.toContain(res.status);
    } else {
      expect(res.status).toBe(who === 'anon' ? 401 : 403);
      expect(res.body.error.code).toBe(who === 'anon' ? 'not-signed-in' : 'forbidden');
    }
  });

  it('when a signed-out tab signs out again, then it is harmless', async () => {
    const tab = await openTab(services.app);
    await tab.agent.delete('/api/session').set('X-CSRF-Token', tab.csrf).expect(204);
  });

  it('when no cookie at all is sent, then reads are 401', async () => {
    const res = await request(services.app).get('/api/projects');
    expect(res.status).toBe(401);
  });
});
