import { useState } from 'react';
import type { OutboxMessageView } from '@shared/schemas/auth.schema';
import { EmptyState } from '@/components/ui/states';
import { formatDateTime } from '@/lib/format';

/** The sink's messages: a list on the left, the chosen message's text on the right. */
export function OutboxList({ messages }: { messages: OutboxMessageView[] }) {
  const [selectedId, setSelectedId] = useState<number | null>(null);
  if (messages.length === 0) {
    return <EmptyState>No messages yet. Invitations and check notices sent by Panelpoint appear here.</EmptyState>;
  }
  const selected = messages.find((m) => m.id === selectedId) ?? messages[0];

  return (
    <div className="grid min-h-96 grid-cols-1 overflow-hidden rounded-xs border border-paper-line bg-paper-raised md:grid-cols-[minmax(16rem,22rem)_1fr]">
      <ul className="max-h-[36rem] overflow-y-auto border-b border-paper-line md:border-r md:border-b-0" aria-label="Messages">
        {messages.map((message) => {
          const active = message.id === selected.id;
          return (
            <li key={message.id}>
              <button
                type="button"
                onClick={() => setSelectedId(message.id)}
                aria-current={active || undefined}
                className={`block w-full border-b border-paper-line/70 px-4 py-2.5 text-left ${active ? 'bg-accent-soft/60' : 'hover:bg-paper'}`}
              >
                <span className="flex items-baseline justify-between gap-3">
                  <span className="truncate text-sm font-medium text-ink">{message.subject || '(no subject)'}</span>
                  <time dateTime={message.receivedAt} className="shrink-0 text-[11px] text-ink-faint">
                    {formatDateTime(message.receivedAt)}
                  </time>
                </span>
                <span className="block truncate text-xs text-ink-soft">to {message.to.join(', ')}</span>
              </button>
            </li>
          );
        })}
      </ul>
      <article className="min-w-0 px-6 py-5">
        <h2 className="text-base font-semibold text-ink">{selected.subject || '(no subject)'}</h2>
        <dl className="mt-2 grid grid-cols-[4rem_1fr] gap-y-0.5 text-xs">
          <dt className="text-ink-faint">From</dt>
          <dd className="text-ink-soft">{selected.from}</dd>
          <dt className="text-ink-faint">To</dt>
          <dd className="text-ink-soft">{selected.to.join(', ')}</dd>
          <dt className="text-ink-faint">Received</dt>
          <dd className="text-ink-soft">
            <time dateTime={selected.receivedAt}>{formatDateTime(selected.receivedAt)}</time>
          </dd>
        </dl>
        <pre className="mt-4 border-t border-paper-line pt-4 font-sans text-sm leading-relaxed break-words whitespace-pre-wrap text-ink">
          {selected.text}
        </pre>
      </article>
    </div>
  );
}
