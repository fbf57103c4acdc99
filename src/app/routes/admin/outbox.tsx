import { Button } from '@/components/ui/button';
import { PageHeader } from '@/components/ui/page-header';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { useOutbox } from '@/features/outbox/api/get-outbox';
import { OutboxList } from '@/features/outbox/components/outbox-list';

export function OutboxRoute() {
  const outbox = useOutbox();
  return (
    <div>
      <PageHeader
        title="Outbox"
        description="The e-mail Panelpoint sent, as the local mail sink received it, newest first."
        actions={
          <Button busy={outbox.isFetching && !outbox.isPending} onClick={() => void outbox.refetch()}>
            Refresh
          </Button>
        }
      />
      {outbox.isPending ? (
        <LoadingState label="Loading messages…" />
      ) : outbox.isError ? (
        <ErrorState title="The outbox could not be loaded" error={outbox.error} onRetry={() => void outbox.refetch()} />
      ) : (
        <OutboxList messages={outbox.data} />
      )}
    </div>
  );
}
