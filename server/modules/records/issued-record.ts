import { createHash } from 'node:crypto';
import { sheetRevisionLabel, type SheetSignerView } from '@shared/schemas/review.schema';
import { canonicalJson } from './canonical-json';
import { keyIdOf } from './firm-key';
import type { PublicKeyCheck } from './signing-keys';
import type { RevisionRow } from './records.repository';

/**
 * The record the firm key signs when a revision is issued, built only from columns the
 * database freezes on issue (never from project or truss names, which may be renamed later).
 * Verification rebuilds it from the row as it is now, so a changed SHA-256, signer or date
 * no longer matches the signature.
 */
export interface IssuedRecord {
  kind: 'panelpoint-issued-calc-sheet';
  /** 1: records issued before key ids; 2: the record also names the signing key's id. */
  formatVersion: 1 | 2;
  /** Format 2: the first 16 hex digits of the SHA-256 of the signing public key (SPKI DER). */
  keyId?: string;
  sheetId: number;
  trussId: number;
  runId: number;
  revision: { number: number; label: string };
  pdf: { sha256: string; size: number };
  signers: SheetSignerView[];
  issuedAt: string;
}

/** The date as ISO text; text is taken as already that (the archive list reads its dates so). */
const iso = (d: Date | string | null, what: string, id: number): string => {
  if (typeof d === 'string' && d) return d;
  if (!d || typeof d === 'string' || Number.isNaN(d.getTime())) throw new Error(`Sheet revision ${id} has no ${what} date; it cannot be signed or verified.`);
  return d.toISOString();
};

/** The columns of a revision that name its signers and their dates (Dates, or ISO text from the archive list). */
export type SignerColumns = Pick<RevisionRow, 'id' | 'preparedById' | 'preparedByName' | 'checkedById' | 'checkedByName' | 'issuedById' | 'issuedByName'> & {
  submittedAt: Date | string | null;
  checkedAt: Date | string | null;
  issuedAt: Date | string | null;
};

export function issuedSigners(row: SignerColumns): SheetSignerView[] {
  return [
    { role: 'prepared', userId: row.preparedById, name: row.preparedByName ?? '', at: iso(row.submittedAt, 'prepared', row.id) },
    { role: 'checked', userId: row.checkedById ?? 0, name: row.checkedByName ?? '', at: iso(row.checkedAt, 'checked', row.id) },
    { role: 'issued', userId: row.issuedById ?? 0, name: row.issuedByName ?? '', at: iso(row.issuedAt, 'issued', row.id) },
  ];
}

export type RecordFormat = 1 | 2;
export const RECORD_FORMAT_CURRENT: RecordFormat = 2;

export function issuedRecord(row: RevisionRow, formatVersion: RecordFormat = RECORD_FORMAT_CURRENT): IssuedRecord {
  return {
    kind: 'panelpoint-issued-calc-sheet',
    formatVersion,
    ...(formatVersion >= 2 ? { keyId: keyIdOf(row.keyFingerprint ?? '') } : {}),
    sheetId: row.id,
    trussId: row.trussId,
    runId: row.runId,
    revision: { number: row.number, label: sheetRevisionLabel(row.number) },
    pdf: { sha256: row.sha256 ?? '', size: row.pdfSize ?? 0 },
    signers: issuedSigners(row),
    issuedAt: iso(row.issuedAt, 'issued', row.id),
  };
}

export function issuedRecordText(row: RevisionRow, formatVersion: RecordFormat = RECORD_FORMAT_CURRENT): string {
  return canonicalJson(issuedRecord(row, formatVersion) as unknown as Parameters<typeof canonicalJson>[0]);
}

/** The format a stored record text declares, or null when it is not a record of ours. */
export function recordFormatOf(text: string): RecordFormat | null {
  try {
    const v = (JSON.parse(text) as { formatVersion?: unknown }).formatVersion;
    return v === 1 || v === 2 ? v : null;
  } catch {
    return null;
  }
}

/**
 * Whether the stored signature still holds: over the record rebuilt from the row now (in the
 * format the stored text declares), by the key the row names (looked up among all the firm's
 * keys, retired ones included), and the stored record text is that same text.
 */
export function issuedRecordVerify(row: RevisionRow, key: PublicKeyCheck | null): boolean {
  if (!row.signature || !row.signedRecord || !key) return false;
  const format = recordFormatOf(row.signedRecord);
  if (format === null) return false;
  let text: string;
  try {
    text = issuedRecordText(row, format);
  } catch {
    return false;
  }
  return text === row.signedRecord && row.keyFingerprint === key.fingerprint && key.verify(text, row.signature);
}

/** How many hex digits of the issue fingerprint a sheet prints. */
export const ISSUE_FINGERPRINT_DIGITS = 12;

/**
 * The short fingerprint printed on every page of an issued sheet: the first 12 hex digits of the
 * SHA-256 of the issue record without its `pdf` part (sheet id, truss, run, revision, signers,
 * issue time, key id), as canonical JSON. The PDF's own SHA-256 cannot be printed inside the PDF
 * it hashes, so the printed fingerprint is of the record; the record the firm key signs then
 * names the PDF's SHA-256. Rebuilt from the frozen columns, so a changed row no longer gives the
 * fingerprint on the paper.
 */
export function issueFingerprint(row: RevisionRow, formatVersion: RecordFormat = RECORD_FORMAT_CURRENT): string {
  const { pdf: _pdf, ...stamp } = issuedRecord(row, formatVersion);
  void _pdf;
  const text = canonicalJson(stamp as unknown as Parameters<typeof canonicalJson>[0]);
  return createHash('sha256').update(text).digest('hex').slice(0, ISSUE_FINGERPRINT_DIGITS);
}

/** What the printed fingerprint is of, in words (printed beside it and on the verify page). */
export const ISSUE_FINGERPRINT_OF =
  'first 12 hex digits of the SHA-256 of the issue record (sheet, revision, run, signers, issue time, key id), not of the PDF file';

/** The public verify address of an issued sheet: PUBLIC_URL/verify/<sheet id>. */
export function verifyUrlOf(publicUrl: string, sheetId: number): string {
  return `${publicUrl.replace(/\/+$/, '')}/verify/${sheetId}`;
}
