import { Worker } from 'node:worker_threads';
import type { CalcSheetInput } from './calc-sheet-view';
import type { PaperSize } from './sheet-printer';

/** A sheet to build, sent to the worker. */
export interface SheetBuildJob {
  jobId: number;
  input: CalcSheetInput;
}

/** Messages a worker sends back: 'view-built' once, then 'built' or 'failed'. */
export type SheetBuildReply =
  | { jobId: number; type: 'view-built'; viewMs: number }
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

interface Task {
  job: SheetBuildJob;
  onViewBuilt?: () => void;
  resolve(sheet: BuiltSheet): void;
  reject(err: Error): void;
}

interface Slot {
  worker: Worker;
  task: Task | null;
}

const WORKER_ENTRY = new URL('./sheet-build-worker-entry.mjs', import.meta.url);

/**
 * A small pool of sheet-build worker threads (default one: the main thread keeps the other core).
 * Workers start on the first sheet and stay for the next (their compiled templates and inlined
 * fonts are kept); a worker that dies fails its sheet and is replaced on demand.
 */
export function sheetBuildPoolCreate(options: { size?: number } = {}): SheetBuildPool {
  const size = Math.max(1, options.size ?? 1);
  const queue: Task[] = [];
  const slots: Slot[] = [];
  let nextId = 1;
  let closed = false;

  function startWorker(): Slot {
    const worker = new Worker(WORKER_ENTRY);
    worker.unref();
    const slot: Slot = { worker, task: null };
    worker.on('message', (reply: SheetBuildReply) => {
      const task = slot.task;
      if (!task || task.job.jobId !== reply.jobId) return;
      if (reply.type === 'view-built') {
        task.onViewBuilt?.();
        return;
      }
      slot.task = null;
      worker.unref();
      if (reply.type === 'built') task.resolve({ html: reply.html, paper: reply.paper, viewMs: reply.viewMs, htmlMs: reply.htmlMs });
      else task.reject(new SheetBuildError(reply.error.code, reply.error.message));
      pump();
    });
    const lost = (why: string) => {
      const index = slots.indexOf(slot);
      if (index >= 0) slots.splice(index, 1);
      const task = slot.task;
      slot.task = null;
      if (task) {
        task.reject(closed ? new SheetBuildPoolClosedError() : new SheetBuildError('sheet-builder-stopped', `The calc sheet builder stopped before finishing (${why}).`));
      }
      if (!closed) pump();
    };
    worker.on('error', (err) => lost(err.message));
    worker.on('exit', (code) => lost(`worker exit code ${code}`));
    slots.push(slot);
    return slot;
  }

  function pump(): void {
    while (!closed && queue.length) {
      const slot = slots.find((s) => s.task === null) ?? (slots.length < size ? startWorker() : null);
      if (!slot) return;
      const task = queue.shift()!;
      slot.task = task;
      slot.worker.ref();
      slot.worker.postMessage(task.job);
    }
  }

  return {
    build(input, onViewBuilt) {
      if (closed) return Promise.reject(new SheetBuildPoolClosedError());
      return new Promise<BuiltSheet>((resolve, reject) => {
        queue.push({ job: { jobId: nextId++, input }, onViewBuilt, resolve, reject });
        pump();
      });
    },
    pending: () => queue.length + slots.filter((s) => s.task).length,
    async close() {
      closed = true;
      for (const task of queue.splice(0)) task.reject(new SheetBuildPoolClosedError());
      await Promise.all(slots.map((s) => s.worker.terminate()));
    },
  };
}
