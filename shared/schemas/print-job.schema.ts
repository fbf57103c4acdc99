/**
 * Calc sheet PDFs made in the background (print jobs).
 *
 * | route | who | answer |
 * | --- | --- | --- |
 * | POST /api/runs/:id/sheet-jobs | everyone | 202 {@link PrintJobView} (state 'queued'; an unfinished job of the same person for the same run is answered again instead of a second one) |
 * | GET  /api/runs/:id/sheet-jobs | everyone | → {@link PrintJobView}[] of the caller's jobs for that run, newest first (at most 5) |
 * | GET  /api/sheet-jobs/:id      | everyone, own jobs only | → {@link PrintJobView} |
 * | GET  /api/sheet-jobs/:id/pdf  | everyone, own jobs only | → application/pdf once 'done'; 409 before |
 */

export const PRINT_JOB_STATES = ['queued', 'building', 'printing', 'done', 'failed'] as const;
export type PrintJobState = (typeof PRINT_JOB_STATES)[number];

export interface PrintJobView {
  id: number;
  runId: number;
  state: PrintJobState;
  /** Where it is, in words: "waiting for the printer", "typesetting the equations", … */
  stage: string;
  /** 0–100. While Chromium writes the pages it is an estimate from the sheet's size. */
  percent: number;
  /** Pages of the PDF, once done. */
  pages: number | null;
  /** Size of the PDF in bytes, once done. */
  pdfBytes: number | null;
  /** One sentence when failed. */
  error: string | null;
  requestedById: number;
  createdAt: string;
  startedAt: string | null;
  finishedAt: string | null;
  /** Where the PDF is downloaded from, once done. */
  pdfUrl: string | null;
}

export const printJobFinished = (state: PrintJobState) => state === 'done' || state === 'failed';
