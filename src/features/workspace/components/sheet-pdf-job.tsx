import { printJobFinished } from '@shared/schemas/print-job.schema';
import { Button } from '@/components/ui/button';
import { useRequestSheetJob, useRunSheetJobs } from '../api/sheet-jobs';

const LINK = 'inline-flex h-8 items-center rounded-xs border border-paper-line bg-paper-raised px-3 text-xs font-medium text-ink hover:bg-paper-sunk';

/**
 * The run's calc sheet PDF, made in the background: a button that asks for it, then one line of
 * progress (stage and percent, polled) and the download link when it is done. A large sheet takes
 * minutes; the page stays usable and the job goes on if the page is closed.
 */
export function SheetPdfJob({ runId }: { runId: number }) {
  const jobs = useRunSheetJobs(runId);
  const ask = useRequestSheetJob(runId);
  const newest = jobs.data?.[0];
  const busy = newest !== undefined && !printJobFinished(newest.state);
  return (
    <div className="flex flex-col items-end gap-1">
      <div className="flex items-center gap-2">
        {newest?.state === 'done' && newest.pdfUrl && (
          <a className={LINK} href={newest.pdfUrl} download>
            Download the calc sheet PDF ({newest.pages} pages)
          </a>
        )}
        <Button size="sm" busy={ask.isPending} disabled={busy} onClick={() => ask.mutate()}>
          {newest?.state === 'done' ? 'Make the PDF again' : 'Make the calc sheet PDF'}
        </Button>
      </div>
      {busy && (
        <p role="status" aria-live="polite" className="flex items-center gap-2 text-xs text-ink-soft">
          <progress className="h-1.5 w-32" max={100} value={newest.percent} aria-label="Calc sheet PDF progress" />
          <span>
            Calc sheet PDF: {newest.stage} · <span className="figures">{newest.percent}</span> %
          </span>
        </p>
      )}
      {newest?.state === 'failed' && (
        <p role="alert" className="text-xs text-danger">
          The calc sheet PDF was not made: {newest.error}
        </p>
      )}
      {ask.isError && (
        <p role="alert" className="text-xs text-danger">
          {ask.error.message}
        </p>
      )}
    </div>
  );
}
