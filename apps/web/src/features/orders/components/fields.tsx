import type { ComponentProps, ReactNode } from 'react';
import { FieldError } from '@/components/ui/field-error';
import { cn } from '@/lib/cn';

// Only the order form uses these; the fields every form shares are in components/ui/form-fields.tsx.

/** One choice in a group of large radio or checkbox cards. */
export function ChoiceCard({
  title,
  description,
  aside,
  className,
  type = 'radio',
  ...props
}: { title: ReactNode; description?: ReactNode; aside?: ReactNode } & Omit<ComponentProps<'input'>, 'title'>) {
  return (
    <label
      className={cn(
        'flex cursor-pointer items-start gap-3 rounded-lg border border-line-strong bg-white p-3.5 hover:border-ink-muted',
        'has-checked:border-brand has-checked:bg-brand-soft/50 has-checked:ring-1 has-checked:ring-brand',
        'has-focus-visible:outline-3 has-focus-visible:outline-offset-2 has-focus-visible:outline-accent',
        className,
      )}
    >
      <input type={type} className="mt-1 size-4 shrink-0 accent-brand focus-visible:outline-none" {...props} />
      <span className="min-w-0 flex-1">
        <span className="block font-semibold text-ink">{title}</span>
        {description ? <span className="mt-0.5 block text-sm text-ink-muted">{description}</span> : null}
      </span>
      {aside ? <span className="shrink-0">{aside}</span> : null}
    </label>
  );
}

/** A numbered part of a long form: a fieldset whose legend reads as a heading. */
export function FormSection({
  number,
  title,
  description,
  children,
  error,
}: {
  number: number;
  title: string;
  description?: ReactNode;
  children: ReactNode;
  error?: string | undefined;
}) {
  return (
    <fieldset className="min-w-0 rounded-card border border-line bg-sheet p-5 shadow-sheet sm:p-6">
      <legend className="sr-only">{title}</legend>
      <div aria-hidden="true" className="mb-4 flex items-baseline gap-3">
        <span className="numeric flex size-7 shrink-0 items-center justify-center rounded-full bg-brand-soft text-sm font-bold text-brand-strong">
          {number}
        </span>
        <span className="text-lg font-semibold text-ink">{title}</span>
      </div>
      {description ? <div className="-mt-2 mb-4 text-sm text-ink-muted">{description}</div> : null}
      <div className="space-y-4">{children}</div>
      {error ? (
        <div className="mt-3">
          <FieldError message={error} />
        </div>
      ) : null}
    </fieldset>
  );
}
