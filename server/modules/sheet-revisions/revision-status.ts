import { sheetRevisionLabel, type SheetAction, type SheetStatus } from '@shared/schemas/review.schema';
import { AppError } from '../../errors/app-error';
import type { ReviewMailKind } from './sheet-revisions.mail';
import type { RevisionRow } from '../records/records.repository';

/** The states of a sheet revision, the moves between them, and the sentences when a move is refused. */

export const FROZEN: readonly SheetStatus[] = ['issued', 'superseded'];

export const STATUS_WORDS: Record<SheetStatus, string> = {
  draft: 'a draft',
  'in-check': 'in check',
  returned: 'returned',
  checked: 'checked',
  issued: 'issued',
  superseded: 'superseded',
};

export const TRANSITIONS: Record<SheetAction, { from: SheetStatus; to: SheetStatus; verb: string; mail: ReviewMailKind }> = {
  submit: { from: 'draft', to: 'in-check', verb: 'submitted for check', mail: 'submitted' },
  return: { from: 'in-check', to: 'returned', verb: 'returned', mail: 'returned' },
  check: { from: 'in-check', to: 'checked', verb: 'checked', mail: 'checked' },
  issue: { from: 'checked', to: 'issued', verb: 'issued', mail: 'issued' },
};

export function frozenError(row: RevisionRow): AppError {
  return new AppError(
    'sheet-issued',
    `Revision ${sheetRevisionLabel(row.number)} is ${STATUS_WORDS[row.status]} and can no longer change. Start a new revision from a new analysis run instead.`,
    409,
  );
}

export function statusConflict(row: RevisionRow, action: SheetAction): AppError {
  if (FROZEN.includes(row.status)) return frozenError(row);
  const t = TRANSITIONS[action];
  return new AppError(
    'sheet-status-conflict',
    `Revision ${sheetRevisionLabel(row.number)} is ${STATUS_WORDS[row.status]}; it can be ${t.verb} only when it is ${STATUS_WORDS[t.from]}. Reload the sheet to see its current status.`,
    409,
  );
}

