import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import puppeteer, { type Browser } from 'puppeteer-core';

/**
 * Prints calc sheet HTML to PDF with the system Chromium through puppeteer-core. One browser per
 * printer: started on the first print, reused, started again when it crashed or was closed, and
 * closed by `close()`. Prints run one at a time from one queue, so a burst of requests never
 * starts a browser each. The queue:
 *
 * - an issue print (the signed record) goes ahead of every waiting preview; issues keep their
 *   order among themselves, and so do previews;
 * - a print whose requester has gone (its `signal` aborts) is taken out of the queue, or, when it
 *   is already printing, its page is closed and nothing is returned;
 * - one person holds at most `previewsPerPerson` previews (waiting or printing); one more is
 *   refused at once with 'print-queue-full' (the API answers 429);
 * - a 'background' print (a large sheet made as a print job, print-jobs.service.ts) runs in a
 *   lane of its own, one at a time, in its own page of the same browser: it never holds up an
 *   issue or a preview, which may print beside it.
 *
 * Chromium runs in its own process group (puppeteer's launcher starts it detached); a failed or
 * timed-out print and `close()` kill the whole group, so no renderer or GPU helper is left behind.
 * Profile folders are named `panelpoint-chromium-<server pid>-*` in the temp folder, so
 * `chromiumLeftoversSweep` (run at server start) can tell the leftovers of a server that is gone
 * (killed with -9, say) from those of one still running, and remove only the former.
 */

export type SheetPrintErrorCode = 'chromium-missing' | 'print-timeout' | 'print-failed' | 'printer-closed' | 'print-queue-full' | 'print-aborted';

/** A print that did not produce a PDF; `code` is stable, the message says what to do. */
export class SheetPrintError extends Error {
  readonly code: SheetPrintErrorCode;
  constructor(code: SheetPrintErrorCode, message: string, options?: { cause?: unknown }) {
    super(message, options);
    this.name = 'SheetPrintError';
    this.code = code;
  }
}

export type PaperSize = 'A4' | 'Letter';

export interface SheetPrinterOptions {
  /** Path of the Chromium executable (config.chromiumPath; default /usr/bin/chromium). */
  chromiumPath?: string;
  /** Longest one print may take, ms (default 60 000); see `printBudgetMs` for large sheets. */
  timeoutMs?: number;
  /** Previews one person may have waiting or printing at once (default 2). */
  previewsPerPerson?: number;
  /** Folder for the browser profiles (default os.tmpdir()). */
  tmpDir?: string;
}

/**
 * 'issue' prints the signed record and goes ahead of every waiting 'preview'; 'background' prints
 * (print jobs) wait in their own lane and never hold up either.
 */
export type PrintPriority = 'issue' | 'preview' | 'background';

/** Where a print is: HTML loading into the page, fonts loading, Chromium laying out and writing the PDF. */
export type PrintPhase = 'loading' | 'fonts' | 'pdf';

export interface PrintRequest {
  /** Default 'preview'. */
  priority?: PrintPriority;
  /** Who asked (a user id); previews are counted per person. Without it a preview is not capped. */
  person?: string | number;
  /** Aborted when the requester has gone: the print leaves the queue, or stops if it has begun. */
  signal?: AbortSignal;
  /** Told when the print enters each phase (print jobs record it as progress). */
  onPhase?: (phase: PrintPhase) => void;
}

/** Where one print is, for tests and the bench: the order prints started in. */
export interface PrintLogEntry {
  label: string;
  priority: PrintPriority;
  startedAt: number;
  /** Filled when the print is done: ms in setContent (parse, load), font loading and page.pdf (print layout, paint, PDF). */
  phases?: { setContentMs: number; fontsMs: number; pdfMs: number };
}

export interface SheetPrinter {
  /** The PDF of a calc sheet HTML document. */
  print(html: string, paper: PaperSize, request?: PrintRequest & { label?: string }): Promise<Buffer>;
  /**
   * Prints to `outPath` through a temporary file in the same folder, renamed when complete: a
   * failed or timed-out print leaves no file (and never a half-written one).
   */
  printToFile(html: string, paper: PaperSize, outPath: string, request?: PrintRequest): Promise<void>;
  /** Prints waiting (not yet started), by priority. */
  waiting(): { issue: number; preview: number; background: number };
  /** The prints started so far, oldest first (the last 100). */
  startedLog(): PrintLogEntry[];
  /** The running browser's process id, or null (tests use it to simulate a crash). */
  browserPid(): number | null;
  /** Closes the browser; later prints fail with 'printer-closed'. */
  close(): Promise<void>;
}

const CHROMIUM_ARGS = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--disable-dev-shm-usage',
  '--font-render-hinting=none',
];

/**
 * Added to the document for printing only: the page is laid out once, for print. Without it
 * Chromium first lays the whole sheet out for the screen after loading (a third of the work on a
 * long sheet, measured with bench/sheet.bench.ts), then again for print.
 */
const PRINT_ONLY_STYLE = '<style>@media screen { body { display: none !important; } }</style>';

function forPrint(html: string): string {
  return /<\/head>/i.test(html) ? html.replace(/<\/head>/i, `${PRINT_ONLY_STYLE}</head>`) : PRINT_ONLY_STYLE + html;
}

/** The message for a missing browser: what is wrong and the one command that fixes it. */
export function chromiumMissingMessage(chromiumPath: string): string {
  return `Chromium was not found at ${chromiumPath}; the calc sheet needs it to print PDFs. Install it with "apt-get install -y chromium", or set CHROMIUM_PATH to the browser's path.`;
}

function assertExecutable(file: string): void {
  try {
    fs.accessSync(file, fs.constants.X_OK);
  } catch {
    throw new SheetPrintError('chromium-missing', chromiumMissingMessage(file));
  }
}

async function withTimeout<T>(work: Promise<T>, ms: number, onTimeout: () => void): Promise<T> {
  let timer: NodeJS.Timeout | undefined;
  const timeout = new Promise<never>((_, reject) => {
    timer = setTimeout(() => {
      onTimeout();
      reject(new SheetPrintError('print-timeout', `Printing the calc sheet took longer than ${Math.round(ms / 1000)} s and was stopped; no PDF was written. Try again; if it keeps happening, the sheet may be too large for one print.`));
    }, ms);
  });
  try {
    return await Promise.race([work, timeout]);
  } finally {
    clearTimeout(timer);
  }
}

/**
 * Time one print may take. The printer's limit (`timeoutMs`) holds for every sheet up to 2 MiB of
 * HTML (about 50 joints and 2 load cases); a longer sheet gets the limit again for every further
 * 2 MiB. Printing time grows in step with the HTML: Chromium's print layout of the KaTeX spans is
 * most of it (bench/sheet.bench.ts prints the split), so a fixed limit would stop every large
 * sheet however healthy the browser, while a stuck renderer is still stopped in proportion.
 */
export function printBudgetMs(htmlLength: number, timeoutMs: number): number {
  const extra = Math.max(0, Math.ceil((htmlLength - 2 * 1024 * 1024) / (2 * 1024 * 1024)));
  return timeoutMs * (1 + extra);
}

/** Profile folders of this server: `panelpoint-chromium-<pid>-XXXXXX` in the temp folder. */
const PROFILE_PREFIX = 'panelpoint-chromium-';

/** Browser process groups alive in this process, killed synchronously if the process exits (this process's own children: nothing another process needs). */
const liveGroups = new Set<number>();
let exitHookSet = false;
function trackGroup(pid: number): void {
  liveGroups.add(pid);
  if (!exitHookSet) {
    exitHookSet = true;
    process.on('exit', () => {
      for (const group of liveGroups) killGroup(group);
    });
  }
}

/** SIGKILL to a browser's whole process group (the main process leads it); never throws. */
function killGroup(pid: number): void {
  liveGroups.delete(pid);
  try {
    process.kill(-pid, 'SIGKILL');
  } catch {
    try {
      process.kill(pid, 'SIGKILL');
    } catch {
      // already gone
    }
  }
}

interface Job {
  priority: PrintPriority;
  person?: string;
  label: string;
  signal?: AbortSignal;
  onPhase?: (phase: PrintPhase) => void;
  html: string;
  paper: PaperSize;
  resolve(pdf: Buffer): void;
  reject(err: unknown): void;
  /** Set while printing: closes the page so the print stops. */
  stop?: () => void;
  onAbort?: () => void;
}

function abortedError(): SheetPrintError {
  return new SheetPrintError('print-aborted', 'The calc sheet print was stopped because whoever asked for it has gone; no PDF was printed.');
}

/** Creates a printer. Nothing starts until the first print. */
export function createSheetPrinter(options: SheetPrinterOptions = {}): SheetPrinter {
  const chromiumPath = options.chromiumPath ?? '/usr/bin/chromium';
  const timeoutMs = options.timeoutMs ?? 60_000;
  const previewsPerPerson = options.previewsPerPerson ?? 2;
  const tmpDir = options.tmpDir ?? os.tmpdir();
  let browser: Browser | null = null;
  let launching: Promise<Browser> | null = null;
  // Every profile folder this printer made; removed when its browser goes and again on close.
  const profiles = new Set<string>();
  let closed = false;
  const waitingJobs: Job[] = [];
  // The main lane (issues, previews) and the background lane (print jobs), one print each.
  let running: Job | null = null;
  let runningDone: Promise<void> = Promise.resolve();
  let runningBackground: Job | null = null;
  let backgroundDone: Promise<void> = Promise.resolve();
  const log: PrintLogEntry[] = [];
  let counter = 0;

  const dropProfile = (dir: string) => {
    fs.rm(dir, { recursive: true, force: true, maxRetries: 3, retryDelay: 100 }, (err) => {
      if (!err) profiles.delete(dir);
    });
  };

  async function launch(): Promise<Browser> {
    assertExecutable(chromiumPath);
    const dir = fs.mkdtempSync(path.join(tmpDir, `${PROFILE_PREFIX}${process.pid}-`));
    profiles.add(dir);
    try {
      // puppeteer's launcher spawns Chromium detached: the browser leads its own process group.
      const b = await puppeteer.launch({
        executablePath: chromiumPath,
        headless: true,
        args: [...CHROMIUM_ARGS, `--user-data-dir=${dir}`],
        handleSIGINT: false,
        handleSIGTERM: false,
        handleSIGHUP: false,
        timeout: 30_000,
        // puppeteer stops any one CDP call after 180 s by default, which cut off page.pdf of a large
        // sheet on a busy machine before our own limit (printBudgetMs) was reached: ours decides.
        protocolTimeout: 3_600_000,
      });
      const pid = b.process()?.pid;
      if (pid) trackGroup(pid);
      b.on('disconnected', () => {
        if (browser === b) browser = null;
        // The main process may be gone while helpers of its group linger: end them too.
        if (pid) killGroup(pid);
        dropProfile(dir);
      });
      return b;
    } catch (err) {
      dropProfile(dir);
      throw new SheetPrintError('print-failed', `Chromium at ${chromiumPath} could not be started: ${(err as Error).message}`, { cause: err });
    }
  }

  async function getBrowser(): Promise<Browser> {
    if (browser && browser.connected) return browser;
    if (!launching) {
      launching = launch().finally(() => {
        launching = null;
      });
    }
    browser = await launching;
    return browser;
  }

  function killBrowser(b: Browser | null): void {
    if (!b) return;
    const pid = b.process()?.pid;
    if (browser === b) browser = null;
    if (pid) killGroup(pid);
  }

  async function printOnce(job: Job): Promise<Buffer> {
    const b = await getBrowser();
    const page = await b.newPage();
    let stopped = false;
    let timedOut = false;
    const budget = printBudgetMs(job.html.length, timeoutMs);
    job.stop = () => {
      stopped = true;
      // Closing the page ends setContent/pdf at once; a page that will not close takes the browser with it.
      const t = setTimeout(() => killBrowser(b), 5_000);
      page.close().catch(() => killBrowser(b)).finally(() => clearTimeout(t));
    };
    try {
      if (job.signal?.aborted) throw abortedError();
      const work = (async () => {
        const t0 = performance.now();
        job.onPhase?.('loading');
        await page.setContent(forPrint(job.html), { waitUntil: 'load', timeout: budget });
        const t1 = performance.now();
        job.onPhase?.('fonts');
        // Nothing is laid out yet (see PRINT_ONLY_STYLE), so no font has been asked for: load every
        // face now, then wait until all are ready, so the print never falls back to a system font.
        await page.evaluate(async () => {
          await Promise.all([...document.fonts].map((face) => face.load().catch(() => undefined)));
          await document.fonts.ready;
        });
        const t2 = performance.now();
        job.onPhase?.('pdf');
        const pdf = await page.pdf({
          format: job.paper === 'Letter' ? 'letter' : 'a4',
          printBackground: true,
          preferCSSPageSize: true,
          // No PDF bookmarks and no tagged structure: together they measured ~0.8 s more per
          // 50-joint sheet and 2.8× the file size; the sheet's contents list does the job.
          outline: false,
          tagged: false,
          timeout: budget,
        });
        const entry = log.find((e) => e.label === job.label && !e.phases);
        if (entry) entry.phases = { setContentMs: t1 - t0, fontsMs: t2 - t1, pdfMs: performance.now() - t2 };
        return Buffer.from(pdf);
      })();
      work.catch(() => {});
      const pdf = await withTimeout(work, budget, () => {
        timedOut = true;
        // A stuck renderer can hold the browser: throw it away, the next print starts a fresh one.
        killBrowser(b);
      });
      if (stopped) throw abortedError();
      return pdf;
    } catch (err) {
      if (stopped) throw abortedError();
      throw err;
    } finally {
      job.stop = undefined;
      if (!timedOut && !stopped) await page.close().catch(() => {});
    }
  }

  async function printWithRetry(job: Job): Promise<Buffer> {
    if (closed) throw new SheetPrintError('printer-closed', 'The calc sheet printer was shut down; no PDF was printed.');
    try {
      return await printOnce(job);
    } catch (err) {
      if (err instanceof SheetPrintError) throw err;
      // The browser died under us (crash, killed, closed): start a fresh one and try once more.
      const b = browser;
      if (!b || !b.connected) {
        killBrowser(b);
        try {
          return await printOnce(job);
        } catch (again) {
          if (again instanceof SheetPrintError) throw again;
          throw new SheetPrintError('print-failed', `Printing the calc sheet failed twice: ${(again as Error).message}`, { cause: again });
        }
      }
      throw new SheetPrintError('print-failed', `Printing the calc sheet failed: ${(err as Error).message}`, { cause: err });
    }
  }

  function previewsOf(person: string): number {
    let n = running && running.priority === 'preview' && running.person === person ? 1 : 0;
    for (const job of waitingJobs) if (job.priority === 'preview' && job.person === person) n += 1;
    return n;
  }

  function pump(): void {
    if (!running) {
      const at = waitingJobs.findIndex((j) => j.priority !== 'background');
      if (at >= 0) {
        const job = waitingJobs.splice(at, 1)[0];
        running = job;
        runningDone = start(job, () => {
          running = null;
        });
      }
    }
    if (!runningBackground) {
      const at = waitingJobs.findIndex((j) => j.priority === 'background');
      if (at >= 0) {
        const job = waitingJobs.splice(at, 1)[0];
        runningBackground = job;
        backgroundDone = start(job, () => {
          runningBackground = null;
        });
      }
    }
  }

  function start(job: Job, done: () => void): Promise<void> {
    log.push({ label: job.label, priority: job.priority, startedAt: performance.now() });
    if (log.length > 100) log.shift();
    return (async () => {
      try {
        job.resolve(await printWithRetry(job));
      } catch (err) {
        // A failed print (not one stopped for a requester who left) ends the browser's whole group.
        if (err instanceof SheetPrintError && err.code !== 'print-aborted' && err.code !== 'printer-closed' && err.code !== 'chromium-missing') {
          killBrowser(browser);
        }
        job.reject(err);
      } finally {
        if (job.onAbort) job.signal?.removeEventListener('abort', job.onAbort);
        done();
        pump();
      }
    })();
  }

  function enqueue(html: string, paper: PaperSize, request: PrintRequest & { label?: string }): Promise<Buffer> {
    const priority = request.priority ?? 'preview';
    const person = request.person === undefined ? undefined : String(request.person);
    if (closed) return Promise.reject(new SheetPrintError('printer-closed', 'The calc sheet printer was shut down; no PDF was printed.'));
    if (request.signal?.aborted) return Promise.reject(abortedError());
    if (priority === 'preview' && person !== undefined && previewsOf(person) >= previewsPerPerson) {
      return Promise.reject(
        new SheetPrintError(
          'print-queue-full',
          `You already have ${previewsPerPerson} calc sheet PDFs waiting to print; wait until one of them is done, then ask again.`,
        ),
      );
    }
    return new Promise<Buffer>((resolve, reject) => {
      counter += 1;
      const job: Job = { priority, person, label: request.label ?? `${priority}-${counter}`, signal: request.signal, onPhase: request.onPhase, html, paper, resolve, reject };
      if (job.signal) {
        job.onAbort = () => {
          const at = waitingJobs.indexOf(job);
          if (at >= 0) {
            waitingJobs.splice(at, 1);
            job.signal?.removeEventListener('abort', job.onAbort!);
            reject(abortedError());
          } else if (running === job || runningBackground === job) {
            job.stop?.();
          }
        };
        job.signal.addEventListener('abort', job.onAbort, { once: true });
      }
      // An issue goes ahead of every waiting preview, behind issues already waiting.
      const firstPreview = priority === 'issue' ? waitingJobs.findIndex((j) => j.priority === 'preview') : -1;
      if (firstPreview >= 0) waitingJobs.splice(firstPreview, 0, job);
      else waitingJobs.push(job);
      pump();
    });
  }

  return {
    print(html, paper, request = {}) {
      return enqueue(html, paper, request);
    },
    async printToFile(html, paper, outPath, request = {}) {
      const pdf = await this.print(html, paper, request);
      const dir = path.dirname(path.resolve(outPath));
      const tmp = path.join(dir, `.${path.basename(outPath)}.${process.pid}.${crypto.randomBytes(4).toString('hex')}.tmp`);
      try {
        await fs.promises.writeFile(tmp, pdf);
        await fs.promises.rename(tmp, outPath);
      } catch (err) {
        await fs.promises.rm(tmp, { force: true });
        throw err;
      }
    },
    waiting() {
      return {
        issue: waitingJobs.filter((j) => j.priority === 'issue').length,
        preview: waitingJobs.filter((j) => j.priority === 'preview').length,
        background: waitingJobs.filter((j) => j.priority === 'background').length,
      };
    },
    startedLog() {
      return log.map((e) => ({ ...e }));
    },
    browserPid() {
      return browser?.process()?.pid ?? null;
    },
    async close() {
      closed = true;
      for (const job of waitingJobs.splice(0)) {
        if (job.onAbort) job.signal?.removeEventListener('abort', job.onAbort);
        job.reject(new SheetPrintError('printer-closed', 'The calc sheet printer was shut down; no PDF was printed.'));
      }
      await Promise.all([runningDone.catch(() => {}), backgroundDone.catch(() => {})]);
      const b = browser ?? (launching ? await launching.catch(() => null) : null);
      browser = null;
      if (b) {
        const pid = b.process()?.pid;
        let timer: NodeJS.Timeout | undefined;
        await Promise.race([b.close().catch(() => {}), new Promise((r) => (timer = setTimeout(r, 5_000)))]);
        clearTimeout(timer);
        // Whatever of the group is still there (a helper, or a browser that would not close) goes now.
        if (pid) killGroup(pid);
      }
      // A browser killed a moment ago may still be writing into its profile: retry, never throw.
      await Promise.all(
        [...profiles].map((dir) => fs.promises.rm(dir, { recursive: true, force: true, maxRetries: 10, retryDelay: 100 }).catch(() => undefined)),
      );
      profiles.clear();
    },
  };
}

/** What `chromiumLeftoversSweep` found and ended. */
export interface ChromiumSweepReport {
  /** Process ids of leftover browsers killed (each with its process group). */
  killed: number[];
  /** Profile folders removed. */
  removed: string[];
}

function pidAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/** The server pid in a profile folder's name, or null for a folder named before the pid was added. */
function profileOwner(dir: string): number | null {
  const m = new RegExp(`^${PROFILE_PREFIX}(\\d+)-`).exec(path.basename(dir));
  return m ? Number(m[1]) : null;
}

/**
 * Run once at server start: ends the Chromium processes and removes the profile folders that a
 * Panelpoint server left behind when it died without closing its printer (kill -9, a crash, a
 * power cut). Only what is ours is touched: a process counts when its `--user-data-dir` is one of
 * our profile folders, and it is a leftover when the server named in the folder is no longer
 * running (a folder without a server pid: when no process uses it, or its browser's parent is
 * gone). Browsers of a server still running, this one included, are left alone. Never throws.
 */
export function chromiumLeftoversSweep(options: { tmpDir?: string } = {}): ChromiumSweepReport {
  const prefix = path.join(options.tmpDir ?? os.tmpdir(), PROFILE_PREFIX);
  const report: ChromiumSweepReport = { killed: [], removed: [] };
  const inUse = new Set<string>();
  const stale = (owner: number | null, orphaned: boolean) => (owner === null ? orphaned : owner !== process.pid && !pidAlive(owner));
  let procs: string[] = [];
  try {
    procs = fs.readdirSync('/proc').filter((e) => /^\d+$/.test(e));
  } catch {
    // not Linux: folders only
  }
  for (const entry of procs) {
    const pid = Number(entry);
    if (pid === process.pid) continue;
    let args: string[];
    let stat: string[];
    try {
      args = fs.readFileSync(`/proc/${pid}/cmdline`, 'utf8').split('\0');
      const raw = fs.readFileSync(`/proc/${pid}/stat`, 'utf8');
      stat = raw.slice(raw.lastIndexOf(')') + 2).split(' ');
    } catch {
      continue; // ended while we looked
    }
    const flag = args.find((a) => a.startsWith(`--user-data-dir=${prefix}`));
    if (!flag) continue;
    const dir = flag.slice('--user-data-dir='.length);
    const ppid = Number(stat[1]);
    const group = Number(stat[2]);
    if (!stale(profileOwner(dir), ppid === 1)) {
      inUse.add(dir);
      continue;
    }
    // The browser leads its own group (see launch): end the group, unless it is ours.
    if (group === pid) killGroup(pid);
    else {
      try {
        process.kill(pid, 'SIGKILL');
      } catch {
        continue;
      }
    }
    report.killed.push(pid);
  }
  const parent = path.dirname(prefix);
  let names: string[] = [];
  try {
    names = fs.readdirSync(parent).filter((n) => n.startsWith(PROFILE_PREFIX));
  } catch {
    return report;
  }
  for (const name of names) {
    const dir = path.join(parent, name);
    if (inUse.has(dir) || !stale(profileOwner(dir), true)) continue;
    try {
      fs.rmSync(dir, { recursive: true, force: true, maxRetries: 5, retryDelay: 100 });
      report.removed.push(dir);
    } catch {
      // not ours to remove (another user's), or busy: left for the next start
    }
  }
  return report;
}
