/**
 * npm run bench:import — generates long multi-panel truss drawings (ASCII DXF, millimetres)
 * of about 1 000, 10 000 and 100 000 segments: top and bottom chords each drawn as one
 * whole-length LINE, a post and a diagonal per panel, and every tenth panel's members drawn
 * twice. Prints, best and median of several runs: dxf-parser's bare parse time, our dxfParse
 * (file checks + dxf-parser), Panelpoint's import time after parsing (dxfImport) and per
 * segment, the ratio import ÷ bare parse, peak memory (resident set, sampled) and the load
 * average, since the machine may be shared. Budget from issue 3: import ≤ ¼ of the bare parse
 * at 100 000 segments, growing about linearly.
 */
import os from 'node:os';
import DxfParser from 'dxf-parser';
import { dxfImport, dxfParse } from '@shared/dxf-import';

function trussDxf(panels: number): { text: string; segments: number } {
  const a = 3000;
  const h = 2000;
  const out: string[] = ['0', 'SECTION', '2', 'HEADER', '9', '$ACADVER', '1', 'AC1015', '9', '$INSUNITS', '70', '4', '0', 'ENDSEC', '0', 'SECTION', '2', 'ENTITIES'];
  let segments = 0;
  const line = (x1: number, y1: number, x2: number, y2: number) => {
    out.push('0', 'LINE', '8', 'TRUSS', '10', String(x1), '20', String(y1), '30', '0', '11', String(x2), '21', String(y2), '31', '0');
    segments++;
  };
  line(0, 0, panels * a, 0);
  line(0, h, panels * a, h);
  for (let i = 0; i <= panels; i++) {
    line(i * a, 0, i * a, h);
    if (i < panels) line(i * a, i % 2 ? h : 0, (i + 1) * a, i % 2 ? 0 : h);
    if (i % 10 === 0) {
      line(i * a, h, i * a, 0);
      if (i < panels) line(i * a, 0, (i + 1) * a, 0);
    }
  }
  out.push('0', 'ENDSEC', '0', 'EOF', '');
  return { text: out.join('\n'), segments };
}

/** Wall time and process CPU time (user + system, all threads, GC helpers included), ms. */
function time<T>(f: () => T): [T, number, number] {
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  const v = f();
  const wall = performance.now() - t0;
  const c = process.cpuUsage(c0);
  return [v, wall, (c.user + c.system) / 1000];
}

let peak = 0;
const sampler = setInterval(() => {
  peak = Math.max(peak, process.memoryUsage().rss);
}, 5);

const median = (v: number[]) => [...v].sort((a, b) => a - b)[v.length >> 1];
const ms = (v: number) => `${v.toFixed(0).padStart(5)} ms`;
const pair = (v: number[]) => `${ms(Math.min(...v))} ${ms(median(v))}`;

// The three steps are timed in turn within each run, so a change in machine load hits them
// alike; the ratio is taken run by run and its best and median are printed.
const rows: string[] = [];
const loadBefore = os.loadavg();
for (const panels of [480, 4_800, 48_000]) {
  const { text, segments } = trussDxf(panels);
  const runs = panels > 10_000 ? 5 : 9;
  const bare: number[] = [];
  const checked: number[] = [];
  const imported: number[] = [];
  const ratio: number[] = [];
  const cpuRatio: number[] = [];
  let model = '';
  for (let r = 0; r < runs; r++) {
    const [, b, bCpu] = time(() => new DxfParser().parse(text));
    const [parsed, c] = time(() => dxfParse(text));
    peak = Math.max(peak, process.memoryUsage().rss);
    const [result, i, iCpu] = time(() => dxfImport(parsed));
    peak = Math.max(peak, process.memoryUsage().rss);
    bare.push(b);
    checked.push(c);
    imported.push(i);
    ratio.push(i / b);
    cpuRatio.push(iCpu / bCpu);
    model = `${result.joints.length} joints, ${result.members.length} members`;
  }
  rows.push(
    [
      String(segments).padStart(7),
      pair(bare),
      pair(checked),
      pair(imported),
      `${((1000 * median(imported)) / segments).toFixed(2).padStart(6)} µs`,
      `${Math.min(...ratio).toFixed(3)} ${median(ratio).toFixed(3)}`,
      `${Math.min(...cpuRatio).toFixed(3)} ${median(cpuRatio).toFixed(3)}`,
      `${(peak / 2 ** 20).toFixed(0).padStart(5)} MiB`,
      model,
    ].join('  '),
  );
}
clearInterval(sampler);
const loadAfter = os.loadavg();
console.log('                bare parse          dxfParse       dxfImport after     import   ratio (wall)  ratio (CPU)');
console.log('segments      best   median      best   median      best   median    per seg   best  median  best  median   peak RSS   model');
for (const r of rows) console.log(r);
console.log('ratio = dxfImport (after parsing) ÷ dxf-parser bare parse, run by run (budget ≤ 0.25 at 100 000 segments);');
console.log('  wall = elapsed time; CPU = process CPU time, steadier when other jobs share the cores');
console.log('dxfParse = our checks of the file text (sniffing, structure pre-scan) plus dxf-parser; not part of the ratio');
console.log(`load average (1, 5, 15 min): before ${loadBefore.map((l) => l.toFixed(2)).join(' ')}, after ${loadAfter.map((l) => l.toFixed(2)).join(' ')} on ${os.cpus().length} cores`);
