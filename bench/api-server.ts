/**
 * The server side of `npm run bench:api`, run as a child process of its own (bench/api.bench.ts
 * forks it), so the load generator's CPU is never counted in the server's latency.
 *
 * Starts the real services on a SQLite file (WAL) in a temp folder, or with BENCH_DATABASE_URL
 * on that (empty) PostgreSQL database with the pg-boss job queue (BENCH_WORKERS_IN_APP=false
 * leaves runs to `npm run worker` processes), seeds the demo firm plus
 * 60 projects of 4 trusses (an invented office's year of jobs) and 40 issued sheet revisions
 * for the archive, listens on loopback and tells the parent its port over IPC. On 'stop' it
 * closes everything, removes its folders and exits (with --cpu-prof, the profile is written then).
 */
import fs from 'node:fs';
import os from 'node:os';
import type { AddressInfo } from 'node:net';
import { loadConfig } from '../server/config';
import { startServices } from '../server/bootstrap';
import { AnalysisRun, Project, Truss, User, SheetRevision } from '../server/db/models';
import { tempDataDir } from '../tests/support/test-services';

export interface BenchServerReady {
  type: 'ready';
  port: number;
  sourceMaps: boolean;
  modelTruss: number;
  writerTrusses: [number, number];
}

async function seed(): Promise<{ modelTruss: number; writerTrusses: [number, number] }> {
  const eng = await User.findOne({ where: { role: 'engineer' } });
  for (let p = 0; p < 60; p++) {
    const project = await Project.create({
      name: `Bench job ${p + 1} — ${['depot roof', 'school hall', 'farm shed', 'retail canopy'][p % 4]}`,
      jobNumber: `BJ-${String(1000 + p)}`,
      client: `Client ${p % 17} (invented)`,
      site: `Plot ${p + 3}, Bench Road`,
      designBasis: 'Invented project for the API benchmark.',
      unitSystem: p % 5 === 0 ? 'US' : 'SI',
      createdById: eng!.id,
    });
    for (let t = 0; t < 4; t++) await Truss.create({ projectId: project.id, name: `T${t + 1}` });
  }
  const trusses = await Truss.findAll({ order: [['id', 'ASC']] });
  // The run the archive's revisions name (PostgreSQL checks the reference; SQLite's table has none to check).
  const run = await AnalysisRun.create({
    trussId: trusses[0].id, number: 1, modelVersion: 1, status: 'solved', progress: '{}', model: '{}', takeoff: null, analysis: null,
    summary: '{"note":"bench run"}', error: null, ranById: eng!.id, startedAt: new Date(), finishedAt: new Date(),
  } as never);
  // The archive: issued revisions straight into the table (printing 40 sheets is bench:sheet's job).
  for (let i = 0; i < 40; i++) {
    const truss = trusses[5 + i];
    // Inserted as a draft and then moved to issued, as the database's guards require.
    const row = await SheetRevision.create({
      trussId: truss.id,
      runId: run.id,
      number: 1,
      status: 'draft',
      preparedById: eng!.id,
      preparedByName: 'Eli Marsh',
      lastActorId: eng!.id,
      lastNote: '',
    } as never);
    await row.update({
      status: 'issued',
      checkedById: eng!.id,
      issuedById: eng!.id,
      checkedByName: 'Rosa Quint',
      issuedByName: 'Eli Marsh',
      submittedAt: new Date(),
      checkedAt: new Date(),
      issuedAt: new Date(Date.now() - i * 3600_000),
      pdfStoredName: `bench-${i}.pdf`,
      pdfSize: 120_000 + i,
      sha256: i.toString(16).padStart(2, '0').repeat(32),
      signedRecord: '{}',
      signature: 'ab'.repeat(32),
      keyFingerprint: 'cd'.repeat(32),
    } as never);
  }
  return { modelTruss: trusses[0].id, writerTrusses: [trusses[1].id, trusses[2].id] };
}

async function main() {
  const dir = tempDataDir();
  const config = {
    ...loadConfig({ NODE_ENV: 'test' }),
    ...dir,
    bcryptRounds: 4,
    publicUrl: 'http://127.0.0.1',
    uploadsDir: fs.mkdtempSync(`${os.tmpdir()}/panelpoint-bench-uploads-`),
    seedDemo: true,
    sourceMaps: process.env.SOURCE_MAPS === 'true',
    ...(process.env.BENCH_DATABASE_URL
      ? { databaseUrl: process.env.BENCH_DATABASE_URL, jobQueue: 'pg-boss' as const, workersInApp: process.env.BENCH_WORKERS_IN_APP !== 'false' }
      : {}),
  };
  const services = await startServices(config, { log: () => {} });
  const ids = await seed();
  const server = services.app.listen(0, '127.0.0.1');
  await new Promise((r) => server.once('listening', r));
  const ready: BenchServerReady = { type: 'ready', port: (server.address() as AddressInfo).port, sourceMaps: config.sourceMaps, ...ids };
  process.send!(ready);
  const removeFolders = () => {
    fs.rmSync(dir.dataDir, { recursive: true, force: true });
    fs.rmSync(config.uploadsDir, { recursive: true, force: true });
  };
  process.on('message', async (msg) => {
    if (msg !== 'stop') return;
    server.closeAllConnections();
    server.close();
    await services.shutdown();
    removeFolders();
    process.exit(0);
  });
  // The parent gone (Ctrl-C, a crash): do not linger.
  process.on('disconnect', () => {
    removeFolders();
    process.exit(1);
  });
}

await main();
