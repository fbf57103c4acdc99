/**
 * npm run bench:api — the API under load on loopback, against a real SQLite file (WAL) in a
 * temp folder, as one office server would run it.
 *
 * The server runs in a child process of its own (bench/api-server.ts), so the load generator
 * and the writers, here in the parent, never count in the server's latency or CPU. The child
 * seeds the demo firm plus 60 projects of 4 trusses and 40 issued sheet revisions; the parent
 * imports the demo drawing on two trusses for the writers. Then, with autocannon at 50
 * connections for DURATION seconds each (after a 2 s warm-up), one signed-in engineer's cookie
 * on every connection:
 *   GET /api/projects, GET /api/trusses/:id/model, GET /api/archive
 * each alone and again while two writers (two other engineers' sessions) save their trusses'
 * models back to back (GET the model, PUT it with its version). Prints req/s, p50, p97.5, p99
 * and max latency, non-2xx answers, the server's CPU time per request (its main thread, and the
 * whole process with the SQLite driver's threads), and the writers' saves per second and failures.
 * Asserts nothing.
 * Usage: npm run bench:api [-- seconds]   (default 8)
 *   BENCH_ONLY=text        only the endpoints whose name contains the text (e.g. archive)
 *   BENCH_CPU_PROF=folder  writes the server's V8 CPU profile there (node --cpu-prof); read its
 *                          top self-time functions with `node bench/cpu-profile-top.mjs FILE`.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fork } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import autocannon from 'autocannon';
import { demoTrussDxf } from '../server/seed/demo-drawing';
import { DEMO_PASSWORD } from '../server/seed/demo';
import type { BenchServerReady } from './api-server';

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

/** The demo drawing imported on the writers' trusses, so they have models to save. */
async function uploadDrawings(base: string, drafter: Session, trussIds: number[]): Promise<void> {
  for (const id of trussIds) {
    const form = new FormData();
    form.set('layers', '["CHORDS","WEBS"]');
    form.set('file', new Blob([Buffer.from(demoTrussDxf(), 'latin1')]), 'bench.dxf');
    const res = await fetch(`${base}/api/trusses/${id}/drawings`, { method: 'POST', headers: { cookie: drafter.cookie, 'x-csrf-token': drafter.csrf }, body: form });
    if (res.status !== 201) throw new Error(`upload for the writers: ${res.status} ${await res.text()}`);
  }
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
  return autocannon({ url, connections: CONNECTIONS, duration: seconds, headers: { cookie } });
}

const fmt = (n: number, w = 8) => String(Math.round(n)).padStart(w);

/**
 * CPU time of the server so far, ms: its main thread (/proc/<pid>/task/<pid>/stat) and the
 * whole process (/proc/<pid>/stat: the SQLite driver's threads too); utime + stime in clock
 * ticks of 10 ms. On a shared machine latencies swing with the load; CPU time per request does
 * not, so it is the figure to compare before and after.
 */
function cpuMs(pid: number): { main: number; process: number } {
  const read = (file: string) => {
    const stat = fs.readFileSync(file, 'utf8');
    const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
    return (Number(fields[11]) + Number(fields[12])) * 10;
  };
  return { main: read(`/proc/${pid}/task/${pid}/stat`), process: read(`/proc/${pid}/stat`) };
}

async function startServer() {
  const profDir = process.env.BENCH_CPU_PROF;
  if (profDir) fs.mkdirSync(profDir, { recursive: true });
  const child = fork(path.join(path.dirname(fileURLToPath(import.meta.url)), 'api-server.ts'), [], {
    execArgv: ['--import', 'tsx', ...(profDir ? ['--cpu-prof', `--cpu-prof-dir=${path.resolve(profDir)}`] : [])],
    stdio: ['ignore', 'inherit', 'inherit', 'ipc'],
  });
  const ready = await new Promise<BenchServerReady>((resolve, reject) => {
    child.once('message', (m) => resolve(m as BenchServerReady));
    child.once('exit', (code) => reject(new Error(`the bench server exited (${code}) before it was ready`)));
  });
  return {
    child,
    ready,
    async stop() {
      const exited = new Promise((r) => child.once('exit', r));
      child.send('stop');
      await exited;
    },
  };
}

async function main() {
  const server = await startServer();
  const { ready, child } = server;
  const base = `http://127.0.0.1:${ready.port}`;
  const pid = child.pid!;
  try {
    const engineer = await signIn(base, 'engineer@demo.panelpoint.test');
    const drafter = await signIn(base, 'drafter@demo.panelpoint.test');
    const { modelTruss, writerTrusses } = ready;
    await uploadDrawings(base, drafter, writerTrusses);
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
    console.log(`\nautocannon, ${CONNECTIONS} connections, ${DURATION} s each, loopback, server in a child process, SQLite file (WAL), source maps ${ready.sourceMaps ? 'on' : 'off (the production default)'}; ${os.cpus().length} CPUs, load average ${os.loadavg().map((l) => l.toFixed(2)).join(' ')}`);
    console.log(`${'endpoint'.padEnd(28)}${'writers'.padStart(8)}${'req/s'.padStart(8)}${'p50'.padStart(8)}${'p97.5'.padStart(8)}${'p99'.padStart(8)}${'max'.padStart(8)}${'non-2xx'.padStart(9)}${'cpu main'.padStart(10)}${'cpu all'.padStart(9)}  saves/s (failed)`);
    for (const [name, url] of targets.filter(([n]) => !process.env.BENCH_ONLY || n.includes(process.env.BENCH_ONLY))) {
      await load(url, engineer.cookie, 2); // warm-up
      for (const withWriters of [false, true]) {
        const w = withWriters ? writers.map((s, i) => writer(base, s, writerTrusses[i])) : [];
        const cpu0 = cpuMs(pid);
        const r = await load(url, engineer.cookie, DURATION);
        const cpu1 = cpuMs(pid);
        const n = Math.max(1, r.requests.total);
        await Promise.all(w.map((x) => x.stop()));
        const saves = w.reduce((s, x) => s + x.tally.saves, 0);
        const failed = w.reduce((s, x) => s + x.tally.failed, 0);
        const statuses = w.flatMap((x) => [...x.tally.statuses.entries()].map(([k, v]) => `${v}×${k}`)).join(' ');
        console.log(
          `${name.padEnd(28)}${String(w.length).padStart(8)}${fmt(r.requests.average)}${fmt(r.latency.p50)}${fmt(r.latency.p97_5)}${fmt(r.latency.p99)}${fmt(r.latency.max)}${String(r.non2xx + r.errors).padStart(9)}${((cpu1.main - cpu0.main) / n).toFixed(2).padStart(10)}${((cpu1.process - cpu0.process) / n).toFixed(2).padStart(9)}  ${withWriters ? `${(saves / DURATION).toFixed(1)} (${failed}${statuses ? `: ${statuses}` : ''})` : ''}`,
        );
      }
    }
    console.log('latencies in ms; cpu main / all: the server\'s CPU ms per request answered, its main thread / the whole process (with writers, their saves included)');
  } finally {
    await server.stop();
  }
}

await main();
