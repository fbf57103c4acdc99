import { dxfImport, dxfLayers, dxfParseBytes, isDxfImportError, type DxfLayerInfo, type DxfParsed } from '@shared/dxf-import';
import type { ImportJob, ImportPool, ImportReply } from './import-pool';

const errorOf = (err: { code: string; message: string }) => ({ code: err.code, message: err.message });

/** Reads one drawing: parse, list the layers when asked, import. Pure work, no I/O. */
export function readDrawingJob(job: ImportJob): Exclude<ImportReply, { type: 'started' }> {
  const { jobId } = job;
  try {
    let parsed: DxfParsed;
    let layers: DxfLayerInfo[] | null = null;
    try {
      parsed = dxfParseBytes(job.bytes);
      if (job.listLayers) layers = dxfLayers(parsed, job.limits);
    } catch (err) {
      if (isDxfImportError(err)) return { jobId, type: 'refused', error: errorOf(err) };
      throw err;
    }
    try {
      return { jobId, type: 'read', layers, imported: { resultJson: JSON.stringify(dxfImport(parsed, job.options, job.limits)) } };
    } catch (err) {
      if (isDxfImportError(err)) return { jobId, type: 'read', layers, imported: { error: errorOf(err) } };
      throw err;
    }
  } catch (err) {
    return { jobId, type: 'crashed', message: err instanceof Error ? err.message : String(err) };
  }
}

/**
 * Reads drawings on the calling thread, without a time limit: only for drawings Panelpoint
 * wrote itself (the demo drawing seeded at start, before the app and its workers exist).
 */
export function importInline(): ImportPool {
  let nextId = 1;
  return {
    read: async (job) => readDrawingJob({ ...job, jobId: nextId++ }),
    pending: () => 0,
    close: async () => {},
  };
}
