import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Services } from '../../server/bootstrap';
import { demoEmail, signIn, startTestServices, type Tab } from '../support/test-services';

// Several people at once on a real SQLite file (WAL, one connection per transaction), the way
// an office uses it — an in-memory database with one connection hid every SQLITE_BUSY.
const fixture = (name: string) => fs.readFileSync(path.join(import.meta.dirname, '..', 'fixtures', 'dxf', name));

let services: Services;
let dataDir: string;
let readers: Tab[];
let engineerA: Tab;
let engineerB: Tab;
let drafter: Tab;
let modelTruss: number;
let uploadTruss: number;

beforeAll(async () => {
  dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'pp-concurrency-'));
  services = await startTestServices({
    dataDir,
    databaseStorage: path.join(dataDir, 'panelpoint.sqlite'),
    uploadsDir: path.join(dataDir, 'uploads'),
    maxUploadBytes: 200_000,
  });
  const app = services.app;
  readers = await Promise.all((['drafter', 'reviewer', 'admin', 'engineer'] as const).map((r) => signIn(app, demoEmail(r))));
  engineerA = await signIn(app, demoEmail('engineer'));
  engineerB = await signIn(app, demoEmail('engineer'));
  drafter = await signIn(app, demoEmail('drafter'));
  const make = async (name: string) =>
    (await drafter.agent.post('/api/projects/1/trusses').set('X-CSRF-Token', drafter.csrf).send({ name }).expect(201)).body.id as number;
  modelTruss = await make('T20 — saved by two engineers');
  uploadTruss = await make('T21 — drawings uploaded meanwhile');
  await drafter.agent
    .post(`/api/trusses/${modelTruss}/drawings`)
    .set('X-CSRF-Token', drafter.csrf)
    .attach('file', fixture('r12-four-panel-unitless.dxf'), 't20.dxf')
    .field('units', 'm')
    .expect(201);
});
afterAll(async () => {
  await services.shutdown();
  fs.rmSync(dataDir, { recursive: true, force: true });
});

async function current(tab: Tab) {
  const res = await tab.agent.get(`/api/trusses/${modelTruss}/model`).expect(200);
  return res.body as { version: number; model: { supports: unknown[]; loadCases: unknown[]; combinations: unknown[]; members: Array<{ id: string }> } };
}

function save(tab: Tab, version: number, note: string) {
  return tab.agent
    .put(`/api/trusses/${modelTruss}/model`)
    .set('X-CSRF-Token', tab.csrf)
    .send({ version, supports: [], loadCases: [{ id: 'D', name: note, category: 'dead', loads: [] }], combinations: [], members: [] });
}

describe('several people at once on a real SQLite file', () => {
  it('four readers, two engineers saving and a drafter uploading: no 500, every save answers 200 or 409, none is lost', async () => {
    const statuses: Record<string, number[]> = { read: [], save: [], upload: [] };
    let writing = true;
    const reader = async (tab: Tab) => {
      while (writing) {
        for (const url of ['/api/projects', `/api/trusses/${modelTruss}/model`, '/api/projects/1/trusses']) {
          statuses.read.push((await tab.agent.get(url)).status);
        }
      }
    };
    let saved = 0;
    const saver = async (tab: Tab, who: string) => {
      for (let i = 0; i < 25; i++) {
        const { version } = await current(tab);
        const res = await save(tab, version, `${who} ${i}`);
        statuses.save.push(res.status);
        if (res.status === 200) saved++;
      }
    };
    const uploader = async () => {
      for (let i = 0; i < 12; i++) {
        const res = await drafter.agent
          .post(`/api/trusses/${uploadTruss}/drawings`)
          .set('X-CSRF-Token', drafter.csrf)
          .attach('file', fixture('r2000-faults-mm.dxf'), `t21-${i}.dxf`);
        statuses.upload.push(res.status);
      }
    };
    const { version: before } = await current(engineerA);
    const readersDone = Promise.all(readers.map(reader));
    await Promise.all([saver(engineerA, 'A'), saver(engineerB, 'B'), uploader()]);
    writing = false;
    await readersDone;

    expect(statuses.read.filter((s) => s !== 200)).toEqual([]);
    expect(statuses.upload.filter((s) => s !== 201)).toEqual([]);
    expect(statuses.save.filter((s) => s !== 200 && s !== 409)).toEqual([]);
    expect(saved).toBeGreaterThan(0);
    // Nothing saved is lost: each 200 moved the version on by exactly one.
    const { version: after } = await current(engineerA);
    expect(after - before).toBe(saved);
  });

  it('two engineers saving the same version at the same moment: one is saved, the other gets 409 with the reason, in every round', async () => {
    for (let round = 0; round < 15; round++) {
      const { version } = await current(engineerA);
      const [a, b] = await Promise.all([save(engineerA, version, `A round ${round}`), save(engineerB, version, `B round ${round}`)]);
      expect([a.status, b.status].sort()).toEqual([200, 409]);
      const loser = a.status === 409 ? a : b;
      expect(loser.body.error.code).toBe('edit-conflict');
      expect(loser.body.error.message).toMatch(/Someone else saved this model/);
      const winner = a.status === 200 ? 'A' : 'B';
      const now = await current(engineerA);
      expect(now.version).toBe(version + 1);
      expect((now.model.loadCases[0] as { name: string }).name).toBe(`${winner} round ${round}`);
    }
  });
});
