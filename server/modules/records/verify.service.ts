import crypto from 'node:crypto';
import type { SheetVerifyView } from '@shared/schemas/review.schema';
import { AppError } from '../../errors/app-error';
import { StoredFileMissingError, type FileStore } from '../../storage/file-store';
import { archiveEntry, labelsOf } from './archive.service';
import { issuedRecordVerify } from './issued-record';
import { recordsRepository as repo, type RevisionRow } from './records.repository';
import type { SigningKeys } from './signing-keys';

/** Whether the bytes look like a PDF: the file header "%PDF-" (ISO 32000-1 §7.5.2). */
export function looksLikePdf(bytes: Buffer): boolean {
  return bytes.length >= 5 && bytes.subarray(0, 5).toString('latin1') === '%PDF-';
}

/**
 * Finds the issued sheet with the same SHA-256 as the upload and re-checks it: the firm
 * signature over the record rebuilt from the database now, the archived file against its
 * recorded SHA-256, and whether a later revision superseded it. Writes nothing.
 */
export async function verifyPdf(bytes: Buffer, deps: { keys: SigningKeys; sheets: FileStore }): Promise<SheetVerifyView> {
  if (!looksLikePdf(bytes)) {
    throw new AppError('not-a-pdf', 'That file is not a PDF (it does not start with "%PDF-"). Drop the calc sheet PDF itself.', 400);
  }
  const sha256 = crypto.createHash('sha256').update(bytes).digest('hex');
  const rows = (await repo.listRevisions({ sha256, statuses: ['issued', 'superseded'] })).sort((a, b) => a.id - b.id);
  const row = rows[0];
  if (!row) {
    return {
      sha256,
      size: bytes.length,
      match: null,
      signature: null,
      archivedFile: null,
      verdict: 'This PDF does not match any issued calc sheet: it was altered after issue, or it is not a sheet this firm issued.',
    };
  }
  const context = (await repo.trussContext(row.trussId))!;
  const match = archiveEntry(row, context, await labelsOf([row.supersededById]));
  // The key the row names, retired or current: a sheet issued before a rotation verifies under its own key.
  const key = row.keyFingerprint ? await deps.keys.publicKeyFor(row.keyFingerprint) : null;
  const signature = issuedRecordVerify(row, key) ? 'valid' : 'invalid';
  const archivedFile = await archivedFileState(row, deps.sheets);
  const sheet = `${context.jobNumber} ${context.projectName} — ${context.trussName}, revision ${match.label}`;
  let verdict: string;
  if (signature === 'invalid') {
    verdict = `This PDF has the fingerprint recorded for ${sheet}, but that record no longer matches the firm's signature: the archive record was changed after issue. Do not rely on it; tell your admin.`;
  } else {
    verdict = `This PDF is the issued calc sheet ${sheet}, issued ${match.issuedAt.slice(0, 10)}; the signature record is intact.`;
    if (match.supersededBy) verdict += ` A later revision (${match.supersededBy.label}) has superseded it.`;
  }
  return { sha256, size: bytes.length, match, signature, archivedFile, verdict };
}

async function archivedFileState(row: RevisionRow, store: FileStore): Promise<'intact' | 'altered' | 'missing'> {
  if (!row.pdfStoredName) return 'missing';
  try {
    const stored = await store.get(row.pdfStoredName);
    return crypto.createHash('sha256').update(stored).digest('hex') === row.sha256 ? 'intact' : 'altered';
  } catch (err) {
    if (err instanceof StoredFileMissingError) return 'missing';
    throw err;
  }
}

