import type { ReactNode } from 'react';
import { ApiError, errorMessage } from '@/lib/api-client';
import { Button } from './button';

export function LoadingState({ label = 'Loading…' }: { label?: string }) {
  return (
    <div role="status" className="flex items-center gap-3 py-10 text-sm text-ink-soft">
      <span aria-hidden className="size-4 animate-spin rounded-full border-2 border-accent border-t-transparent" />
      {label}
    </div>
  );
}

/** A failed read, said plainly, with a way to try again. Never a stack trace. */
export function ErrorState({ error, title = 'This could not be loaded', onRetry }: { error: unknown; title?: string; onRetry?: () => void }) {
  // Not found, forbidden and the like will answer the same on a second try.
  const retryable = !(error instanceof ApiError && error.status >= 400 && error.status < 500);
  return (
    <div role="alert" className="my-6 rounded-md border border-danger/30 bg-paper-raised px-5 py-4">
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

export function EmptyState({ children }: { children: ReactNode }) {
  return <div className="rounded-md border border-dashed border-paper-line px-5 py-8 text-center text-sm text-ink-soft">{children}</div>;
}
