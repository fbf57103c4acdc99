/**
 * npm run bench:import — generates long multi-panel truss drawings (ASCII DXF, millimetres)
 * of about 1 000, 10 000 and 100 000 segments: top and bottom chords each drawn as one
 * whole-length LINE, a post and a diagonal per panel, and every tenth panel's members drawn
 * twice. Prints dxf-parser's bare parse time, Panelpoint's import time after parsing
 * (dxfImport), their ratio, and peak memory (resident set, sampled). Budget from issue 3:
 * import ≤ ¼ of the bare parse at 100 000 segments, growing about linearly.
 */
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

function time<T>(f: () => T): [T, number] {
  const t0 = performance.now();
  const v = f();
  return [v, performance.now() - t0];
}

let peak = 0;
const sampler = setInterval(() => {
  peak = Math.max(peak, process.memoryUsage().rss);
}, 5);

function best<T>(runs: number, f: () => T): [T, number] {
  let out: [T, number] = time(f);
  for (let r = 1; r < runs; r++) {
    const next = time(f);
    if (next[1] < out[1]) out = next;
  }
  return out;
}

const rows: string[] = [];
for (const panels of [480, 4_800, 48_000]) {
  const { text, segments } = trussDxf(panels);
  const runs = panels > 10_000 ? 3 : 5;
  global.gc?.();
  const [, bare] = best(runs, () => new DxfParser().parse(text));
  const [parsed, checked] = best(runs, () => dxfParse(text));
  peak = Math.max(peak, process.memoryUsage().rss);
  const [result, imp] = best(runs, () => dxfImport(parsed));
  peak = Math.max(peak, process.memoryUsage().rss);
  rows.push(
    [
      String(segments).padStart(7),
      `${bare.toFixed(0).padStart(6)} ms`,
      `${checked.toFixed(0).padStart(6)} ms`,
      `${imp.toFixed(0).padStart(6)} ms`,
      (imp / bare).toFixed(3).padStart(6),
      `${(peak / 2 ** 20).toFixed(0).padStart(5)} MiB`,
      `${result.joints.length} joints, ${result.members.length} members`,
    ].join('  '),
  );
}
clearInterval(sampler);
console.log('segments  bare parse  dxfParse   import    ratio   peak RSS   model');
for (const r of rows) console.log(r);
console.log('ratio = import after parsing ÷ dxf-parser bare parse (budget ≤ 0.25 at 100 000 segments)');
