import type { SheetStatus } from '@shared/schemas/review.schema';
import { SHEET_STATUS_LABELS } from '../utils/sheet-actions';

// Each state is its word plus a short line sample before it, so the state reads without colour
// (docs/visual-language.md, "States"): the line firms up as the sheet moves towards issue.
const MARKS: Record<SheetStatus, { line: string; word: string }> = {
  draft: { line: 'border-t-2 border-dashed border-ink-faint', word: 'text-ink-soft' },
  'in-check': { line: 'border-t-2 border-dotted border-accent', word: 'text-accent' },
  returned: { line: 'border-t-[3px] border-double border-danger', word: 'text-danger' },
  checked: { line: 'border-t border-accent', word: 'text-accent' },
  issued: { line: 'border-t-[3px] border-accent', word: 'font-semibold text-accent' },
  superseded: { line: 'border-t border-ink-faint', word: 'text-ink-faint line-through decoration-ink-faint' },
};

/**
 * A revision's status in words, marked by a line whose style follows how far along the way it
 * is. A returned revision that has been revised says which revision replaces it
 * ("Returned — replaced by revision C"), in the faint ink of what is done with.
 */
export function SheetStatusBadge({ status, replacedBy }: { status: SheetStatus; replacedBy?: { label: string } | null }) {
  const mark = MARKS[status];
  const replaced = status === 'returned' && replacedBy;
  return (
    <span className="inline-flex items-center gap-1.5 text-[13px] leading-4 font-medium whitespace-nowrap">
      <span aria-hidden className={`inline-block w-4 ${replaced ? MARKS.superseded.line : mark.line}`} />
      <span className={replaced ? 'text-ink-soft' : mark.word}>
        {SHEET_STATUS_LABELS[status]}
        {replaced && <span className="font-normal"> — replaced by revision {replacedBy.label}</span>}
      </span>
    </span>
  );
}
