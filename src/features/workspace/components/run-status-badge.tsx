import type { RunSummaryView } from '@shared/schemas/run.schema';
import { Badge } from '@/components/ui/page-header';

/** A run's state in a word, with a progress bar while it is queued or solving. */
export function RunStatusBadge({ run }: { run: Pick<RunSummaryView, 'status' | 'progress'> }) {
  if (run.status === 'queued' || run.status === 'running') {
    const pct = Math.round(run.progress.fraction * 100);
    return (
      <span className="inline-flex items-center gap-2" role="status">
        <span className="text-xs font-medium text-ink-soft">{run.status === 'queued' ? 'Queued' : `Solving ${pct} %`}</span>
        <span className="h-1.5 w-16 overflow-hidden border border-paper-rule bg-paper-raised" aria-hidden>
          <span className="block h-full bg-accent transition-all" style={{ width: `${Math.max(4, pct)}%` }} />
        </span>
      </span>
    );
  }
  if (run.status === 'solved') return <Badge tone="accent">Solved</Badge>;
  if (run.status === 'unstable') return <Badge tone="danger">Unstable</Badge>;
  return <Badge tone="danger">Failed</Badge>;
}
