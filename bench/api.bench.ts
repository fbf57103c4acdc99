/**
 * npm run bench:api — the API under load on loopback, against a real SQLite file (WAL) in a
 * temp folder, as one office server would run it.
 *
 * Seeds the demo firm plus 60 projects of 4 trusses (an invented office's year of jobs),
 * 40 issued sheet revisions for the archive, and the demo drawing imported on two trusses for
 * the writers. Then, with autocannon at 50 connections for DURATION seconds each (after a
 * 2 s warm-up), one signed-in engineer's cookie on every connection:
 *   GET /api/projects, GET /api/trusses/:id/model, GET /api/archive
 * each alone and again while two writers (two other engineers' sessions) save their trusses'
 * models back to back (GET the model, PUT it with its version). Prints req/s, p50, p97.5, p99
 * and max latency, non-2xx answers, the main thread's CPU time per request, and the writers'
 * saves per second and failures.
 * Asserts nothing. Usage: npm run bench:api [-- seconds]   (default 8)
 */
import fs from 'node:fs';
import os from 'node:os';
import type { AddressInfo } from 'node:net';
import autocannon from 'autocannon';
import { loadConfig } from '../server/config';
import { startServices } from '../server/bootstrap';
import { Project, Truss, User, SheetRevision } from '../server/db/models';
import { demoTrussDxf } from '../server/seed/demo-drawing';
import { DEMO_PASSWORD } from '../server/seed/demo';
import { tempDataDir } from '../tests/support/test-services';

const DURATION = Number(process.argv[2] ?? 8);
const CONNECTIONS = 50;

interface Session {
  cookie: string;
  csrf: string;
}

async function signIn(base: string, email: string): Promise<Session> {
  const first = await fetch(`${base}/api/session`);
  const cookie0 = first.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
  const { csrfToken } = (await first.json()) as { csrfToken: string };
  const res = await fetch(`${base}/api/session`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'x-csrf-token': csrfToken, cookie: cookie0 },
    body: JSON.stringify({ email, password: DEMO_PASSWORD }),
  });
  if (res.status !== 200) throw new Error(`sign-in as ${email}: ${res.status} ${await res.text()}`);
  const body = (await res.json()) as { csrfToken: string };
  const set = res.headers.getSetCookie().map((c) => c.split(';')[0]);
  const jar = new Map<string, string>();
  for (const c of [...cookie0.split('; '), ...set]) jar.set(c.split('=')[0], c);
  return { cookie: [...jar.values()].join('; '), csrf: body.csrfToken };
}

async function seed(base: string, engineer: Session, drafter: Session): Promise<{ modelTruss: number; writerTrusses: [number, number] }> {
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
  // The archive: issued revisions straight into the table (printing 40 sheets is bench:sheet's job).
  for (let i = 0; i < 40; i++) {
    const truss = trusses[5 + i];
    // Inserted as a draft and then moved to issued, as the database's guards require.
    const row = await SheetRevision.create({
      trussId: truss.id,
      runId: 1,
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
  const writerTrusses: [number, number] = [trusses[1].id, trusses[2].id];
  for (const id of writerTrusses) {
    const form = new FormData();
    form.set('layers', '["CHORDS","WEBS"]');
    form.set('file', new Blob([Buffer.from(demoTrussDxf(), 'latin1')]), 'bench.dxf');
    const res = await fetch(`${base}/api/trusses/${id}/drawings`, { method: 'POST', headers: { cookie: drafter.cookie, 'x-csrf-token': drafter.csrf }, body: form });
    if (res.status !== 201) throw new Error(`upload for the writers: ${res.status} ${await res.text()}`);
  }
  void engineer;
  return { modelTruss: trusses[0].id, writerTrusses };
}

/** Saves one truss's model back to back until stopped; counts saves and failures. */
function writer(base: string, s: Session, trussId: number) {
  let stop = false;
  const tally = { saves: 0, failed: 0, statuses: new Map<number, number>() };
  const done = (async () => {
    while (!stop) {
      const got = await fetch(`${base}/api/trusses/${trussId}/model`, { headers: { cookie: s.cookie } });
      const view = (await got.json()) as { version: number; model: { supports: unknown; loadCases: unknown; combinations: unknown; members: Record<string, unknown>[] } };
      const body = {
        version: view.version,
        supports: view.model.supports,
        loadCases: view.model.loadCases,
        combinations: view.model.combinations,
        members: view.model.members.map(({ id, group, E, A, EA, material, section }) => ({ id, group, E, A, EA, material, section })),
      };
      const put = await fetch(`${base}/api/trusses/${trussId}/model`, {
        method: 'PUT',
        headers: { cookie: s.cookie, 'x-csrf-token': s.csrf, 'content-type': 'application/json' },
        body: JSON.stringify(body),
      });
      await put.arrayBuffer();
      if (put.status === 200) tally.saves++;
      else {
        tally.failed++;
        tally.statuses.set(put.status, (tally.statuses.get(put.status) ?? 0) + 1);
      }
    }
  })();
  return {
    tally,
    async stop() {
      stop = true;
      await done;
    },
  };
}

async function load(url: string, cookie: string, seconds: number) {
  // The load comes from a worker thread of its own, so it does not share the server's event loop.
  return autocannon({ url, connections: CONNECTIONS, duration: seconds, headers: { cookie }, workers: 1 });
}

const fmt = (n: number, w = 8) => String(Math.round(n)).padStart(w);

/**
 * CPU time of the server's main thread so far, ms (Linux: /proc/self/task/<pid>/stat, utime +
 * stime in clock ticks of 10 ms). On a shared machine latencies swing with the load; the main
 * thread's CPU time per request does not, so it is the figure to compare before and after.
 */
function mainThreadCpuMs(): number {
  const stat = fs.readFileSync(`/proc/self/task/${process.pid}/stat`, 'utf8');
  const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
  return (Number(fields[11]) + Number(fields[12])) * 10;
}

async function main() {
  const dir = tempDataDir();
  const config = { ...loadConfig({ NODE_ENV: 'test' }), ...dir, bcryptRounds: 4, publicUrl: 'http://127.0.0.1', uploadsDir: fs.mkdtempSync(`${os.tmpdir()}/panelpoint-bench-uploads-`), seedDemo: true, sourceMaps: process.env.SOURCE_MAPS === 'true' };
  const services = await startServices(config, { log: () => {} });
  const server = services.app.listen(0, '127.0.0.1');
  await new Promise((r) => server.once('listening', r));
  const base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  try {
    const engineer = await signIn(base, 'engineer@demo.panelpoint.test');
    const drafter = await signIn(base, 'drafter@demo.panelpoint.test');
    const { modelTruss, writerTrusses } = await seed(base, engineer, drafter);
    const writers = [await signIn(base, 'engineer@demo.panelpoint.test'), await signIn(base, 'engineer@demo.panelpoint.test')];
    const targets: [string, string][] = [
      ['GET /api/projects', `${base}/api/projects`],
      ['GET /api/trusses/:id/model', `${base}/api/trusses/${modelTruss}/model`],
      ['GET /api/archive', `${base}/api/archive`],
    ];
    for (const [, url] of targets) {
      const probe = await fetch(url, { headers: { cookie: engineer.cookie } });
      const bytes = (await probe.arrayBuffer()).byteLength;
      console.log(`${url.replace(base, '')}: ${probe.status}, ${bytes} bytes${probe.headers.get('content-encoding') ? ` (${probe.headers.get('content-encoding')})` : ''}`);
    }
    console.log(`\nautocannon, ${CONNECTIONS} connections, ${DURATION} s each, loopback, SQLite file (WAL), source maps ${config.sourceMaps ? 'on' : 'off (the production default)'}; ${os.cpus().length} CPUs, load average ${os.loadavg().map((l) => l.toFixed(2)).join(' ')}`);
    console.log(`${'endpoint'.padEnd(28)}${'writers'.padStart(8)}${'req/s'.padStart(8)}${'p50'.padStart(8)}${'p97.5'.padStart(8)}${'p99'.padStart(8)}${'max'.padStart(8)}${'non-2xx'.padStart(9)}${'cpu ms/req'.padStart(11)}  saves/s (failed)`);
    for (const [name, url] of targets) {
      await load(url, engineer.cookie, 2); // warm-up
      for (const withWriters of [false, true]) {
        const w = withWriters ? writers.map((s, i) => writer(base, s, writerTrusses[i])) : [];
        const cpu0 = mainThreadCpuMs();
        const r = await load(url, engineer.cookie, DURATION);
        const cpuPerRequest = (mainThreadCpuMs() - cpu0) / Math.max(1, r.requests.total);
        await Promise.all(w.map((x) => x.stop()));
        const saves = w.reduce((s, x) => s + x.tally.saves, 0);
        const failed = w.reduce((s, x) => s + x.tally.failed, 0);
        const statuses = w.flatMap((x) => [...x.tally.statuses.entries()].map(([k, v]) => `${v}×${k}`)).join(' ');
        console.log(
          `${name.padEnd(28)}${String(w.length).padStart(8)}${fmt(r.requests.average)}${fmt(r.latency.p50)}${fmt(r.latency.p97_5)}${fmt(r.latency.p99)}${fmt(r.latency.max)}${String(r.non2xx + r.errors).padStart(9)}${cpuPerRequest.toFixed(2).padStart(11)}  ${withWriters ? `${(saves / DURATION).toFixed(1)} (${failed}${statuses ? `: ${statuses}` : ''})` : ''}`,
        );
      }
    }
    console.log('latencies in ms; cpu ms/req: CPU time of the server\'s main thread per request answered (with writers, their saves included)');
  } finally {
    server.close();
    await services.shutdown();
    fs.rmSync(dir.dataDir, { recursive: true, force: true });
    fs.rmSync(config.uploadsDir, { recursive: true, force: true });
  }
}

await main();
