import crypto from 'node:crypto';
import { sheetRevisionLabel, type PublicSheetView, type PublicVerifyView } from '@shared/schemas/review.schema';
import { AppError } from '../../errors/app-error';
import { getFirm } from '../firm/firm.service';
import { ISSUE_FINGERPRINT_OF, issueFingerprint, issuedRecordVerify, recordFormatOf } from './issued-record';
import { pdfClaim } from './pdf-claim';
import { recordsRepository as repo, type RevisionRow } from './records.repository';
import type { SigningKeys } from './signing-keys';
import { looksLikePdf } from './verify.service';

/**
 * The verify page anyone holding an issued sheet may use, signed in or not (the routes limit it
 * per network address). It shows only what the sheet itself prints, and writes nothing.
 */

function notIssued(id: number): AppError {
  return new AppError('sheet-not-found', `No issued calc sheet has the number ${id}. Check the number after "Issued sheet" in the sheet's footer.`, 404);
}

async function publicView(row: RevisionRow): Promise<PublicSheetView> {
  const context = await repo.trussContext(row.trussId);
  if (!context || !row.issuedAt) throw notIssued(row.id);
  const later = row.supersededById === null ? null : await repo.findRevision(row.supersededById);
  let fingerprint = '';
  try {
    fingerprint = issueFingerprint(row, recordFormatOf(row.signedRecord ?? '') ?? undefined);
  } catch {
    fingerprint = '';
  }
  return {
    sheetId: row.id,
    firm: (await getFirm()).name,
    jobNumber: context.jobNumber,
    projectName: context.projectName,
    trussName: context.trussName,
    revision: sheetRevisionLabel(row.number),
    issuedOn: row.issuedAt.toISOString().slice(0, 10),
    status: row.status === 'superseded' ? 'superseded' : 'current',
    supersededBy: later ? sheetRevisionLabel(later.number) : null,
    fingerprint,
    fingerprintOf: ISSUE_FINGERPRINT_OF,
  };
}

async function issuedRow(id: number): Promise<RevisionRow | null> {
  const row = await repo.findRevision(id);
  return row && (row.status === 'issued' || row.status === 'superseded') ? row : null;
}

/** The public facts of one issued sheet (404 for a number that is not an issued sheet). */
export async function publicSheet(id: number): Promise<PublicSheetView> {
  const row = await issuedRow(id);
  if (!row) throw notIssued(id);
  return publicView(row);
}

const named = (s: PublicSheetView) => `issued sheet ${s.sheetId} (${s.firm}, job ${s.jobNumber} ${s.projectName}, truss ${s.trussName}, revision ${s.revision}, issued ${s.issuedOn})`;

/** Compares a dropped PDF's bytes with the archive; when they match none, names the sheet it claims to be. */
export async function publicVerifyPdf(bytes: Buffer, deps: { keys: SigningKeys }): Promise<PublicVerifyView> {
  if (!looksLikePdf(bytes)) {
    throw new AppError('not-a-pdf', 'That file is not a PDF (it does not start with "%PDF-"): choose the calc sheet PDF itself.', 400);
  }
  const sha256 = crypto.createHash('sha256').update(bytes).digest('hex');
  const base = { sha256, size: bytes.length };
  const [row] = (await repo.listRevisions({ sha256, statuses: ['issued', 'superseded'] })).sort((a, b) => a.id - b.id);
  if (row) {
    const sheet = await publicView(row);
    const key = row.keyFingerprint ? await deps.keys.publicKeyFor(row.keyFingerprint) : null;
    const intact = issuedRecordVerify(row, key);
    let verdict = intact
      ? `This file is exactly ${named(sheet)}: its bytes match the copy archived at issue.`
      : `This file has the bytes recorded for ${named(sheet)}, but that record no longer matches the firm's signature: do not rely on it, and tell the firm.`;
    if (intact && sheet.status === 'superseded') verdict += ` It has since been superseded by revision ${sheet.supersededBy}: ask the firm for that one.`;
    return { ...base, outcome: 'match', sheet, recordIntact: intact, verdict };
  }
  const claim = pdfClaim(bytes);
  const claimed = claim ? await issuedRow(claim.sheetId) : null;
  if (claim && claimed) {
    const sheet = await publicView(claimed);
    const fp = claim.fingerprint === sheet.fingerprint ? '' : ` (and the fingerprint it names, ${claim.fingerprint}, is not that sheet's ${sheet.fingerprint})`;
    return {
      ...base,
      outcome: 'altered',
      sheet,
      recordIntact: null,
      verdict: `This file claims to be ${named(sheet)}${fp}, but its bytes differ from the copy archived at issue: it was changed after it was issued. Ask the firm for the issued copy.`,
    };
  }
  if (claim) {
    return {
      ...base,
      outcome: 'unknown',
      sheet: null,
      recordIntact: null,
      verdict: `This file claims to be issued sheet ${claim.sheetId}, but no issued sheet has that number and no issued sheet has these bytes: it is not a sheet this firm issued.`,
    };
  }
  return {
    ...base,
    outcome: 'unknown',
    sheet: null,
    recordIntact: null,
    verdict: 'No issued calc sheet has these bytes, and the file does not say which sheet it is: it was altered after issue, or it is not a sheet this firm issued.',
  };
}
