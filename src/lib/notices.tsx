import { useEffect, useId, useSyncExternalStore } from 'react';

/**
 * A short message about what just happened ("Project 24-031 created."). Notices are part of the
 * page, not toasts in a corner: they sit on a ruled line under the page title (`PageNotices`,
 * placed by `PageHeader`), or at the top of the page where a page has no title block
 * (`Notices`, the shell's fallback). See docs/visual-language.md, "States".
 */
export interface Notice {
  id: number;
  tone: 'success' | 'error';
  message: string;
}

/** A done-message fades after a while; a failure stays until it is dismissed or replaced. */
const LIFETIME_MS = { success: 6000, error: 20000 } as const;

let notices: Notice[] = [];
let nextId = 1;
/** Places that can show notices, in mount order; only the first shows them. */
let slots: string[] = [];
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
  notices = [...notices.slice(-2), notice];
  emit();
  setTimeout(() => dismissNotice(notice.id), LIFETIME_MS[tone]);
}

function subscribe(listener: () => void): () => void {
  listeners.add(listener);
  return () => listeners.delete(listener);
}

function useNotices(): Notice[] {
  return useSyncExternalStore(subscribe, () => notices, () => notices);
}

function useSlots(): string[] {
  return useSyncExternalStore(subscribe, () => slots, () => slots);
}

/** The notices as lines of the page: a rule at the left whose style carries the tone, the sentence, "Dismiss". */
function NoticeLines({ className = '' }: { className?: string }) {
  const current = useNotices();
  return (
    <div aria-live="polite" className={current.length ? `flex flex-col gap-1 ${className}` : ''}>
      {current.map((notice) => (
        <div
          key={notice.id}
          role={notice.tone === 'error' ? 'alert' : 'status'}
          className={`flex items-baseline gap-4 border-b border-paper-line py-1.5 pr-1 pl-3 text-sm ${
            notice.tone === 'error' ? 'border-l-[4px] border-double border-l-danger text-danger' : 'border-l-2 border-l-accent text-ink'
          }`}
        >
          <p className="flex-1">{notice.message}</p>
          <button type="button" onClick={() => dismissNotice(notice.id)} className="text-[12px] text-ink-soft hover:text-ink hover:underline">
            Dismiss
          </button>
        </div>
      ))}
    </div>
  );
}

/** Notices under a page's title block. The first mounted place shows them; the shell's fallback then stays empty. */
export function PageNotices({ className = '' }: { className?: string }) {
  const id = useId();
  useEffect(() => {
    slots = [...slots, id];
    emit();
    return () => {
      slots = slots.filter((s) => s !== id);
      emit();
    };
  }, [id]);
  const all = useSlots();
  return all[0] === id ? <NoticeLines className={className} /> : null;
}

/** The fallback at the top of a page without a title block (signing in, a page still loading). */
export function Notices({ className = '' }: { className?: string }) {
  const all = useSlots();
  return all.length === 0 ? <NoticeLines className={className} /> : null;
}
