import crypto from 'node:crypto';
import type { Role } from '@shared/schemas/auth.schema';
import { sheetRevisionLabel, type SheetAction, type SheetEventView, type SheetRevisionSummaryView, type SheetRevisionView } from '@shared/schemas/review.schema';
import { AppError, notFound } from '../../errors/app-error';
import type { Mailer } from '../../mail/mailer';
import type { FileStore } from '../../storage/file-store';
import { keyIdOf } from '../records/firm-key';
import type { SigningKeys } from '../records/signing-keys';
import { ISSUE_FINGERPRINT_OF, issuedRecordText, issuedSigners, issueFingerprint, verifyUrlOf } from '../records/issued-record';
import { recordsRepository as records, type RevisionRow, type TrussContext } from '../records/records.repository';
import { FROZEN, frozenError, STATUS_WORDS, statusConflict, TRANSITIONS } from './revision-status';
import { reviewMailSend, type MailComment, type ReviewMailKind } from './sheet-revisions.mail';
import { placeOf, runSheetPlaces, type SheetPlace } from '../calc-sheets/step-numbers';
import { sheetRevisionsRepository as repo } from './sheet-revisions.repository';
import { commentThreads, pageUrl, peopleOf, person, replacementsOf, summaryView } from './sheet-revisions.views';
import type { RunRef, RunSource, SheetRenderer } from './sheet-renderer';
import { modelSaveName, runName } from '@shared/text/citations';

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
  /** The firm's signing keys; issuing signs with the current one. */
  keys: SigningKeys;
  /** Where issued PDFs are kept. */
  sheets: FileStore;
  log: (msg: string, err?: unknown) => void;
  now?: () => Date;
  /** The numbered steps and sections of a run's sheet, for the e-mails; default runSheetPlaces (calc-sheets/step-numbers.ts). */
  sheetPlaces?: (runId: number) => Promise<Map<string, SheetPlace>>;
}

export async function revisionOr404(id: number): Promise<RevisionRow> {
  const row = await records.findRevision(id);
  if (!row) throw notFound('That sheet revision');
  return row;
}

export async function contextOr404(trussId: number): Promise<TrussContext> {
  const context = await records.trussContext(trussId);
  if (!context) throw notFound('That truss');
  return context;
}

/** "Run 2 of T7 (model save 5)" as people cite it; the row id only where the number is unknown. */
function citeRun(run: RunRef): string {
  if (run.number === undefined) return `Analysis run ${run.id}`;
  return `${runName(run.number, run.trussName)}${run.modelVersion !== undefined ? ` (${modelSaveName(run.modelVersion)})` : ''}`;
}

/** Starts a draft revision of a truss's calc sheet from a solved run of that truss. */
export async function createRevision(input: { trussId: number; runId: number; note: string }, actor: Actor, deps: ReviewServiceDeps): Promise<SheetRevisionView> {
  await contextOr404(input.trussId);
  const run = await deps.runs.findRun(input.runId);
  if (!run) throw new AppError('run-not-found', `Analysis run ${input.runId} was not found. Run the analysis, then start the sheet from that run.`, 422);
  if (run.trussId !== input.trussId) {
    throw new AppError('run-of-other-truss', `${citeRun(run)} belongs to another truss. Choose a run of this truss.`, 422);
  }
  if (run.status !== 'solved') {
    throw new AppError('run-not-solved', `${citeRun(run)} is ${run.status}, so it has no results to put on a sheet. Fix the model and run it again.`, 409);
  }
  const row = await repo.createDraft({ trussId: input.trussId, runId: input.runId, preparedById: actor.id, note: input.note });
  return getRevision(row.id, deps);
}

export async function listTrussRevisions(trussId: number): Promise<SheetRevisionSummaryView[]> {
  const context = await contextOr404(trussId);
  const rows = await records.listRevisions({ trussId });
  const [names, open] = await Promise.all([repo.userNames(rows.flatMap(peopleOf)), repo.openThreadCounts(rows.map((r) => r.id))]);
  const labels = new Map(rows.map((r) => [r.id, sheetRevisionLabel(r.number)]));
  const replacements = replacementsOf(rows);
  return rows.map((r) => summaryView(r, context, names, open.get(r.id) ?? 0, labels, replacements));
}

export async function getRevision(id: number, deps: Pick<ReviewServiceDeps, 'publicUrl'>): Promise<SheetRevisionView> {
  const row = await revisionOr404(id);
  const context = await contextOr404(row.trussId);
  const [events, comments, siblings] = await Promise.all([
    records.events(row.id),
    repo.commentsUpTo(row.trussId, row.number),
    records.listRevisions({ trussId: row.trussId }),
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
    ...summaryView(row, context, names, openOnThis, labels, replacementsOf(siblings)),
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
            keyId: keyIdOf(row.keyFingerprint),
          }
        : null,
    pageUrl: pageUrl(deps, row.id),
  };
}

/** Active reviewers: the people a preparer may choose as checker (the preparer is an engineer, so never among them). */
export async function listCheckers(actor: Actor): Promise<{ id: number; name: string; email: string }[]> {
  return (await repo.activeReviewers()).filter((u) => u.id !== actor.id);
}

const ROLE_WORDS: Record<Role, string> = { drafter: 'a drafter', engineer: 'an engineer', reviewer: 'a reviewer', admin: 'an admin' };

/**
 * The checker chosen for a revision, or a 422 naming what is wrong with the choice. Who may
 * check is the rule of the return and check routes: an active reviewer who did not prepare
 * the revision ('own-sheet'). `byPreparer` words the refusal of the preparer themselves.
 */
async function checkerOr422(checkerId: number | undefined, row: RevisionRow, byPreparer: boolean): Promise<{ id: number; name: string }> {
  if (checkerId === undefined) throw new AppError('checker-missing', 'Choose the checker: the reviewer who will check this revision.', 422);
  if (checkerId === row.preparedById) {
    throw new AppError(
      'checker-self',
      byPreparer ? 'You prepared this revision, so you cannot be its checker. Choose a reviewer.' : 'The preparer of a revision cannot be its checker. Choose another reviewer.',
      422,
    );
  }
  const user = await repo.userById(checkerId);
  if (!user) throw new AppError('checker-unknown', `Nobody in the firm has the id ${checkerId}. Choose the checker from the list of reviewers.`, 422);
  if (user.role !== 'reviewer') {
    throw new AppError('checker-not-reviewer', `${user.name} is ${ROLE_WORDS[user.role]}, not a reviewer, so they cannot check sheets. Choose a reviewer.`, 422);
  }
  if (user.disabled) throw new AppError('checker-inactive', `${user.name}'s account is disabled. Choose an active reviewer.`, 422);
  if (!user.active) throw new AppError('checker-inactive', `${user.name} has not accepted the invitation yet. Choose a reviewer who has signed in.`, 422);
  return { id: user.id, name: user.name };
}

/**
 * Moves a revision one step along draft → in check → returned | checked → issued. Who may:
 * submit — the engineer who prepared it, naming the checker; return and check — the checker
 * chosen on submitting (on revisions submitted before checkers were chosen, any reviewer who
 * did not prepare it); issue — an engineer (role checks are on the route). The move is a
 * conditional update, so of two people acting at once one wins and the other gets a 409
 * naming the status now. A refusal writes nothing.
 */
export async function transitionRevision(
  id: number,
  action: SheetAction,
  note: string,
  actor: Actor,
  deps: ReviewServiceDeps,
  options: { checkerId?: number } = {},
): Promise<SheetRevisionView> {
  const rule = TRANSITIONS[action];
  const row = await revisionOr404(id);
  if (row.status !== rule.from) throw statusConflict(row, action);
  if (action === 'submit' && row.preparedById !== actor.id) {
    throw new AppError('not-preparer', 'Only the engineer who prepared this revision can submit it for check.', 403);
  }
  if ((action === 'return' || action === 'check') && row.preparedById === actor.id) {
    throw new AppError('own-sheet', 'You prepared this revision, so you cannot check or return it. Another reviewer must.', 403);
  }
  if ((action === 'return' || action === 'check') && row.checkerId !== null && row.checkerId !== actor.id) {
    const checker = (await repo.userNames([row.checkerId])).get(row.checkerId) ?? 'another reviewer';
    throw new AppError(
      'not-checker',
      `Revision ${sheetRevisionLabel(row.number)} was sent to ${checker} to check, so only they can return it or mark it checked; an admin can hand it to you.`,
      403,
    );
  }
  const checker = action === 'submit' ? await checkerOr422(options.checkerId, row, true) : null;
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
        ? { submittedAt: now, preparedByName: actor.name, checkerId: checker!.id }
        : action === 'check'
          ? { checkedAt: now, checkedById: actor.id, checkedByName: actor.name }
          : {};
    moved = await repo.transition(row.id, rule.from, rule.to, actor.id, note, fields);
  }
  if (!moved) throw statusConflict(await revisionOr404(id), action);

  await notify(rule.mail, checker ? { ...row, checkerId: checker.id } : row, actor, note, deps, sha256);
  return getRevision(id, deps);
}

/**
 * An admin hands a revision in check to another checker (someone away, say). The new checker
 * gets the "submitted" e-mail; the audit log keeps a line naming both. Refused (nothing
 * written) unless the revision is in check and the new checker could have been chosen.
 */
export async function reassignChecker(id: number, checkerId: number, note: string, actor: Actor, deps: ReviewServiceDeps): Promise<SheetRevisionView> {
  const row = await revisionOr404(id);
  if (row.status !== 'in-check') {
    if (FROZEN.includes(row.status)) throw frozenError(row);
    throw new AppError(
      'sheet-status-conflict',
      `Revision ${sheetRevisionLabel(row.number)} is ${STATUS_WORDS[row.status]}; only a revision in check can be given another checker. Reload the sheet to see its current status.`,
      409,
    );
  }
  const checker = await checkerOr422(checkerId, row, false);
  if (checker.id === row.checkerId) throw new AppError('checker-unchanged', `${checker.name} is already the checker of this revision.`, 422);
  const before = row.checkerId === null ? 'every reviewer' : ((await repo.userNames([row.checkerId])).get(row.checkerId) ?? 'the earlier checker');
  const moved = await repo.checkerChange(row.id, row.checkerId, checker.id, actor.id, `Checker changed from ${before} to ${checker.name}.${note ? ` ${note}` : ''}`);
  if (!moved) throw statusConflict(await revisionOr404(id), 'check');
  // The e-mail reads as the preparer's submission (it is theirs), with a line saying who handed it over.
  const preparer = row.preparedByName ?? (await repo.userNames([row.preparedById])).get(row.preparedById) ?? 'The preparer';
  const handed = `${actor.name} handed this revision to you to check.${note ? ` ${note}` : ''}`;
  await notify('submitted', { ...row, checkerId: checker.id }, { ...actor, name: preparer }, handed, deps);
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
  const key = await deps.keys.current();
  // The row as it will be once issued, but for the PDF's own size and hash: its fingerprint is
  // printed on every page, so it is computed from what is known before the print.
  const stamped: RevisionRow = {
    ...row,
    issuedAt: now,
    issuedById: actor.id,
    issuedByName: actor.name,
    keyFingerprint: key.fingerprint,
  };
  const pdf = await deps.renderer.renderPdf({
    runId: row.runId,
    revisionLabel: label,
    signatures: {
      preparedBy: { name: row.preparedByName ?? '', role: 'Prepared by', date: submittedAt.toISOString() },
      checkedBy: { name: row.checkedByName ?? '', role: 'Checked by', date: checkedAt.toISOString() },
      issuedBy: { name: actor.name, role: 'Issued by', date: now.toISOString() },
    },
    issue: {
      sheetId: row.id,
      fingerprint: issueFingerprint(stamped),
      fingerprintOf: ISSUE_FINGERPRINT_OF,
      verifyUrl: verifyUrlOf(deps.publicUrl(), row.id),
    },
  });
  const sha256 = crypto.createHash('sha256').update(pdf).digest('hex');
  const storedName = `sheet-${row.id}-${label}-${sha256.slice(0, 16)}-${crypto.randomBytes(4).toString('hex')}.pdf`;
  const issued: RevisionRow = {
    ...stamped,
    pdfStoredName: storedName,
    pdfSize: pdf.length,
    sha256,
  };
  const record = issuedRecordText(issued);
  const signature = key.sign(record);
  await deps.sheets.put(storedName, pdf);
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
      keyFingerprint: key.fingerprint,
    });
  } finally {
    if (!moved) await deps.sheets.delete(storedName);
  }
  return { moved, sha256 };
}

/**
 * Tells the next person, less those who turned this e-mail off on their account page. A mail
 * failure is logged, never undoes the move.
 */
async function notify(kind: ReviewMailKind, row: RevisionRow, actor: Actor, note: string, deps: ReviewServiceDeps, sha256?: string) {
  try {
    const context = await contextOr404(row.trussId);
    let to: string[];
    // Submitted: the chosen checker only; every reviewer for a row without one (before 0017).
    if (kind === 'submitted') to = await repo.activeEmails(row.checkerId !== null ? { ids: [row.checkerId], kind } : { role: 'reviewer', kind });
    else if (kind === 'issued') to = await repo.activeEmails({ ids: await repo.projectPeople(context.projectId), kind });
    else to = await repo.activeEmails({ ids: [row.preparedById], kind });
    if (to.length === 0) return;
    const comments = kind === 'returned' || kind === 'submitted' ? await openComments(row, deps) : undefined;
    const run = await deps.runs.findRun(row.runId);
    await reviewMailSend(deps.mailer, {
      kind,
      to,
      context,
      label: sheetRevisionLabel(row.number),
      ...(run ? { run: citeRun(run) } : {}),
      actorName: actor.name,
      note,
      pageUrl: pageUrl(deps, row.id),
      openComments: comments?.length,
      comments,
      sha256,
      toChecker: kind === 'submitted' && row.checkerId !== null,
    });
  } catch (err) {
    deps.log(`Review e-mail (${kind}) for sheet revision ${row.id} was not sent`, err);
  }
}

/**
 * The comment threads still open on a revision (its own and earlier revisions' of the truss),
 * each with the step number the sheet prints, in the sheet's order. Without the sheet's
 * numbers (a sheet that cannot be built) the threads are still quoted, by their anchors.
 */
async function openComments(row: RevisionRow, deps: ReviewServiceDeps): Promise<MailComment[]> {
  const open = (await repo.commentsUpTo(row.trussId, row.number)).filter((c) => c.parentId === null && c.resolvedAt === null);
  if (open.length === 0) return [];
  let places = new Map<string, SheetPlace>();
  try {
    places = await (deps.sheetPlaces ?? runSheetPlaces)(row.runId);
  } catch (err) {
    deps.log(`Step numbers of sheet revision ${row.id} could not be worked out for its e-mail; its comments are quoted by anchor`, err);
  }
  const names = await repo.userNames(open.map((c) => c.authorId));
  const quoted = open.map((c) => {
    const place = placeOf(c.anchor, places);
    return { number: place?.number ?? null, place: place?.title ?? c.anchor, author: names.get(c.authorId) ?? 'Someone', body: c.body };
  });
  return quoted.sort((a, b) => stepOrder(a.number, b.number));
}

/** "2" < "6.4" < "6.10" < "10.1"; unnumbered last (the sort is stable, so those keep their order). */
function stepOrder(a: string | null, b: string | null): number {
  if (a === b) return 0;
  if (a === null) return 1;
  if (b === null) return -1;
  const pa = a.split('.').map(Number);
  const pb = b.split('.').map(Number);
  for (let i = 0; i < Math.max(pa.length, pb.length); i++) {
    const d = (pa[i] ?? 0) - (pb[i] ?? 0);
    if (d !== 0) return d;
  }
  return pa.length - pb.length;
}
