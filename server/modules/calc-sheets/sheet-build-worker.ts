import { parentPort } from 'node:worker_threads';
import { buildCalcSheetView } from './calc-sheet-view';
import { renderCalcSheetHtml } from './calc-sheet-html';
import type { SheetBuildJob, SheetBuildReply } from './sheet-build-pool';

/**
 * Builds calc sheet HTML (view with every equation typeset by KaTeX, then the templates) off the
 * server's main thread: a 200-joint sheet with five load cases takes seconds to tens of seconds,
 * during which the main thread would answer nobody.
 */
const port = parentPort;
if (!port) throw new Error('sheet-build-worker.ts runs only as a worker thread (see sheet-build-pool.ts).');
port.on('message', (job: SheetBuildJob) => {
  port.postMessage({ jobId: job.jobId, type: 'started' } satisfies SheetBuildReply);
  try {
    const t0 = performance.now();
    const view = buildCalcSheetView(job.input);
    const viewMs = performance.now() - t0;
    port.postMessage({ jobId: job.jobId, type: 'progress', stage: 'view-built', viewMs } satisfies SheetBuildReply);
    const html = renderCalcSheetHtml(view);
    port.postMessage({ jobId: job.jobId, type: 'built', html, paper: view.paper, viewMs, htmlMs: performance.now() - t0 - viewMs } satisfies SheetBuildReply);
  } catch (err) {
    const message = err instanceof Error ? err.message : String(err);
    const code = (err as { code?: unknown })?.code;
    port.postMessage({ jobId: job.jobId, type: 'failed', error: { code: typeof code === 'string' ? code : 'sheet-build-failed', message } } satisfies SheetBuildReply);
  }
});
