import { useMemo } from 'react';
import { Link } from 'react-router-dom';
import { createColumnHelper } from '@tanstack/react-table';
import type { ProjectView } from '@shared/schemas/project.schema';
import { DataTable } from '@/components/ui/data-table';
import { Badge } from '@/components/ui/page-header';
import { formatDate } from '@/lib/format';

const column = createColumnHelper<ProjectView>();

/** The firm's projects, newest change first; job number and name open the project. */
export function ProjectsTable({ projects, filter }: { projects: ProjectView[]; filter: string }) {
  const columns = useMemo(
    () => [
      column.accessor('jobNumber', {
        header: 'Job no.',
        meta: { width: 'w-28' },
        cell: (info) => (
          <Link to={`/projects/${info.row.original.id}`} className="figures font-medium text-accent hover:underline">
            {info.getValue()}
          </Link>
        ),
      }),
      column.accessor('name', {
        header: 'Project',
        cell: (info) => (
          <span className="flex items-center gap-2">
            <Link to={`/projects/${info.row.original.id}`} className="font-medium text-ink hover:text-accent">
              {info.getValue()}
            </Link>
            {info.row.original.archived && <Badge tone="muted">Archived</Badge>}
          </span>
        ),
      }),
      column.accessor('client', { header: 'Client', cell: (info) => info.getValue() || <span className="text-ink-faint">—</span> }),
      column.accessor('site', { header: 'Site', cell: (info) => info.getValue() || <span className="text-ink-faint">—</span> }),
      column.accessor('unitSystem', {
        header: 'Units',
        meta: { width: 'w-16' },
        cell: (info) => <span className="text-ink-soft">{info.getValue() === 'US' ? 'US' : 'SI'}</span>,
      }),
      column.accessor('trussCount', {
        header: 'Trusses',
        meta: { align: 'right', width: 'w-20' },
        enableGlobalFilter: false,
      }),
      column.accessor('updatedAt', {
        header: 'Updated',
        meta: { align: 'right', width: 'w-28' },
        enableGlobalFilter: false,
        cell: (info) => (
          <time dateTime={info.getValue()} className="text-ink-soft">
            {formatDate(info.getValue())}
          </time>
        ),
      }),
    ],
    [],
  );

  return (
    <DataTable
      data={projects}
      columns={columns}
      filter={filter}
      initialSorting={[{ id: 'updatedAt', desc: true }]}
      getRowId={(p) => String(p.id)}
      rowClassName={(p) => (p.archived ? 'text-ink-faint' : '')}
      empty={filter ? `No project matches “${filter}”.` : 'No projects yet.'}
    />
  );
}
