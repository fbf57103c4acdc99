import { useMemo } from 'react';
import { createColumnHelper } from '@tanstack/react-table';
import { ROLES, type Role, type UserView } from '@shared/schemas/auth.schema';
import { Button } from '@/components/ui/button';
import { DataTable } from '@/components/ui/data-table';
import { Badge } from '@/components/ui/page-header';
import { formatDate } from '@/lib/format';
import { notify } from '@/lib/notices';
import { ROLE_LABELS } from '@/lib/permissions';
import { useUpdateUser } from '../api/update-user';
import { useSendPasswordReset } from '../api/send-password-reset';

const column = createColumnHelper<UserView>();

/** Everyone in the firm, with their role and whether they may sign in. */
export function UsersTable({ users, currentUserId, filter }: { users: UserView[]; currentUserId: number; filter?: string }) {
  const update = useUpdateUser();
  const pendingId = update.isPending ? update.variables?.id : undefined;
  const sendReset = useSendPasswordReset();
  const sendingResetId = sendReset.isPending ? sendReset.variables?.id : undefined;

  const columns = useMemo(
    () => [
      column.accessor('name', {
        header: 'Name',
        cell: (info) => (
          <span className="font-medium whitespace-nowrap text-ink">
            {info.getValue()}
            {info.row.original.id === currentUserId && <span className="ml-2 text-xs font-normal text-ink-faint">(you)</span>}
          </span>
        ),
      }),
      column.accessor('email', { header: 'E-mail', cell: (info) => <span className="text-ink-soft">{info.getValue()}</span> }),
      column.accessor('role', {
        header: 'Role',
        meta: { width: 'w-36' },
        cell: (info) => {
          const user = info.row.original;
          const self = user.id === currentUserId;
          return (
            <select
              aria-label={`Role of ${user.name}`}
              value={info.getValue()}
              disabled={self || pendingId === user.id}
              title={self ? 'Another admin changes your own role.' : undefined}
              onChange={(e) =>
                update.mutate(
                  { id: user.id, role: e.target.value as Role },
                  { onSuccess: (u) => notify('success', `${u.name} is now ${ROLE_LABELS[u.role].toLowerCase()}.`) },
                )
              }
              className="h-7 w-full rounded-xs border border-paper-line bg-paper-raised px-1.5 text-[13px] disabled:bg-transparent disabled:text-ink-soft"
            >
              {ROLES.map((role) => (
                <option key={role} value={role}>
                  {ROLE_LABELS[role]}
                </option>
              ))}
            </select>
          );
        },
      }),
      column.accessor('disabled', {
        header: 'Status',
        meta: { width: 'w-24' },
        cell: (info) =>
          info.getValue() ? (
            <Badge tone="danger">Disabled</Badge>
          ) : info.row.original.pending ? (
            <Badge tone="neutral">Invited</Badge>
          ) : (
            <Badge tone="accent">Active</Badge>
          ),
      }),
      column.accessor('createdAt', {
        header: 'Joined',
        meta: { align: 'right', width: 'w-28' },
        cell: (info) => <time dateTime={info.getValue()}>{formatDate(info.getValue())}</time>,
      }),
      column.display({
        id: 'actions',
        header: () => <span className="sr-only">Actions</span>,
        meta: { align: 'right', width: 'w-64' },
        cell: ({ row }) => {
          const user = row.original;
          if (user.id === currentUserId) return null;
          return (
            <span className="inline-flex items-center gap-2">
            {!user.disabled && !user.pending && (
              <Button
                size="sm"
                variant="quiet"
                busy={sendingResetId === user.id}
                title="E-mail a one-time link to choose a new password; their password stays until they use it."
                onClick={() =>
                  sendReset.mutate(
                    { id: user.id },
                    { onSuccess: (sent) => notify('success', `A reset link is on its way to ${sent.email}; it works once within the hour.`) },
                  )
                }
              >
                Send reset link
              </Button>
            )}
            <Button
              size="sm"
              variant={user.disabled ? 'secondary' : 'danger'}
              busy={pendingId === user.id}
              onClick={() =>
                update.mutate(
                  { id: user.id, disabled: !user.disabled },
                  {
                    onSuccess: (u) =>
                      notify('success', u.disabled ? `${u.name} can no longer sign in.` : `${u.name} can sign in again.`),
                  },
                )
              }
            >
              {user.disabled ? 'Enable' : 'Disable'}
            </Button>
            </span>
          );
        },
      }),
    ],
    [currentUserId, pendingId, update, sendReset, sendingResetId],
  );

  return (
    <DataTable
      data={users}
      columns={columns}
      filter={filter}
      initialSorting={[{ id: 'name', desc: false }]}
      getRowId={(u) => String(u.id)}
      rowClassName={(u) => (u.disabled ? 'text-ink-faint' : '')}
      empty="No one matches."
    />
  );
}
