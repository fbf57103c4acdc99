import { useParams } from 'react-router-dom';
import { Wordmark } from '@/components/ui/wordmark';
import { PublicVerify } from '@/features/records/components/public-verify';
import { CAUTION } from '../app-shell';

/** /verify/:sheetId — the address printed (and in the QR code) on every issued sheet; no sign-in. */
export function PublicVerifyRoute() {
  const sheetId = Number(useParams().sheetId);
  return (
    <div className="flex min-h-screen flex-col">
      <main className="mx-auto flex w-full max-w-2xl flex-1 flex-col gap-6 px-6 pt-10 pb-12">
        <Wordmark size="lg" />
        <div>
          <h1 className="text-lg font-semibold text-ink">Verify an issued calc sheet</h1>
          <p className="mt-1 text-sm text-ink-soft">
            What the firm’s archive says about issued sheet {Number.isSafeInteger(sheetId) ? sheetId : '—'}: only what the sheet itself prints.
          </p>
        </div>
        <PublicVerify sheetId={sheetId} />
      </main>
      <footer className="border-t border-paper-line">
        <p className="mx-auto max-w-6xl px-6 py-3 text-center text-xs text-ink-faint">{CAUTION}</p>
      </footer>
    </div>
  );
}
