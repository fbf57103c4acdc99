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

/** A revision's status in words, marked by a line whose style follows how far along the way it is. */
export function SheetStatusBadge({ status }: { status: SheetStatus }) {
  const mark = MARKS[status];
  return (
    <span className="inline-flex items-center gap-1.5 text-[13px] leading-4 font-medium whitespace-nowrap">
      <span aria-hidden className={`inline-block w-4 ${mark.line}`} />
      <span className={mark.word}>{SHEET_STATUS_LABELS[status]}</span>
    </span>
  );
}
