import type { ReactNode } from 'react';
import { Wordmark } from '@/components/ui/wordmark';
import { PageNotices } from '@/lib/notices';
import { CAUTION } from '../app-shell';

/** A quiet page for signing in and joining: the mark, one sheet, the caution line. */
export function AuthLayout({ title, lead, children }: { title: string; lead?: ReactNode; children: ReactNode }) {
  return (
    <div className="flex min-h-screen flex-col">
      <main className="flex flex-1 flex-col items-center px-6 pt-[12vh] pb-12">
        <Wordmark size="lg" />
        {/* A single sheet on the drafting table: ruled edge, square corners, the title ruled off. */}
        <section className="mt-8 w-full max-w-sm rounded-xs border border-paper-rule bg-paper-raised px-7 pt-5 pb-7">
          <h1 className="border-b border-ink-soft pb-2 text-lg font-semibold text-ink">{title}</h1>
          <PageNotices className="mt-2" />
          {lead && <p className="mt-1 text-sm text-ink-soft">{lead}</p>}
          <div className="mt-5">{children}</div>
        </section>
        <TrussSketch />
      </main>
      <footer className="border-t border-paper-rule">
        <p className="mx-auto max-w-6xl px-6 py-3 text-center text-xs text-ink-faint">{CAUTION}</p>
      </footer>
    </div>
  );
}

/** A faint line drawing of a pitched truss under the card. */
function TrussSketch() {
  const span = 320;
  const rise = 60;
  const panels = 6;
  const xs = Array.from({ length: panels + 1 }, (_, i) => (i * span) / panels);
  const top = (x: number) => rise - (rise * Math.abs(x - span / 2)) / (span / 2);
  return (
    <svg viewBox={`-8 -8 ${span + 16} ${rise + 16}`} className="mt-12 w-80 max-w-full text-ink-faint/60" aria-hidden>
      <g fill="none" stroke="currentColor" strokeWidth="1.2" strokeLinejoin="round">
        <path d={`M0 ${rise} L${span / 2} 0 L${span} ${rise} Z`} />
        {xs.slice(1, -1).map((x) => (
          <line key={`v${x}`} x1={x} y1={rise} x2={x} y2={rise - top(x)} />
        ))}
        {xs.slice(1, -1).map((x, i) => {
          const next = x < span / 2 ? xs[i + 2] : xs[i];
          return x === span / 2 ? null : <line key={`d${x}`} x1={x} y1={rise} x2={next} y2={rise - top(next)} />;
        })}
      </g>
      <g className="fill-paper" stroke="currentColor" strokeWidth="1.2">
        {xs.map((x) => (
          <circle key={`b${x}`} cx={x} cy={rise} r="2.6" />
        ))}
        {xs.slice(1, -1).map((x) => (
          <circle key={`t${x}`} cx={x} cy={rise - top(x)} r="2.6" />
        ))}
      </g>
    </svg>
  );
}
