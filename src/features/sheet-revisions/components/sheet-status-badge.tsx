import type { SheetStatus } from '@shared/schemas/review.schema';
import { SHEET_STATUS_LABELS } from '../utils/sheet-actions';

const STYLES: Record<SheetStatus, string> = {
  draft: 'border-dashed border-ink-faint/60 bg-paper-raised text-ink-soft',
  'in-check': 'border-accent/30 bg-accent-soft text-accent',
  returned: 'border-danger/30 bg-danger/5 text-danger',
  checked: 'border-accent bg-paper-raised text-accent',
  issued: 'border-accent bg-accent text-paper-raised',
  superseded: 'border-paper-line bg-paper-sunk text-ink-faint line-through decoration-ink-faint/60',
};

/** A revision's status in words, its tone following how far along the way it is. */
export function SheetStatusBadge({ status }: { status: SheetStatus }) {
  return (
    <span className={`inline-flex items-center rounded-sm border px-1.5 py-px text-[11px] font-semibold tracking-wide uppercase ${STYLES[status]}`}>
      {SHEET_STATUS_LABELS[status]}
    </span>
  );
}
