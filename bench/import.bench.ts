/**
 * npm run bench:import — generates long multi-panel truss drawings (ASCII DXF, millimetres)
 * of about 1 000, 10 000 and 100 000 segments: top and bottom chords each drawn as one
 * whole-length LINE, a post and a diagonal per panel, and every tenth panel's members drawn
 * twice. Each LINE is written as a CAD program writes an R2000 file: handle, owner, subclass
 * markers, layer, and coordinates with decimals at a site offset. At 100 000 segments a
 * "minimal" drawing (integer coordinates at the origin, no handles or subclass markers) is
 * measured too, for comparison: dxf-parser reads it faster (about 1.4 times here), so its
 * ratio is the stricter one.
 *
 * Prints, best and median of several runs after two untimed warm-up imports (the first,
 * cold import is printed apart): dxf-parser's bare parse time; our dxfParse (file checks +
 * dxf-parser); Panelpoint's import after parsing (dxfImportGeometry: healing, reading order,
 * tags, report, geometry as typed arrays) and per segment; the ratio import ÷ bare parse;
 * the time to build the model's joint and member objects from that geometry (dxfModelOf,
 * what dxfImport adds) and the ratio with it; the handover step (dxfHandover: member groups from
 * layers and outline, tags in the report, the mechanism check) and the ratio with all three; peak memory (resident set, sampled while each
 * drawing is parsed and imported; the process keeps some of what earlier drawings took) and
 * the load average, since the machine may be shared. Budget from issue 3: import ≤ ¼ of the bare
 * parse at 100 000 segments (bare parse there: about 1.6 s for 100 000 LINEs), growing about
 * linearly.
 */
import os from 'node:os';
import DxfParser from 'dxf-parser';
import { dxfHandover, dxfImportGeometry, dxfModelOf, dxfParse } from '@shared/dxf-import';

type Style = 'cad' | 'minimal';

function trussDxf(panels: number, style: Style): { text: string; segments: number } {
  const cad = style === 'cad';
  const a = cad ? 2873.5 : 3000;
  const h = cad ? 1916.25 : 2000;
  const x0 = cad ? 152_340.125 : 0;
  const y0 = cad ? 48_210.5 : 0;
  const out: string[] = ['0', 'SECTION', '2', 'HEADER', '9', '$ACADVER', '1', 'AC1015', '9', '$INSUNITS', '70', '4', '0', 'ENDSEC', '0', 'SECTION', '2', 'ENTITIES'];
  let segments = 0;
  let handle = 0x200;
  const line = (x1: number, y1: number, x2: number, y2: number) => {
    if (cad) {
      out.push('0', 'LINE', '5', (handle++).toString(16).toUpperCase(), '330', '1F', '100', 'AcDbEntity', '8', 'TRUSS', '100', 'AcDbLine');
      out.push('10', String(x0 + x1), '20', String(y0 + y1), '30', '0.0', '11', String(x0 + x2), '21', String(y0 + y2), '31', '0.0');
    } else {
      out.push('0', 'LINE', '8', 'TRUSS', '10', String(x1), '20', String(y1), '30', '0', '11', String(x2), '21', String(y2), '31', '0');
    }
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
const ratios = (v: number[]) => `${Math.min(...v).toFixed(3)} ${median(v).toFixed(3)}`;

// The steps are timed in turn within each run, so a change in machine load hits them alike;
// the ratios are taken run by run and their best and median printed.
const rows: string[] = [];
const loadBefore = os.loadavg();
const cases: [number, Style][] = [
  [480, 'cad'],
  [4_800, 'cad'],
  [48_000, 'cad'],
  [48_000, 'minimal'],
];
for (const [panels, style] of cases) {
  const { text, segments } = trussDxf(panels, style);
  peak = process.memoryUsage().rss; // the peak while this drawing is parsed and imported
  const runs = panels > 10_000 ? 5 : 9;
  const bare: number[] = [];
  const checked: number[] = [];
  const imported: number[] = [];
  const objects: number[] = [];
  const ratio: number[] = [];
  const ratioWithObjects: number[] = [];
  const handover: number[] = [];
  const ratioWithHandover: number[] = [];
  const cpuRatio: number[] = [];
  let cold = 0;
  let model = '';
  for (let r = -2; r < runs; r++) {
    const [, b, bCpu] = time(() => new DxfParser().parse(text));
    const [parsed, c] = time(() => dxfParse(text));
    peak = Math.max(peak, process.memoryUsage().rss);
    const [result, i, iCpu] = time(() => dxfImportGeometry(parsed));
    const [made, o] = time(() => dxfModelOf(result.geometry));
    const { geometry: _g, ...facts } = result;
    const [, hv] = time(() => dxfHandover({ ...made, ...facts }, result.geometry));
    peak = Math.max(peak, process.memoryUsage().rss);
    model = `${made.joints.length} joints, ${made.members.length} members`;
    if (r === -2) cold = i;
    if (r < 0) continue;
    bare.push(b);
    checked.push(c);
    imported.push(i);
    objects.push(o);
    ratio.push(i / b);
    ratioWithObjects.push((i + o) / b);
    handover.push(hv);
    ratioWithHandover.push((i + o + hv) / b);
    cpuRatio.push(iCpu / bCpu);
  }
  rows.push(
    [
      `${String(segments).padStart(7)} ${style.padEnd(7)}`,
      pair(bare),
      pair(checked),
      ms(cold),
      pair(imported),
      `${((1000 * median(imported)) / segments).toFixed(2).padStart(5)} µs`,
      ratios(ratio),
      ratios(cpuRatio),
      pair(objects),
      ratios(ratioWithObjects),
      pair(handover),
      ratios(ratioWithHandover),
      `${(peak / 2 ** 20).toFixed(0).padStart(5)} MiB`,
      model,
    ].join('  '),
  );
}
clearInterval(sampler);
const loadAfter = os.loadavg();
console.log('                     bare parse          dxfParse       import  import after parsing  import   ratio (wall)  ratio (CPU)    model objects    ratio with       handover      ratio with');
console.log('segments drawing   best   median      best   median      cold      best   median   per seg   best  median  best  median     best   median   objects        best   median   handover    peak RSS   model');
for (const r of rows) console.log(r);
console.log('import = dxfImportGeometry after parsing; ratio = import ÷ dxf-parser bare parse, run by run (budget ≤ 0.25 at 100 000 segments)');
console.log('  wall = elapsed time; CPU = process CPU time, steadier when other jobs share the cores; cold = the first import of that drawing');
console.log('model objects = dxfModelOf, one object per joint and member (what dxfImport adds); "ratio with objects" counts it in');
console.log('handover = dxfHandover (member groups, report lines named by tag, the mechanism check; what dxfImport adds after the objects); "ratio with handover" counts objects and it in');
console.log('dxfParse = our checks of the file text (sniffing, structure pre-scan) plus dxf-parser; not part of the ratio');
console.log('cad = written as a CAD program writes R2000 (handles, subclass markers, site coordinates); minimal = only the codes a LINE needs');
console.log(`load average (1, 5, 15 min): before ${loadBefore.map((l) => l.toFixed(2)).join(' ')}, after ${loadAfter.map((l) => l.toFixed(2)).join(' ')} on ${os.cpus().length} cores`);
