import type { ReactNode } from 'react';
import { cn } from '@/lib/cn';

/** What a screen says when there is nothing to show yet: honest, and saying what will appear. */
export function EmptyState({
  title,
  children,
  icon,
  className,
}: {
  title: ReactNode;
  children?: ReactNode;
  icon?: ReactNode;
  className?: string;
}) {
  return (
    <div
      className={cn(
        'flex flex-col items-center rounded-card border border-dashed border-line-strong bg-sheet px-6 py-12 text-center',
        className,
      )}
    >
      {icon ? <div className="mb-4 text-brand">{icon}</div> : null}
      <h2 className="text-lg font-semibold text-ink">{title}</h2>
      {children ? <div className="mt-2 max-w-md text-ink-muted">{children}</div> : null}
    </div>
  );
}
