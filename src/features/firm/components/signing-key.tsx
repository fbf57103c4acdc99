import { ErrorState, LoadingState } from '@/components/ui/states';
import { useSigningKey } from '../api/get-signing-key';

/** Groups a hex fingerprint in fours so two people can read it to each other. */
function groupHex(hex: string): string {
  return hex.match(/.{1,4}/g)?.join(' ') ?? hex;
}

/** The firm's public signing key, for anyone who wants to check an issued record outside Panelpoint. */
export function SigningKey() {
  const key = useSigningKey();
  if (key.isPending) return <LoadingState label="Loading the signing key…" />;
  if (key.isError) return <ErrorState title="The signing key could not be loaded" error={key.error} onRetry={() => void key.refetch()} />;
  return (
    <div className="flex flex-col gap-4 text-sm">
      <p className="text-ink-soft">
        Every sheet issued from now on has its record (sheet, revision, SHA-256 of the PDF, signers, times and this key’s id) signed with
        this {key.data.algorithm} key. Its private half is kept in the data folder; back that folder up. Without it Panelpoint will not
        start while issued sheets exist.
      </p>
      <div>
        <div className="mb-1 text-xs font-semibold text-ink-soft">Key id</div>
        <code className="font-mono text-[13px] text-ink">{key.data.keyId}</code>
      </div>
      <div>
        <div className="mb-1 text-xs font-semibold text-ink-soft">Fingerprint (SHA-256 of the public key)</div>
        <code className="font-mono text-[13px] break-all text-ink">{groupHex(key.data.fingerprint)}</code>
      </div>
      <div>
        <div className="mb-1 text-xs font-semibold text-ink-soft">Public key (PEM)</div>
        <pre className="overflow-x-auto rounded-xs border border-paper-line bg-paper-sunk px-3 py-2 font-mono text-xs text-ink">{key.data.publicKeyPem.trim()}</pre>
      </div>
    </div>
  );
}
