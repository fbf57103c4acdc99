/**
 * Panelpoint's mark: a king-post truss drawn as three joints and a post,
 * in the accent colour, beside the name.
 */
export function PanelpointMark({ className = 'size-6' }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" className={className} aria-hidden focusable="false">
      <path d="M5 25 L16 7 L27 25 Z M16 7 L16 25" fill="none" className="stroke-accent" strokeWidth="2.4" strokeLinejoin="round" />
      <circle cx="5" cy="25" r="3" className="fill-paper stroke-ink" strokeWidth="2" />
      <circle cx="27" cy="25" r="3" className="fill-paper stroke-ink" strokeWidth="2" />
      <circle cx="16" cy="7" r="3" className="fill-paper stroke-ink" strokeWidth="2" />
    </svg>
  );
}

export function Wordmark({ size = 'md' }: { size?: 'md' | 'lg' }) {
  return (
    <span className="inline-flex items-center gap-2">
      <PanelpointMark className={size === 'lg' ? 'size-9' : 'size-6'} />
      <span className={`font-semibold tracking-tight text-ink ${size === 'lg' ? 'text-2xl' : 'text-[17px]'}`}>Panelpoint</span>
    </span>
  );
}
