import { useMemo } from 'react';
import { Link } from 'react-router-dom';
import { createColumnHelper } from '@tanstack/react-table';
import type { TrussView } from '@shared/schemas/project.schema';
import { DataTable } from '@/components/ui/data-table';
import { formatDateTime } from '@/lib/format';

const column = createColumnHelper<TrussView>();

export function TrussesTable({ trusses }: { trusses: TrussView[] }) {
  const columns = useMemo(
    () => [
      column.accessor('name', {
        header: 'Truss',
        cell: (info) => (
          <Link to={`/trusses/${info.row.original.id}`} className="font-medium text-accent hover:underline">
            {info.getValue()}
          </Link>
        ),
      }),
      column.accessor('createdAt', {
        header: 'Added',
        meta: { align: 'right', width: 'w-40' },
        cell: (info) => <time dateTime={info.getValue()} className="text-ink-soft">{formatDateTime(info.getValue())}</time>,
      }),
      column.accessor('updatedAt', {
        header: 'Updated',
        meta: { align: 'right', width: 'w-40' },
        cell: (info) => <time dateTime={info.getValue()} className="text-ink-soft">{formatDateTime(info.getValue())}</time>,
      }),
    ],
    [],
  );
  return (
    <DataTable
      data={trusses}
      columns={columns}
      initialSorting={[{ id: 'name', desc: false }]}
      getRowId={(t) => String(t.id)}
      empty="No trusses yet."
    />
  );
}
