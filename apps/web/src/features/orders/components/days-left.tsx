import type { OrderStatus } from '@underfoot/core';
import { cn } from '@/lib/cn';

/** Deadlines this close are flagged: the contingency window leaves little room to negotiate a repair. */
export const DEADLINE_WARNING_DAYS = 3;

export type DeadlineUrgency = 'passed' | 'soon' | 'later' | 'settled';

/** How pressing a deadline is; finished and cancelled orders no longer race it. */
export function deadlineUrgency(daysLeft: number, status?: OrderStatus): DeadlineUrgency {
  if (status === 'published' || status === 'cancelled') return 'settled';
  if (daysLeft < 0) return 'passed';
  if (daysLeft <= DEADLINE_WARNING_DAYS) return 'soon';
  return 'later';
}

export function daysLeftText(daysLeft: number): string {
  if (daysLeft < 0) return 'passed';
  if (daysLeft === 0) return 'today';
  if (daysLeft === 1) return '1 day left';
  return `${daysLeft} days left`;
}

/** The days left to the contingency deadline: highlighted at three days or fewer, "passed" once gone. */
export function DaysLeft({ daysLeft, status, className }: { daysLeft: number; status?: OrderStatus; className?: string }) {
  const urgency = deadlineUrgency(daysLeft, status);
  return (
    <span
      data-urgency={urgency}
      className={cn(
        'numeric inline-flex items-center gap-1 whitespace-nowrap',
        urgency === 'passed' && 'font-semibold text-danger',
        urgency === 'soon' && 'rounded bg-caution-soft px-1.5 font-semibold text-caution',
        (urgency === 'later' || urgency === 'settled') && 'text-ink-muted',
        className,
      )}
    >
      {urgency === 'soon' || urgency === 'passed' ? (
        <svg aria-hidden="true" viewBox="0 0 12 12" className="size-3 shrink-0" fill="none" stroke="currentColor" strokeWidth="1.6">
          <path d="M6 2.5v4M6 9v.01" strokeLinecap="round" />
        </svg>
      ) : null}
      {daysLeft < 0 ? 'Deadline passed' : daysLeftText(daysLeft)}
    </span>
  );
}
