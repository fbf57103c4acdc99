import { useCallback, useMemo, useState } from 'react';
import { Link } from 'react-router-dom';
import type { UserView } from '@shared/schemas/auth.schema';
import type { SheetCommentView, SheetRevisionView } from '@shared/schemas/review.schema';
import { useTrussSheets } from '../api/get-truss-sheets';
import { sheetPreviewUrl } from '../api/get-sheet';
import { groupCommentsByStep, openThreadsOf } from '../utils/comment-groups';
import { canCommentOnSheet, isSheetFrozen } from '../utils/sheet-actions';
import { stepLabel } from '../utils/step-anchor';
import { CommentComposer, CommentThreads } from './comment-threads';
import { SheetPreview, type StepFocus } from './sheet-preview';
import { useSheetCompare } from '../api/get-sheet-compare';
import { RevisionChanges } from './revision-changes';

/**
 * Reading and commenting: the sheet as it prints on the left, its comment threads by step on the
 * right. A click on a step opens a comment box for it; a click on a thread shows its step.
 */
export function SheetReview({ sheet, user }: { sheet: SheetRevisionView; user: Pick<UserView, 'id' | 'role'> }) {
  // The step shown as chosen on the sheet, and the step a new comment is being written on.
  const [selected, setSelected] = useState<string | null>(null);
  const [writingOn, setWritingOn] = useState<string | null>(null);
  const [focus, setFocus] = useState<StepFocus | null>(null);
  const [stepOrder, setStepOrder] = useState<string[]>([]);
  const [stepTitles, setStepTitles] = useState<Record<string, string>>({});
  const labelOf = useCallback((anchor: string) => stepLabel(anchor, stepTitles), [stepTitles]);
  const [show, setShow] = useState<'all' | 'open'>('all');
  const siblings = useTrussSheets(sheet.trussId);
  const canComment = canCommentOnSheet(user, sheet.status);
  // What changed since the revision before (or one chosen): a first revision has nothing to compare with.
  const [compareWith, setCompareWith] = useState<number | undefined>(undefined);
  const [folded, setFolded] = useState(true);
  const compare = useSheetCompare(sheet.id, { enabled: sheet.number > 1 || compareWith !== undefined, withId: compareWith });
  const changedSteps = useMemo(
    () => (compare.data ? new Map(compare.data.steps.changed.map((s) => [s.id, s.change] as const)) : undefined),
    [compare.data],
  );
  const foldSteps = useMemo(() => (compare.data && folded ? new Set(compare.data.steps.unchanged) : null), [compare.data, folded]);
  const compareOthers = useMemo(
    () => (siblings.data ?? []).filter((r) => r.id !== sheet.id).sort((a, b) => a.number - b.number).map((r) => ({ id: r.id, label: r.label })),
    [siblings.data, sheet.id],
  );

  const groups = useMemo(() => groupCommentsByStep(sheet.comments, stepOrder, show), [sheet.comments, stepOrder, show]);
  const commented = useMemo(() => {
    const marks = new Map<string, number>();
    for (const group of groupCommentsByStep(sheet.comments)) marks.set(group.anchor, group.openCount);
    return marks;
  }, [sheet.comments]);
  const openThreads = useMemo(() => openThreadsOf(sheet.comments, sheet.openCommentIds), [sheet.comments, sheet.openCommentIds]);

  // A thread's own revision decides whether it can still be resolved: issued ones stay as they were.
  const statusOf = useMemo(() => new Map((siblings.data ?? []).map((r) => [r.id, r.status])), [siblings.data]);
  const canResolve = useCallback(
    (thread: SheetCommentView) => {
      // Nothing on an issued page changes, not even threads of earlier revisions.
      if ((user.role !== 'engineer' && user.role !== 'reviewer') || isSheetFrozen(sheet.status)) return false;
      const status = thread.revisionId === sheet.id ? sheet.status : statusOf.get(thread.revisionId);
      return status !== undefined && !isSheetFrozen(status);
    },
    [user.role, sheet.id, sheet.status, statusOf],
  );

  const focusStep = useCallback((anchor: string) => {
    setSelected(anchor);
    setFocus((prev) => ({ anchor, seq: (prev?.seq ?? 0) + 1 }));
  }, []);
  const pickStep = useCallback((anchor: string) => {
    setSelected(anchor);
    setWritingOn(anchor);
  }, []);

  return (
    <div className="flex flex-col gap-4">
      {sheet.status === 'returned' && openThreads.length > 0 && (
        <section className="rounded-xs border border-danger/40 bg-danger/5 px-5 py-4" aria-label="Open comments">
          <h2 className="text-sm font-semibold text-danger">
            Returned with {openThreads.length} open comment{openThreads.length === 1 ? '' : 's'}
          </h2>
          <p className="mt-0.5 text-xs text-ink-soft">
            Answer each in the model, run the analysis again and start a new revision from{' '}
            <Link to={`/trusses/${sheet.trussId}?tab=sheets`} className="font-medium text-accent hover:underline">
              the truss page
            </Link>
            , then mark each one resolved on the new revision.
          </p>
          <ul className="mt-3 flex flex-col gap-1.5">
            {openThreads.map((t) => (
              <li key={t.id}>
                <button type="button" onClick={() => focusStep(t.anchor)} className="group flex w-full gap-3 text-left text-[13px]">
                  <span className="w-48 shrink-0 truncate text-xs font-semibold leading-5 text-danger group-hover:underline" title={t.anchor}>
                    {labelOf(t.anchor)}
                  </span>
                  <span className="min-w-0 flex-1 text-ink">
                    {t.body.split('\n')[0]} <span className="text-ink-faint">— {t.author.name}</span>
                  </span>
                </button>
              </li>
            ))}
          </ul>
        </section>
      )}

      {compare.data && (
        <RevisionChanges
          compare={compare.data}
          others={compareOthers}
          withId={compareWith}
          onWith={setCompareWith}
          folded={folded}
          onFolded={setFolded}
          onFocusStep={focusStep}
        />
      )}
      {compare.isPending && (sheet.number > 1 || compareWith !== undefined) && (
        <p role="status" className="text-xs text-ink-soft">
          Comparing with the revision before…
        </p>
      )}
      {compare.isError && (
        <p role="alert" className="text-xs text-danger">
          The changes since the revision before could not be shown: {compare.error.message}
        </p>
      )}

      <div className="grid items-start gap-4 lg:grid-cols-[minmax(0,1fr)_20rem]">
        <SheetPreview
          // The sheet's title block follows the revision's moves: lay it out again after each.
          key={sheet.updatedAt}
          src={sheetPreviewUrl(sheet.id)}
          commented={commented}
          selected={selected}
          focus={focus}
          onPickStep={canComment ? pickStep : undefined}
          onAnchors={setStepOrder}
          onTitles={setStepTitles}
          changed={changedSteps}
          fold={foldSteps}
        />

        <aside className="flex max-h-[78vh] flex-col overflow-hidden rounded-xs border border-paper-line bg-paper-raised" aria-label="Comments">
          <div className="flex items-center justify-between gap-2 border-b border-paper-line px-4 py-2.5">
            <h2 className="text-sm font-semibold text-ink">Comments</h2>
            <div role="group" aria-label="Which threads" className="flex rounded-xs border border-paper-line p-0.5 text-[11px]">
              {(['all', 'open'] as const).map((option) => (
                <button
                  key={option}
                  type="button"
                  aria-pressed={show === option}
                  onClick={() => setShow(option)}
                  className={`rounded-xs px-2 py-0.5 ${show === option ? 'bg-paper-sunk font-semibold text-ink' : 'text-ink-soft hover:text-ink'}`}
                >
                  {option === 'all' ? 'All' : `Open (${sheet.comments.filter((c) => !c.resolved).length})`}
                </button>
              ))}
            </div>
          </div>
          <div className="flex-1 overflow-y-auto px-4 py-3">
            {canComment &&
              (writingOn ? (
                <div className="-mx-1 mb-4 rounded-xs border border-accent/40 bg-accent-soft/40 pt-2">
                  <p className="px-3 pb-1.5 text-[11px] text-ink-soft">
                    New comment on <span className="font-semibold text-accent" title={writingOn}>{labelOf(writingOn)}</span>
                  </p>
                  <CommentComposer
                    key={writingOn}
                    sheetId={sheet.id}
                    anchor={writingOn}
                    placeholder="What should the preparer look at here?"
                    submitLabel="Comment"
                    onDone={() => {
                      setWritingOn(null);
                      setSelected(null);
                    }}
                  />
                </div>
              ) : (
                <p className="mb-4 rounded-xs border border-dashed border-paper-line px-3 py-2 text-xs text-ink-soft">
                  Click a step on the sheet to comment on it.
                </p>
              ))}
            {groups.length === 0 ? (
              <p className="py-6 text-center text-xs text-ink-faint">
                {show === 'open' ? 'No open threads.' : 'No comments on this sheet yet.'}
              </p>
            ) : (
              <CommentThreads
                groups={groups}
                sheetId={sheet.id}
                trussId={sheet.trussId}
                currentLabel={sheet.label}
                canReply={canComment}
                canResolve={canResolve}
                onFocusStep={focusStep}
                labelOf={labelOf}
              />
            )}
          </div>
        </aside>
      </div>
    </div>
  );
}
