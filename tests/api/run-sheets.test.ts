import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Services } from '../../server/bootstrap';
import type { RunView } from '@shared/schemas/run.schema';
import { binaryBody, solvedDemoRun } from '../support/fixtures';
import { demoEmail, demoUserId, signIn, startTestServices, type Tab } from '../support/test-services';

/**
 * The demo truss T1 (12 m span, 3 m rise, six 2 m panels, diagonals from the upper joints
 * down toward mid-span) with 10 kN at each of the five upper panel points, pinned at the left
 * bearing and on a roller at the right.
 *
 * Expected values by hand (method of joints, tension positive):
 *   reactions R = 5 × 10 / 2 = 25 kN at each bearing (symmetry, ΣFy = 0);
 *   at the left bearing the top chord rises 1 in 2, so its vertical component balances R:
 *   N_top = −R·√5 = −55.90 kN (C) and the bottom chord takes its horizontal part, +2R = +50.00 kN (T).
 */
let services: Services;
let engineer: Tab;
let reviewer: Tab;
let run: RunView;

const text = (pdf: Buffer) => {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'pp-sheet-'));
  const file = path.join(dir, 'sheet.pdf');
  fs.writeFileSync(file, pdf);
  try {
    return execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' });
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
};
const binary = binaryBody;

beforeAll(async () => {
  services = await startTestServices();
  engineer = await signIn(services.app, demoEmail('engineer'));
  reviewer = await signIn(services.app, demoEmail('reviewer'));
  run = await solvedDemoRun(engineer);
}, 60_000);

afterAll(async () => {
  await services.shutdown();
});

describe('calc sheet of an analysis run', () => {
  it('when a reviewer opens the preview, then it is the sheet HTML with the caution and the run named', async () => {
    const res = await reviewer.agent.get(`/api/runs/${run.id}/sheet`);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/text\/html/);
    expect(res.text).toMatch(/reviewed by a licensed/i);
    expect(res.text).toContain('HV-2417');
    // Cited as the app and the e-mails cite it: the number within the truss, the truss, the model save.
    const truss = (await reviewer.agent.get('/api/trusses/1').expect(200)).body as { name: string };
    expect(res.text).toContain(`Run ${run.number} of ${truss.name} (model save ${run.modelVersion})`);
    expect(res.text).not.toContain(`run Run ${run.number}`);
  });

  it('when the draft PDF is downloaded, then its file name carries the job, the truss and the run number within the truss', async () => {
    const truss = (await reviewer.agent.get('/api/trusses/1').expect(200)).body as { name: string; projectId: number };
    const project = (await reviewer.agent.get(`/api/projects/${truss.projectId}`).expect(200)).body as { jobNumber: string };
    const res = await binary(reviewer.agent.get(`/api/runs/${run.id}/sheet.pdf`));
    expect(res.status).toBe(200);
    const part = (t: string) => t.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '');
    expect(res.headers['content-disposition']).toContain(`${part(project.jobNumber)}-${part(truss.name)}-run-${run.number}-calc-sheet-draft.pdf`);
  }, 60_000);

  it('when the PDF is downloaded, then its text carries the hand-computed reactions and chord forces', async () => {
    const res = await binary(reviewer.agent.get(`/api/runs/${run.id}/sheet.pdf`));
    expect(res.status).toBe(200);
    const pdf = res.body as Buffer;
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
    const t = text(pdf);
    expect(t).toMatch(/25\.00/);
    expect(t).toMatch(/55\.90/);
    expect(t).toMatch(/50\.00/);
  }, 60_000);

  it('when a revision is checked and issued, then the issued PDF is the real sheet with both signers and it verifies', async () => {
    const created = await engineer.agent.post('/api/trusses/1/sheets').set('X-CSRF-Token', engineer.csrf).send({ runId: run.id });
    expect(created.status).toBe(201);
    const id = created.body.id;
    const preview = await reviewer.agent.get(`/api/sheets/${id}/preview`);
    expect(preview.status).toBe(200);
    expect(preview.text).toContain('Eli Marsh');

    await engineer.agent.post(`/api/sheets/${id}/submit`).set('X-CSRF-Token', engineer.csrf).send({ checkerId: await demoUserId() }).expect(200);
    await reviewer.agent.post(`/api/sheets/${id}/check`).set('X-CSRF-Token', reviewer.csrf).send({}).expect(200);
    const issued = await engineer.agent.post(`/api/sheets/${id}/issue`).set('X-CSRF-Token', engineer.csrf).send({});
    expect(issued.status).toBe(200);
    expect(issued.body.status).toBe('issued');

    const pdf = (await binary(reviewer.agent.get(`/api/sheets/${id}/pdf`))).body as Buffer;
    const t = text(pdf);
    expect(t).toContain('Eli Marsh');
    expect(t).toContain('Rosa Quint');
    expect(t).toMatch(/Issued by\s+Eli Marsh/);
    expect(t).toMatch(/55\.90/);

    const verified = await reviewer.agent.post('/api/archive/verify').set('X-CSRF-Token', reviewer.csrf).attach('file', pdf, 'issued.pdf');
    expect(verified.status).toBe(200);
    expect(verified.body.match.sheetId).toBe(id);
    expect(verified.body.signature).toBe('valid');
  }, 90_000);

  it('when the run does not exist, then 404 and no browser work', async () => {
    expect((await reviewer.agent.get('/api/runs/99999/sheet.pdf')).status).toBe(404);
  });
});
