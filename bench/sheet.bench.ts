/**
 * `npm run bench:sheet`: calc sheets for parallel-chord trusses of 10, 50 and 200 joints (one load
 * case and one combination). Prints, per size: pages, time to HTML (view + templates), time to
 * PDF with the browser warm (median of 3), and peak memory of this process and of Chromium.
 * Target (issue 6): the 50-joint sheet prints in under 3 s with the browser warm on 2 cores.
 *
 * Then the large sheet: 200 joints with 5 load cases (one free-body step per joint and case),
 * printed once, with where the time goes: view (solver steps → KaTeX in this process), HTML,
 * setContent, font loading and page.pdf; and page.pdf again with every KaTeX span left out of the
 * layout (display: none), which gives KaTeX's share of the print. Also the time limit the printer
 * allows for a sheet of that size (printBudgetMs). `npm run bench:sheet -- --large` runs that part alone.
 */
import fs from 'node:fs';
import os from 'node:os';
import { trussSolve } from '@shared/solver';
import { modelFromSketch, parallelChordSketch } from '@shared/solver/test-trusses';
import { buildCalcSheetView } from '../server/modules/calc-sheets/calc-sheet-view';
import { renderCalcSheetHtml } from '../server/modules/calc-sheets/calc-sheet-html';
import { createSheetPrinter, printBudgetMs } from '../server/modules/calc-sheets/sheet-printer';

const SIZES = [
  { joints: 10, panels: 4 },
  { joints: 50, panels: 24 },
  { joints: 200, panels: 99 },
];

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
}

/** Peak resident memory (VmHWM, MiB) summed over a process and all its descendants (Linux). */
function treePeakMiB(rootPid: number | null): number {
  if (!rootPid) return 0;
  const parent = new Map<number, number>();
  for (const entry of fs.readdirSync('/proc')) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      const stat = fs.readFileSync(`/proc/${entry}/stat`, 'utf8');
      const ppid = Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[1]);
      parent.set(Number(entry), ppid);
    } catch {
      // process ended while listing
    }
  }
  const inTree = (pid: number): boolean => {
    for (let p: number | undefined = pid, hops = 0; p && hops < 20; p = parent.get(p), hops++) if (p === rootPid) return true;
    return false;
  };
  let kib = 0;
  for (const pid of parent.keys()) {
    if (!inTree(pid)) continue;
    try {
      const m = /VmHWM:\s+(\d+) kB/.exec(fs.readFileSync(`/proc/${pid}/status`, 'utf8'));
      kib += m ? Number(m[1]) : 0;
    } catch {
      // ended
    }
  }
  return kib / 1024;
}

/** CPU seconds (user + system) used so far by a process and all its descendants (Linux). */
function treeCpuSeconds(rootPid: number | null): number {
  if (!rootPid) return 0;
  const parent = new Map<number, number>();
  const cpu = new Map<number, number>();
  const tick = 100; // USER_HZ on Linux
  for (const entry of fs.readdirSync('/proc')) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      const stat = fs.readFileSync(`/proc/${entry}/stat`, 'utf8');
      const f = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
      parent.set(Number(entry), Number(f[1]));
      // utime + stime, and cutime + cstime: a renderer that ended with its page (reaped by the
      // zygote) is still counted through its parent.
      cpu.set(Number(entry), (Number(f[11]) + Number(f[12]) + Number(f[13]) + Number(f[14])) / tick);
    } catch {
      // ended
    }
  }
  let total = 0;
  for (const [pid, c] of cpu) {
    for (let p: number | undefined = pid, hops = 0; p && hops < 20; p = parent.get(p), hops++) {
      if (p === rootPid) {
        total += c;
        break;
      }
    }
  }
  return total;
}

function pageCount(pdf: Buffer): number {
  return (pdf.toString('latin1').match(/\/Type\s*\/Page(?!s)/g) ?? []).length;
}

async function main() {
  const printer = createSheetPrinter({ chromiumPath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium', timeoutMs: 600_000 });
  console.log(`calc sheet bench — ${os.cpus().length} cores, load average ${os.loadavg().map((l) => l.toFixed(1)).join(' ')}`);
  // Warm the browser and the template/font caches once.
  const warm = modelFromSketch(parallelChordSketch('pratt', 8, 3, 3, 10));
  const warmInput = {
    firm: { name: 'Harrow & Vale Structural (demo)', address: '4 Tanner’s Yard, Northgate', paperSize: 'A4' as const },
    project: { name: 'Kestrel Logistics — warehouse roof', jobNumber: 'HV-2417', unitSystem: 'SI' as const },
    revision: 'P1',
    generatedAt: new Date(),
  };
  await printer.print(renderCalcSheetHtml(buildCalcSheetView({ ...warmInput, trussName: 'warm', subject: 'warm', model: warm, analysis: trussSolve(warm) })), 'A4');
  console.log('Wall times depend on what else runs on the machine; CPU seconds (Chromium and this process) per print do not.');
  if (process.argv.includes('--large')) {
    await largeSheet(printer, warmInput);
    await printer.close();
    return;
  }
  console.log('joints  members  pages  HTML (ms)  HTML (KiB)  PDF warm wall (ms, median of 3)  PDF CPU (s)  PDF (KiB)  node peak (MiB)  chromium peak (MiB)');
  for (const size of SIZES) {
    const sketch = parallelChordSketch('pratt', size.panels, 3, 3, 10);
    sketch.combinations = [{ name: 'LRFD-1', factors: { D: 1.4 }, clause: 'ASCE/SEI 7-16 §2.3.1 (1)' }];
    const model = modelFromSketch(sketch);
    const analysis = trussSolve(model);
    const t0 = performance.now();
    const html = renderCalcSheetHtml(buildCalcSheetView({ ...warmInput, trussName: `P${size.joints}`, subject: `Truss P${size.joints}`, model, analysis }));
    const htmlMs = performance.now() - t0;
    const times: number[] = [];
    const cpus: number[] = [];
    let pdf: Buffer = Buffer.alloc(0);
    for (let i = 0; i < 3; i++) {
      const c0 = treeCpuSeconds(printer.browserPid());
      const n0 = process.cpuUsage();
      const t = performance.now();
      pdf = await printer.print(html, 'A4');
      times.push(performance.now() - t);
      const n1 = process.cpuUsage(n0);
      cpus.push(treeCpuSeconds(printer.browserPid()) - c0 + (n1.user + n1.system) / 1e6);
    }
    const nodePeak = Number(/VmHWM:\s+(\d+) kB/.exec(fs.readFileSync('/proc/self/status', 'utf8'))?.[1] ?? 0) / 1024;
    console.log(
      [
        String(model.joints.length).padStart(6),
        String(model.members.length).padStart(8),
        String(pageCount(pdf)).padStart(6),
        htmlMs.toFixed(0).padStart(10),
        (html.length / 1024).toFixed(0).padStart(11),
        median(times).toFixed(0).padStart(32),
        median(cpus).toFixed(2).padStart(12),
        (pdf.length / 1024).toFixed(0).padStart(10),
        nodePeak.toFixed(0).padStart(16),
        treePeakMiB(printer.browserPid()).toFixed(0).padStart(20),
      ].join(' '),
    );
  }
  await largeSheet(printer, warmInput);
  await printer.close();
}

async function largeSheet(printer: ReturnType<typeof createSheetPrinter>, warmInput: Parameters<typeof buildCalcSheetView>[0] extends infer T ? Omit<T & object, 'trussName' | 'subject' | 'model' | 'analysis'> : never) {
  const sketch = parallelChordSketch('pratt', 99, 3, 3, 10);
  const base = sketch.cases![0].loads;
  // Five cases of invented loads on the same joints: D, L, S, W (with a sideways part), E.
  sketch.cases = ['D', 'L', 'S', 'W', 'E'].map((id, k) => ({ id, loads: base.map(([j, , fy]) => [j, k === 3 ? 2 : 0, fy * (1 + k / 2)] as [string, number, number]) }));
  sketch.combinations = [{ name: 'LRFD-2', factors: { D: 1.2, L: 1.6, S: 0.5 }, clause: 'ASCE/SEI 7-16 §2.3.1 (2)' }];
  const model = modelFromSketch(sketch);
  const analysis = trussSolve(model);
  const t0 = performance.now();
  const view = buildCalcSheetView({ ...warmInput, trussName: 'P200', subject: 'Truss P200, 5 load cases', model, analysis });
  const t1 = performance.now();
  const html = renderCalcSheetHtml(view);
  const t2 = performance.now();
  const c0 = treeCpuSeconds(printer.browserPid());
  const w0 = performance.now();
  const pdf = await printer.print(html, 'A4', { label: 'large' });
  const wall = performance.now() - w0;
  const cpu = treeCpuSeconds(printer.browserPid()) - c0;
  const phases = printer.startedLog().find((e) => e.label === 'large')?.phases;
  const noKatex = html.replace(/<\/head>/i, '<style>.katex{display:none !important}</style></head>');
  const c1 = treeCpuSeconds(printer.browserPid());
  await printer.print(noKatex, 'A4', { label: 'large-no-katex' });
  const cpuNoKatex = treeCpuSeconds(printer.browserPid()) - c1;
  const phasesNoKatex = printer.startedLog().find((e) => e.label === 'large-no-katex')?.phases;
  const budget = printBudgetMs(html.length, 60_000);
  console.log('');
  console.log(`large sheet: ${model.joints.length} joints, ${model.members.length} members, ${model.loadCases.length} load cases, ${pageCount(pdf)} pages, HTML ${(html.length / 1024 / 1024).toFixed(1)} MiB, PDF ${(pdf.length / 1024).toFixed(0)} KiB`);
  console.log(`  view (solver steps → KaTeX, this process) ${(t1 - t0).toFixed(0)} ms; HTML (templates) ${(t2 - t1).toFixed(0)} ms`);
  console.log(
    `  print wall ${wall.toFixed(0)} ms (Chromium CPU ${cpu.toFixed(1)} s): setContent ${phases?.setContentMs.toFixed(0)} ms, fonts ${phases?.fontsMs.toFixed(0)} ms, page.pdf ${phases?.pdfMs.toFixed(0)} ms`,
  );
  console.log(
    `  same sheet with KaTeX left out of the layout: page.pdf ${phasesNoKatex?.pdfMs.toFixed(0)} ms (Chromium CPU ${cpuNoKatex.toFixed(1)} s), so KaTeX's layout is about ${(100 * (1 - (phasesNoKatex?.pdfMs ?? 0) / (phases?.pdfMs ?? 1))).toFixed(0)} % of page.pdf`,
  );
  console.log(`  time limit for this size (printBudgetMs, base 60 s): ${(budget / 1000).toFixed(0)} s — ${wall < budget ? 'printed within it' : 'NOT within it'}`);
}

main().catch((e) => {
  console.error(e);
  process.exit(1);
});
