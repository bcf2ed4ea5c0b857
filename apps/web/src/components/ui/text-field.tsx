import { useId, useState, type ComponentProps, type ReactNode } from 'react';
import { cn } from '@/lib/cn';

export interface TextFieldProps extends Omit<ComponentProps<'input'>, 'id'> {
  label: ReactNode;
  /** The message under the field when its value is not accepted. */
  error?: string | undefined;
  /** Guidance shown under the label, e.g. the password rule. */
  hint?: ReactNode;
  id?: string;
  /** Extra control inside the field's row (e.g. a show-password button). */
  trailing?: ReactNode;
}

export const inputClasses =
  'block w-full min-h-11 rounded-lg border bg-white px-3 py-2 text-base text-ink placeholder:text-ink-muted ' +
  'border-line-strong hover:border-ink-muted aria-invalid:border-danger aria-invalid:ring-1 aria-invalid:ring-danger ' +
  'disabled:bg-sand disabled:text-ink-muted';

export function TextField({ label, error, hint, id, trailing, className, ...inputProps }: TextFieldProps) {
  const autoId = useId();
  const inputId = id ?? autoId;
  const hintId = hint ? `${inputId}-hint` : undefined;
  const errorId = error ? `${inputId}-error` : undefined;
  const describedBy = [hintId, errorId].filter(Boolean).join(' ') || undefined;

  return (
    <div className={cn('space-y-1.5', className)}>
      <label htmlFor={inputId} className="block text-sm font-semibold text-ink">
        {label}
      </label>
      {hint ? (
        <p id={hintId} className="text-sm text-ink-muted">
          {hint}
        </p>
      ) : null}
      <div className="relative">
        <input
          id={inputId}
          aria-invalid={error ? true : undefined}
          aria-describedby={describedBy}
          className={cn(inputClasses, trailing ? 'pr-20' : undefined)}
          {...inputProps}
        />
        {trailing ? <div className="absolute inset-y-0 right-1 flex items-center">{trailing}</div> : null}
      </div>
      {error ? (
        <p id={errorId} className="flex items-start gap-1.5 text-sm font-medium text-danger">
          <svg aria-hidden="true" viewBox="0 0 20 20" className="mt-0.5 size-4 shrink-0" fill="currentColor">
            <path d="M10 2a8 8 0 1 0 0 16 8 8 0 0 0 0-16Zm-.75 4h1.5v5.5h-1.5V6Zm.75 8.75a1 1 0 1 1 0-2 1 1 0 0 1 0 2Z" />
          </svg>
          <span>{error}</span>
        </p>
      ) : null}
    </div>
  );
}

/** A password input with a show/hide switch instead of a "repeat password" box. */
export function PasswordField(props: Omit<TextFieldProps, 'type' | 'trailing'>) {
  const [visible, setVisible] = useState(false);
  return (
    <TextField
      {...props}
      type={visible ? 'text' : 'password'}
      spellCheck={false}
      autoCapitalize="none"
      trailing={
        <button
          type="button"
          onClick={() => setVisible((v) => !v)}
          aria-pressed={visible}
          className="min-h-9 rounded-md px-2.5 text-sm font-semibold text-accent hover:bg-accent-soft"
        >
          {visible ? 'Hide' : 'Show'}
          <span className="sr-only"> password</span>
        </button>
      }
    />
  );
}
