import { useId, type KeyboardEvent, type ReactNode } from 'react';
import { useSearchParams } from 'react-router-dom';

/** One tab of the truss page; the route composes them from the features (drawing, loads, …). */
export interface TrussTab {
  /** Short, URL-safe: kept in the address as ?tab=<id> so a tab can be linked to. */
  id: string;
  label: ReactNode;
  content: ReactNode;
}

/**
 * The truss page's sections as tabs, the open one kept in the address (?tab=…), the first one
 * by default. Arrow keys move between tabs, as the WAI-ARIA tabs pattern describes.
 */
export function TrussTabs({ tabs }: { tabs: TrussTab[] }) {
  const [params, setParams] = useSearchParams();
  const baseId = useId();
  const wanted = params.get('tab');
  const active = tabs.find((t) => t.id === wanted) ?? tabs[0];
  if (!active) return null;

  const open = (id: string) =>
    setParams(
      (p) => {
        const next = new URLSearchParams(p);
        if (id === tabs[0]?.id) next.delete('tab');
        else next.set('tab', id);
        return next;
      },
      { replace: true },
    );

  const onKeyDown = (event: KeyboardEvent) => {
    const i = tabs.indexOf(active);
    const step = event.key === 'ArrowRight' ? 1 : event.key === 'ArrowLeft' ? -1 : 0;
    if (!step) return;
    event.preventDefault();
    const next = tabs[(i + step + tabs.length) % tabs.length]!;
    open(next.id);
    document.getElementById(`${baseId}-tab-${next.id}`)?.focus();
  };

  return (
    <div>
      {tabs.length > 1 && (
        <div role="tablist" aria-label="Truss sections" className="mb-5 flex flex-wrap border-b border-paper-rule" onKeyDown={onKeyDown}>
          {tabs.map((tab) => {
            const selected = tab === active;
            return (
              <button
                key={tab.id}
                id={`${baseId}-tab-${tab.id}`}
                type="button"
                role="tab"
                aria-selected={selected}
                aria-controls={`${baseId}-panel-${tab.id}`}
                tabIndex={selected ? 0 : -1}
                onClick={() => open(tab.id)}
                // A sheet's index tab: the open one stands on the rule as a piece of the raised paper
                // with the accent line along its top (as the open page in the bar); the others are words.
                className={`relative -mb-px border px-4 py-2 text-sm ${
                  selected
                    ? 'border-paper-rule border-b-paper-raised bg-paper-raised font-semibold text-ink before:absolute before:-inset-x-px before:-top-px before:h-[3px] before:bg-accent'
                    : 'border-transparent text-ink-soft hover:text-ink hover:underline hover:decoration-paper-rule hover:underline-offset-4'
                }`}
              >
                {tab.label}
              </button>
            );
          })}
        </div>
      )}
      <div role={tabs.length > 1 ? 'tabpanel' : undefined} id={`${baseId}-panel-${active.id}`} aria-labelledby={tabs.length > 1 ? `${baseId}-tab-${active.id}` : undefined}>
        {active.content}
      </div>
    </div>
  );
}
