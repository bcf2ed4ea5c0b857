import { useId, type ReactNode } from 'react';

/** The red line under a field or a group, tied to it with aria-describedby. */
export function FieldError({ id, message }: { id?: string | undefined; message?: string | undefined }) {
  if (!message) return null;
  return (
    <p id={id} className="flex items-start gap-1.5 text-sm font-medium text-danger">
      <svg aria-hidden="true" viewBox="0 0 20 20" className="mt-0.5 size-4 shrink-0" fill="currentColor">
        <path d="M10 2a8 8 0 1 0 0 16 8 8 0 0 0 0-16Zm-.75 4h1.5v5.5h-1.5V6Zm.75 8.75a1 1 0 1 1 0-2 1 1 0 0 1 0 2Z" />
      </svg>
      <span>{message}</span>
    </p>
  );
}

/**
 * The ids that tie a control to its hint and its error, so a screen reader reads
 * them with it. `id` is the control's own id when the caller chose one.
 */
export function useFieldIds(hint: ReactNode, error: string | undefined, id?: string) {
  const autoId = useId();
  const controlId = id ?? autoId;
  const hintId = hint ? `${controlId}-hint` : undefined;
  const errorId = error ? `${controlId}-error` : undefined;
  return { id: controlId, hintId, errorId, describedBy: [hintId, errorId].filter(Boolean).join(' ') || undefined };
}
