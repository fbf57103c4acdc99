import { describe, expect, it } from 'vitest';
import type { SheetCommentView } from '@shared/schemas/review.schema';
import { groupCommentsByStep, openThreadsOf } from './comment-groups';

let nextId = 1;
function thread(anchor: string, createdAt: string, resolved = false, revisionLabel = 'A'): SheetCommentView {
  const id = nextId++;
  return {
    id,
    revisionId: revisionLabel === 'A' ? 1 : 2,
    revisionLabel,
    anchor,
    body: `comment ${id}`,
    author: { id: 3, name: 'Ruth Okafor' },
    createdAt,
    parentId: null,
    resolved,
    resolvedBy: resolved ? { id: 4, name: 'Ines Varga' } : null,
    resolvedAt: resolved ? createdAt : null,
    replies: [],
  };
}

describe('groupCommentsByStep', () => {
  const onD = thread('case-D/joint-C', '2025-03-02T10:00:00Z');
  const onReactions = thread('case-D-reactions', '2025-03-01T09:00:00Z', true);
  const onDAgain = thread('case-D/joint-C', '2025-03-01T08:00:00Z', true);
  const dropped = thread('case-S/joint-F', '2025-03-03T08:00:00Z');
  const all = [onD, onReactions, onDAgain, dropped];
  // Document order of the sheet: reactions come before the joint steps.
  const order = ['cover', 'case-D', 'case-D-reactions', 'case-D/joint-A', 'case-D/joint-C'];

  it('when threads are on several steps, then groups follow the sheet order and steps not on the sheet come last', () => {
    const groups = groupCommentsByStep(all, order);
    expect(groups.map((g) => g.anchor)).toEqual(['case-D-reactions', 'case-D/joint-C', 'case-S/joint-F']);
  });

  it('when a step has two threads, then they are listed oldest first and only the unresolved one counts as open', () => {
    const joint = groupCommentsByStep(all, order).find((g) => g.anchor === 'case-D/joint-C')!;
    expect(joint.threads.map((t) => t.id)).toEqual([onDAgain.id, onD.id]);
    expect(joint.openCount).toBe(1);
  });

  it('when only open threads are asked for, then resolved threads and steps left without threads disappear', () => {
    const groups = groupCommentsByStep(all, order, 'open');
    expect(groups.map((g) => [g.anchor, g.threads.length])).toEqual([
      ['case-D/joint-C', 1],
      ['case-S/joint-F', 1],
    ]);
  });

  it('when the sheet order is not known yet, then steps come in the order they were first commented on', () => {
    expect(groupCommentsByStep(all).map((g) => g.anchor)).toEqual(['case-D/joint-C', 'case-D-reactions', 'case-S/joint-F']);
  });
});

describe('openThreadsOf', () => {
  it('when the server lists open ids, then exactly those threads come back, oldest first', () => {
    const a = thread('x', '2025-03-05T00:00:00Z');
    const b = thread('y', '2025-03-04T00:00:00Z', false, 'B');
    const c = thread('z', '2025-03-03T00:00:00Z', true);
    expect(openThreadsOf([a, b, c], [a.id, b.id]).map((t) => t.id)).toEqual([b.id, a.id]);
  });
});
