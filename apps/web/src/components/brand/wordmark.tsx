import { cn } from '@/lib/cn';

/** Our mark: the ground line with the pipe beneath it, as a camera sees it end-on. */
export function Mark({ className }: { className?: string }) {
  return (
    <svg aria-hidden="true" viewBox="0 0 32 32" className={cn('size-8 shrink-0', className)}>
      <rect width="32" height="32" rx="7" fill="var(--color-brand)" />
      <path d="M6 10.5h20" stroke="var(--color-paper)" strokeWidth="2.5" strokeLinecap="round" />
      <circle cx="16" cy="20.5" r="5.25" fill="none" stroke="var(--color-paper)" strokeWidth="2.5" />
      <circle cx="16" cy="20.5" r="1.75" fill="var(--color-paper)" />
    </svg>
  );
}

export function Wordmark({ className }: { className?: string }) {
  return (
    <span className={cn('inline-flex items-center gap-2.5', className)}>
      <Mark />
      <span className="text-xl font-bold tracking-tight text-ink">Underfoot</span>
    </span>
  );
}
