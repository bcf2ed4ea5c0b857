import type { ReactNode } from 'react';
import { cn } from '@/lib/cn';

export type AlertTone = 'danger' | 'info' | 'success' | 'caution';

const tones: Record<AlertTone, string> = {
  danger: 'border-danger/40 bg-danger-soft text-danger',
  info: 'border-accent/30 bg-accent-soft text-accent-strong',
  success: 'border-success/40 bg-success-soft text-success',
  caution: 'border-caution/40 bg-caution-soft text-caution',
};

const icons: Record<AlertTone, ReactNode> = {
  danger: <path d="M12 8v5m0 3.5v.01M10.3 3.9 2.4 17.5A2 2 0 0 0 4.1 20.5h15.8a2 2 0 0 0 1.7-3L13.7 3.9a2 2 0 0 0-3.4 0Z" />,
  caution: <path d="M12 8v5m0 3.5v.01M10.3 3.9 2.4 17.5A2 2 0 0 0 4.1 20.5h15.8a2 2 0 0 0 1.7-3L13.7 3.9a2 2 0 0 0-3.4 0Z" />,
  info: <path d="M12 11v6m0-9.5v.01M21 12a9 9 0 1 1-18 0 9 9 0 0 1 18 0Z" />,
  success: <path d="m8 12.5 2.5 2.5L16 9.5M21 12a9 9 0 1 1-18 0 9 9 0 0 1 18 0Z" />,
};

export interface AlertProps {
  tone?: AlertTone;
  title?: ReactNode;
  children?: ReactNode;
  className?: string;
  /** `alert` for errors a person must notice now; `status` for calm news. */
  role?: 'alert' | 'status';
}

export function Alert({ tone = 'info', title, children, className, role }: AlertProps) {
  return (
    <div
      role={role ?? (tone === 'danger' ? 'alert' : 'status')}
      className={cn('flex gap-3 rounded-lg border px-4 py-3 text-sm leading-6', tones[tone], className)}
    >
      <svg
        aria-hidden="true"
        viewBox="0 0 24 24"
        className="mt-0.5 size-5 shrink-0"
        fill="none"
        stroke="currentColor"
        strokeWidth="2"
        strokeLinecap="round"
        strokeLinejoin="round"
      >
        {icons[tone]}
      </svg>
      <div className="min-w-0">
        {title ? <p className="font-semibold">{title}</p> : null}
        {children ? <div className={title ? 'mt-0.5' : undefined}>{children}</div> : null}
      </div>
    </div>
  );
}
