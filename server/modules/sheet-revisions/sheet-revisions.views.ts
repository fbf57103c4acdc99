import { sheetRevisionLabel, type PersonRef, type SheetCommentView, type SheetRevisionSummaryView } from '@shared/schemas/review.schema';
import type { RevisionRow, TrussContext } from '../records/records.repository';
import type { CommentRow } from './sheet-revisions.repository';

/** Rows → the API's views of revisions and comment threads. */

export const pageUrl = (deps: { publicUrl: () => string }, id: number) => `${deps.publicUrl().replace(/\/+$/, '')}/sheets/${id}`;

export function commentThreads(rows: CommentRow[], names: Map<number, string>, labels: Map<number, string>): SheetCommentView[] {
  const toView = (c: CommentRow): SheetCommentView => ({
    id: c.id,
    revisionId: c.revisionId,
    revisionLabel: labels.get(c.revisionId) ?? '',
    anchor: c.anchor,
    body: c.body,
    author: person(c.authorId, names)!,
    createdAt: c.createdAt.toISOString(),
    parentId: c.parentId,
    resolved: c.parentId === null && c.resolvedAt !== null,
    resolvedBy: person(c.resolvedById, names),
    resolvedAt: c.resolvedAt?.toISOString() ?? null,
    replies: [],
  });
  const threads = new Map<number, SheetCommentView>();
  for (const c of rows) if (c.parentId === null) threads.set(c.id, toView(c));
  for (const c of rows) if (c.parentId !== null) threads.get(c.parentId)?.replies.push(toView(c));
  return [...threads.values()];
}

export function peopleOf(r: RevisionRow): (number | null)[] {
  return [r.preparedById, r.checkedById, r.checkerId, r.issuedById];
}

/**
 * Returned revisions that have been revised, each with the revision that replaces it: the next
 * revision of the same truss (the lowest number above it). `rows` are revisions of any trusses.
 */
export function replacementsOf(rows: Pick<RevisionRow, 'id' | 'trussId' | 'number' | 'status'>[]): Map<number, { id: number; label: string }> {
  const out = new Map<number, { id: number; label: string }>();
  for (const r of rows) {
    if (r.status !== 'returned') continue;
    let next: (typeof rows)[number] | undefined;
    for (const s of rows) if (s.trussId === r.trussId && s.number > r.number && (!next || s.number < next.number)) next = s;
    if (next) out.set(r.id, { id: next.id, label: sheetRevisionLabel(next.number) });
  }
  return out;
}

export function person(id: number | null, names: Map<number, string>): PersonRef | null {
  return id === null ? null : { id, name: names.get(id) ?? '(unknown)' };
}

export function summaryView(
  r: RevisionRow,
  c: TrussContext,
  names: Map<number, string>,
  openCommentCount: number,
  labels: Map<number, string>,
  replacements: Map<number, { id: number; label: string }> = new Map(),
): SheetRevisionSummaryView {
  return {
    id: r.id,
    projectId: c.projectId,
    trussId: r.trussId,
    runId: r.runId,
    number: r.number,
    label: sheetRevisionLabel(r.number),
    status: r.status,
    // Signed names are the ones printed; the live name is only for revisions not yet signed.
    preparedBy: { id: r.preparedById, name: r.preparedByName ?? names.get(r.preparedById) ?? '(unknown)' },
    checkedBy: r.checkedById === null ? null : { id: r.checkedById, name: r.checkedByName ?? names.get(r.checkedById) ?? '(unknown)' },
    checker: person(r.checkerId, names),
    issuedBy: r.issuedById === null ? null : { id: r.issuedById, name: r.issuedByName ?? names.get(r.issuedById) ?? '(unknown)' },
    createdAt: r.createdAt.toISOString(),
    updatedAt: r.updatedAt.toISOString(),
    supersededBy: r.supersededById === null ? null : { id: r.supersededById, label: labels.get(r.supersededById) ?? '' },
    replacedBy: replacements.get(r.id) ?? null,
    openCommentCount,
  };
}
