import type { ReactNode } from 'react';
import { ApiError, errorMessage } from '@/lib/api-client';
import { Button } from './button';

/** Waiting, said in words: no spinner, a short dashed rule that fills as a sign of life. */
export function LoadingState({ label = 'Loading…' }: { label?: string }) {
  return (
    <div role="status" className="flex items-center gap-3 py-8 text-sm text-ink-soft">
      <span aria-hidden className="inline-block w-6 animate-pulse border-t-2 border-dashed border-accent" />
      {label}
    </div>
  );
}

/** A failed read, said plainly, with a way to try again. Never a stack trace. A double rule at the left marks it. */
export function ErrorState({ error, title = 'This could not be loaded', onRetry }: { error: unknown; title?: string; onRetry?: () => void }) {
  // Not found, forbidden and the like will answer the same on a second try.
  const retryable = !(error instanceof ApiError && error.status >= 400 && error.status < 500);
  return (
    <div role="alert" className="my-6 border-l-[4px] border-double border-danger py-1 pl-4">
      <p className="text-sm font-semibold text-danger">{title}</p>
      <p className="mt-1 text-sm text-ink-soft">{errorMessage(error)}</p>
      {onRetry && retryable && (
        <Button size="sm" className="mt-3" onClick={onRetry}>
          Try again
        </Button>
      )}
    </div>
  );
}

/** Nothing here yet: a sentence saying so and what to do, between two hairlines. */
export function EmptyState({ children }: { children: ReactNode }) {
  return <div className="border-y border-paper-line px-1 py-5 text-sm text-ink-soft">{children}</div>;
}

/** A standing remark about the page (archived, superseded): a sentence on the calc-pad ground under a hairline rule. */
export function NoteLine({ children, className = '' }: { children: ReactNode; className?: string }) {
  return <p className={`border-l-2 border-ink-faint bg-paper-sunk py-2 pr-4 pl-3 text-sm text-ink-soft ${className}`}>{children}</p>;
}
