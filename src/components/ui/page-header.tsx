import type { ReactNode } from 'react';
import { PageNotices } from '@/lib/notices';

interface PageHeaderProps {
  title: ReactNode;
  /** A small line above the title, e.g. the job number or a way back. */
  eyebrow?: ReactNode;
  description?: ReactNode;
  actions?: ReactNode;
}

/**
 * A page's title block: the title in graphite over one full-width 1 px ink rule, like the
 * title strip of a drawing sheet; the page's actions sit on the rule at the right. What just
 * happened ("Project details saved.") is said on a ruled line under it, never in a corner.
 */
export function PageHeader({ title, eyebrow, description, actions }: PageHeaderProps) {
  return (
    <>
    <header className="mb-7 flex flex-wrap items-end justify-between gap-x-6 gap-y-3 border-b border-ink-soft pb-3">
      <div className="min-w-0">
        {eyebrow && <div className="mb-1 text-[13px] text-ink-soft">{eyebrow}</div>}
        <h1 className="text-[22px] leading-7 font-semibold text-ink">{title}</h1>
        {description && <p className="mt-1 max-w-2xl text-sm text-ink-soft">{description}</p>}
      </div>
      {actions && <div className="flex shrink-0 items-center gap-2">{actions}</div>}
    </header>
    <PageNotices className="-mt-5 mb-6" />
    </>
  );
}

/**
 * A titled block of a page. "sheet" (the default) is a sheet laid on the drafting table: the
 * raised paper, a 1 px ruled edge, square corners, no shadow, its title ruled off below.
 * "pad" is the calc pad: the sunk ground with faint ruled lines and a margin rule, for working.
 */
export function Panel({
  title,
  actions,
  children,
  className = '',
  kind = 'sheet',
}: {
  title?: ReactNode;
  actions?: ReactNode;
  children: ReactNode;
  className?: string;
  kind?: 'sheet' | 'pad';
}) {
  const ground = kind === 'pad' ? 'calc-pad border-paper-rule' : 'bg-paper-raised border-paper-rule';
  return (
    <section className={`rounded-xs border ${ground} ${className}`}>
      {(title || actions) && (
        <div className="flex min-h-10 items-center justify-between gap-3 border-b border-paper-line px-4 py-2">
          {title && <h2 className="text-[15px] leading-5 font-semibold text-ink">{title}</h2>}
          {actions}
        </div>
      )}
      <div className={kind === 'pad' ? 'py-3 pr-4 pl-10' : 'px-4 py-4'}>{children}</div>
    </section>
  );
}

/**
 * A short state word beside a thing, never a filled pill: the word in its tone, marked by a
 * 2 px rule at its left whose line style carries the tone as well (solid, dashed, double).
 */
export function Badge({ children, tone = 'neutral' }: { children: ReactNode; tone?: 'neutral' | 'accent' | 'muted' | 'danger' }) {
  const tones = {
    neutral: 'border-ink-soft text-ink-soft',
    accent: 'border-accent text-accent',
    muted: 'border-dashed border-ink-faint text-ink-faint',
    danger: 'border-double border-l-[3px] border-danger text-danger',
  } as const;
  return <span className={`inline-flex items-center border-l-2 pl-1.5 text-[12px] leading-4 font-medium whitespace-nowrap ${tones[tone]}`}>{children}</span>;
}
