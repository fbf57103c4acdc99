import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import puppeteer, { type Browser } from 'puppeteer-core';

/**
 * Prints calc sheet HTML to PDF with the system Chromium through puppeteer-core. One browser per
 * printer: started on the first print, reused, started again when it crashed or was closed, and
 * closed by `close()`. Prints run one after another through a queue, so a burst of requests never
 * starts a browser each.
 */

export type SheetPrintErrorCode = 'chromium-missing' | 'print-timeout' | 'print-failed' | 'printer-closed';

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
  /** Longest one print may take, ms (default 60 000). */
  timeoutMs?: number;
}

export interface SheetPrinter {
  /** The PDF of a calc sheet HTML document. */
  print(html: string, paper: PaperSize): Promise<Buffer>;
  /**
   * Prints to `outPath` through a temporary file in the same folder, renamed when complete: a
   * failed or timed-out print leaves no file (and never a half-written one).
   */
  printToFile(html: string, paper: PaperSize, outPath: string): Promise<void>;
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

/** Creates a printer. Nothing starts until the first print. */
export function createSheetPrinter(options: SheetPrinterOptions = {}): SheetPrinter {
  const chromiumPath = options.chromiumPath ?? '/usr/bin/chromium';
  const timeoutMs = options.timeoutMs ?? 60_000;
  let browser: Browser | null = null;
  let launching: Promise<Browser> | null = null;
  // Every profile folder this printer made; removed when its browser goes and again on close.
  const profiles = new Set<string>();
  let closed = false;
  let queue: Promise<unknown> = Promise.resolve();

  const dropProfile = (dir: string) => {
    fs.rm(dir, { recursive: true, force: true, maxRetries: 3, retryDelay: 100 }, (err) => {
      if (!err) profiles.delete(dir);
    });
  };

  async function launch(): Promise<Browser> {
    assertExecutable(chromiumPath);
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'panelpoint-chromium-'));
    profiles.add(dir);
    try {
      const b = await puppeteer.launch({
        executablePath: chromiumPath,
        headless: true,
        args: [...CHROMIUM_ARGS, `--user-data-dir=${dir}`],
        handleSIGINT: false,
        handleSIGTERM: false,
        handleSIGHUP: false,
        timeout: 30_000,
      });
      b.on('disconnected', () => {
        if (browser === b) browser = null;
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
    const proc = b.process();
    if (browser === b) browser = null;
    try {
      proc?.kill('SIGKILL');
    } catch {
      // already gone
    }
  }

  async function printOnce(html: string, paper: PaperSize): Promise<Buffer> {
    const b = await getBrowser();
    const page = await b.newPage();
    let timedOut = false;
    try {
      const work = (async () => {
        await page.setContent(forPrint(html), { waitUntil: 'load', timeout: timeoutMs });
        // Nothing is laid out yet (see PRINT_ONLY_STYLE), so no font has been asked for: load every
        // face now, then wait until all are ready, so the print never falls back to a system font.
        await page.evaluate(async () => {
          await Promise.all([...document.fonts].map((face) => face.load().catch(() => undefined)));
          await document.fonts.ready;
        });
        const pdf = await page.pdf({
          format: paper === 'Letter' ? 'letter' : 'a4',
          printBackground: true,
          preferCSSPageSize: true,
          // No PDF bookmarks and no tagged structure: together they measured ~0.8 s more per
          // 50-joint sheet and 2.8× the file size; the sheet's contents list does the job.
          outline: false,
          tagged: false,
          timeout: timeoutMs,
        });
        return Buffer.from(pdf);
      })();
      return await withTimeout(work, timeoutMs, () => {
        timedOut = true;
        // A stuck renderer can hold the browser: throw it away, the next print starts a fresh one.
        killBrowser(b);
      });
    } finally {
      if (!timedOut) await page.close().catch(() => {});
    }
  }

  async function printWithRetry(html: string, paper: PaperSize): Promise<Buffer> {
    if (closed) throw new SheetPrintError('printer-closed', 'The calc sheet printer was shut down; no PDF was printed.');
    try {
      return await printOnce(html, paper);
    } catch (err) {
      if (err instanceof SheetPrintError) throw err;
      // The browser died under us (crash, killed, closed): start a fresh one and try once more.
      const b = browser;
      if (!b || !b.connected) {
        killBrowser(b);
        try {
          return await printOnce(html, paper);
        } catch (again) {
          if (again instanceof SheetPrintError) throw again;
          throw new SheetPrintError('print-failed', `Printing the calc sheet failed twice: ${(again as Error).message}`, { cause: again });
        }
      }
      throw new SheetPrintError('print-failed', `Printing the calc sheet failed: ${(err as Error).message}`, { cause: err });
    }
  }

  function enqueue<T>(job: () => Promise<T>): Promise<T> {
    const next = queue.then(job, job);
    queue = next.catch(() => {});
    return next;
  }

  return {
    print(html, paper) {
      return enqueue(() => printWithRetry(html, paper));
    },
    async printToFile(html, paper, outPath) {
      const pdf = await this.print(html, paper);
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
    browserPid() {
      return browser?.process()?.pid ?? null;
    },
    async close() {
      closed = true;
      await queue.catch(() => {});
      const b = browser ?? (launching ? await launching.catch(() => null) : null);
      browser = null;
      if (b) await b.close().catch(() => killBrowser(b));
      // A browser killed a moment ago may still be writing into its profile: retry, never throw.
      await Promise.all(
        [...profiles].map((dir) => fs.promises.rm(dir, { recursive: true, force: true, maxRetries: 10, retryDelay: 100 }).catch(() => undefined)),
      );
      profiles.clear();
    },
  };
}
