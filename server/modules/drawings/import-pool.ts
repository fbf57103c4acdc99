import { Worker } from 'node:worker_threads';
import type { DxfExplodeLimits, DxfImportOptions, DxfLayerInfo } from '@shared/dxf-import';

/**
 * A drawing to read in a worker: the file's bytes, the import options, the caps, and whether
 * to list its layers too (an upload does, a re-import does not).
 */
export interface ImportJob {
  jobId: number;
  bytes: Uint8Array;
  options: DxfImportOptions;
  limits: DxfExplodeLimits;
  listLayers: boolean;
}

/**
 * What a worker sends back: 'started' once, then one of
 *  - 'read': the drawing parsed; `layers` when asked for; the import's result as JSON text (one
 *    string copy instead of a deep clone) or its refusal;
 *  - 'refused': the file could not be read at all (not a DXF, a block inside itself, over a
 *    cap) — the sentence for the person;
 *  - 'crashed': an error the import does not know (a defect).
 */
export type ImportReply =
  | { jobId: number; type: 'started' }
  | {
      jobId: number;
      type: 'read';
      layers: DxfLayerInfo[] | null;
      imported: { resultJson: string } | { error: { code: string; message: string } };
    }
  | { jobId: number; type: 'refused'; error: { code: string; message: string } }
  | { jobId: number; type: 'crashed'; message: string };

/** A finished job: the worker's answer, or the pool's own when it stopped the worker. */
export type ImportOutcome =
  | Extract<ImportReply, { type: 'read' | 'refused' | 'crashed' }>
  | { jobId: number; type: 'timed-out'; seconds: number }
  | { jobId: number; type: 'out-of-memory'; megabytes: number }
  | { jobId: number; type: 'stopped'; why: string };

/** Reads drawings off the main thread, with a time limit per drawing. */
export interface ImportPool {
  /** Queues a drawing; the time limit runs from when a worker picks it up. */
  read(job: Omit<ImportJob, 'jobId'>, timeLimitMs: number): Promise<ImportOutcome>;
  /** Jobs waiting plus jobs being read. */
  pending(): number;
  /** Terminates the workers; queued and running jobs are rejected with {@link ImportPoolClosedError}. */
  close(): Promise<void>;
}

export class ImportPoolClosedError extends Error {
  constructor() {
    super('The drawing import pool was closed (the server is shutting down).');
    this.name = 'ImportPoolClosedError';
  }
}

interface Task {
  job: ImportJob;
  timeLimitMs: number;
  timer?: NodeJS.Timeout;
  resolve(outcome: ImportOutcome): void;
  reject(err: Error): void;
}

interface Slot {
  worker: Worker;
  task: Task | null;
}

const WORKER_ENTRY = new URL('./import-worker-entry.mjs', import.meta.url);

/**
 * A small pool of import worker threads (default one). A drawing that is still being read when
 * its time limit is up has its worker terminated (the only way to stop a synchronous parse);
 * a worker that runs out of its heap (`memoryMb`) dies the same way. Either way the job gets an
 * outcome with a sentence, and a fresh worker starts for the next job.
 */
export function importPoolCreate(options: { size?: number; memoryMb?: number } = {}): ImportPool {
  const size = Math.max(1, options.size ?? 1);
  const memoryMb = options.memoryMb ?? 1536;
  const queue: Task[] = [];
  const slots: Slot[] = [];
  let nextId = 1;
  let closed = false;

  function finish(slot: Slot, outcome: ImportOutcome): void {
    const task = slot.task;
    if (!task) return;
    clearTimeout(task.timer);
    slot.task = null;
    task.resolve(outcome);
  }

  function drop(slot: Slot): void {
    const index = slots.indexOf(slot);
    if (index >= 0) slots.splice(index, 1);
  }

  function startWorker(): Slot {
    const worker = new Worker(WORKER_ENTRY, { resourceLimits: { maxOldGenerationSizeMb: memoryMb } });
    worker.unref();
    const slot: Slot = { worker, task: null };
    worker.on('message', (reply: ImportReply) => {
      const task = slot.task;
      if (!task || task.job.jobId !== reply.jobId) return;
      if (reply.type === 'started') {
        task.timer = setTimeout(() => {
          // Out of time: stop the worker mid-parse; its replacement starts on demand.
          drop(slot);
          finish(slot, { jobId: task.job.jobId, type: 'timed-out', seconds: task.timeLimitMs / 1000 });
          void worker.terminate();
          pump();
        }, task.timeLimitMs);
        return;
      }
      finish(slot, reply);
      worker.unref();
      pump();
    });
    let lostOnce = false;
    const lost = (err: Error | null, code: number | null) => {
      if (lostOnce) return;
      lostOnce = true;
      drop(slot);
      const task = slot.task;
      if (task) {
        if (closed) {
          clearTimeout(task.timer);
          slot.task = null;
          task.reject(new ImportPoolClosedError());
        } else if ((err as { code?: string } | null)?.code === 'ERR_WORKER_OUT_OF_MEMORY') {
          finish(slot, { jobId: task.job.jobId, type: 'out-of-memory', megabytes: memoryMb });
        } else {
          finish(slot, { jobId: task.job.jobId, type: 'stopped', why: err ? err.message : `worker exit code ${code}` });
        }
      }
      if (!closed) pump();
    };
    worker.on('error', (err) => lost(err, null));
    worker.on('exit', (code) => lost(null, code));
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
      // The bytes move to the worker (transferred, not copied).
      slot.worker.postMessage(task.job, [task.job.bytes.buffer as ArrayBuffer]);
    }
  }

  return {
    read(job, timeLimitMs) {
      if (closed) return Promise.reject(new ImportPoolClosedError());
      return new Promise<ImportOutcome>((resolve, reject) => {
        queue.push({ job: { ...job, jobId: nextId++ }, timeLimitMs, resolve, reject });
        pump();
      });
    },
    pending: () => queue.length + slots.filter((s) => s.task).length,
    async close() {
      closed = true;
      for (const task of queue.splice(0)) task.reject(new ImportPoolClosedError());
      await Promise.all(slots.map((s) => s.worker.terminate()));
    },
  };
}

