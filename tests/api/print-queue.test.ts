import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Services } from '../../server/bootstrap';
import type { RunView } from '@shared/schemas/run.schema';
import { trussSolve } from '@shared/solver';
import { modelFromSketch, parallelChordSketch } from '@shared/solver/test-trusses';
import { buildCalcSheetView } from '../../server/modules/calc-sheets/calc-sheet-view';
import { renderCalcSheetHtml } from '../../server/modules/calc-sheets/calc-sheet-html';
import { createSheetPrinter, type SheetPrinter } from '../../server/modules/calc-sheets/sheet-printer';
import { demoEmail, signIn, startTestServices, type Tab } from '../support/test-services';
import { solvedDemoRun } from '../support/fixtures';

/**
 * The draft PDF route and the print queue through a listening server, real sessions, a real
 * SQLite file and the real Chromium: the per-person cap answers 429, and a request whose client
 * hangs up is never printed. A print of another sheet holds the queue meanwhile.
 */
let services: Services;
let server: http.Server;
let base: string;
let printer: SheetPrinter;
let engineer: Tab;
let run: RunView;
let blockerHtml: string;

async function until(check: () => boolean, ms = 20_000): Promise<boolean> {
  const end = Date.now() + ms;
  while (Date.now() < end) {
    if (check()) return true;
    await new Promise((r) => setTimeout(r, 20));
  }
  return check();
}

beforeAll(async () => {
  printer = createSheetPrinter({ chromiumPath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium' });
  services = await startTestServices({}, { realFile: true, printer });
  server = http.createServer(services.app);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  engineer = await signIn(base, demoEmail('engineer'));
  run = await solvedDemoRun(engineer);
  const model = modelFromSketch(parallelChordSketch('pratt', 16, 3, 3, 10));
  blockerHtml = renderCalcSheetHtml(
    buildCalcSheetView({
      firm: { name: 'Orchard Lane Engineers (demo)', address: '12 Mill Row', paperSize: 'A4' },
      project: { name: 'Brackenfield depot canopy', jobNumber: 'OL-0912', unitSystem: 'SI' },
      trussName: 'T9',
      subject: 'Truss T9',
      revision: 'P1',
      model,
      analysis: trussSolve(model),
      generatedAt: '2026-05-11T08:00:00Z',
    }),
  );
}, 120_000);

afterAll(async () => {
  await new Promise((r) => server?.close(r));
  await services?.shutdown();
  await printer?.close();
});

describe('draft PDF through the print queue', () => {
  it('when one person has two draft PDFs waiting, then a third request answers 429 with one sentence and prints nothing more', async () => {
    const blocker = printer.print(blockerHtml, 'A4', { label: 'blocker' });
    const url = `/api/runs/${run.id}/sheet.pdf`;
    const first = engineer.agent.get(url).then((r) => r);
    const second = engineer.agent.get(url).then((r) => r);
    expect(await until(() => printer.waiting().preview === 2)).toBe(true);
    const third = await engineer.agent.get(url);
    expect(third.status).toBe(429);
    expect(third.body.error.code).toBe('print-queue-full');
    expect(third.body.error.message.split(/(?<=\.)\s/)).toHaveLength(1);
    await blocker;
    const [a, b] = await Promise.all([first, second]);
    expect([a.status, b.status]).toEqual([200, 200]);
    expect(a.headers['content-type']).toMatch(/application\/pdf/);
    // blocker + the two accepted drafts; the refused one never entered the queue.
    expect(printer.startedLog().map((e) => e.label).slice(-3)).toEqual(['blocker', 'preview-2', 'preview-3']);
  }, 240_000);

  it('when the client hangs up while its draft PDF waits, then it leaves the queue and is never printed', async () => {
    const blocker = printer.print(blockerHtml, 'A4', { label: 'blocker-2' });
    const cookie = await new Promise<string>((resolve) => {
      // The agent's session cookie, sent by a plain request we can cut off.
      const jar = (engineer.agent as unknown as { jar: { getCookies(o: unknown): { toValueString(): string } } }).jar;
      resolve(jar.getCookies({ domain: '127.0.0.1', path: '/', secure: false, script: false }).toValueString());
    });
    const req = http.get(`${base}/api/runs/${run.id}/sheet.pdf`, { headers: { cookie } });
    req.on('error', () => {});
    expect(await until(() => printer.waiting().preview === 1)).toBe(true);
    req.destroy();
    expect(await until(() => printer.waiting().preview === 0)).toBe(true);
    await blocker;
    // Give the queue a moment: nothing may start after the blocker.
    await new Promise((r) => setTimeout(r, 300));
    expect(printer.startedLog().at(-1)!.label).toBe('blocker-2');
  }, 240_000);
});
