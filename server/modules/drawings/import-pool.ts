import { threadPoolCreate, type PoolOutcome } from '../../workers/thread-pool';
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
  | Exclude<PoolOutcome<never>, { type: 'done' }>;

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

const WORKER_ENTRY = new URL('./import-worker-entry.mjs', import.meta.url);

/**
 * A small pool of import worker threads (default one). A drawing that is still being read when
 * its time limit is up has its worker terminated (the only way to stop a synchronous parse);
 * a worker that runs out of its heap (`memoryMb`) dies the same way. Either way the job gets an
 * outcome with a sentence, and a fresh worker starts for the next job.
 */
export function importPoolCreate(options: { size?: number; memoryMb?: number } = {}): ImportPool {
  const pool = threadPoolCreate<Omit<ImportJob, 'jobId'>, ImportReply>({
    entry: WORKER_ENTRY,
    size: options.size,
    memoryMb: options.memoryMb ?? 1536,
    closedError: () => new ImportPoolClosedError(),
  });
  return {
    async read(job, timeLimitMs) {
      // The bytes move to the worker (transferred, not copied).
      const outcome = await pool.run(job, { timeLimitMs, transfer: [job.bytes.buffer as ArrayBuffer] });
      if (outcome.type !== 'done') return outcome;
      if (outcome.reply.type === 'started') throw new Error('An import worker replied "started" twice.');
      return outcome.reply;
    },
    pending: pool.pending,
    close: pool.close,
  };
}
