import { formatFeetInches, parseFootage } from '@underfoot/core';
import { useState, type ReactNode } from 'react';
import { inputClasses } from '@/components/ui/text-field';
import { cn } from '@/lib/cn';
import { FieldError, useFieldIds } from '@/components/ui/field-error';

export interface FootageInput {
  /** The stored distance, or null when empty or unreadable. */
  value: number | null;
  /** Why the text is not a distance (empty is fine for optional fields). */
  error: string | null;
}

export function readFootage(text: string, optional: boolean): FootageInput {
  if (text.trim() === '') return { value: null, error: optional ? null : `Enter a distance, like 24' 6".` };
  const parsed = parseFootage(text);
  return parsed.ok ? { value: parsed.value, error: null } : { value: null, error: parsed.error };
}

/**
 * A distance typed the way the trade says it (`52' 7"`, `52 ft 7 in`, `52.6 ft`, `16 m`),
 * parsed by core into the stored unit on every keystroke, so the form always holds what
 * the field shows. It says what it understood; its own error shows once the field is left.
 */
export function FootageField({
  label,
  value,
  onChange,
  error,
  hint,
  optional = false,
  disabled,
  className,
  autoFocus,
  onCommit,
}: {
  label: ReactNode;
  value: number | null;
  onChange: (input: FootageInput) => void;
  /** A problem from outside (the form or the document), shown under the field. */
  error?: string | undefined;
  hint?: ReactNode;
  optional?: boolean;
  disabled?: boolean;
  className?: string;
  autoFocus?: boolean;
  /** Called when the person leaves the field with a readable distance (for fields that save on their own). */
  onCommit?: (value: number | null) => void;
}) {
  const [text, setText] = useState(() => (value === null ? '' : formatFeetInches(value)));
  const [previousValue, setPreviousValue] = useState(value);
  const [touched, setTouched] = useState(false);
  // When the value itself changes from outside (a merge, a reload, another field), the text follows;
  // a parent that keeps the old value while the person types (saving on leave) leaves the text alone.
  if (value !== previousValue) {
    setPreviousValue(value);
    const current = readFootage(text, optional);
    if (current.value !== value) setText(value === null ? '' : formatFeetInches(value));
  }
  const own = readFootage(text, optional);
  const shownError = (touched ? own.error : null) ?? error;
  const ids = useFieldIds(true, shownError ?? undefined);

  return (
    <div className={cn('min-w-0 space-y-1.5', className)}>
      <label htmlFor={ids.id} className="block text-sm font-semibold text-ink">
        {label}
        {optional ? <span className="font-normal text-ink-muted"> (optional)</span> : null}
      </label>
      <input
        id={ids.id}
        type="text"
        // Feet and inches need ' and ", which numeric keyboards lack.
        inputMode="text"
        autoComplete="off"
        autoCapitalize="none"
        autoCorrect="off"
        spellCheck={false}
        placeholder={`e.g. 24' 6"`}
        value={text}
        disabled={disabled}
        autoFocus={autoFocus}
        aria-invalid={shownError ? true : undefined}
        aria-describedby={ids.describedBy}
        className={cn(inputClasses, 'numeric')}
        onChange={(e) => {
          setText(e.target.value);
          onChange(readFootage(e.target.value, optional));
        }}
        onBlur={() => {
          setTouched(true);
          const current = readFootage(text, optional);
          if (current.error === null) {
            if (current.value !== null) setText(formatFeetInches(current.value));
            onCommit?.(current.value);
          }
        }}
      />
      {/* A fixed minimum height: the "Reads as" line going away on leaving the field must not move the button being tapped. */}
      <p id={ids.hintId} className="min-h-5 text-sm text-ink-muted">
        {hint}
        {own.value !== null && text.trim() !== formatFeetInches(own.value) ? (
          <span className="numeric">
            {hint ? ' ' : ''}Reads as {formatFeetInches(own.value)}.
          </span>
        ) : null}
      </p>
      <FieldError id={ids.errorId} message={shownError ?? undefined} />
    </div>
  );
}
