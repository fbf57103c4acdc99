import type { ReactNode } from 'react';

interface PageHeaderProps {
  title: ReactNode;
  /** A small line above the title, e.g. the job number or a way back. */
  eyebrow?: ReactNode;
  description?: ReactNode;
  actions?: ReactNode;
}

export function PageHeader({ title, eyebrow, description, actions }: PageHeaderProps) {
  return (
    <header className="mb-6 flex flex-wrap items-end justify-between gap-4 border-b border-paper-line pb-4">
      <div className="min-w-0">
        {eyebrow && <div className="mb-1 text-xs font-medium tracking-wide text-ink-faint uppercase">{eyebrow}</div>}
        <h1 className="text-2xl font-semibold tracking-tight text-ink">{title}</h1>
        {description && <p className="mt-1 max-w-2xl text-sm text-ink-soft">{description}</p>}
      </div>
      {actions && <div className="flex shrink-0 items-center gap-2">{actions}</div>}
    </header>
  );
}

/** A titled block of a page, set on the raised paper. */
export function Panel({ title, actions, children, className = '' }: { title?: ReactNode; actions?: ReactNode; children: ReactNode; className?: string }) {
  return (
    <section className={`rounded-lg border border-paper-line bg-paper-raised ${className}`}>
      {(title || actions) && (
        <div className="flex items-center justify-between gap-3 border-b border-paper-line px-5 py-3">
          {title && <h2 className="text-sm font-semibold text-ink">{title}</h2>}
          {actions}
        </div>
      )}
      <div className="px-5 py-4">{children}</div>
    </section>
  );
}

export function Badge({ children, tone = 'neutral' }: { children: ReactNode; tone?: 'neutral' | 'accent' | 'muted' | 'danger' }) {
  const tones = {
    neutral: 'bg-paper-sunk text-ink-soft border-paper-line',
    accent: 'bg-accent-soft text-accent border-accent/20',
    muted: 'bg-paper-sunk text-ink-faint border-paper-line',
    danger: 'bg-danger/5 text-danger border-danger/25',
  } as const;
  return <span className={`inline-flex items-center rounded border px-1.5 py-0.5 text-[11px] font-medium ${tones[tone]}`}>{children}</span>;
}
