import type { SheetIssueView } from '@shared/schemas/review.schema';
import { formatDateTime } from '@/lib/format';

const ROLE_WORDS = { prepared: 'Prepared', checked: 'Checked', issued: 'Issued' } as const;

function formatBytes(size: number): string {
  return size < 1024 * 1024 ? `${(size / 1024).toFixed(1)} KiB` : `${(size / 1024 / 1024).toFixed(2)} MiB`;
}

/** What issuing fixed: the archived file's fingerprint and size, the signers and the firm key that signed. */
export function SheetIssueRecord({ issue }: { issue: SheetIssueView }) {
  return (
    <dl className="grid grid-cols-[7rem_1fr] gap-x-3 gap-y-2 text-[13px]">
      <dt className="text-ink-soft">SHA-256</dt>
      <dd className="font-mono text-xs break-all text-ink">{issue.sha256}</dd>
      <dt className="text-ink-soft">File</dt>
      <dd className="figures">{formatBytes(issue.size)}</dd>
      <dt className="text-ink-soft">Signed by</dt>
      <dd>
        {issue.signers.map((s) => (
          <div key={s.role}>
            {ROLE_WORDS[s.role]}: <span className="font-medium">{s.name}</span>{' '}
            <span className="figures text-ink-soft">{formatDateTime(s.at)}</span>
          </div>
        ))}
      </dd>
      <dt className="text-ink-soft">Firm key</dt>
      <dd className="font-mono text-xs break-all text-ink-soft" title="SHA-256 of the firm's Ed25519 public key; the key id is its first 16 digits">
        <span className="font-medium text-ink">{issue.keyId}</span>
        {issue.keyFingerprint.slice(issue.keyId.length)}
      </dd>
    </dl>
  );
}
