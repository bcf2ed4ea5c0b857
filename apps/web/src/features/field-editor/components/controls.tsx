import { useEffect, useId, useState, type ReactNode } from 'react';
import { Button } from '@/components/ui/button';
import { Card, CardBody } from '@/components/ui/card';
import { Modal, sheetLook } from '@/components/ui/dialog';
import { cn } from '@/lib/cn';

/** A card with a heading; the heading names the region for screen readers. */
export function SectionCard({
  title,
  description,
  actions,
  children,
  className,
  id,
}: {
  title: ReactNode;
  description?: ReactNode;
  actions?: ReactNode;
  children: ReactNode;
  className?: string;
  id?: string;
}) {
  const headingId = useId();
  return (
    <Card className={className}>
      <CardBody className="p-4 sm:p-6">
        <section aria-labelledby={headingId} id={id}>
          <div className="mb-3 flex flex-wrap items-start justify-between gap-2">
            <div className="min-w-0">
              <h2 id={headingId} className="text-lg font-semibold">
                {title}
              </h2>
              {description ? <p className="mt-0.5 text-sm text-ink-muted">{description}</p> : null}
            </div>
            {actions ? <div className="flex flex-wrap gap-2">{actions}</div> : null}
          </div>
          {children}
        </section>
      </CardBody>
    </Card>
  );
}

/** Two or three choices side by side, as one radio group (large touch targets). */
export function Segmented<T extends string>({
  legend,
  value,
  options,
  onChange,
  disabled,
}: {
  legend: string;
  value: T;
  options: readonly { value: T; label: string }[];
  onChange: (value: T) => void;
  disabled?: boolean;
}) {
  const name = useId();
  return (
    <fieldset className="min-w-0" disabled={disabled}>
      <legend className="mb-1.5 block text-sm font-semibold text-ink">{legend}</legend>
      <div className="flex rounded-lg border border-line-strong bg-white p-0.5">
        {options.map((option) => (
          <label
            key={option.value}
            className={cn(
              'flex min-h-10 flex-1 cursor-pointer items-center justify-center rounded-md px-2 text-center text-sm font-semibold has-[:focus-visible]:outline-3 has-[:focus-visible]:outline-accent',
              value === option.value ? 'bg-accent text-white' : 'text-ink hover:bg-sand',
            )}
          >
            <input
              type="radio"
              name={name}
              value={option.value}
              checked={value === option.value}
              onChange={() => onChange(option.value)}
              className="sr-only"
            />
            {option.label}
          </label>
        ))}
      </div>
    </fieldset>
  );
}

/**
 * A modal sheet on the browser's own <dialog> (focus trapped, Escape closes, focus
 * returns to the opener). On a phone it fills the width and scrolls inside.
 */
export function Sheet({
  open,
  onClose,
  title,
  description,
  children,
  wide = false,
  dismissible = true,
}: {
  open: boolean;
  onClose: () => void;
  title: string;
  description?: ReactNode;
  children: ReactNode;
  wide?: boolean;
  /** False for a question that must be answered: no close button, Escape does nothing. */
  dismissible?: boolean;
}) {
  const titleId = useId();
  return (
    <Modal
      open={open}
      labelledBy={titleId}
      onClose={onClose}
      onCancel={dismissible ? onClose : () => undefined}
      className={cn(
        sheetLook,
        'max-h-[calc(100dvh-1rem)] overflow-y-auto',
        wide ? 'w-[min(56rem,calc(100vw-1rem))]' : 'w-[min(34rem,calc(100vw-1rem))]',
      )}
    >
      {open ? (
        <div className="p-4 sm:p-6">
          <div className="mb-4 flex items-start justify-between gap-3">
            <div className="min-w-0">
              <h2 id={titleId} className="text-lg font-semibold">
                {title}
              </h2>
              {description ? <div className="mt-1 text-sm text-ink-muted">{description}</div> : null}
            </div>
            {dismissible ? (
              <button
                type="button"
                onClick={onClose}
                className="-mt-1 -mr-1 inline-flex min-h-11 min-w-11 items-center justify-center rounded-lg text-ink-muted hover:bg-sand"
              >
                <svg aria-hidden="true" viewBox="0 0 24 24" className="size-5" fill="none" stroke="currentColor" strokeWidth="2">
                  <path d="M6 6l12 12M18 6 6 18" />
                </svg>
                <span className="sr-only">Close</span>
              </button>
            ) : null}
          </div>
          {children}
        </div>
      ) : null}
    </Modal>
  );
}

/** A destructive button that asks for a second tap instead of a pop-up; it calms down after a few seconds. */
export function ConfirmButton({
  label,
  confirmLabel,
  onConfirm,
  className,
  size = 'md',
}: {
  label: string;
  confirmLabel: string;
  onConfirm: () => void;
  className?: string;
  size?: 'md' | 'sm';
}) {
  const [armed, setArmed] = useState(false);
  useEffect(() => {
    if (!armed) return;
    const timer = setTimeout(() => setArmed(false), 4000);
    return () => clearTimeout(timer);
  }, [armed]);
  return (
    <Button
      variant={armed ? 'danger' : 'quiet'}
      size={size}
      className={cn(!armed && 'text-danger hover:bg-danger-soft', className)}
      onClick={() => (armed ? onConfirm() : setArmed(true))}
    >
      <span aria-live="polite">{armed ? confirmLabel : label}</span>
    </Button>
  );
}
