import crypto from 'node:crypto';
import type { Role } from '@shared/schemas/auth.schema';
import {
  sheetRevisionLabel,
  type PersonRef,
  type SheetAction,
  type SheetCommentView,
  type SheetEventView,
  type SheetRevisionSummaryView,
  type SheetRevisionView,
  type SheetStatus,
} from '@shared/schemas/review.schema';
import { AppError, notFound } from '../../errors/app-error';
import type { Mailer } from '../../mail/mailer';
import type { FileStore } from '../../storage/file-store';
import type { FirmKey } from '../records/firm-key';
import { issuedRecordText, issuedSigners } from '../records/issued-record';
import { reviewMailSend, type ReviewMailKind } from './sheet-revisions.mail';
import { reviewRepository as repo, type CommentRow, type RevisionRow, type TrussContext } from './sheet-revisions.repository';
import type { RunSource, SheetRenderer } from './sheet-renderer';

export interface Actor {
  id: number;
  name: string;
  role: Role;
}

export interface ReviewServiceDeps {
  mailer: Mailer;
  publicUrl: () => string;
  renderer: SheetRenderer;
  runs: RunSource;
  key: FirmKey;
  /** Where issued PDFs are kept. */
  sheets: FileStore;
  log: (msg: string, err?: unknown) => void;
  now?: () => Date;
}

const FROZEN: readonly SheetStatus[] = ['issued', 'superseded'];

const STATUS_WORDS: Record<SheetStatus, string> = {
  draft: 'a draft',
  'in-check': 'in check',
  returned: 'returned',
  checked: 'checked',
  issued: 'issued',
  superseded: 'superseded',
};

const TRANSITIONS: Record<SheetAction, { from: SheetStatus; to: SheetStatus; verb: string; mail: ReviewMailKind }> = {
  submit: { from: 'draft', to: 'in-check', verb: 'submitted for check', mail: 'submitted' },
  return: { from: 'in-check', to: 'returned', verb: 'returned', mail: 'returned' },
  check: { from: 'in-check', to: 'checked', verb: 'checked', mail: 'checked' },
  issue: { from: 'checked', to: 'issued', verb: 'issued', mail: 'issued' },
};

const pageUrl = (deps: Pick<ReviewServiceDeps, 'publicUrl'>, id: number) => `${deps.publicUrl().replace(/\/+$/, '')}/sheets/${id}`;

function frozenError(row: RevisionRow): AppError {
  return new AppError(
    'sheet-issued',
    `Revision ${sheetRevisionLabel(row.number)} is ${STATUS_WORDS[row.status]} and can no longer change. Start a new revision from a new analysis run instead.`,
    409,
  );
}

function statusConflict(row: RevisionRow, action: SheetAction): AppError {
  if (FROZEN.includes(row.status)) return frozenError(row);
  const t = TRANSITIONS[action];
  return new AppError(
    'sheet-status-conflict',
    `Revision ${sheetRevisionLabel(row.number)} is ${STATUS_WORDS[row.status]}; it can be ${t.verb} only when it is ${STATUS_WORDS[t.from]}. Reload the sheet to see its current status.`,
    409,
  );
}

async function revisionOr404(id: number): Promise<RevisionRow> {
  const row = await repo.findRevision(id);
  if (!row) throw notFound('That sheet revision');
  return row;
}

async function contextOr404(trussId: number): Promise<TrussContext> {
  const context = await repo.trussContext(trussId);
  if (!context) throw notFound('That truss');
  return context;
}

/** Starts a draft revision of a truss's calc sheet from a solved run of that truss. */
export async function createRevision(input: { trussId: number; runId: number; note: string }, actor: Actor, deps: ReviewServiceDeps): Promise<SheetRevisionView> {
  await contextOr404(input.trussId);
  const run = await deps.runs.findRun(input.runId);
  if (!run) throw new AppError('run-not-found', `Analysis run ${input.runId} was not found. Run the analysis, then start the sheet from that run.`, 422);
  if (run.trussId !== input.trussId) {
    throw new AppError('run-of-other-truss', `Analysis run ${input.runId} belongs to another truss. Choose a run of this truss.`, 422);
  }
  if (run.status !== 'solved') {
    throw new AppError('run-not-solved', `Analysis run ${input.runId} is ${run.status}, so it has no results to put on a sheet. Fix the model and run it again.`, 409);
  }
  const row = await repo.createDraft({ trussId: input.trussId, runId: input.runId, preparedById: actor.id, note: input.note });
  return getRevision(row.id, deps);
}

export async function listTrussRevisions(trussId: number): Promise<SheetRevisionSummaryView[]> {
  const context = await contextOr404(trussId);
  const rows = await repo.listRevisions({ trussId });
  const [names, open] = await Promise.all([repo.userNames(rows.flatMap(peopleOf)), repo.openThreadCounts(rows.map((r) => r.id))]);
  const labels = new Map(rows.map((r) => [r.id, sheetRevisionLabel(r.number)]));
  return rows.map((r) => summaryView(r, context, names, open.get(r.id) ?? 0, labels));
}

export async function getRevision(id: number, deps: Pick<ReviewServiceDeps, 'publicUrl'>): Promise<SheetRevisionView> {
  const row = await revisionOr404(id);
  const context = await contextOr404(row.trussId);
  const [events, comments, siblings] = await Promise.all([
    repo.events(row.id),
    repo.commentsUpTo(row.trussId, row.number),
    repo.listRevisions({ trussId: row.trussId }),
  ]);
  const labels = new Map(siblings.map((r) => [r.id, sheetRevisionLabel(r.number)]));
  const names = await repo.userNames([
    ...peopleOf(row),
    ...events.map((e) => e.actorId),
    ...comments.flatMap((c) => [c.authorId, c.resolvedById]),
  ]);
  const threads = commentThreads(comments, names, labels);
  const openOnThis = threads.filter((t) => !t.resolved && t.revisionId === row.id).length;
  return {
    ...summaryView(row, context, names, openOnThis, labels),
    project: { id: context.projectId, name: context.projectName, jobNumber: context.jobNumber },
    truss: { id: context.trussId, name: context.trussName },
    events: events.map(
      (e): SheetEventView => ({
        id: e.id,
        from: e.fromStatus,
        to: e.toStatus,
        by: person(e.actorId, names),
        at: e.at.toISOString(),
        note: e.note,
      }),
    ),
    comments: threads,
    openCommentIds: threads.filter((t) => !t.resolved).map((t) => t.id),
    issue:
      row.sha256 && row.issuedAt && row.signature && row.signedRecord && row.keyFingerprint
        ? {
            sha256: row.sha256,
            size: row.pdfSize ?? 0,
            issuedAt: row.issuedAt.toISOString(),
            signers: issuedSigners(row),
            record: row.signedRecord,
            signature: row.signature,
            keyFingerprint: row.keyFingerprint,
          }
        : null,
    pageUrl: pageUrl(deps, row.id),
  };
}

/**
 * Moves a revision one step along draft → in check → returned | checked → issued. Who may:
 * submit — the engineer who prepared it; return and check — a reviewer who did not prepare
 * it; issue — an engineer (role checks are on the route). The move is a conditional update, so
 * of two people acting at once one wins and the other gets a 409 naming the status now.
 */
export async function transitionRevision(id: number, action: SheetAction, note: string, actor: Actor, deps: ReviewServiceDeps): Promise<SheetRevisionView> {
  const rule = TRANSITIONS[action];
  const row = await revisionOr404(id);
  if (row.status !== rule.from) throw statusConflict(row, action);
  if (action === 'submit' && row.preparedById !== actor.id) {
    throw new AppError('not-preparer', 'Only the engineer who prepared this revision can submit it for check.', 403);
  }
  if ((action === 'return' || action === 'check') && row.preparedById === actor.id) {
    throw new AppError('own-sheet', 'You prepared this revision, so you cannot check or return it. Another reviewer must.', 403);
  }
  const now = (deps.now ?? (() => new Date()))();
  let moved: boolean;
  let sha256: string | undefined;

  if (action === 'check') {
    const open = (await repo.commentsUpTo(row.trussId, row.number)).filter((c) => c.parentId === null && c.resolvedAt === null);
    if (open.length > 0) {
      const anchors = [...new Set(open.map((c) => c.anchor))].slice(0, 5).join(', ');
      throw new AppError('open-comments', `${open.length} comment thread(s) are still open (${anchors}). Resolve them, or return the revision.`, 409);
    }
  }

  if (action === 'issue') {
    const later = await repo.hasIssuedAfter(row.trussId, row.number);
    if (later) {
      throw new AppError(
        'newer-revision-issued',
        `Revision ${sheetRevisionLabel(later.number)} of this truss is already issued, so the earlier revision ${sheetRevisionLabel(row.number)} cannot be issued after it.`,
        409,
      );
    }
    const issued = await issueRevision(row, note, actor, now, deps);
    moved = issued.moved;
    sha256 = issued.sha256;
  } else {
    const fields =
      action === 'submit'
        ? { submittedAt: now, preparedByName: actor.name }
        : action === 'check'
          ? { checkedAt: now, checkedById: actor.id, checkedByName: actor.name }
          : {};
    moved = await repo.transition(row.id, rule.from, rule.to, actor.id, note, fields);
  }
  if (!moved) throw statusConflict(await revisionOr404(id), action);

  await notify(rule.mail, row, actor, note, deps, sha256);
  return getRevision(id, deps);
}

/**
 * Prints the sheet with its signature block, stores the bytes under a name derived from their
 * SHA-256, signs the record and moves checked → issued in one conditional update. If someone
 * else issued it meanwhile, the stored file is removed and nothing else was written.
 */
async function issueRevision(row: RevisionRow, note: string, actor: Actor, now: Date, deps: ReviewServiceDeps): Promise<{ moved: boolean; sha256: string }> {
  const submittedAt = row.submittedAt ?? now;
  const checkedAt = row.checkedAt ?? now;
  const label = sheetRevisionLabel(row.number);
  const pdf = await deps.renderer.renderPdf({
    runId: row.runId,
    revisionLabel: label,
    signatures: {
      preparedBy: { name: row.preparedByName ?? '', role: 'Prepared by', date: submittedAt.toISOString() },
      checkedBy: { name: row.checkedByName ?? '', role: 'Checked by', date: checkedAt.toISOString() },
      issuedBy: { name: actor.name, role: 'Issued by', date: now.toISOString() },
    },
  });
  const sha256 = crypto.createHash('sha256').update(pdf).digest('hex');
  const storedName = `sheet-${row.id}-${label}-${sha256.slice(0, 16)}-${crypto.randomBytes(4).toString('hex')}.pdf`;
  const issued: RevisionRow = {
    ...row,
    issuedAt: now,
    issuedById: actor.id,
    issuedByName: actor.name,
    pdfStoredName: storedName,
    pdfSize: pdf.length,
    sha256,
    keyFingerprint: deps.key.fingerprint,
  };
  const record = issuedRecordText(issued);
  const signature = deps.key.sign(record);
  await deps.sheets.write(storedName, pdf);
  let moved = false;
  try {
    moved = await repo.transition(row.id, 'checked', 'issued', actor.id, note, {
      issuedAt: now,
      issuedById: actor.id,
      issuedByName: actor.name,
      pdfStoredName: storedName,
      pdfSize: pdf.length,
      sha256,
      signedRecord: record,
      signature,
      keyFingerprint: deps.key.fingerprint,
    });
  } finally {
    if (!moved) await deps.sheets.remove(storedName);
  }
  return { moved, sha256 };
}

/** Tells the next person. A mail failure is logged, never undoes the move. */
async function notify(kind: ReviewMailKind, row: RevisionRow, actor: Actor, note: string, deps: ReviewServiceDeps, sha256?: string) {
  try {
    const context = await contextOr404(row.trussId);
    let to: string[];
    let openComments: number | undefined;
    if (kind === 'submitted') to = await repo.activeEmails({ role: 'reviewer' });
    else if (kind === 'issued') to = await repo.activeEmails({ ids: await repo.projectPeople(context.projectId) });
    else to = await repo.activeEmails({ ids: [row.preparedById] });
    if (kind === 'returned') openComments = (await repo.openThreadCounts([row.id])).get(row.id) ?? 0;
    await reviewMailSend(deps.mailer, {
      kind,
      to,
      context,
      label: sheetRevisionLabel(row.number),
      actorName: actor.name,
      note,
      pageUrl: pageUrl(deps, row.id),
      openComments,
      sha256,
    });
  } catch (err) {
    deps.log(`Review e-mail (${kind}) for sheet revision ${row.id} was not sent`, err);
  }
}

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
  const siblings = await repo.listRevisions({ trussId: root.trussId });
  const labels = new Map(siblings.map((r) => [r.id, sheetRevisionLabel(r.number)]));
  labels.set(revision.id, sheetRevisionLabel(revision.number));
  const names = await repo.userNames(all.flatMap((c) => [c.authorId, c.resolvedById]));
  const [thread] = commentThreads(all, names, labels);
  if (pick !== undefined && pick !== thread.id) return thread.replies.find((r) => r.id === pick)!;
  return thread;
}

function commentThreads(rows: CommentRow[], names: Map<number, string>, labels: Map<number, string>): SheetCommentView[] {
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

function peopleOf(r: RevisionRow): (number | null)[] {
  return [r.preparedById, r.checkedById, r.issuedById];
}

function person(id: number | null, names: Map<number, string>): PersonRef | null {
  return id === null ? null : { id, name: names.get(id) ?? '(unknown)' };
}

function summaryView(r: RevisionRow, c: TrussContext, names: Map<number, string>, openCommentCount: number, labels: Map<number, string>): SheetRevisionSummaryView {
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
    issuedBy: r.issuedById === null ? null : { id: r.issuedById, name: r.issuedByName ?? names.get(r.issuedById) ?? '(unknown)' },
    createdAt: r.createdAt.toISOString(),
    updatedAt: r.updatedAt.toISOString(),
    supersededBy: r.supersededById === null ? null : { id: r.supersededById, label: labels.get(r.supersededById) ?? '' },
    openCommentCount,
  };
}
