import { useState, type ReactNode } from 'react';
import { Link } from 'react-router-dom';
import type { SheetVerifyView } from '@shared/schemas/review.schema';
import { formatDate } from '@/lib/format';
import { useVerifySheet } from '../api/verify-sheet';
import { PdfDropZone, VerifyProgress } from './pdf-drop-zone';

/** Drop (or choose) a PDF; the answer says whether it is one of the firm's issued sheets, as issued. */
export function VerifyDrop() {
  const verify = useVerifySheet();
  const [fileName, setFileName] = useState<string>();
  const send = (file: File) => {
    setFileName(file.name);
    verify.mutate(file);
  };

  return (
    <div className="flex flex-col gap-5">
      <PdfDropZone
        title="Drop a calc sheet PDF here"
        hint="It is compared with the archive by its SHA-256 fingerprint and not kept."
        onFile={send}
      />
      <VerifyProgress pending={verify.isPending} error={verify.isError ? verify.error : null} fileName={fileName} />
      {verify.isSuccess && <VerifyResult result={verify.data} fileName={fileName} />}
    </div>
  );
}

type Tone = 'good' | 'bad' | 'note';

function Check({ tone, title, children }: { tone: Tone; title: string; children: ReactNode }) {
  const mark = { good: '✓', bad: '✗', note: '!' }[tone];
  const colour = { good: 'bg-accent text-paper-raised', bad: 'bg-danger text-paper-raised', note: 'bg-ink-soft text-paper-raised' }[tone];
  return (
    <li className="flex gap-3 py-2.5">
      <span aria-hidden className={`mt-0.5 flex size-5 shrink-0 items-center justify-center rounded-full text-[11px] font-bold ${colour}`}>
        {mark}
      </span>
      <div className="min-w-0 text-sm">
        <p className="font-medium text-ink">{title}</p>
        <div className="text-ink-soft">{children}</div>
      </div>
    </li>
  );
}

/** The verify answer as a short list of plain checks, worst news first in its own colour. */
export function VerifyResult({ result, fileName }: { result: SheetVerifyView; fileName?: string }) {
  const m = result.match;
  const allGood = m !== null && result.signature === 'valid' && result.archivedFile === 'intact' && m.status === 'issued';
  return (
    <section
      aria-label="Verification result"
      className={`rounded-xs border bg-paper-raised px-5 py-4 ${m === null || result.signature === 'invalid' || result.archivedFile !== 'intact' ? 'border-danger/40' : allGood ? 'border-accent/50' : 'border-paper-line'}`}
    >
      <p className={`text-base font-semibold ${m === null ? 'text-danger' : allGood ? 'text-accent' : 'text-ink'}`}>{result.verdict}</p>
      <p className="mt-1 font-mono text-xs break-all text-ink-faint">
        {fileName ? `${fileName} · ` : ''}SHA-256 {result.sha256}
      </p>
      <ul className="mt-3 divide-y divide-paper-line/70 border-t border-paper-line/70">
        {m === null ? (
          <Check tone="bad" title="Not an issued sheet">
            No sheet in the archive has this fingerprint: the file was changed after it was issued, or it was never issued by the firm.
          </Check>
        ) : (
          <>
            <Check tone="good" title="Matches an issued sheet">
              <Link to={`/sheets/${m.sheetId}`} className="font-medium text-accent hover:underline">
                {m.jobNumber} {m.projectName} · {m.trussName} · revision {m.label}
              </Link>
              , issued {formatDate(m.issuedAt)}
              {m.signers.length > 0 && <> ({m.signers.map((s) => `${s.role} by ${s.name}`).join(', ')})</>}.
            </Check>
            <Check tone={result.signature === 'valid' ? 'good' : 'bad'} title={result.signature === 'valid' ? 'Signature record intact' : 'Signature record does not verify'}>
              {result.signature === 'valid'
                ? 'The firm key’s signature holds over the record as it stands (sheet, revision, fingerprint, signers, times).'
                : 'The record was changed after issue: the firm key’s signature no longer holds. Tell your admin.'}
            </Check>
            <Check
              tone={result.archivedFile === 'intact' ? 'good' : 'bad'}
              title={result.archivedFile === 'intact' ? 'File on record intact' : result.archivedFile === 'missing' ? 'File on record missing' : 'File on record altered'}
            >
              {result.archivedFile === 'intact'
                ? 'The archived copy still has the recorded fingerprint.'
                : 'The archived copy no longer matches what was issued. Tell your admin.'}
            </Check>
            {m.supersededBy ? (
              <Check tone="note" title={`Superseded by revision ${m.supersededBy.label}`}>
                A later revision of this truss was issued:{' '}
                <Link to={`/sheets/${m.supersededBy.id}`} className="font-medium text-accent hover:underline">
                  open revision {m.supersededBy.label}
                </Link>
                . Build from that one.
              </Check>
            ) : (
              <Check tone="good" title="Current">
                No later revision of this truss has been issued.
              </Check>
            )}
          </>
        )}
      </ul>
    </section>
  );
}
