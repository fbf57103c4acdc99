import type { SheetEventView } from '@shared/schemas/review.schema';
import { formatDateTime } from '@/lib/format';
import { SHEET_STATUS_LABELS } from '../utils/sheet-actions';

/** Every move of the revision, oldest first: when, who, from → to, and the note given. */
export function SheetAuditLog({ events }: { events: SheetEventView[] }) {
  return (
    <ol className="text-[13px]">
      {events.map((event) => (
        <li key={event.id} className="grid grid-cols-[8.5rem_1fr] gap-x-3 border-b border-paper-line/70 py-2 last:border-b-0">
          <time dateTime={event.at} className="figures text-ink-soft">
            {formatDateTime(event.at)}
          </time>
          <div className="min-w-0">
            <div>
              <span className="font-medium text-ink">{event.by?.name ?? 'Panelpoint'}</span>{' '}
              <span className="text-ink-soft">
                {event.from === null ? (
                  <>started it as {SHEET_STATUS_LABELS[event.to].toLowerCase()}</>
                ) : event.from === event.to ? (
                  // A line that is no move (an admin handing the revision to another checker): its note says what changed.
                  <>changed the checker (still {SHEET_STATUS_LABELS[event.to].toLowerCase()})</>
                ) : (
                  <>
                    {SHEET_STATUS_LABELS[event.from].toLowerCase()} → <span className="font-medium text-ink">{SHEET_STATUS_LABELS[event.to].toLowerCase()}</span>
                  </>
                )}
              </span>
            </div>
            {event.note && <p className="mt-0.5 whitespace-pre-line text-ink-soft italic">“{event.note}”</p>}
          </div>
        </li>
      ))}
    </ol>
  );
}
