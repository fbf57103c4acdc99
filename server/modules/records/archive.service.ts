import crypto from 'node:crypto';
import { sheetRevisionLabel, type ArchiveEntryView, type SheetVerifyView } from '@shared/schemas/review.schema';
import { AppError, notFound } from '../../errors/app-error';
import type { FileStore } from '../../storage/file-store';
import type { FirmKey } from './firm-key';
import { issuedRecordVerify, issuedSigners } from './issued-record';
import { reviewRepository as repo, type RevisionRow, type TrussContext } from '../sheet-revisions/sheet-revisions.repository';

/** Issued (and superseded) sheets across projects, their archived bytes, and verification. */

export async function searchArchive(query: { q?: string; jobNumber?: string; project?: string; truss?: string; superseded: 'include' | 'exclude' }): Promise<ArchiveEntryView[]> {
  const trussIds = await repo.trussIdsMatching({ text: query.q, jobNumber: query.jobNumber, project: query.project, truss: query.truss });
  if (trussIds.length === 0) return [];
  const rows = await repo.listRevisions({ trussIds, statuses: query.superseded === 'include' ? ['issued', 'superseded'] : ['issued'] });
  const contexts = await repo.trussContexts([...new Set(rows.map((r) => r.trussId))]);
  const labels = await labelsOf(rows.map((r) => r.supersededById));
  return rows
    .map((r) => archiveEntry(r, contexts.get(r.trussId)!, labels))
    .sort((a, b) => b.issuedAt.localeCompare(a.issuedAt) || b.sheetId - a.sheetId);
}

export async function getIssuedPdf(id: number, store: FileStore): Promise<{ bytes: Buffer; name: string }> {
  const row = await repo.findRevision(id);
  if (!row) throw notFound('That sheet revision');
  if ((row.status !== 'issued' && row.status !== 'superseded') || !row.pdfStoredName) {
    throw new AppError('sheet-not-issued', `Revision ${sheetRevisionLabel(row.number)} is not issued, so there is no archived PDF. Preview the calc sheet instead.`, 409);
  }
  const context = (await repo.trussContext(row.trussId))!;
  const safe = (s: string) => s.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '');
  return { bytes: await store.read(row.pdfStoredName), name: `${safe(context.jobNumber)}-${safe(context.trussName)}-rev-${sheetRevisionLabel(row.number)}.pdf` };
}

/** Whether the bytes look like a PDF: the file header "%PDF-" (ISO 32000-1 §7.5.2). */
export function looksLikePdf(bytes: Buffer): boolean {
  return bytes.length >= 5 && bytes.subarray(0, 5).toString('latin1') === '%PDF-';
}

/**
 * Finds the issued sheet with the same SHA-256 as the upload and re-checks it: the firm
 * signature over the record rebuilt from the database now, the archived file against its
 * recorded SHA-256, and whether a later revision superseded it. Writes nothing.
 */
export async function verifyPdf(bytes: Buffer, deps: { key: FirmKey; sheets: FileStore }): Promise<SheetVerifyView> {
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
  const signature = issuedRecordVerify(row, deps.key) ? 'valid' : 'invalid';
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
    const stored = await store.read(row.pdfStoredName);
    return crypto.createHash('sha256').update(stored).digest('hex') === row.sha256 ? 'intact' : 'altered';
  } catch {
    return 'missing';
  }
}

async function labelsOf(ids: (number | null)[]): Promise<Map<number, string>> {
  const out = new Map<number, string>();
  for (const id of new Set(ids)) {
    if (id === null) continue;
    const r = await repo.findRevision(id);
    if (r) out.set(id, sheetRevisionLabel(r.number));
  }
  return out;
}

function archiveEntry(r: RevisionRow, c: TrussContext, labels: Map<number, string>): ArchiveEntryView {
  return {
    sheetId: r.id,
    projectId: c.projectId,
    jobNumber: c.jobNumber,
    projectName: c.projectName,
    trussId: r.trussId,
    trussName: c.trussName,
    number: r.number,
    label: sheetRevisionLabel(r.number),
    status: r.status as 'issued' | 'superseded',
    issuedAt: r.issuedAt?.toISOString() ?? '',
    sha256: r.sha256 ?? '',
    size: r.pdfSize ?? 0,
    signers: safeSigners(r),
    supersededBy: r.supersededById === null ? null : { id: r.supersededById, label: labels.get(r.supersededById) ?? '' },
  };
}

function safeSigners(r: RevisionRow) {
  try {
    return issuedSigners(r);
  } catch {
    return [];
  }
}
