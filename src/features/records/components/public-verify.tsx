import { useState } from 'react';
import type { PublicSheetView, PublicVerifyView } from '@shared/schemas/review.schema';
import { errorMessage } from '@/lib/api-client';
import { usePublicSheet } from '../api/get-public-sheet';
import { useVerifySheetPublic } from '../api/verify-sheet';
import { PdfDropZone, VerifyProgress } from './pdf-drop-zone';

/** The facts the sheet itself prints, as a short list to compare with the paper. */
function SheetFacts({ sheet }: { sheet: PublicSheetView }) {
  const rows: [string, string][] = [
    ['Firm', sheet.firm],
    ['Job', `${sheet.jobNumber} · ${sheet.projectName}`],
    ['Truss', sheet.trussName],
    ['Revision', sheet.revision],
    ['Issued', sheet.issuedOn],
    ['Fingerprint', sheet.fingerprint],
  ];
  return (
    <section aria-label="Issued sheet" className="rounded-xs border border-paper-line bg-paper-raised px-5 py-4">
      <p className={`text-base font-semibold ${sheet.status === 'current' ? 'text-accent' : 'text-ink'}`}>
        {sheet.status === 'current'
          ? `Issued sheet ${sheet.sheetId} is the current revision of this truss.`
          : `Issued sheet ${sheet.sheetId} has been superseded by revision ${sheet.supersededBy}: ask the firm for that one.`}
      </p>
      <dl className="mt-3 divide-y divide-paper-line/70 border-t border-paper-line/70 text-sm">
        {rows.map(([label, value]) => (
          <div key={label} className="grid grid-cols-[8rem_minmax(0,1fr)] gap-3 py-2">
            <dt className="text-ink-soft">{label}</dt>
            <dd className={`min-w-0 break-words text-ink ${label === 'Fingerprint' ? 'font-mono' : ''}`}>{value}</dd>
          </div>
        ))}
      </dl>
      <p className="mt-2 text-xs text-ink-faint">Compare these with the sheet’s page head and footer. The fingerprint is the {sheet.fingerprintOf}.</p>
    </section>
  );
}

function Answer({ result }: { result: PublicVerifyView }) {
  const good = result.outcome === 'match' && result.recordIntact === true;
  return (
    <section
      aria-label="Verification result"
      className={`rounded-xs border bg-paper-raised px-5 py-4 ${good ? 'border-accent/50' : 'border-danger/40'}`}
    >
      <p className={`text-base font-semibold ${good ? 'text-accent' : 'text-danger'}`}>{result.verdict}</p>
      <p className="mt-1 font-mono text-xs break-all text-ink-faint">SHA-256 {result.sha256}</p>
    </section>
  );
}

/**
 * The public verify page of one issued sheet (the address its QR code holds): what the sheet
 * prints, and a drop zone that compares a PDF's bytes with the archived copy. No sign-in.
 */
export function PublicVerify({ sheetId }: { sheetId: number }) {
  const sheet = usePublicSheet(sheetId);
  const verify = useVerifySheetPublic();
  const [fileName, setFileName] = useState<string>();
  const send = (file: File) => {
    setFileName(file.name);
    verify.mutate(file);
  };

  return (
    <div className="flex flex-col gap-5">
      {sheet.isPending && <p role="status" className="text-sm text-ink-soft">Looking up issued sheet {sheetId}…</p>}
      {sheet.isError && (
        <p role="alert" className="rounded-xs border border-danger/30 bg-danger/5 px-4 py-3 text-sm text-danger">
          {errorMessage(sheet.error)}
        </p>
      )}
      {sheet.isSuccess && <SheetFacts sheet={sheet.data} />}
      <PdfDropZone
        title="Have the PDF? Drop it here to compare its bytes with the issued copy"
        hint="The file is hashed and compared, never kept."
        onFile={send}
      />
      <VerifyProgress pending={verify.isPending} error={verify.isError ? verify.error : null} fileName={fileName} />
      {verify.isSuccess && <Answer result={verify.data} />}
    </div>
  );
}
