import { useState } from 'react';
import type { SheetCommentView } from '@shared/schemas/review.schema';
import { Button } from '@/components/ui/button';
import { FormError } from '@/components/ui/field';
import { errorMessage } from '@/lib/api-client';
import { formatDateTime } from '@/lib/format';
import { useAddSheetComment } from '../api/add-sheet-comment';
import { useResolveSheetComment } from '../api/resolve-sheet-comment';
import type { CommentGroup } from '../utils/comment-groups';

interface ThreadsProps {
  groups: CommentGroup[];
  sheetId: number;
  trussId: number;
  /** Label of the revision on the page, to tell its threads from earlier ones. */
  currentLabel: string;
  /** The person may reply on this revision. */
  canReply: boolean;
  /** Whether threads made on that revision can still be resolved or reopened. */
  canResolve: (thread: SheetCommentView) => boolean;
  onFocusStep: (anchor: string) => void;
  /** The step's title as the sheet prints it. */
  labelOf: (anchor: string) => string;
}

/** The sheet's comment threads, step by step; a step's title brings it into view on the sheet. */
export function CommentThreads({ groups, onFocusStep, labelOf, ...rest }: ThreadsProps) {
  return (
    <div className="flex flex-col gap-4">
      {groups.map((group) => (
        <section key={group.anchor} aria-label={`Comments on ${labelOf(group.anchor)}`}>
          <button
            type="button"
            onClick={() => onFocusStep(group.anchor)}
            className="mb-1.5 flex w-full items-baseline justify-between gap-2 text-left"
            title="Show this step on the sheet"
          >
            <span className="truncate text-xs font-semibold text-accent hover:underline" title={group.anchor}>
              {labelOf(group.anchor)}
            </span>
            <span className={`shrink-0 text-[11px] ${group.openCount > 0 ? 'font-semibold text-danger' : 'text-ink-faint'}`}>
              {group.openCount > 0 ? `${group.openCount} open` : 'all resolved'}
            </span>
          </button>
          <div className="flex flex-col gap-2">
            {group.threads.map((thread) => (
              <Thread key={thread.id} thread={thread} onFocusStep={onFocusStep} {...rest} />
            ))}
          </div>
        </section>
      ))}
    </div>
  );
}

function Thread({ thread, sheetId, trussId, currentLabel, canReply, canResolve, onFocusStep }: Omit<ThreadsProps, 'groups' | 'labelOf'> & { thread: SheetCommentView }) {
  const [replying, setReplying] = useState(false);
  const resolve = useResolveSheetComment();
  const earlier = thread.revisionLabel !== currentLabel;
  return (
    <article
      className={`rounded-xs border bg-paper-raised text-[13px] ${thread.resolved ? 'border-paper-line' : 'border-danger/35'}`}
      onClick={(e) => {
        if (!(e.target as Element).closest('button, textarea, a')) onFocusStep(thread.anchor);
      }}
    >
      <div className="flex items-center gap-2 border-b border-paper-line/70 px-3 py-1.5 text-[11px]">
        <span className={`font-semibold ${thread.resolved ? 'text-accent' : 'text-danger'}`}>{thread.resolved ? 'Resolved' : 'Open'}</span>
        <span className="text-ink-faint">·</span>
        <span className={earlier ? 'font-medium text-ink-soft' : 'text-ink-faint'} title={`Made on revision ${thread.revisionLabel}`}>
          {earlier ? `from rev. ${thread.revisionLabel}` : `rev. ${thread.revisionLabel}`}
        </span>
        {canResolve(thread) && (
          <Button
            size="sm"
            variant="quiet"
            className="ml-auto -my-1"
            busy={resolve.isPending}
            onClick={() => resolve.mutate({ commentId: thread.id, resolved: !thread.resolved, sheetId, trussId })}
          >
            {thread.resolved ? 'Reopen' : 'Mark resolved'}
          </Button>
        )}
      </div>
      <Comment comment={thread} />
      {thread.resolved && thread.resolvedBy && (
        <p className="px-3 pb-2 text-[11px] text-ink-faint">
          Resolved by {thread.resolvedBy.name}
          {thread.resolvedAt ? `, ${formatDateTime(thread.resolvedAt)}` : ''}
        </p>
      )}
      {thread.replies.length > 0 && (
        <div className="ml-3 border-l-2 border-paper-line">
          {thread.replies.map((reply) => (
            <Comment key={reply.id} comment={reply} showRevision={reply.revisionLabel !== thread.revisionLabel} />
          ))}
        </div>
      )}
      {canReply &&
        (replying ? (
          <CommentComposer
            sheetId={sheetId}
            parentId={thread.id}
            placeholder="Reply…"
            submitLabel="Reply"
            onDone={() => setReplying(false)}
          />
        ) : (
          <div className="px-3 pb-2">
            <button type="button" className="text-xs font-medium text-accent hover:underline" onClick={() => setReplying(true)}>
              Reply
            </button>
          </div>
        ))}
    </article>
  );
}

function Comment({ comment, showRevision = false }: { comment: SheetCommentView; showRevision?: boolean }) {
  return (
    <div className="px-3 py-2">
      <div className="flex flex-wrap items-baseline gap-x-2 text-[11px]">
        <span className="font-semibold text-ink">{comment.author.name}</span>
        <time dateTime={comment.createdAt} className="text-ink-faint">
          {formatDateTime(comment.createdAt)}
        </time>
        {showRevision && <span className="text-ink-faint">on rev. {comment.revisionLabel}</span>}
      </div>
      <p className="mt-0.5 whitespace-pre-line text-ink">{comment.body}</p>
    </div>
  );
}

interface ComposerProps {
  sheetId: number;
  anchor?: string;
  parentId?: number;
  placeholder: string;
  submitLabel: string;
  onDone: () => void;
  autoFocus?: boolean;
}

/** A comment box: a new thread on a step (anchor) or a reply (parentId). */
export function CommentComposer({ sheetId, anchor, parentId, placeholder, submitLabel, onDone, autoFocus = true }: ComposerProps) {
  const [body, setBody] = useState('');
  const add = useAddSheetComment();
  return (
    <form
      className="flex flex-col gap-2 px-3 pb-3"
      onSubmit={(e) => {
        e.preventDefault();
        if (!body.trim()) return;
        add.mutate(
          { sheetId, input: parentId !== undefined ? { parentId, body } : { anchor, body } },
          {
            onSuccess: () => {
              setBody('');
              onDone();
            },
          },
        );
      }}
    >
      <textarea
        // A fresh box takes the typing at once; the person just chose where to write.
        autoFocus={autoFocus}
        rows={3}
        maxLength={4000}
        value={body}
        placeholder={placeholder}
        aria-label={placeholder}
        onChange={(e) => setBody(e.target.value)}
        className="w-full rounded-xs border border-paper-line bg-paper-raised px-2.5 py-1.5 text-[13px] leading-relaxed text-ink placeholder:text-ink-faint focus:border-accent focus:ring-2 focus:ring-accent/20 focus:outline-none"
      />
      <FormError message={add.isError ? errorMessage(add.error) : undefined} />
      <div className="flex justify-end gap-2">
        <Button size="sm" variant="quiet" onClick={onDone} disabled={add.isPending}>
          Cancel
        </Button>
        <Button size="sm" variant="primary" type="submit" busy={add.isPending} disabled={!body.trim()}>
          {submitLabel}
        </Button>
      </div>
    </form>
  );
}
