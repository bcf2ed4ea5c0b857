import { useEffect, useId, useRef, type MouseEventHandler, type ReactNode } from 'react';
import { cn } from '@/lib/cn';
import { Button } from './button';

/**
 * The browser's own <dialog>, shown as a modal while `open`: it traps focus,
 * Escape cancels (the caller decides what that means) and focus returns to the
 * button that opened it. Every dialog, sheet and lightbox of the app is one of these;
 * `className` sizes and colours it.
 */
export function Modal({
  open,
  labelledBy,
  className,
  onCancel,
  onClose,
  onClick,
  children,
}: {
  open: boolean;
  labelledBy: string;
  className: string;
  onCancel: () => void;
  onClose?: () => void;
  onClick?: MouseEventHandler<HTMLDialogElement>;
  children: ReactNode;
}) {
  const ref = useRef<HTMLDialogElement>(null);

  useEffect(() => {
    const dialog = ref.current;
    if (!dialog) return;
    if (open && !dialog.open) {
      // jsdom has no showModal; there the dialog simply opens in place.
      if (typeof dialog.showModal === 'function') dialog.showModal();
      else dialog.setAttribute('open', '');
    } else if (!open && dialog.open) {
      if (typeof dialog.close === 'function') dialog.close();
      else dialog.removeAttribute('open');
    }
  }, [open]);

  return (
    <dialog
      ref={ref}
      aria-labelledby={labelledBy}
      onClose={onClose}
      onCancel={(e) => {
        e.preventDefault();
        onCancel();
      }}
      onClick={onClick}
      className={cn('m-auto rounded-card border p-0', className)}
    >
      {children}
    </dialog>
  );
}

/** The light card look of dialogs and sheets over a dimmed page. */
export const sheetLook = 'border-line bg-sheet text-ink shadow-sheet backdrop:bg-ink/40';

/** A modal with a title, an optional line under it, and whatever form or text it holds. */
export function Dialog({
  open,
  onClose,
  title,
  description,
  children,
}: {
  open: boolean;
  onClose: () => void;
  title: string;
  description?: ReactNode;
  children: ReactNode;
}) {
  const titleId = useId();
  return (
    <Modal
      open={open}
      labelledBy={titleId}
      className={cn(sheetLook, 'w-[min(32rem,calc(100vw-2rem))]')}
      onCancel={onClose}
      onClose={onClose}
    >
      {open ? (
        <div className="p-5 sm:p-6">
          <h2 id={titleId} className="text-lg font-semibold">
            {title}
          </h2>
          {description ? <div className="mt-1 text-sm text-ink-muted">{description}</div> : null}
          <div className="mt-4">{children}</div>
        </div>
      ) : null}
    </Modal>
  );
}

/** Asks before a step that is hard to undo (disabling an account); Escape and "Keep as it is" cancel. */
export function ConfirmDialog({
  open,
  title,
  children,
  confirmLabel,
  tone = 'danger',
  pending,
  onConfirm,
  onCancel,
}: {
  open: boolean;
  title: string;
  children: ReactNode;
  confirmLabel: string;
  tone?: 'danger' | 'primary';
  pending?: boolean;
  onConfirm: () => void;
  onCancel: () => void;
}) {
  const titleId = useId();
  return (
    <Modal open={open} labelledBy={titleId} className={cn(sheetLook, 'w-[min(30rem,calc(100vw-2rem))]')} onCancel={onCancel}>
      {open ? (
        <div className="space-y-4 p-5 sm:p-6">
          <h2 id={titleId} className="text-lg font-semibold">
            {title}
          </h2>
          <div className="space-y-2 text-ink-muted">{children}</div>
          <div className="flex flex-wrap justify-end gap-2">
            <Button variant="secondary" onClick={onCancel}>
              Keep as it is
            </Button>
            <Button variant={tone} onClick={onConfirm} pending={pending}>
              {confirmLabel}
            </Button>
          </div>
        </div>
      ) : null}
    </Modal>
  );
}
