import { useSyncExternalStore } from 'react';

/** A short message shown in the corner for a few seconds: the one place toasts come from. */
export interface Notice {
  id: number;
  tone: 'success' | 'error';
  message: string;
}

const LIFETIME_MS = { success: 4000, error: 8000 } as const;

let notices: Notice[] = [];
let nextId = 1;
const listeners = new Set<() => void>();

function emit(): void {
  for (const listener of listeners) listener();
}

export function dismissNotice(id: number): void {
  notices = notices.filter((n) => n.id !== id);
  emit();
}

export function notify(tone: Notice['tone'], message: string): void {
  const notice = { id: nextId++, tone, message };
  notices = [...notices.slice(-3), notice];
  emit();
  setTimeout(() => dismissNotice(notice.id), LIFETIME_MS[tone]);
}

function subscribe(listener: () => void): () => void {
  listeners.add(listener);
  return () => listeners.delete(listener);
}

export function Notices() {
  const current = useSyncExternalStore(subscribe, () => notices, () => notices);
  return (
    <div aria-live="polite" className="pointer-events-none fixed right-4 bottom-4 z-50 flex w-80 flex-col gap-2">
      {current.map((notice) => (
        <div
          key={notice.id}
          role={notice.tone === 'error' ? 'alert' : 'status'}
          className={`pointer-events-auto flex items-start gap-3 rounded-md border bg-paper-raised px-4 py-3 text-sm shadow-sm ${
            notice.tone === 'error' ? 'border-danger/40 text-danger' : 'border-accent/30 text-ink'
          }`}
        >
          <span
            aria-hidden
            className={`mt-1.5 size-2 shrink-0 rounded-full ${notice.tone === 'error' ? 'bg-danger' : 'bg-accent'}`}
          />
          <p className="flex-1">{notice.message}</p>
          <button
            type="button"
            onClick={() => dismissNotice(notice.id)}
            className="text-ink-faint hover:text-ink"
            aria-label="Dismiss"
          >
            ×
          </button>
        </div>
      ))}
    </div>
  );
}
