import { sheetRevisionLabel, type SheetSignerView } from '@shared/schemas/review.schema';
import { canonicalJson } from './canonical-json';
import type { FirmKey } from './firm-key';
import type { RevisionRow } from './records.repository';

/**
 * The record the firm key signs when a revision is issued, built only from columns the
 * database freezes on issue (never from project or truss names, which may be renamed later).
 * Verification rebuilds it from the row as it is now, so a changed SHA-256, signer or date
 * no longer matches the signature.
 */
export interface IssuedRecord {
  kind: 'panelpoint-issued-calc-sheet';
  formatVersion: 1;
  sheetId: number;
  trussId: number;
  runId: number;
  revision: { number: number; label: string };
  pdf: { sha256: string; size: number };
  signers: SheetSignerView[];
  issuedAt: string;
}

const iso = (d: Date | null, what: string, id: number): string => {
  if (!d || Number.isNaN(d.getTime())) throw new Error(`Sheet revision ${id} has no ${what} date; it cannot be signed or verified.`);
  return d.toISOString();
};

export function issuedSigners(row: RevisionRow): SheetSignerView[] {
  return [
    { role: 'prepared', userId: row.preparedById, name: row.preparedByName ?? '', at: iso(row.submittedAt, 'prepared', row.id) },
    { role: 'checked', userId: row.checkedById ?? 0, name: row.checkedByName ?? '', at: iso(row.checkedAt, 'checked', row.id) },
    { role: 'issued', userId: row.issuedById ?? 0, name: row.issuedByName ?? '', at: iso(row.issuedAt, 'issued', row.id) },
  ];
}

export function issuedRecord(row: RevisionRow): IssuedRecord {
  return {
    kind: 'panelpoint-issued-calc-sheet',
    formatVersion: 1,
    sheetId: row.id,
    trussId: row.trussId,
    runId: row.runId,
    revision: { number: row.number, label: sheetRevisionLabel(row.number) },
    pdf: { sha256: row.sha256 ?? '', size: row.pdfSize ?? 0 },
    signers: issuedSigners(row),
    issuedAt: iso(row.issuedAt, 'issued', row.id),
  };
}

export function issuedRecordText(row: RevisionRow): string {
  return canonicalJson(issuedRecord(row) as unknown as Parameters<typeof canonicalJson>[0]);
}

/**
 * Whether the stored signature still holds: over the record rebuilt from the row now, by the
 * firm key, and the stored record text is that same text.
 */
export function issuedRecordVerify(row: RevisionRow, key: FirmKey): boolean {
  if (!row.signature || !row.signedRecord) return false;
  let text: string;
  try {
    text = issuedRecordText(row);
  } catch {
    return false;
  }
  return text === row.signedRecord && row.keyFingerprint === key.fingerprint && key.verify(text, row.signature);
}
