import { z } from 'zod';

/**
 * Check, sign and archive: calc-sheet revisions, their review, step comments, the issued
 * archive and the verify page. Inputs are zod schemas (server validation and client forms);
 * views are what the API answers.
 *
 * Routes (every write needs the session's X-CSRF-Token):
 *
 * | route | who | body | answer |
 * | --- | --- | --- | --- |
 * | GET    /api/trusses/:id/sheets     | any role | — | SheetRevisionSummaryView[] (newest first) |
 * | POST   /api/trusses/:id/sheets     | engineer | NewSheetRevisionInput | 201 SheetRevisionView (draft) |
 * | GET    /api/sheets/:id             | any role | — | SheetRevisionView |
 * | GET    /api/checkers               | engineer, admin | — | CheckerView[] (who may be chosen as checker) |
 * | POST   /api/sheets/:id/submit      | engineer (its preparer) | SheetSubmitInput | SheetRevisionView (in-check) |
 * | POST   /api/sheets/:id/checker     | admin | SheetCheckerInput | SheetRevisionView (in check, another checker) |
 * | POST   /api/sheets/:id/return      | reviewer (its checker) | SheetTransitionInput | SheetRevisionView (returned) |
 * | POST   /api/sheets/:id/check       | reviewer (its checker) | SheetTransitionInput | SheetRevisionView (checked) |
 * | GET    /api/me/work                | any role | — | MyWorkView |
 * | POST   /api/sheets/:id/issue       | engineer | SheetTransitionInput | SheetRevisionView (issued) |
 * | GET    /api/sheets/:id/pdf         | any role | — | the archived PDF bytes (issued or superseded only) |
 * | POST   /api/sheets/:id/comments    | engineer, reviewer | NewSheetCommentInput | 201 SheetCommentView |
 * | PATCH  /api/sheet-comments/:id     | engineer, reviewer | SheetCommentResolveInput | SheetCommentView |
 * | GET    /api/archive                | any role | query: ArchiveQuery | ArchiveEntryView[] |
 * | POST   /api/archive/verify         | any role | multipart, one PDF in field "file" | SheetVerifyView |
 * | GET    /api/public/verify/:id      | public (rate-limited per address) | — | PublicSheetView |
 * | POST   /api/public/verify          | public (rate-limited per address) | multipart, one PDF in field "file" | PublicVerifyView |
 * | GET    /api/firm/signing-key       | admin | — | FirmSigningKeyView (the current key) |
 * | GET    /api/firm/signing-keys      | admin | — | SigningKeyView[] (current first, then newest first) |
 * | POST   /api/firm/signing-keys/rotate | admin | — | 201 SigningKeyView (the new current key) |
 * | GET    /api/admin/audit-chain      | admin | — | AuditChainView |
 *
 * Refusals answer `{ error: { code, message } }` (shared/api/errors.ts). Codes of this area:
 * 'sheet-status-conflict' (409, a transition out of order or lost to someone acting at the same
 * time; the message names the current status), 'not-preparer' (403, only the preparer submits),
 * 'own-sheet' (403, a reviewer cannot check or return a sheet they prepared), 'not-checker' (403,
 * only the checker chosen on submitting returns or checks), 'checker-missing' / 'checker-self' /
 * 'checker-unknown' / 'checker-not-reviewer' / 'checker-inactive' (422, the chosen checker),
 * 'sheet-issued'
 * (409, an issued or superseded revision cannot change), 'open-comments' (409, checking while
 * comments are unresolved), 'run-not-solved' / 'run-of-other-truss' (409/422, a revision needs a
 * solved run of its own truss), 'newer-revision-issued' (409), 'not-a-pdf' (400),
 * 'file-too-large' (413), 'file-missing' (400), 'archived-file-altered' / 'archived-file-missing' (409,
 * the stored PDF no longer hashes to its record, or is gone; restore it from backup),
 * 'signing-key-mismatch' (503, the key file does not hold the current key).
 */

/** Statuses a sheet revision passes through; `superseded` follows `issued` when a later revision is issued. */
export const sheetStatusSchema = z.enum(['draft', 'in-check', 'returned', 'checked', 'issued', 'superseded']);
export type SheetStatus = z.infer<typeof sheetStatusSchema>;

/** Which way a transition goes, as the route names it. */
export type SheetAction = 'submit' | 'return' | 'check' | 'issue';

const note = z.string().trim().max(2000, 'Keep the note under 2000 characters.');

/** Starts a revision of a truss's calc sheet from one of its analysis runs. */
export const newSheetRevisionSchema = z.object({
  runId: z.number({ error: 'Give the analysis run as a number.' }).int().positive('Choose an analysis run.'),
  note: note.default(''),
});
export type NewSheetRevisionInput = z.input<typeof newSheetRevisionSchema>;

/** Body of submit / return / check / issue: an optional note kept in the audit log. */
export const sheetTransitionSchema = z.object({ note: note.default('') });
export type SheetTransitionInput = z.input<typeof sheetTransitionSchema>;

const checkerId = z
  .number({ error: 'Choose the checker: the reviewer who will check this revision.' })
  .int('Choose the checker from the list of reviewers.')
  .positive('Choose the checker from the list of reviewers.');

/**
 * Body of submit: the checker the preparer chooses (a reviewer, never themselves) and an
 * optional note. checkerId is optional here so that leaving it out gets the service's own
 * sentence ('checker-missing', 422) rather than a field list; the service requires it.
 */
export const sheetSubmitSchema = z.object({ note: note.default(''), checkerId: checkerId.optional() });
export type SheetSubmitInput = z.input<typeof sheetSubmitSchema>;

/** Body of an admin's re-assignment of a revision in check to another checker. */
export const sheetCheckerSchema = z.object({ note: note.default(''), checkerId });
export type SheetCheckerInput = z.input<typeof sheetCheckerSchema>;

/** A person who may be chosen as the checker of a revision. */
export interface CheckerView {
  id: number;
  name: string;
  email: string;
}

/**
 * A comment on one step of the sheet. `anchor` is the solver's step id as printed on the sheet
 * (e.g. "case-D/joint-C"); a reply names its thread's first comment in `parentId` and takes
 * that comment's anchor.
 */
export const newSheetCommentSchema = z
  .object({
    anchor: z
      .string()
      .trim()
      .min(1, 'Say which step the comment is on.')
      .max(200)
      .regex(/^[A-Za-z0-9][A-Za-z0-9._:/-]*$/, 'A step anchor is the step id on the sheet, e.g. "case-D/joint-C".')
      .optional(),
    body: z.string().trim().min(1, 'Write the comment.').max(4000, 'Keep a comment under 4000 characters.'),
    parentId: z.number().int().positive().optional(),
  })
  .refine((v) => v.anchor !== undefined || v.parentId !== undefined, {
    message: 'Give the step anchor for a new comment, or parentId for a reply.',
    path: ['anchor'],
  });
export type NewSheetCommentInput = z.input<typeof newSheetCommentSchema>;

/** Marks a comment thread resolved, or open again. */
export const sheetCommentResolveSchema = z.object({ resolved: z.boolean({ error: 'Say resolved: true or false.' }) });
export type SheetCommentResolveInput = z.infer<typeof sheetCommentResolveSchema>;

/** Archive search; every field optional, matched case-insensitively as a part of the text. */
export const archiveQuerySchema = z.object({
  /** Matches job number, project name or truss name. */
  q: z.string().trim().max(200).optional(),
  jobNumber: z.string().trim().max(40).optional(),
  project: z.string().trim().max(160).optional(),
  truss: z.string().trim().max(160).optional(),
  /** Include superseded revisions (default true). */
  superseded: z.enum(['include', 'exclude']).default('include'),
});
export type ArchiveQuery = z.input<typeof archiveQuerySchema>;

export interface PersonRef {
  id: number;
  name: string;
}

/** One line of the audit log: who moved the revision from which status to which, when, why. */
export interface SheetEventView {
  id: number;
  /** null for the revision's creation. */
  from: SheetStatus | null;
  to: SheetStatus;
  by: PersonRef | null;
  /** ISO 8601. */
  at: string;
  note: string;
}

export interface SheetCommentView {
  id: number;
  /** The revision the comment was made on. */
  revisionId: number;
  revisionLabel: string;
  anchor: string;
  body: string;
  author: PersonRef;
  createdAt: string;
  /** The thread's first comment; null for a thread's first comment. */
  parentId: number | null;
  /** Threads only (replies are never resolved on their own). */
  resolved: boolean;
  resolvedBy: PersonRef | null;
  resolvedAt: string | null;
  /** Replies, oldest first (empty on replies). */
  replies: SheetCommentView[];
}

/** A signature on the sheet: who, in what role, when. */
export interface SheetSignerView {
  role: 'prepared' | 'checked' | 'issued';
  userId: number;
  name: string;
  at: string;
}

/** What issuing fixed: the stored PDF's fingerprint and the firm's signature of the record. */
export interface SheetIssueView {
  sha256: string;
  size: number;
  issuedAt: string;
  signers: SheetSignerView[];
  /** The canonical JSON the firm key signed. */
  record: string;
  /** Ed25519 signature of `record`, base64. */
  signature: string;
  /** SHA-256 (hex) of the signing public key (SPKI DER). */
  keyFingerprint: string;
  /** The key id the record names: the first 16 hex digits of keyFingerprint. */
  keyId: string;
}

export interface SheetRevisionSummaryView {
  id: number;
  projectId: number;
  trussId: number;
  runId: number;
  /** 1, 2, 3 … per truss. */
  number: number;
  /** As printed on the sheet: A, B, C … */
  label: string;
  status: SheetStatus;
  preparedBy: PersonRef;
  checkedBy: PersonRef | null;
  /** The checker chosen on submitting; null on drafts and on revisions submitted before checkers were chosen. */
  checker: PersonRef | null;
  issuedBy: PersonRef | null;
  createdAt: string;
  updatedAt: string;
  supersededBy: { id: number; label: string } | null;
  /** A returned revision that has been revised: the next revision of the truss, which replaces it. */
  replacedBy: { id: number; label: string } | null;
  /** Unresolved threads made on this revision. */
  openCommentCount: number;
}

export interface SheetRevisionView extends SheetRevisionSummaryView {
  project: { id: number; name: string; jobNumber: string };
  truss: { id: number; name: string };
  /** Audit log, oldest first. */
  events: SheetEventView[];
  /**
   * Comment threads made on this revision and on every earlier revision of the truss, oldest
   * first, each with the revision it was made on and whether it is resolved.
   */
  comments: SheetCommentView[];
  /** Ids of the unresolved threads among `comments` (a returned revision lists these). */
  openCommentIds: number[];
  /** Set once issued. */
  issue: SheetIssueView | null;
  /** The app page of this revision (PUBLIC_URL + /sheets/:id), as linked in e-mails. */
  pageUrl: string;
}

export interface ArchiveEntryView {
  sheetId: number;
  projectId: number;
  jobNumber: string;
  projectName: string;
  trussId: number;
  trussName: string;
  number: number;
  label: string;
  status: 'issued' | 'superseded';
  issuedAt: string;
  sha256: string;
  size: number;
  signers: SheetSignerView[];
  supersededBy: { id: number; label: string } | null;
}

/**
 * The verify page's answer. `match` is null when no issued sheet has the upload's SHA-256 (an
 * altered copy, or not one of ours).
 */
export interface SheetVerifyView {
  sha256: string;
  size: number;
  match: ArchiveEntryView | null;
  /**
   * 'valid': the firm key's signature verifies over the record rebuilt from the database as it
   * is now; 'invalid': it does not (the record was changed after issue); null: no match.
   */
  signature: 'valid' | 'invalid' | null;
  /** 'intact' when the archived file still hashes to the recorded SHA-256. */
  archivedFile: 'intact' | 'altered' | 'missing' | null;
  /** Plain sentence for the page. */
  verdict: string;
}

/**
 * What the public verify page shows of an issued sheet: only what the sheet itself prints (firm,
 * job, truss, revision, issue date, the fingerprint of its footer), and whether it is current.
 */
export interface PublicSheetView {
  sheetId: number;
  firm: string;
  jobNumber: string;
  projectName: string;
  trussName: string;
  revision: string;
  /** Date of issue, YYYY-MM-DD (UTC), as the sheet prints it. */
  issuedOn: string;
  status: 'current' | 'superseded';
  /** The revision that superseded it, by its letter. */
  supersededBy: string | null;
  /** The fingerprint printed in every page's footer (12 hex digits) and what it is of. */
  fingerprint: string;
  fingerprintOf: string;
}

/**
 * The public verify answer for a dropped PDF. 'match': its bytes are an issued sheet's; 'altered':
 * its metadata claims an issued sheet but its bytes differ from the archived copy; 'unknown':
 * no issued sheet has these bytes and the file claims none.
 */
export interface PublicVerifyView {
  outcome: 'match' | 'altered' | 'unknown';
  sha256: string;
  size: number;
  /** The matching sheet, or the one the file claims to be. */
  sheet: PublicSheetView | null;
  /** 'match' only: whether the firm's signature over the issue record still holds. */
  recordIntact: boolean | null;
  verdict: string;
}

export interface FirmSigningKeyView {
  algorithm: 'Ed25519';
  /** SPKI public key, PEM. */
  publicKeyPem: string;
  /** SHA-256 (hex) of the SPKI DER. */
  fingerprint: string;
  /** First 16 hex digits of the fingerprint; what issued records name. */
  keyId: string;
}

/** One of the firm's signing keys, current or retired; retired public keys are kept for verifying. */
export interface SigningKeyView {
  keyId: string;
  fingerprint: string;
  algorithm: 'Ed25519';
  publicKeyPem: string;
  createdAt: string;
  retiredAt: string | null;
  current: boolean;
  /** Issued or superseded sheets whose record this key signed. */
  sheetsSigned: number;
}

/** The audit log's hash chain, checked line by line from the first. */
export interface AuditChainView {
  ok: boolean;
  /** Lines checked. */
  lines: number;
  /** Of those, lines sealed before the audit key existed (plain SHA-256), and lines sealed with it (HMAC). */
  beforeKeying: number;
  keyed: number;
  /** Hash of the last line (64 zeros for an empty log). */
  lastHash: string;
  /** The first line that breaks the chain, or null. */
  broken: { eventId: number; revisionId: number; reason: string } | null;
  /** One sentence for the page and the command. */
  message: string;
}

/** Revision labels: 1 → A, 26 → Z, 27 → AA (the sheet's revision letter). */
export function sheetRevisionLabel(n: number): string {
  if (!Number.isInteger(n) || n < 1) throw new RangeError(`A revision number is a whole number from 1; got ${n}.`);
  let label = '';
  let rest = n;
  while (rest > 0) {
    const d = (rest - 1) % 26;
    label = String.fromCharCode(65 + d) + label;
    rest = Math.floor((rest - 1) / 26);
  }
  return label;
}

/** One revision waiting for someone, with where it belongs; the link is the sheet page (/sheets/:id). */
export interface WorkRevisionItem {
  id: number;
  label: string;
  status: SheetStatus;
  project: { id: number; name: string; jobNumber: string };
  truss: { id: number; name: string };
  preparedBy: PersonRef;
  checker: PersonRef | null;
  /** When it came to this list: submitted, returned or checked (ISO 8601). */
  since: string;
  openCommentCount: number;
}

/** A truss whose newest drawing version failed to import or imported with warnings; the link is the truss page. */
export interface WorkDrawingItem {
  drawingId: number;
  /** The drawing version, 1, 2, … per truss. */
  version: number;
  originalName: string;
  status: 'imported' | 'failed';
  project: { id: number; name: string; jobNumber: string };
  truss: { id: number; name: string };
  /** The failure's sentence, or the warnings' sentences (at most five). */
  problems: string[];
  /** All warnings (a failed import counts as one). */
  problemCount: number;
  importedAt: string;
}

/** GET /api/me/work: what waits for the signed-in person, by role. Lists a role has no part in are empty. */
export interface MyWorkView {
  /** Reviewer: in check, I am the checker (or no checker was chosen and I did not prepare it). */
  toCheck: WorkRevisionItem[];
  /** Engineer: returned revisions I prepared that no later revision of the truss has replaced yet. */
  returnedToMe: WorkRevisionItem[];
  /** Engineer: my checked revisions, ready to issue. */
  readyToIssue: WorkRevisionItem[];
  /** Drafter: drawings whose newest version failed to import or has warnings, in the firm's open projects. */
  drawingsToFix: WorkDrawingItem[];
  /** The number of rows in all four lists (the navigation's count). */
  total: number;
}
