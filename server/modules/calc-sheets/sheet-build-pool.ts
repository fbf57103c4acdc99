import { threadPoolCreate } from '../../workers/thread-pool';
import type { CalcSheetInput } from './calc-sheet-view';
import type { PaperSize } from './sheet-printer';

/** A sheet to build, sent to the worker (the pool adds the `jobId`). */
export interface SheetBuildJob {
  jobId: number;
  input: CalcSheetInput;
}

/** Messages a worker sends back: 'started', then 'progress' once the view is built, then 'built' or 'failed'. */
export type SheetBuildReply =
  | { jobId: number; type: 'started' }
  | { jobId: number; type: 'progress'; stage: 'view-built'; viewMs: number }
  | { jobId: number; type: 'built'; html: string; paper: PaperSize; viewMs: number; htmlMs: number }
  | { jobId: number; type: 'failed'; error: { code: string; message: string } };

export interface BuiltSheet {
  html: string;
  paper: PaperSize;
  /** Time in the worker: the view (solver steps typeset by KaTeX) and the templates. */
  viewMs: number;
  htmlMs: number;
}

/** A sheet the worker could not build (a bug: the view builder threw); the message is the builder's. */
export class SheetBuildError extends Error {
  readonly code: string;
  constructor(code: string, message: string) {
    super(message);
    this.name = 'SheetBuildError';
    this.code = code;
  }
}

export class SheetBuildPoolClosedError extends Error {
  constructor() {
    super('The calc sheet builder was closed (the server is shutting down).');
    this.name = 'SheetBuildPoolClosedError';
  }
}

/** Builds calc sheet HTML off the main thread, so other people's requests keep being answered. */
export interface SheetBuildPool {
  /** The sheet's HTML; `onViewBuilt` is called when the view is done and the templates start. */
  build(input: CalcSheetInput, onViewBuilt?: () => void): Promise<BuiltSheet>;
  /** Sheets waiting plus sheets being built. */
  pending(): number;
  close(): Promise<void>;
}

type Done = Extract<SheetBuildReply, { type: 'built' | 'failed' }>;

/**
 * Sheet-build worker threads on the shared thread pool (default one: the main thread keeps the
 * other core). Workers start on the first sheet and stay for the next (their compiled templates
 * and inlined fonts are kept); a worker that dies fails its sheet and is replaced on demand.
 */
export function sheetBuildPoolCreate(options: { size?: number } = {}): SheetBuildPool {
  const pool = threadPoolCreate<{ input: CalcSheetInput }, Done>({
    entry: new URL('./sheet-build-worker-entry.mjs', import.meta.url),
    size: options.size ?? 1,
    closedError: () => new SheetBuildPoolClosedError(),
  });

  return {
    async build(input, onViewBuilt) {
      const outcome = await pool.run({ input }, { onProgress: () => onViewBuilt?.() });
      if (outcome.type !== 'done') {
        const why = outcome.type === 'stopped' ? outcome.why : outcome.type;
        throw new SheetBuildError('sheet-builder-stopped', `The calc sheet builder stopped before finishing (${why}).`);
      }
      const reply = outcome.reply;
      if (reply.type === 'failed') throw new SheetBuildError(reply.error.code, reply.error.message);
      return { html: reply.html, paper: reply.paper, viewMs: reply.viewMs, htmlMs: reply.htmlMs };
    },
    pending: () => pool.pending(),
    close: () => pool.close(),
  };
}
