import type { SheetRevisionView, SheetStatus } from '@shared/schemas/review.schema';
import { formatDate } from '@/lib/format';

function lastMoveTo(sheet: SheetRevisionView, to: SheetStatus): string | undefined {
  return sheet.events.filter((e) => e.to === to).at(-1)?.at;
}

/** Prepared, checked and issued by whom and when, as far as the revision has come. */
export function SheetSigners({ sheet }: { sheet: SheetRevisionView }) {
  const rows: { role: string; name?: string; at?: string }[] = [
    { role: 'Prepared', name: sheet.preparedBy.name, at: lastMoveTo(sheet, 'in-check') ?? sheet.createdAt },
    sheet.checkedBy || !sheet.checker
      ? { role: 'Checked', name: sheet.checkedBy?.name, at: lastMoveTo(sheet, 'checked') }
      : { role: 'Checker', name: sheet.checker.name },
    { role: 'Issued', name: sheet.issuedBy?.name, at: sheet.issue?.issuedAt ?? lastMoveTo(sheet, 'issued') },
  ];
  return (
    <dl className="flex flex-wrap gap-x-6 gap-y-1 text-[13px]">
      {rows.map((row) => (
        <div key={row.role} className="flex items-baseline gap-1.5">
          <dt className="text-ink-faint">{row.role}</dt>
          <dd className={row.name ? 'text-ink' : 'text-ink-faint'}>
            {row.name ? (
              <>
                <span className="font-medium">{row.name}</span>{' '}
                {row.at && <time dateTime={row.at} className="text-ink-soft">{formatDate(row.at)}</time>}
              </>
            ) : (
              '—'
            )}
          </dd>
        </div>
      ))}
    </dl>
  );
}
