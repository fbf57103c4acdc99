import { useMemo } from 'react';
import { Link } from 'react-router-dom';
import { createColumnHelper } from '@tanstack/react-table';
import type { ArchiveEntryView, SheetSignerView } from '@shared/schemas/review.schema';
import { DataTable } from '@/components/ui/data-table';
import { formatDate } from '@/lib/format';
import { archivedPdfUrl } from '../api/get-archive';

const column = createColumnHelper<ArchiveEntryView>();

const signerOf = (signers: SheetSignerView[], role: SheetSignerView['role']) => signers.find((s) => s.role === role)?.name ?? '';

/** The archive: one row per issued or superseded revision, with its fingerprint and its exact bytes. */
export function ArchiveTable({ entries }: { entries: ArchiveEntryView[] }) {
  const columns = useMemo(
    () => [
      column.accessor('jobNumber', {
        header: 'Job',
        meta: { width: 'w-24' },
        cell: (info) => <span className="font-medium whitespace-nowrap">{info.getValue()}</span>,
      }),
      column.accessor('projectName', {
        header: 'Project',
        cell: (info) => (
          <Link to={`/projects/${info.row.original.projectId}`} className="hover:text-accent hover:underline">
            {info.getValue()}
          </Link>
        ),
      }),
      column.accessor('trussName', {
        header: 'Truss',
        cell: (info) => (
          <Link to={`/trusses/${info.row.original.trussId}`} className="hover:text-accent hover:underline">
            {info.getValue()}
          </Link>
        ),
      }),
      column.accessor('number', {
        header: 'Rev.',
        meta: { width: 'w-28' },
        cell: (info) => {
          const e = info.row.original;
          return (
            <span className="inline-flex items-baseline gap-1.5 whitespace-nowrap">
              <Link to={`/sheets/${e.sheetId}`} className="font-semibold text-accent hover:underline">
                {e.label}
              </Link>
              {e.status === 'superseded' && (
                <span className="text-[11px] text-ink-faint" title={e.supersededBy ? `Superseded by revision ${e.supersededBy.label}` : undefined}>
                  superseded{e.supersededBy ? ` by ${e.supersededBy.label}` : ''}
                </span>
              )}
            </span>
          );
        },
      }),
      column.accessor('issuedAt', {
        header: 'Issued',
        meta: { align: 'right', width: 'w-28' },
        cell: (info) => <time dateTime={info.getValue()}>{formatDate(info.getValue())}</time>,
      }),
      column.accessor((e) => `${signerOf(e.signers, 'prepared')} ${signerOf(e.signers, 'checked')}`, {
        id: 'signers',
        header: 'Prepared / checked',
        enableSorting: false,
        cell: (info) => (
          <span className="text-ink-soft">
            {signerOf(info.row.original.signers, 'prepared')} / {signerOf(info.row.original.signers, 'checked')}
          </span>
        ),
      }),
      column.accessor('sha256', {
        header: 'SHA-256',
        enableSorting: false,
        meta: { width: 'w-28' },
        cell: (info) => (
          <code className="font-mono text-xs text-ink-soft" title={info.getValue()}>
            {info.getValue().slice(0, 12)}
          </code>
        ),
      }),
      column.display({
        id: 'download',
        header: () => <span className="sr-only">Download</span>,
        meta: { align: 'right', width: 'w-16' },
        cell: (info) => (
          <a href={archivedPdfUrl(info.row.original.sheetId)} download className="text-xs font-medium text-accent hover:underline">
            PDF
          </a>
        ),
      }),
    ],
    [],
  );
  return (
    <DataTable
      data={entries}
      columns={columns}
      initialSorting={[{ id: 'issuedAt', desc: true }]}
      getRowId={(e) => String(e.sheetId)}
      rowClassName={(e) => (e.status === 'superseded' ? 'text-ink-soft' : '')}
      empty="No issued sheet matches. Try the job number, the project or the truss name."
    />
  );
}
