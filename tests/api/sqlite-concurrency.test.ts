import http from 'node:http';
import type { AddressInfo } from 'node:net';
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import type { Services } from '../../server/bootstrap';
import { demoEmail, signIn, startTestServices, type Tab } from '../support/test-services';
import { pgTestsOn } from '../support/pg';

/**
 * Several people at once on a real SQLite file (WAL, one file, separate connections for
 * transactions), through a real HTTP server: readers, model savers and drawing uploads in
 * parallel. None of it may answer 500.
 */
let services: Services;
let server: http.Server;
let base: string;
let trussId: number;
let uploadTrussId: number;

const dxf = fs.readFileSync(path.join(import.meta.dirname, '..', 'fixtures', 'dxf', 'r2000-faults-mm.dxf'));

beforeAll(async () => {
  services = await startTestServices({}, { realFile: true });
  server = http.createServer(services.app);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const engineer = await signIn(base, demoEmail('engineer'));
  const trusses = await engineer.agent.get('/api/projects/1/trusses').expect(200);
  trussId = trusses.body[0].id;
  // Uploads go to the other truss: a drawing re-sets geometry, which would disturb the savers.
  uploadTrussId = trusses.body[1].id;
});
afterAll(async () => {
  await new Promise((resolve) => server.close(resolve));
  await services.shutdown();
});

async function modelSave(tab: Tab, version: number) {
  const current = await tab.agent.get(`/api/trusses/${trussId}/model`);
  const m = current.body.model;
  return tab.agent
    .put(`/api/trusses/${trussId}/model`)
    .set('X-CSRF-Token', tab.csrf)
    .send({ version, supports: m.supports, loadCases: m.loadCases, combinations: m.combinations, members: [] });
}

describe('SQLite under parallel use (real file)', () => {
  // SQLite's own settings (PRAGMA); the PostgreSQL run of the suite has no file to look at.
  it.skipIf(pgTestsOn())('is a file in WAL mode with a busy timeout on every connection', async () => {
    expect(fs.existsSync(services.config.databaseStorage)).toBe(true);
    const [[mode]] = (await services.sequelize.query('PRAGMA journal_mode;')) as [{ journal_mode: string }[], unknown];
    expect(mode.journal_mode).toBe('wal');
    // A transaction runs on its own connection; it must carry the timeout too.
    const timeout = await services.sequelize.transaction(async (transaction) => {
      const [[row]] = (await services.sequelize.query('PRAGMA busy_timeout;', { transaction })) as [Record<string, number>[], unknown];
      return Object.values(row)[0];
    });
    expect(timeout).toBeGreaterThanOrEqual(5000);
  });

  it('when four people read while two engineers save and a drafter uploads, then no request answers 500 and every save is either applied or 409', async () => {
    const readers = await Promise.all(['drafter', 'reviewer', 'admin', 'engineer'].map((r) => signIn(base, demoEmail(r as 'drafter'))));
    const writers = await Promise.all([signIn(base, demoEmail('engineer')), signIn(base, demoEmail('engineer'))]);
    const uploader = await signIn(base, demoEmail('drafter'));
    const statuses: number[] = [];
    const bodies: string[] = [];
    const note = (res: request.Response) => {
      statuses.push(res.status);
      if (res.status >= 500) bodies.push(JSON.stringify(res.body));
      return res;
    };
    let applied = 0;
    let conflicts = 0;
    const readLoop = async (tab: Tab) => {
      for (let i = 0; i < 25; i++) {
        note(await tab.agent.get('/api/projects'));
        note(await tab.agent.get(`/api/trusses/${trussId}/model`));
      }
    };
    const writeLoop = async (tab: Tab) => {
      for (let i = 0; i < 20; i++) {
        const current = note(await tab.agent.get(`/api/trusses/${trussId}/model`));
        const res = note(await modelSave(tab, current.body.version));
        if (res.status === 200) applied++;
        else if (res.status === 409) conflicts++;
      }
    };
    const uploadLoop = async (tab: Tab) => {
      for (let i = 0; i < 8; i++) {
        note(await tab.agent.post(`/api/trusses/${uploadTrussId}/drawings`).set('X-CSRF-Token', tab.csrf).attach('file', dxf, `t1-${i}.dxf`));
      }
    };
    const before = (await writers[0].agent.get(`/api/trusses/${trussId}/model`)).body.version as number;
    await Promise.all([...readers.map(readLoop), ...writers.map(writeLoop), uploadLoop(uploader)]);
    expect(bodies).toEqual([]);
    expect(statuses.filter((s) => s >= 500)).toHaveLength(0);
    expect(applied + conflicts).toBe(40);
    // Every applied save moved the version by exactly one, so none was lost or applied twice.
    const after = (await writers[0].agent.get(`/api/trusses/${trussId}/model`)).body.version as number;
    expect(after - before).toBe(applied);
  }, 120_000);

  it('when two engineers save the same version at the same moment, then one is applied and the other gets 409 with the edit-conflict sentence, in every round', async () => {
    const a = await signIn(base, demoEmail('engineer'));
    const b = await signIn(base, demoEmail('engineer'));
    for (let round = 0; round < 15; round++) {
      const version = (await a.agent.get(`/api/trusses/${trussId}/model`)).body.version as number;
      const [ra, rb] = await Promise.all([modelSave(a, version), modelSave(b, version)]);
      expect([ra.status, rb.status].sort()).toEqual([200, 409]);
      const loser = ra.status === 409 ? ra : rb;
      expect(loser.body.error.code).toBe('edit-conflict');
      expect(loser.body.error.message).toMatch(/^Someone else saved this model/);
    }
  }, 60_000);
});
