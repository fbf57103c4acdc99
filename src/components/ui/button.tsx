import type { ButtonHTMLAttributes } from 'react';

type Variant = 'primary' | 'secondary' | 'quiet' | 'danger';

// Square 2 px corners, a 1 px rule all round, no shadow. The main action is the one filled
// block on a page; the rest are ruled outlines or plain underlined words.
const VARIANTS: Record<Variant, string> = {
  primary: 'bg-accent text-paper-raised border-accent hover:bg-accent-hover hover:border-accent-hover',
  secondary: 'bg-paper-raised text-ink border-paper-rule hover:border-ink-soft hover:bg-paper',
  quiet: 'bg-transparent text-accent border-transparent underline decoration-accent/40 underline-offset-[3px] hover:decoration-accent',
  danger: 'bg-paper-raised text-danger border-danger/60 hover:border-danger hover:bg-danger/5',
};

export interface ButtonProps extends ButtonHTMLAttributes<HTMLButtonElement> {
  variant?: Variant;
  size?: 'sm' | 'md';
  busy?: boolean;
}

const BASE = 'inline-flex items-center justify-center gap-2 rounded-sm border font-medium whitespace-nowrap';
const SIZES = { sm: 'h-7 px-2.5 text-[13px]', md: 'h-8 px-3.5 text-sm' } as const;

/** The button look for a link that acts as a button (a download, a page opened in a new tab). */
export function buttonClass(variant: Variant = 'secondary', size: 'sm' | 'md' = 'md'): string {
  return `${BASE} ${SIZES[size]} ${VARIANTS[variant]}`;
}

/** The app's one button: the filled accent block for the main action, ruled or plain words for the rest. */
export function Button({ variant = 'secondary', size = 'md', busy = false, className = '', disabled, children, type = 'button', ...rest }: ButtonProps) {
  return (
    <button
      type={type}
      disabled={disabled || busy}
      aria-busy={busy || undefined}
      className={`${BASE} disabled:cursor-not-allowed disabled:border-dashed disabled:opacity-60 ${SIZES[size]} ${VARIANTS[variant]} ${className}`}
      {...rest}
    >
      {children}
      {/* Working: said by a moving ellipsis after the words (hidden from the button's name). */}
      {busy && (
        <span aria-hidden className="-ml-1.5 inline-block w-3 animate-pulse text-left">
          …
        </span>
      )}
    </button>
  );
}
