import type { UserView } from '@shared/schemas/auth.schema';
import type { SheetAction, SheetRevisionSummaryView, SheetStatus } from '@shared/schemas/review.schema';

// The client only hides what a person cannot do; the server checks every move again.

type Person = Pick<UserView, 'id' | 'role'>;
type Revision = Pick<SheetRevisionSummaryView, 'status' | 'preparedBy'> & Partial<Pick<SheetRevisionSummaryView, 'checker'>>;

/** Issued and superseded revisions never change: no moves, no comments, no resolving. */
export function isSheetFrozen(status: SheetStatus): boolean {
  return status === 'issued' || status === 'superseded';
}

/**
 * The moves this person may offer on this revision, in the order the page shows them:
 * submit — the engineer who prepared it, on a draft; return and check — the checker chosen on
 * submitting (a revision submitted before checkers were chosen: any reviewer who did not
 * prepare it), while it is in check; issue — any engineer, once it is checked.
 */
export function sheetActionsFor(user: Person, revision: Revision): SheetAction[] {
  const actions: SheetAction[] = [];
  const preparer = revision.preparedBy.id === user.id;
  const checker = revision.checker ? revision.checker.id === user.id : !preparer;
  if (revision.status === 'draft' && user.role === 'engineer' && preparer) actions.push('submit');
  if (revision.status === 'in-check' && user.role === 'reviewer' && !preparer && checker) actions.push('return', 'check');
  if (revision.status === 'checked' && user.role === 'engineer') actions.push('issue');
  return actions;
}

/** Engineers and reviewers talk on a sheet until it is issued. */
export function canCommentOnSheet(user: Person, status: SheetStatus): boolean {
  return (user.role === 'engineer' || user.role === 'reviewer') && !isSheetFrozen(status);
}

/** Only engineers start revisions. */
export function canStartSheetRevision(user: Person): boolean {
  return user.role === 'engineer';
}

export const SHEET_STATUS_LABELS: Record<SheetStatus, string> = {
  draft: 'Draft',
  'in-check': 'In check',
  returned: 'Returned',
  checked: 'Checked',
  issued: 'Issued',
  superseded: 'Superseded',
};

export const SHEET_ACTION_LABELS: Record<SheetAction, string> = {
  submit: 'Submit for check',
  return: 'Return to the preparer',
  check: 'Mark checked',
  issue: 'Issue',
};
