import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { CONTROL_CLASS } from '@/components/ui/field';
import { PageHeader, Panel } from '@/components/ui/page-header';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { useUsers } from '@/features/users/api/get-users';
import { InviteUserForm } from '@/features/users/components/invite-user-form';
import { UsersTable } from '@/features/users/components/users-table';
import { useCurrentUser } from '../../current-user';

export function UsersRoute() {
  const user = useCurrentUser();
  const users = useUsers();
  const [filter, setFilter] = useState('');
  const [inviting, setInviting] = useState(false);

  return (
    <div>
      <PageHeader
        title="Users"
        description="Who works in Panelpoint and in what role. A disabled person can no longer sign in; their signatures on issued sheets stay valid."
        actions={
          !inviting && (
            <Button variant="primary" onClick={() => setInviting(true)}>
              Invite someone
            </Button>
          )
        }
      />
      {inviting && (
        <Panel title="Invite someone" className="mb-6">
          <InviteUserForm onClose={() => setInviting(false)} />
        </Panel>
      )}
      <div className="mb-3 flex items-center gap-4">
        <input
          type="search"
          value={filter}
          onChange={(e) => setFilter(e.target.value)}
          placeholder="Filter by name or e-mail"
          aria-label="Filter users"
          className={`${CONTROL_CLASS} w-full max-w-xs`}
        />
        {users.data && (
          <span className="figures ml-auto text-xs text-ink-faint">
            {users.data.length} {users.data.length === 1 ? 'person' : 'people'}, {users.data.filter((u) => !u.disabled && !u.pending).length} active
          </span>
        )}
      </div>
      {users.isPending ? (
        <LoadingState label="Loading users…" />
      ) : users.isError ? (
        <ErrorState title="The users could not be loaded" error={users.error} onRetry={() => void users.refetch()} />
      ) : (
        <UsersTable users={users.data} currentUserId={user.id} filter={filter} />
      )}
    </div>
  );
}
