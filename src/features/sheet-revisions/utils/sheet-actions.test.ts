import { describe, expect, it } from 'vitest';
import type { Role } from '@shared/schemas/auth.schema';
import type { SheetStatus } from '@shared/schemas/review.schema';
import { canCommentOnSheet, sheetActionsFor } from './sheet-actions';

// The expected moves restate issue 7's rules (draft → in check → returned | checked → issued;
// only the preparer submits; a reviewer other than the preparer returns or checks; an engineer
// issues) as one table, written out by hand rather than derived from the code under test.
const PREPARER = 7;
const revision = (status: SheetStatus) => ({ status, preparedBy: { id: PREPARER, name: 'Ines Varga' } });
const person = (role: Role, id = 20) => ({ id, role });

describe('sheetActionsFor', () => {
  const table: [string, { id: number; role: Role }, SheetStatus, string[]][] = [
    ['the preparer engineer on a draft', person('engineer', PREPARER), 'draft', ['submit']],
    ['another engineer on a draft', person('engineer'), 'draft', []],
    ['a reviewer on a draft', person('reviewer'), 'draft', []],
    ['a reviewer on a revision in check', person('reviewer'), 'in-check', ['return', 'check']],
    ['the preparer on their own revision in check', person('engineer', PREPARER), 'in-check', []],
    ['a reviewer who prepared the revision, in check', person('reviewer', PREPARER), 'in-check', []],
    ['an engineer on a checked revision', person('engineer'), 'checked', ['issue']],
    ['the preparer engineer on a checked revision', person('engineer', PREPARER), 'checked', ['issue']],
    ['a reviewer on a checked revision', person('reviewer'), 'checked', []],
    ['an engineer on a returned revision', person('engineer', PREPARER), 'returned', []],
    ['a reviewer on a returned revision', person('reviewer'), 'returned', []],
    ['an engineer on an issued revision', person('engineer'), 'issued', []],
    ['a reviewer on a superseded revision', person('reviewer'), 'superseded', []],
    ['an admin on a checked revision', person('admin'), 'checked', []],
    ['a drafter on a draft they did not prepare', person('drafter'), 'draft', []],
  ];
  it.each(table)('when %s, then the moves offered are exactly the listed ones', (_label, user, status, expected) => {
    expect(sheetActionsFor(user, revision(status))).toEqual(expected);
  });
});

describe('sheetActionsFor with a chosen checker', () => {
  // Issue 15: the preparer names the checker on submitting; only that reviewer returns or checks.
  const inCheck = { status: 'in-check' as const, preparedBy: { id: PREPARER, name: 'Ines Varga' }, checker: { id: 21, name: 'Noor Haddad' } };
  it('when the signed-in reviewer is the chosen checker, then return and check are offered', () => {
    expect(sheetActionsFor(person('reviewer', 21), inCheck)).toEqual(['return', 'check']);
  });
  it('when another reviewer opens it, then no move is offered', () => {
    expect(sheetActionsFor(person('reviewer', 20), inCheck)).toEqual([]);
  });
  it('when no checker was chosen (submitted before checkers were chosen), then any reviewer but the preparer may act', () => {
    expect(sheetActionsFor(person('reviewer', 20), { ...inCheck, checker: null })).toEqual(['return', 'check']);
    expect(sheetActionsFor(person('reviewer', PREPARER), { ...inCheck, checker: null })).toEqual([]);
  });
});

describe('canCommentOnSheet', () => {
  it('when the revision is issued or superseded, then nobody may comment', () => {
    for (const role of ['engineer', 'reviewer', 'admin', 'drafter'] as const) {
      expect(canCommentOnSheet(person(role), 'issued')).toBe(false);
      expect(canCommentOnSheet(person(role), 'superseded')).toBe(false);
    }
  });

  it('when the revision is still moving, then engineers and reviewers may comment and drafters and admins may not', () => {
    for (const status of ['draft', 'in-check', 'returned', 'checked'] as const) {
      expect(canCommentOnSheet(person('engineer'), status)).toBe(true);
      expect(canCommentOnSheet(person('reviewer'), status)).toBe(true);
      expect(canCommentOnSheet(person('drafter'), status)).toBe(false);
      expect(canCommentOnSheet(person('admin'), status)).toBe(false);
    }
  });
});
