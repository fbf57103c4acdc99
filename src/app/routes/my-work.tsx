import { PageHeader } from '@/components/ui/page-header';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { useMyWork } from '@/features/my-work/api/get-my-work';
import { MyWorkLists } from '@/features/my-work/components/my-work-lists';
import { useCurrentUser } from '../current-user';

export function MyWorkRoute() {
  const user = useCurrentUser();
  const work = useMyWork();
  return (
    <div>
      <PageHeader title="My work" description="What waits for you: sheets to check, revisions returned to you, checked revisions to issue and drawings to fix." />
      {work.isPending ? (
        <LoadingState label="Loading your work…" />
      ) : work.isError ? (
        <ErrorState title="Your work could not be loaded" error={work.error} onRetry={() => void work.refetch()} />
      ) : (
        <MyWorkLists work={work.data} role={user.role} />
      )}
    </div>
  );
}
