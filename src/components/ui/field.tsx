import { useId, type InputHTMLAttributes, type ReactNode, type SelectHTMLAttributes, type TextareaHTMLAttributes } from 'react';

/**
 * When a form's messages appear: only once a field has been left (blurred) or a submit tried;
 * after that they follow every keystroke. Spread into every form's useForm so no message shows
 * before the person has typed anything (docs/visual-language.md, "Forms").
 */
export const MESSAGES_AFTER_TOUCH = { mode: 'onTouched', reValidateMode: 'onChange' } as const;

// A ruled box on the sheet ground, 2 px corners; in focus the rule turns accent and thickens at
// the foot (an inset 1 px line), like a line being written on.
const CONTROL_LOOK =
  'rounded-sm border bg-paper-raised px-2.5 text-sm text-ink placeholder:text-ink-faint focus:border-accent focus:shadow-[inset_0_-1px_0_0_var(--pp-accent)] focus:outline-none disabled:border-dashed disabled:bg-paper-sunk disabled:text-ink-soft';
const CONTROL = `w-full ${CONTROL_LOOK}`;

/** The look of a bare control outside a labelled field (a filter box labelled by aria-label). */
export const CONTROL_CLASS = `${CONTROL_LOOK} h-8 border-paper-rule`;

function borderFor(error?: string) {
  return error ? 'border-danger shadow-[inset_0_-1px_0_0_var(--pp-danger)]' : 'border-paper-rule';
}

interface FrameProps {
  id: string;
  label: string;
  error?: string;
  hint?: ReactNode;
  children: ReactNode;
}

function FieldFrame({ id, label, error, hint, children }: FrameProps) {
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-[13px] leading-4 font-medium text-ink">
        {label}
      </label>
      {children}
      {/* One line is kept for the message even while there is none, so a message that appears
          when a field is left does not push the button being clicked out from under the pointer. */}
      {error ? (
        <p id={`${id}-error`} className="min-h-4 border-l-2 border-danger pl-2 text-[13px] leading-4 text-danger">
          {error}
        </p>
      ) : hint ? (
        <p id={`${id}-hint`} className="min-h-4 text-[13px] leading-4 text-ink-faint">
          {hint}
        </p>
      ) : (
        <span aria-hidden className="block min-h-4" />
      )}
    </div>
  );
}

function describedBy(id: string, error?: string, hint?: ReactNode) {
  if (error) return `${id}-error`;
  return hint ? `${id}-hint` : undefined;
}

interface Common {
  label: string;
  error?: string;
  hint?: ReactNode;
}

export function TextField({ label, error, hint, className = '', ...input }: Common & InputHTMLAttributes<HTMLInputElement>) {
  const id = useId();
  return (
    <FieldFrame id={id} label={label} error={error} hint={hint}>
      <input
        id={id}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(id, error, hint)}
        className={`${CONTROL} h-8 ${borderFor(error)} ${className}`}
        {...input}
      />
    </FieldFrame>
  );
}

export function TextareaField({ label, error, hint, className = '', ...input }: Common & TextareaHTMLAttributes<HTMLTextAreaElement>) {
  const id = useId();
  return (
    <FieldFrame id={id} label={label} error={error} hint={hint}>
      <textarea
        id={id}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(id, error, hint)}
        className={`${CONTROL} py-2 leading-relaxed ${borderFor(error)} ${className}`}
        {...input}
      />
    </FieldFrame>
  );
}

export function SelectField({ label, error, hint, className = '', children, ...input }: Common & SelectHTMLAttributes<HTMLSelectElement>) {
  const id = useId();
  return (
    <FieldFrame id={id} label={label} error={error} hint={hint}>
      <select
        id={id}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(id, error, hint)}
        className={`${CONTROL} h-8 ${borderFor(error)} ${className}`}
        {...input}
      >
        {children}
      </select>
    </FieldFrame>
  );
}

/** The form-wide message (from the server) shown above a form's buttons. */
export function FormError({ message }: { message?: string }) {
  if (!message) return null;
  return (
    <p role="alert" className="border-l-[3px] border-danger py-1 pl-3 text-sm text-danger">
      {message}
    </p>
  );
}
