import { useEffect, useState } from 'react';
import { Spinner } from '@/components/ui/spinner';
import { cn } from '@/lib/cn';
import type { EditorSnapshot } from '../model/autosave';

const timeFormat = new Intl.DateTimeFormat(undefined, { hour: 'numeric', minute: '2-digit' });

/** Seconds until a moment, refreshed each second while shown. */
function useSecondsUntil(at: number | null): number | null {
  const [now, setNow] = useState(() => Date.now());
  useEffect(() => {
    if (at === null) return;
    const timer = setInterval(() => setNow(Date.now()), 1000);
    return () => clearInterval(timer);
  }, [at]);
  return at === null ? null : Math.max(0, Math.ceil((at - now) / 1000));
}

/**
 * Saved / saving / not saved, always in words (never colour alone), announced politely
 * to screen readers. "Not saved" says why and what happens next.
 */
export function SaveStatus({
  snapshot,
  onRetry,
  compact = false,
  announce = true,
}: {
  snapshot: EditorSnapshot;
  onRetry: () => void;
  compact?: boolean;
  /** One status line on a screen speaks to screen readers; copies stay quiet. */
  announce?: boolean;
}) {
  const seconds = useSecondsUntil(snapshot.state === 'retrying' ? snapshot.retryAt : null);
  const { state } = snapshot;
  let tone: 'ok' | 'busy' | 'problem' | 'quiet';
  let label: string;
  switch (state) {
    case 'saved':
      tone = 'ok';
      label = snapshot.lastSavedAt ? `Saved ${timeFormat.format(new Date(snapshot.lastSavedAt))}` : 'Nothing recorded yet';
      break;
    case 'pending':
      tone = 'busy';
      label = 'Saving soon…';
      break;
    case 'saving':
      tone = 'busy';
      label = 'Saving…';
      break;
    case 'retrying':
      tone = 'problem';
      // Kept short to fit a phone beside "Retry now"; the line under it says the change is kept on the phone.
      label = seconds !== null && seconds > 0 ? `Not saved · retry in ${seconds} s` : 'Not saved · retrying';
      break;
    case 'invalid':
      tone = 'problem';
      label = 'Not saved · a field needs fixing';
      break;
    case 'conflict':
      tone = 'problem';
      label = 'Not saved · changed elsewhere';
      break;
    default:
      tone = 'quiet';
      label = 'Read only';
  }
  return (
    <div className={cn('flex min-w-0 items-center gap-2', compact ? 'text-xs' : 'text-sm')}>
      <p
        role={announce ? 'status' : undefined}
        aria-live={announce ? 'polite' : undefined}
        data-save-state={state}
        className={cn(
          'inline-flex min-w-0 items-center gap-1.5 rounded-full border px-2.5 py-1 font-semibold',
          tone === 'ok' && 'border-success/40 bg-success-soft text-success',
          tone === 'busy' && 'border-accent/30 bg-accent-soft text-accent-strong',
          tone === 'problem' && 'border-danger/40 bg-danger-soft text-danger',
          tone === 'quiet' && 'border-line bg-sand text-ink-muted',
        )}
      >
        {tone === 'busy' ? <Spinner className="[&_svg]:size-3.5" /> : null}
        {tone === 'ok' ? (
          <svg aria-hidden="true" viewBox="0 0 20 20" className="size-3.5 shrink-0" fill="none" stroke="currentColor" strokeWidth="2.5">
            <path d="m4.5 10.5 3.5 3.5 7.5-8" />
          </svg>
        ) : null}
        {tone === 'problem' ? (
          <svg aria-hidden="true" viewBox="0 0 20 20" className="size-3.5 shrink-0" fill="currentColor">
            <path d="M10 2a8 8 0 1 0 0 16 8 8 0 0 0 0-16Zm-.75 4h1.5v5.5h-1.5V6Zm.75 8.75a1 1 0 1 1 0-2 1 1 0 0 1 0 2Z" />
          </svg>
        ) : null}
        <span className="truncate">{label}</span>
      </p>
      {state === 'retrying' ? (
        <button type="button" onClick={onRetry} className="min-h-9 shrink-0 rounded-md px-2 font-semibold text-accent hover:bg-accent-soft">
          Retry now
        </button>
      ) : null}
    </div>
  );
}
