import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { formatDateTime } from '@/lib/format';
import { useRotateSigningKey, useSigningKeys } from '../api/signing-keys';

const groupHex = (hex: string) => hex.match(/.{1,4}/g)?.join(' ') ?? hex;

/**
 * Every signing key the firm has had, with its dates and fingerprint. Retired public keys stay
 * so that sheets issued before a rotation still verify under the key id their record names.
 */
export function SigningKeys() {
  const keys = useSigningKeys();
  const rotate = useRotateSigningKey();
  const [confirming, setConfirming] = useState(false);
  if (keys.isPending) return <LoadingState label="Loading the signing keys…" />;
  if (keys.isError) return <ErrorState title="The signing keys could not be loaded" error={keys.error} onRetry={() => void keys.refetch()} />;
  return (
    <div className="flex flex-col gap-4 text-sm">
      <div className="overflow-x-auto">
        <table className="w-full text-left text-[13px]" aria-label="Signing keys">
          <thead className="text-xs text-ink-soft">
            <tr>
              <th className="py-1 pr-3 font-semibold">Key id</th>
              <th className="py-1 pr-3 font-semibold">State</th>
              <th className="py-1 pr-3 font-semibold">Made</th>
              <th className="py-1 pr-3 font-semibold">Retired</th>
              <th className="py-1 pr-3 font-semibold">Sheets signed</th>
              <th className="py-1 font-semibold">Fingerprint (SHA-256 of the public key)</th>
            </tr>
          </thead>
          <tbody>
            {keys.data.map((k) => (
              <tr key={k.keyId} className="border-t border-paper-line align-top">
                <td className="py-2 pr-3 font-mono text-xs">{k.keyId}</td>
                <td className="py-2 pr-3">{k.current ? <span className="font-medium text-accent">current</span> : <span className="text-ink-soft">retired</span>}</td>
                <td className="figures py-2 pr-3">{formatDateTime(k.createdAt)}</td>
                <td className="figures py-2 pr-3">{k.retiredAt ? formatDateTime(k.retiredAt) : '—'}</td>
                <td className="figures py-2 pr-3">{k.sheetsSigned}</td>
                <td className="py-2">
                  <code className="font-mono text-xs break-all text-ink">{groupHex(k.fingerprint)}</code>
                  <details className="mt-1">
                    <summary className="cursor-pointer text-xs text-ink-soft">Public key (PEM)</summary>
                    <pre className="mt-1 overflow-x-auto rounded-xs border border-paper-line bg-paper-sunk px-3 py-2 font-mono text-xs">{k.publicKeyPem.trim()}</pre>
                  </details>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {confirming ? (
        <div className="flex flex-wrap items-center gap-3 rounded-xs border border-paper-line bg-paper-sunk px-3 py-2">
          <span>
            A new key will sign every sheet issued from now on; the current key is retired and its public key kept. Back up the data folder
            afterwards.
          </span>
          <Button
            variant="danger"
            size="sm"
            busy={rotate.isPending}
            onClick={() => rotate.mutate(undefined, { onSettled: () => setConfirming(false) })}
          >
            Make a new key
          </Button>
          <Button variant="quiet" size="sm" onClick={() => setConfirming(false)}>
            Cancel
          </Button>
        </div>
      ) : (
        <div>
          <Button size="sm" onClick={() => setConfirming(true)}>
            Rotate the signing key…
          </Button>
        </div>
      )}
    </div>
  );
}
