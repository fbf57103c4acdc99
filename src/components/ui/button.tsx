import type { ButtonHTMLAttributes } from 'react';

type Variant = 'primary' | 'secondary' | 'quiet' | 'danger';

const VARIANTS: Record<Variant, string> = {
  primary: 'bg-accent text-paper-raised hover:bg-accent-hover border-accent',
  secondary: 'bg-paper-raised text-ink hover:bg-paper-sunk border-paper-line',
  quiet: 'bg-transparent text-accent hover:bg-accent-soft border-transparent',
  danger: 'bg-paper-raised text-danger hover:bg-danger/5 border-danger/40',
};

export interface ButtonProps extends ButtonHTMLAttributes<HTMLButtonElement> {
  variant?: Variant;
  size?: 'sm' | 'md';
  busy?: boolean;
}

/** The app's one button: solid accent for the main action, quieter ones for the rest. */
export function Button({ variant = 'secondary', size = 'md', busy = false, className = '', disabled, children, type = 'button', ...rest }: ButtonProps) {
  const sizing = size === 'sm' ? 'h-7 px-2.5 text-xs' : 'h-9 px-4 text-sm';
  return (
    <button
      type={type}
      disabled={disabled || busy}
      aria-busy={busy || undefined}
      className={`inline-flex items-center justify-center gap-2 rounded-md border font-medium whitespace-nowrap transition-colors disabled:cursor-not-allowed disabled:opacity-55 ${sizing} ${VARIANTS[variant]} ${className}`}
      {...rest}
    >
      {busy && <span aria-hidden className="size-3 animate-spin rounded-full border-2 border-current border-t-transparent" />}
      {children}
    </button>
  );
}
