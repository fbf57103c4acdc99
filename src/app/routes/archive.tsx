import { useDeferredValue } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { CONTROL_CLASS } from '@/components/ui/field';
import { PageHeader } from '@/components/ui/page-header';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { useArchive } from '@/features/records/api/get-archive';
import { ArchiveTable } from '@/features/records/components/archive-table';

export function ArchiveRoute() {
  // The search lives in the address, so a found sheet can be shared as a link.
  const [params, setParams] = useSearchParams();
  const q = params.get('q') ?? '';
  const withSuperseded = params.get('superseded') !== 'exclude';
  const deferredQ = useDeferredValue(q.trim());
  const archive = useArchive({ q: deferredQ, superseded: withSuperseded ? 'include' : 'exclude' });

  const update = (next: { q?: string; superseded?: boolean }) => {
    const p = new URLSearchParams(params);
    if (next.q !== undefined) {
      if (next.q) p.set('q', next.q);
      else p.delete('q');
    }
    if (next.superseded !== undefined) {
      if (next.superseded) p.delete('superseded');
      else p.set('superseded', 'exclude');
    }
    setParams(p, { replace: true });
  };

  return (
    <div>
      <PageHeader
        title="Archive"
        description="Every issued calc sheet across the firm’s projects, with the exact bytes that were issued and their SHA-256 fingerprint."
        actions={
          <Link to="/verify" className="text-sm font-medium text-accent hover:underline">
            Verify a PDF →
          </Link>
        }
      />
      <div className="mb-4 flex flex-wrap items-center gap-4">
        <input
          type="search"
          value={q}
          onChange={(e) => update({ q: e.target.value })}
          placeholder="Job number, project or truss"
          aria-label="Search the archive"
          className={`${CONTROL_CLASS} w-80`}
        />
        <label className="flex items-center gap-2 text-sm text-ink-soft">
          <input type="checkbox" checked={withSuperseded} onChange={(e) => update({ superseded: e.target.checked })} className="accent-accent" />
          Show superseded revisions
        </label>
        {archive.isFetching && !archive.isPending && <span className="text-xs text-ink-faint">Searching…</span>}
      </div>
      {archive.isPending ? (
        <LoadingState label="Loading the archive…" />
      ) : archive.isError ? (
        <ErrorState title="The archive could not be loaded" error={archive.error} onRetry={() => void archive.refetch()} />
      ) : (
        <ArchiveTable entries={archive.data} />
      )}
    </div>
  );
}
