import { useId, type ComponentProps, type ReactNode } from 'react';
import { cn } from '@/lib/cn';
import { FieldError, useFieldIds } from './field-error';
import { inputClasses } from './text-field';

/** A small select for dense office rows: a role in a table, rows per page. */
export const compactSelectClasses = cn(inputClasses, 'min-h-9 w-auto py-1 pr-8 text-sm');

interface FieldFrameProps {
  label: ReactNode;
  hint?: ReactNode;
  error?: string | undefined;
  className?: string;
}

/** The label, the hint and the error around one form control. */
function FieldFrame({
  label,
  hint,
  error,
  className,
  ids,
  children,
}: FieldFrameProps & { ids: ReturnType<typeof useFieldIds>; children: ReactNode }) {
  return (
    <div className={cn('min-w-0 space-y-1.5', className)}>
      <label htmlFor={ids.id} className="block text-sm font-semibold text-ink">
        {label}
      </label>
      {hint ? (
        <p id={ids.hintId} className="text-sm text-ink-muted">
          {hint}
        </p>
      ) : null}
      {children}
      <FieldError id={ids.errorId} message={error} />
    </div>
  );
}

export function SelectField({
  label,
  hint,
  error,
  className,
  children,
  ...props
}: FieldFrameProps & Omit<ComponentProps<'select'>, 'id' | 'className'>) {
  const ids = useFieldIds(hint, error);
  return (
    <FieldFrame label={label} hint={hint} error={error} className={className} ids={ids}>
      <select
        id={ids.id}
        aria-invalid={error ? true : undefined}
        aria-describedby={ids.describedBy}
        className={cn(inputClasses, 'pr-8')}
        {...props}
      >
        {children}
      </select>
    </FieldFrame>
  );
}

export function TextAreaField({
  label,
  hint,
  error,
  className,
  ...props
}: FieldFrameProps & Omit<ComponentProps<'textarea'>, 'id' | 'className'>) {
  const ids = useFieldIds(hint, error);
  return (
    <FieldFrame label={label} hint={hint} error={error} className={className} ids={ids}>
      <textarea
        id={ids.id}
        rows={3}
        aria-invalid={error ? true : undefined}
        aria-describedby={ids.describedBy}
        className={cn(inputClasses, 'resize-y')}
        {...props}
      />
    </FieldFrame>
  );
}

/** A yes/no setting: a checkbox with its consequence spelled out beside it. */
export function CheckboxField({
  label,
  description,
  error,
  className,
  ...props
}: { label: ReactNode; description?: ReactNode; error?: string | undefined; className?: string } & Omit<
  ComponentProps<'input'>,
  'type' | 'className'
>) {
  const ids = useFieldIds(description, error);
  return (
    <div className={cn('space-y-1.5', className)}>
      <label
        htmlFor={ids.id}
        className="flex cursor-pointer items-start gap-3 rounded-lg border border-line-strong bg-white p-3.5 hover:border-ink-muted has-checked:border-brand has-checked:bg-brand-soft/40"
      >
        <input
          id={ids.id}
          type="checkbox"
          aria-describedby={ids.describedBy}
          aria-invalid={error ? true : undefined}
          className="mt-1 size-4 shrink-0 accent-brand"
          {...props}
        />
        <span className="min-w-0">
          <span className="block font-semibold text-ink">{label}</span>
          {description ? (
            <span id={ids.hintId} className="mt-0.5 block text-sm text-ink-muted">
              {description}
            </span>
          ) : null}
        </span>
      </label>
      <FieldError id={ids.errorId} message={error} />
    </div>
  );
}

/** The label above a control that narrows a list (search, status, dates); `className` goes on the wrapper. */
function FilterFrame({
  id,
  label,
  className,
  children,
}: {
  id: string;
  label: ReactNode;
  className?: string | undefined;
  children: ReactNode;
}) {
  return (
    <div className={cn('space-y-1.5', className)}>
      <label htmlFor={id} className="block text-sm font-semibold">
        {label}
      </label>
      {children}
    </div>
  );
}

/** A search box or date above a list. */
export function FilterInput({ label, className, ...props }: { label: ReactNode } & Omit<ComponentProps<'input'>, 'id'>) {
  const id = useId();
  return (
    <FilterFrame id={id} label={label} className={className}>
      <input id={id} className={inputClasses} {...props} />
    </FilterFrame>
  );
}

/** A choice above a list: a status, a person, an order. */
export function FilterSelect({ label, className, children, ...props }: { label: ReactNode } & Omit<ComponentProps<'select'>, 'id'>) {
  const id = useId();
  return (
    <FilterFrame id={id} label={label} className={className}>
      <select id={id} className={cn(inputClasses, 'pr-8')} {...props}>
        {children}
      </select>
    </FilterFrame>
  );
}
