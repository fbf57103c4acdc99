import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { loadConfig } from '../../server/config';
import { startServices } from '../../server/bootstrap';
import { AnalysisRun } from '../../server/db/models';
import { demoEmail, signIn } from '../support/test-services';

const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'panelpoint-restart-'));
afterAll(() => fs.rmSync(dataDir, { recursive: true, force: true }));

const config = () => ({
  ...loadConfig({ NODE_ENV: 'test', DATA_DIR: dataDir, UPLOADS_DIR: path.join(dataDir, 'uploads') }),
  bcryptRounds: 4,
});

describe('runs interrupted by a server stop', () => {
  it('when the server starts again, then a run left queued or running is failed with a message to run again', async () => {
    const first = await startServices(config(), { log: () => {} });
    const stuck = await AnalysisRun.create({
      trussId: 1,
      number: (await AnalysisRun.count({ where: { trussId: 1 } })) + 1,
      modelVersion: 1,
      status: 'running',
      progress: JSON.stringify({ phase: 'solving', fraction: 0.1 }),
      model: '{}',
      takeoff: null,
      analysis: null,
      summary: null,
      error: null,
      ranById: null,
      startedAt: new Date(),
      finishedAt: null,
    });
    await first.shutdown();

    const second = await startServices(config(), { log: () => {} });
    try {
      const tab = await signIn(second.app, demoEmail('reviewer'));
      const run = (await tab.agent.get(`/api/runs/${stuck.id}`).expect(200)).body;
      expect(run.status).toBe('failed');
      expect(run.error).toMatchObject({ code: 'server-restarted' });
      expect(run.error.message).toMatch(/Run the analysis again/);
    } finally {
      await second.shutdown();
    }
  });
});
