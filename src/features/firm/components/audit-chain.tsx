import { Button } from '@/components/ui/button';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { useAuditChain } from '../api/get-audit-chain';

/** The sheet audit log's hash chain, checked on the server from the first line (as `npm run audit:verify` does). */
export function AuditChain() {
  const chain = useAuditChain();
  if (chain.isPending) return <LoadingState label="Checking the audit log…" />;
  if (chain.isError) return <ErrorState title="The audit log could not be checked" error={chain.error} onRetry={() => void chain.refetch()} />;
  const c = chain.data;
  return (
    <div className="flex flex-col gap-3 text-sm">
      <p role="status" className={c.ok ? 'text-ink' : 'font-medium text-danger'}>
        {c.message}
      </p>
      {c.lines > 0 && (
        <p className="text-[13px] text-ink-soft">
          <span className="figures">{c.keyed}</span> line(s) sealed with the audit key
          {c.beforeKeying > 0 && (
            <>
              {', '}
              <span className="figures">{c.beforeKeying}</span> from before keying (checked by their plain hash, as before)
            </>
          )}
          .
        </p>
      )}
      {c.broken && (
        <dl className="grid grid-cols-[9rem_1fr] gap-x-3 gap-y-1 text-[13px]">
          <dt className="text-ink-soft">Audit line</dt>
          <dd className="figures">{c.broken.eventId}</dd>
          <dt className="text-ink-soft">Sheet revision</dt>
          <dd className="figures">{c.broken.revisionId}</dd>
          <dt className="text-ink-soft">Why</dt>
          <dd>{c.broken.reason}</dd>
        </dl>
      )}
      <div>
        <Button size="sm" busy={chain.isFetching} onClick={() => void chain.refetch()}>
          Check again
        </Button>
      </div>
    </div>
  );
}
