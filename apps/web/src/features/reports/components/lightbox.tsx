import { useId, type ReactNode } from 'react';
import { Modal } from '@/components/ui/dialog';

/**
 * A full-screen dialog on the browser's own <dialog> for a still or the video: it traps
 * focus, closes on Escape or the close button, and hands focus back to what opened it.
 */
export function Lightbox({ open, onClose, title, children }: { open: boolean; onClose: () => void; title: string; children: ReactNode }) {
  const titleId = useId();

  return (
    <Modal
      open={open}
      labelledBy={titleId}
      onClose={onClose}
      onCancel={onClose}
      onClick={(e) => {
        // A tap on the dim backdrop (the dialog element itself, outside its content) closes it.
        if (e.target === e.currentTarget) onClose();
      }}
      className="max-h-[calc(100dvh-1rem)] w-[min(64rem,calc(100vw-1rem))] overflow-hidden border-line bg-ink text-white backdrop:bg-ink/80"
    >
      {open ? (
        <div className="flex max-h-[calc(100dvh-1rem)] flex-col">
          <div className="flex items-center gap-3 px-4 py-2">
            <h2 id={titleId} className="min-w-0 flex-1 truncate text-base font-semibold">
              {title}
            </h2>
            <button
              type="button"
              onClick={onClose}
              className="inline-flex min-h-11 min-w-11 items-center justify-center rounded-lg hover:bg-white/10"
              autoFocus
            >
              <svg aria-hidden="true" viewBox="0 0 24 24" className="size-6" fill="none" stroke="currentColor" strokeWidth="2">
                <path d="M6 6l12 12M18 6 6 18" />
              </svg>
              <span className="sr-only">Close</span>
            </button>
          </div>
          <div className="min-h-0 flex-1 overflow-auto">{children}</div>
        </div>
      ) : null}
    </Modal>
  );
}
