import { useState, type ComponentProps, type ReactNode } from 'react';
import { cn } from '@/lib/cn';
import { FieldError, useFieldIds } from './field-error';

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
  const { id: inputId, hintId, errorId, describedBy } = useFieldIds(hint, error, id);

  return (
    <div className={cn('min-w-0 space-y-1.5', className)}>
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
      <FieldError id={errorId} message={error} />
    </div>
  );
}

/** The rule for a new password, said the same way on every form that sets one. */
export const passwordHint = 'At least 10 characters. A few unrelated words make a strong password that is easy to remember.';

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
