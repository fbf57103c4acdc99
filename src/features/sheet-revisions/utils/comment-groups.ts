import type { SheetCommentView } from '@shared/schemas/review.schema';

export interface CommentGroup {
  anchor: string;
  /** Threads on this step, oldest first. */
  threads: SheetCommentView[];
  openCount: number;
}

const byTime = (a: SheetCommentView, b: SheetCommentView) => a.createdAt.localeCompare(b.createdAt) || a.id - b.id;

/**
 * Gathers comment threads by the step they are on. Steps follow `stepOrder` (the anchors as
 * they appear on the sheet); a step not on the sheet (a later revision may drop it) comes after,
 * in the order it was first commented on. `show: 'open'` keeps unresolved threads only.
 */
export function groupCommentsByStep(
  threads: readonly SheetCommentView[],
  stepOrder: readonly string[] = [],
  show: 'all' | 'open' = 'all',
): CommentGroup[] {
  const position = new Map(stepOrder.map((anchor, i) => [anchor, i]));
  const groups = new Map<string, SheetCommentView[]>();
  for (const thread of [...threads].sort(byTime)) {
    if (show === 'open' && thread.resolved) continue;
    const list = groups.get(thread.anchor);
    if (list) list.push(thread);
    else groups.set(thread.anchor, [thread]);
  }
  const firstSeen = [...groups.keys()];
  const rank = (anchor: string) => position.get(anchor) ?? stepOrder.length + firstSeen.indexOf(anchor);
  return [...groups.entries()]
    .sort(([a], [b]) => rank(a) - rank(b))
    .map(([anchor, list]) => ({ anchor, threads: list, openCount: list.filter((t) => !t.resolved).length }));
}

/** The unresolved threads the server listed for a revision, oldest first. */
export function openThreadsOf(threads: readonly SheetCommentView[], openIds: readonly number[]): SheetCommentView[] {
  const open = new Set(openIds);
  return threads.filter((t) => open.has(t.id)).sort(byTime);
}
