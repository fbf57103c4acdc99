import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { startServices, type Services } from '../../server/bootstrap';
import { Drawing } from '../../server/db/models';
import { FIRM_KEY_FILE } from '../../server/modules/records/firm-key';
import { localFileStore } from '../../server/storage/file-store';
import { loadConfig } from '../../server/config';
import { demoEmail, signIn, tempDataDir } from '../support/test-services';
import { tinyPdf } from '../support/tiny-pdf';

// File modes and the sweep of left-over uploads, on a real data folder and SQLite file.
// Modes are read back with fs.stat (POSIX permission bits).
const mode = (file: string) => fs.statSync(file).mode & 0o777;
const started: Services[] = [];
const dirs: string[] = [];
afterAll(async () => {
  while (started.length) await started.pop()!.shutdown();
  for (const dir of dirs) fs.rmSync(dir, { recursive: true, force: true });
});

async function startOn(file: ReturnType<typeof tempDataDir>, uploadsDir: string, log: string[] = []) {
  // As startTestServices, but with a log that is kept.
  const config = { ...loadConfig({ NODE_ENV: 'test' }), ...file, uploadsDir, bcryptRounds: 4, publicUrl: 'http://panelpoint.test' };
  const s = await startServices(config, { log: (m) => log.push(m) });
  started.push(s);
  return s;
}

function freshFolders() {
  const file = tempDataDir();
  const uploadsDir = fs.mkdtempSync(path.join(os.tmpdir(), 'panelpoint-uploads-'));
  dirs.push(file.dataDir, uploadsDir);
  return { file, uploadsDir };
}

describe('files Panelpoint writes are readable by its own user only', () => {
  it('the database (and its WAL files), the session secret, the firm key, uploads and stored sheets are 0600; the folders 0700', async () => {
    const { file, uploadsDir } = freshFolders();
    const s = await startOn(file, uploadsDir);
    const drafter = await signIn(s.app, demoEmail('drafter'));
    const dxf = fs.readFileSync(path.join(import.meta.dirname, '..', 'fixtures', 'dxf', 'r12-four-panel-unitless.dxf'));
    const truss = await drafter.agent.post('/api/projects/1/trusses').set('X-CSRF-Token', drafter.csrf).send({ name: 'T-modes' });
    const up = await drafter.agent.post(`/api/trusses/${truss.body.id}/drawings`).set('X-CSRF-Token', drafter.csrf).attach('file', dxf, 'modes.dxf');
    expect(up.status).toBe(201);
    // An issued sheet is written through the same store the sheet-revision service uses.
    await localFileStore(path.join(file.dataDir, 'issued-sheets')).put('probe.pdf', tinyPdf(['mode probe']));

    const db = file.databaseStorage;
    const expected = [db, `${db}-wal`, `${db}-shm`, path.join(file.dataDir, 'session-secret'), path.join(file.dataDir, FIRM_KEY_FILE), path.join(file.dataDir, 'issued-sheets', 'probe.pdf')];
    for (const f of expected) expect([f, mode(f).toString(8)]).toEqual([f, '600']);
    const uploads = fs.readdirSync(uploadsDir);
    expect(uploads.length).toBeGreaterThanOrEqual(2); // the demo drawing and the new one
    for (const f of uploads) expect([f, mode(path.join(uploadsDir, f)).toString(8)]).toEqual([f, '600']);
    for (const d of [file.dataDir, uploadsDir, path.join(file.dataDir, 'issued-sheets')]) expect([d, mode(d).toString(8)]).toEqual([d, '700']);
  });

  it('files an older version left with 0644 are made 0600 at the next start, and the start says so', async () => {
    const { file, uploadsDir } = freshFolders();
    await startOn(file, uploadsDir);
    await started.pop()!.shutdown();
    fs.chmodSync(file.databaseStorage, 0o644);
    fs.chmodSync(path.join(file.dataDir, 'session-secret'), 0o644);
    fs.chmodSync(file.dataDir, 0o755);
    const log: string[] = [];
    await startOn(file, uploadsDir, log);
    expect(mode(file.databaseStorage)).toBe(0o600);
    expect(mode(path.join(file.dataDir, 'session-secret'))).toBe(0o600);
    expect(mode(file.dataDir)).toBe(0o700);
    expect(log.join('\n')).toMatch(/readable by this user only/);
  });
});

describe('uploads left behind by a crash are swept at start', () => {
  it('removes old files no drawing names and .part files, keeps every referenced file and young unreferenced ones, and logs it', async () => {
    const { file, uploadsDir } = freshFolders();
    await startOn(file, uploadsDir);
    const referenced = (await Drawing.findAll({ raw: true })).map((d) => d.storedName);
    expect(referenced.length).toBeGreaterThan(0);
    await started.pop()!.shutdown();

    const twoHoursAgo = new Date(Date.now() - 2 * 3600 * 1000);
    const put = (dir: string, name: string, old: boolean) => {
      fs.mkdirSync(dir, { recursive: true });
      fs.writeFileSync(path.join(dir, name), 'x');
      if (old) fs.utimesSync(path.join(dir, name), twoHoursAgo, twoHoursAgo);
    };
    put(uploadsDir, 'aaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaa.dxf', true); // multer wrote it, the request died
    put(uploadsDir, 'bbbbbbbbbbbbbbbbbbbbbbbbbbbbbbbb.dxf.part', true); // a store write never renamed
    put(uploadsDir, 'cccccccccccccccccccccccccccccccc.dxf', false); // maybe another process's upload in flight
    const sheets = path.join(file.dataDir, 'issued-sheets');
    put(sheets, 'r1.pdf.part', true);
    put(sheets, 'r1.pdf', true); // a stored sheet: never swept by row
    for (const name of referenced) fs.utimesSync(path.join(uploadsDir, name), twoHoursAgo, twoHoursAgo);

    const log: string[] = [];
    await startOn(file, uploadsDir, log);
    const left = fs.readdirSync(uploadsDir).sort();
    expect(left).toEqual([...referenced, 'cccccccccccccccccccccccccccccccc.dxf'].sort());
    expect(fs.readdirSync(sheets)).toEqual(['r1.pdf']);
    const said = log.join('\n');
    expect(said).toMatch(/Removed 3 file\(s\) left behind/);
    expect(said).toContain('aaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaa.dxf');
    expect(said).toMatch(/Kept 1 unreferenced upload/);
  });
});
