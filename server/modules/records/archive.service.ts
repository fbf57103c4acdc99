import crypto from 'node:crypto';
import { sheetRevisionLabel, type ArchiveEntryView } from '@shared/schemas/review.schema';
import { AppError, notFound } from '../../errors/app-error';
import { StoredFileMissingError, type FileStore } from '../../storage/file-store';
import { issuedSigners } from './issued-record';
import { recordsRepository as repo, type ArchiveRevisionRow, type TrussContext } from './records.repository';

/** Issued (and superseded) sheets across projects and their archived bytes. */

export async function searchArchive(query: { q?: string; jobNumber?: string; project?: string; truss?: string; superseded: 'include' | 'exclude' }): Promise<ArchiveEntryView[]> {
  const trussIds = await repo.trussIdsMatching({ text: query.q, jobNumber: query.jobNumber, project: query.project, truss: query.truss });
  if (trussIds !== 'all' && trussIds.length === 0) return [];
  const lines = await repo.archiveLines({ ...(trussIds === 'all' ? {} : { trussIds }), statuses: query.superseded === 'include' ? ['issued', 'superseded'] : ['issued'] });
  const labels = new Map<number, string>();
  for (const l of lines) {
    if (l.row.supersededById !== null && l.supersededByNumber !== null) labels.set(l.row.supersededById, sheetRevisionLabel(l.supersededByNumber));
  }
  return lines
    .map((l) => archiveEntry(l.row, l.context, labels))
    // Newest first. ISO texts of one form order as their code units do: no locale collation needed.
    .sort((a, b) => (a.issuedAt < b.issuedAt ? 1 : a.issuedAt > b.issuedAt ? -1 : b.sheetId - a.sheetId));
}

export async function getIssuedPdf(id: number, store: FileStore): Promise<{ bytes: Buffer; name: string }> {
  const row = await repo.findRevision(id);
  if (!row) throw notFound('That sheet revision');
  if ((row.status !== 'issued' && row.status !== 'superseded') || !row.pdfStoredName) {
    throw new AppError('sheet-not-issued', `Revision ${sheetRevisionLabel(row.number)} is not issued, so there is no archived PDF. Preview the calc sheet instead.`, 409);
  }
  let bytes: Buffer;
  try {
    bytes = await store.get(row.pdfStoredName);
  } catch (err) {
    // Only a missing object is "missing"; a store that does not answer is its own 503.
    if (!(err instanceof StoredFileMissingError)) throw err;
    throw new AppError('archived-file-missing', `The archived file of revision ${sheetRevisionLabel(row.number)} is missing from ${store.label}; restore it from backup.`, 409);
  }
  // Served only if it still is the file that was issued: its SHA-256 against the record's.
  if (crypto.createHash('sha256').update(bytes).digest('hex') !== row.sha256) {
    throw new AppError('archived-file-altered', 'The archived file no longer matches its record; restore it from backup.', 409);
  }
  const context = (await repo.trussContext(row.trussId))!;
  const safe = (s: string) => s.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '');
  return { bytes, name: `${safe(context.jobNumber)}-${safe(context.trussName)}-rev-${sheetRevisionLabel(row.number)}.pdf` };
}

/** Revision letters of the given revisions, by id. */
export async function labelsOf(ids: (number | null)[]): Promise<Map<number, string>> {
  const out = new Map<number, string>();
  for (const id of new Set(ids)) {
    if (id === null) continue;
    const r = await repo.findRevision(id);
    if (r) out.set(id, sheetRevisionLabel(r.number));
  }
  return out;
}

/** One line of the archive: the issued revision, where it belongs, who signed, what superseded it. */
export function archiveEntry(r: ArchiveRevisionRow, c: TrussContext, labels: Map<number, string>): ArchiveEntryView {
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
    issuedAt: isoOf(r.issuedAt),
    sha256: r.sha256 ?? '',
    size: r.pdfSize ?? 0,
    signers: safeSigners(r),
    supersededBy: r.supersededById === null ? null : { id: r.supersededById, label: labels.get(r.supersededById) ?? '' },
  };
}

function isoOf(d: Date | string | null): string {
  if (typeof d === 'string') return d;
  return d && !Number.isNaN(d.getTime()) ? d.toISOString() : '';
}

function safeSigners(r: ArchiveRevisionRow) {
  try {
    return issuedSigners(r);
  } catch {
    return [];
  }
}
