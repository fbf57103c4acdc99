import { spawn } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { trussSolve } from '@shared/solver';
import { modelFromSketch, parallelChordSketch } from '@shared/solver/test-trusses';
import { buildCalcSheetView } from '../server/modules/calc-sheets/calc-sheet-view';
import { renderCalcSheetHtml } from '../server/modules/calc-sheets/calc-sheet-html';
import { chromiumLeftoversSweep, createSheetPrinter, printBudgetMs, type SheetPrinter } from '../server/modules/calc-sheets/sheet-printer';

/**
 * The print queue with the real Chromium: issue before previews, requesters who leave, the
 * per-person cap, process groups and the start-up sweep. Order is read from the printer's log of
 * started prints; figures are printed, speed itself is in bench/sheet.bench.ts.
 */
const CHROMIUM = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
const SLOW = 240_000;

function sheetHtml(panels: number): string {
  const model = modelFromSketch(parallelChordSketch('pratt', panels, 3, 3, 10));
  return renderCalcSheetHtml(
    buildCalcSheetView({
      firm: { name: 'Orchard Lane Engineers (demo)', address: '12 Mill Row', paperSize: 'A4' },
      project: { name: 'Brackenfield depot canopy', jobNumber: 'OL-0912', unitSystem: 'SI' },
      trussName: 'T4',
      subject: 'Truss T4 — member forces',
      revision: 'P1',
      model,
      analysis: trussSolve(model),
      generatedAt: '2026-05-11T08:00:00Z',
    }),
  );
}

/** /proc/<pid>/stat fields after the command name: [state, ppid, pgrp, ...]. */
function statOf(pid: number): string[] | null {
  try {
    const raw = fs.readFileSync(`/proc/${pid}/stat`, 'utf8');
    return raw.slice(raw.lastIndexOf(')') + 2).split(' ');
  } catch {
    return null;
  }
}

/** Live (not zombie) processes whose command line mentions `needle`. */
function processesMentioning(needle: string): number[] {
  const out: number[] = [];
  for (const e of fs.readdirSync('/proc')) {
    if (!/^\d+$/.test(e)) continue;
    try {
      if (fs.readFileSync(`/proc/${e}/cmdline`, 'utf8').includes(needle) && statOf(Number(e))?.[0] !== 'Z') out.push(Number(e));
    } catch {
      // ended
    }
  }
  return out;
}

function inGroup(group: number): number[] {
  return fs
    .readdirSync('/proc')
    .filter((e) => /^\d+$/.test(e))
    .map(Number)
    .filter((pid) => {
      const st = statOf(pid);
      return st !== null && st[0] !== 'Z' && Number(st[2]) === group;
    });
}

async function until(check: () => boolean, ms = 10_000): Promise<boolean> {
  const end = Date.now() + ms;
  while (Date.now() < end) {
    if (check()) return true;
    await new Promise((r) => setTimeout(r, 50));
  }
  return check();
}

describe('print queue (real Chromium)', () => {
  let printer: SheetPrinter;
  let tmp: string;
  let big: string;
  let small: string;

  beforeAll(() => {
    tmp = fs.mkdtempSync(path.join(os.tmpdir(), 'pp-queue-test-'));
    printer = createSheetPrinter({ chromiumPath: CHROMIUM, tmpDir: tmp });
    big = sheetHtml(12);
    small = sheetHtml(3);
  });

  afterAll(async () => {
    await printer?.close();
    if (tmp) fs.rmSync(tmp, { recursive: true, force: true });
  });

  it('when an issue is asked for behind three waiting previews, then it prints right after the running one and the previews keep their order', async () => {
    const t0 = performance.now();
    const done: Record<string, number> = {};
    const track = (label: string, p: Promise<Buffer>) => p.then((pdf) => ((done[label] = performance.now() - t0), pdf));
    const jobs = [
      track('p0', printer.print(big, 'A4', { label: 'p0', person: 'a' })),
      track('p1', printer.print(big, 'A4', { label: 'p1', person: 'b' })),
      track('p2', printer.print(big, 'A4', { label: 'p2', person: 'c' })),
      track('p3', printer.print(big, 'A4', { label: 'p3', person: 'd' })),
    ];
    expect(printer.waiting()).toEqual({ issue: 0, preview: 3, background: 0 });
    const issueAsked = performance.now() - t0;
    jobs.push(track('i1', printer.print(small, 'A4', { label: 'i1', priority: 'issue' })));
    expect(printer.waiting()).toEqual({ issue: 1, preview: 3, background: 0 });
    const pdfs = await Promise.all(jobs);
    expect(pdfs.every((p) => p.subarray(0, 5).toString() === '%PDF-')).toBe(true);
    const order = printer.startedLog().slice(-5).map((e) => e.label);
    expect(order).toEqual(['p0', 'i1', 'p1', 'p2', 'p3']);
    // Finished in the order started: the issue was done before any of the three previews.
    expect(done.i1).toBeLessThan(Math.min(done.p1, done.p2, done.p3));
    console.log(
      `queue order ${order.join(' → ')}; issue asked at ${issueAsked.toFixed(0)} ms, done at ${done.i1.toFixed(0)} ms; ` +
        `previews done at ${['p0', 'p1', 'p2', 'p3'].map((l) => done[l].toFixed(0)).join(', ')} ms`,
    );
  }, SLOW);

  it('when a background print (a print job) is printing, then an issue and a preview asked for after it start beside it and finish first; background prints wait for each other', async () => {
    const t0 = performance.now();
    const done: Record<string, number> = {};
    const phases: string[] = [];
    const track = (label: string, p: Promise<Buffer>) => p.then((pdf) => ((done[label] = performance.now() - t0), pdf));
    const huge = sheetHtml(40);
    const jobs = [
      track('b0', printer.print(huge, 'A4', { label: 'b0', priority: 'background', onPhase: (ph) => phases.push(ph) })),
      track('b1', printer.print(small, 'A4', { label: 'b1', priority: 'background' })),
    ];
    // The second background print waits for the first; nothing else is waiting.
    expect(printer.waiting()).toEqual({ issue: 0, preview: 0, background: 1 });
    expect(await until(() => phases.includes('pdf'), 60_000)).toBe(true);
    jobs.push(track('i1', printer.print(small, 'A4', { label: 'i1', priority: 'issue' })));
    jobs.push(track('p1', printer.print(small, 'A4', { label: 'p1', person: 'e' })));
    const pdfs = await Promise.all(jobs);
    expect(pdfs.every((p) => p.subarray(0, 5).toString() === '%PDF-')).toBe(true);
    expect(phases).toEqual(['loading', 'fonts', 'pdf']);
    const order = printer.startedLog().slice(-4).map((e) => e.label);
    // i1 started while b0 printed (not after it), and b1 only once b0 was done.
    expect(order).toEqual(['b0', 'i1', 'p1', 'b1']);
    expect(done.i1).toBeLessThan(done.b0);
    expect(done.p1).toBeLessThan(done.b0);
    expect(done.b1).toBeGreaterThan(done.b0);
    console.log(`background lane: issue done at ${done.i1.toFixed(0)} ms and preview at ${done.p1.toFixed(0)} ms while the 82-joint background print took until ${done.b0.toFixed(0)} ms`);
  }, SLOW);

  it('when the requester of a waiting preview goes, then it leaves the queue and is never printed', async () => {
    const gone = new AbortController();
    const first = printer.print(big, 'A4', { label: 'keep-1' });
    const dropped = printer.print(big, 'A4', { label: 'dropped', signal: gone.signal });
    const after = printer.print(small, 'A4', { label: 'keep-2' });
    gone.abort();
    await expect(dropped).rejects.toMatchObject({ code: 'print-aborted' });
    expect(printer.waiting().preview).toBe(1);
    await Promise.all([first, after]);
    const labels = printer.startedLog().map((e) => e.label);
    expect(labels).not.toContain('dropped');
    expect(labels.slice(-2)).toEqual(['keep-1', 'keep-2']);
  }, SLOW);

  it('when the requester goes while its preview is printing, then the print stops, gives no PDF, and the next print still works', async () => {
    const gone = new AbortController();
    const stopped = printer.print(big, 'A4', { label: 'stopped', signal: gone.signal });
    expect(await until(() => printer.startedLog().at(-1)?.label === 'stopped')).toBe(true);
    const pid = printer.browserPid();
    gone.abort();
    await expect(stopped).rejects.toMatchObject({ code: 'print-aborted' });
    const next = await printer.print(small, 'A4', { label: 'after-stop' });
    expect(next.subarray(0, 5).toString()).toBe('%PDF-');
    // The page was closed, not the browser: the same browser printed the next sheet.
    expect(printer.browserPid()).toBe(pid);
  }, SLOW);

  it('when one person asks for a third preview while two are queued, then it is refused at once with one sentence; an issue is still taken', async () => {
    const a = printer.print(big, 'A4', { label: 'cap-1', person: 7 });
    const b = printer.print(big, 'A4', { label: 'cap-2', person: 7 });
    const refused = await printer.print(small, 'A4', { label: 'cap-3', person: 7 }).catch((e: Error & { code: string }) => e);
    expect(refused).toMatchObject({ code: 'print-queue-full' });
    expect((refused as Error).message.split(/(?<=\.)\s/)).toHaveLength(1);
    expect((refused as Error).message).toMatch(/2 calc sheet PDFs waiting/);
    const other = printer.print(small, 'A4', { label: 'other-person', person: 8 });
    const issue = printer.print(small, 'A4', { label: 'cap-issue', priority: 'issue' });
    await Promise.all([a, b, other, issue]);
    expect(printer.startedLog().map((e) => e.label)).not.toContain('cap-3');
    // Once those are done, the same person may ask again.
    await expect(printer.print(small, 'A4', { person: 7 })).resolves.toBeInstanceOf(Buffer);
  }, SLOW);

  it('when the browser runs, then it leads its own process group, and close() leaves no process of that group', async () => {
    const ownTmp = path.join(tmp, 'group');
    fs.mkdirSync(ownTmp);
    const own = createSheetPrinter({ chromiumPath: CHROMIUM, tmpDir: ownTmp });
    await own.print(small, 'A4');
    const pid = own.browserPid()!;
    expect(Number(statOf(pid)![2])).toBe(pid);
    const group = inGroup(pid);
    // Browser, zygotes, renderer, utility processes: all in the group.
    expect(group.length).toBeGreaterThan(1);
    const profile = fs.readdirSync(ownTmp).find((n) => n.startsWith(`panelpoint-chromium-${process.pid}-`));
    expect(profile).toBeDefined();
    await own.close();
    expect(await until(() => inGroup(pid).length === 0)).toBe(true);
    expect(fs.existsSync(path.join(ownTmp, profile!))).toBe(false);
  }, SLOW);

  it('when a print fails (time limit), then the whole browser group is killed and no process of that profile is left', async () => {
    const own = tmp + '/failing';
    fs.mkdirSync(own);
    const quick = createSheetPrinter({ chromiumPath: CHROMIUM, tmpDir: own, timeoutMs: 1 });
    try {
      await expect(quick.print(big, 'A4')).rejects.toMatchObject({ code: 'print-timeout' });
      expect(await until(() => processesMentioning(`--user-data-dir=${own}/`).length === 0)).toBe(true);
    } finally {
      await quick.close();
    }
  }, SLOW);

  it('when a long sheet is printed, then its time limit grows with the HTML, in steps of the base limit', () => {
    // Common practice, no source: a fixed limit for every size would stop healthy large prints.
    const MiB = 1024 * 1024;
    expect(printBudgetMs(0, 60_000)).toBe(60_000);
    expect(printBudgetMs(2 * MiB, 60_000)).toBe(60_000);
    expect(printBudgetMs(2 * MiB + 1, 60_000)).toBe(120_000);
    expect(printBudgetMs(20 * MiB, 60_000)).toBe(600_000);
  });
});

describe('start-up sweep of Chromium leftovers (real Chromium)', () => {
  let tmp: string;
  beforeAll(() => {
    tmp = fs.mkdtempSync(path.join(os.tmpdir(), 'pp-sweep-test-'));
  });
  afterAll(() => fs.rmSync(tmp, { recursive: true, force: true }));

  it('when a dead server left a running Chromium and profile folders, then the sweep ends that browser group and removes them, and keeps those of live servers', async () => {
    // A server pid that is certainly gone: a child that has exited.
    const dead = await new Promise<number>((resolve) => {
      const c = spawn(process.execPath, ['-e', '0']);
      c.on('exit', () => resolve(c.pid!));
    });
    expect(() => process.kill(dead, 0)).toThrow();
    const orphanDir = path.join(tmp, `panelpoint-chromium-${dead}-orphan`);
    const staleDir = path.join(tmp, `panelpoint-chromium-${dead}-stale`);
    const legacyDir = path.join(tmp, 'panelpoint-chromium-Xy12ab');
    const liveDir = path.join(tmp, `panelpoint-chromium-${process.pid}-live`);
    for (const d of [orphanDir, staleDir, legacyDir, liveDir]) fs.mkdirSync(d);
    fs.writeFileSync(path.join(staleDir, 'Local State'), '{}');
    // A real browser left running with the dead server's profile, in its own group as ours are.
    const orphan = spawn(CHROMIUM, ['--headless', '--no-sandbox', '--disable-gpu', `--user-data-dir=${orphanDir}`, '--remote-debugging-port=0', 'about:blank'], {
      detached: true,
      stdio: 'ignore',
    });
    const exited = new Promise<void>((r) => orphan.on('exit', () => r()));
    expect(await until(() => inGroup(orphan.pid!).length > 1)).toBe(true);

    const report = chromiumLeftoversSweep({ tmpDir: tmp });
    expect(report.killed).toContain(orphan.pid);
    await exited;
    expect(await until(() => inGroup(orphan.pid!).length === 0)).toBe(true);
    expect(report.removed.sort()).toEqual([legacyDir, orphanDir, staleDir].sort());
    for (const d of [orphanDir, staleDir, legacyDir]) expect(fs.existsSync(d)).toBe(false);
    expect(fs.existsSync(liveDir)).toBe(true);
  }, SLOW);

  it('when nothing was left behind, then the sweep ends nothing and removes nothing', () => {
    const empty = fs.mkdtempSync(path.join(tmp, 'empty-'));
    expect(chromiumLeftoversSweep({ tmpDir: empty })).toEqual({ killed: [], removed: [] });
  });
});
