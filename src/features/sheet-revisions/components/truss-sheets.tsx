import { useMemo } from 'react';
import { Link, useNavigate } from 'react-router-dom';
import { createColumnHelper } from '@tanstack/react-table';
import type { UserView } from '@shared/schemas/auth.schema';
import type { SheetRevisionSummaryView } from '@shared/schemas/review.schema';
import { Button } from '@/components/ui/button';
import { DataTable } from '@/components/ui/data-table';
import { FormError } from '@/components/ui/field';
import { Panel } from '@/components/ui/page-header';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { errorMessage } from '@/lib/api-client';
import { formatDateTime } from '@/lib/format';
import { useCreateSheet } from '../api/create-sheet';
import { useTrussRuns } from '../api/get-truss-runs';
import { useTrussSheets } from '../api/get-truss-sheets';
import { newestSolvedRun } from '../utils/newest-run';
import { canStartSheetRevision } from '../utils/sheet-actions';
import { SheetStatusBadge } from './sheet-status-badge';

const column = createColumnHelper<SheetRevisionSummaryView>();

/** The truss's calc-sheet revisions with their status, and for engineers a way to start the next one. */
export function TrussSheets({ trussId, user }: { trussId: number; user: Pick<UserView, 'id' | 'role'> }) {
  const sheets = useTrussSheets(trussId);
  const columns = useMemo(
    () => [
      column.accessor('number', {
        header: 'Rev.',
        meta: { width: 'w-16' },
        cell: (info) => (
          <Link to={`/sheets/${info.row.original.id}`} className="font-semibold text-accent hover:underline">
            {info.row.original.label}
          </Link>
        ),
      }),
      column.accessor('status', {
        header: 'Status',
        meta: { width: 'w-28' },
        cell: (info) => <SheetStatusBadge status={info.getValue()} replacedBy={info.row.original.replacedBy} />,
      }),
      column.accessor((r) => r.preparedBy.name, { id: 'preparedBy', header: 'Prepared by' }),
      column.accessor((r) => r.checkedBy?.name ?? r.checker?.name ?? '', {
        id: 'checkedBy',
        header: 'Checker',
        cell: (info) => info.getValue() || <span className="text-ink-faint">—</span>,
      }),
      column.accessor('openCommentCount', {
        header: 'Open comments',
        meta: { align: 'right', width: 'w-32' },
        cell: (info) => (info.getValue() > 0 ? <span className="font-semibold text-danger">{info.getValue()}</span> : <span className="text-ink-faint">0</span>),
      }),
      column.accessor('createdAt', {
        header: 'Started',
        meta: { align: 'right', width: 'w-36' },
        cell: (info) => <time dateTime={info.getValue()} className="text-ink-soft">{formatDateTime(info.getValue())}</time>,
      }),
      column.accessor('updatedAt', {
        header: 'Last move',
        meta: { align: 'right', width: 'w-36' },
        cell: (info) => <time dateTime={info.getValue()} className="text-ink-soft">{formatDateTime(info.getValue())}</time>,
      }),
    ],
    [],
  );

  return (
    <Panel title="Calc sheets" actions={canStartSheetRevision(user) ? <NewRevision trussId={trussId} /> : undefined}>
      {sheets.isPending ? (
        <LoadingState label="Loading the sheet revisions…" />
      ) : sheets.isError ? (
        <ErrorState title="The sheet revisions could not be loaded" error={sheets.error} onRetry={() => void sheets.refetch()} />
      ) : (
        <DataTable
          data={sheets.data}
          columns={columns}
          initialSorting={[{ id: 'number', desc: true }]}
          getRowId={(r) => String(r.id)}
          empty="No calc sheet yet. An engineer starts revision A from a solved analysis run."
        />
      )}
    </Panel>
  );
}

function NewRevision({ trussId }: { trussId: number }) {
  const runs = useTrussRuns(trussId);
  const create = useCreateSheet();
  const navigate = useNavigate();
  const run = runs.data ? newestSolvedRun(runs.data) : null;

  if (runs.isPending) return <span className="text-xs text-ink-faint">Looking for solved runs…</span>;
  if (runs.isError) return <span className="text-xs text-danger">{errorMessage(runs.error)}</span>;
  if (!run) return <span className="text-xs text-ink-soft">Run the analysis to start a calc sheet.</span>;

  return (
    <div className="flex flex-col items-end gap-1">
      <div className="flex items-center gap-3">
        <span className="text-xs text-ink-soft">
          Run {run.number}, {formatDateTime(run.finishedAt ?? run.createdAt)}
          {run.stale && <span className="text-danger"> · the model changed since</span>}
        </span>
        <Button
          size="sm"
          variant="primary"
          busy={create.isPending}
          onClick={() => create.mutate({ trussId, input: { runId: run.id } }, { onSuccess: (sheet) => navigate(`/sheets/${sheet.id}`) })}
        >
          New revision from Run {run.number}
        </Button>
      </div>
      {create.isError && <FormError message={errorMessage(create.error)} />}
    </div>
  );
}
