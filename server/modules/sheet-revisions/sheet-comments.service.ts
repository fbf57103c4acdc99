import { sheetRevisionLabel, type SheetCommentView } from '@shared/schemas/review.schema';
import { AppError, notFound } from '../../errors/app-error';
import { FROZEN, frozenError } from './revision-status';
import { recordsRepository as records } from '../records/records.repository';
import { sheetRevisionsRepository as repo } from './sheet-revisions.repository';
import { revisionOr404, type Actor, type ReviewServiceDeps } from './sheet-revisions.service';
import { commentThreads } from './sheet-revisions.views';

/** Comments on the steps of a revision: threads one level deep, resolved by their first comment. */

/** Adds a comment on a step of a revision, or a reply to a thread. */
export async function addComment(
  revisionId: number,
  input: { anchor?: string; body: string; parentId?: number },
  actor: Actor,
  deps: Pick<ReviewServiceDeps, 'publicUrl'>,
): Promise<SheetCommentView> {
  const row = await revisionOr404(revisionId);
  if (FROZEN.includes(row.status)) throw frozenError(row);
  let anchor = input.anchor;
  if (input.parentId !== undefined) {
    const parent = await repo.findComment(input.parentId);
    if (!parent || parent.trussId !== row.trussId) throw notFound('The comment you are replying to');
    if (parent.parentId !== null) {
      throw new AppError('reply-to-reply', 'Reply to the thread’s first comment; threads are one level deep.', 422);
    }
    anchor = parent.anchor;
    const parentRevision = await revisionOr404(parent.revisionId);
    if (parentRevision.number > row.number) throw notFound('The comment you are replying to');
  }
  const created = await repo.createComment({
    revisionId: row.id,
    trussId: row.trussId,
    parentId: input.parentId ?? null,
    anchor: anchor!,
    body: input.body,
    authorId: actor.id,
  });
  return commentView(created.parentId ?? created.id, deps, created.id);
}

/** Marks a thread resolved (or open again). Threads on issued revisions stay as they were. */
export async function resolveComment(id: number, resolved: boolean, actor: Actor, deps: Pick<ReviewServiceDeps, 'publicUrl' | 'now'>): Promise<SheetCommentView> {
  const comment = await repo.findComment(id);
  if (!comment) throw notFound('That comment');
  if (comment.parentId !== null) {
    throw new AppError('resolve-thread', 'Resolve the thread through its first comment, not a reply.', 422);
  }
  const row = await revisionOr404(comment.revisionId);
  if (FROZEN.includes(row.status)) throw frozenError(row);
  await repo.setResolved(id, resolved ? { userId: actor.id, at: (deps.now ?? (() => new Date()))() } : null);
  return commentView(id, deps);
}

async function commentView(threadId: number, _deps: unknown, pick?: number): Promise<SheetCommentView> {
  const root = await repo.findComment(threadId);
  if (!root) throw notFound('That comment');
  const revision = await revisionOr404(root.revisionId);
  const all = (await repo.commentsUpTo(root.trussId, Number.MAX_SAFE_INTEGER)).filter((c) => c.id === root.id || c.parentId === root.id);
  const siblings = await records.listRevisions({ trussId: root.trussId });
  const labels = new Map(siblings.map((r) => [r.id, sheetRevisionLabel(r.number)]));
  labels.set(revision.id, sheetRevisionLabel(revision.number));
  const names = await repo.userNames(all.flatMap((c) => [c.authorId, c.resolvedById]));
  const [thread] = commentThreads(all, names, labels);
  if (pick !== undefined && pick !== thread.id) return thread.replies.find((r) => r.id === pick)!;
  return thread;
}

