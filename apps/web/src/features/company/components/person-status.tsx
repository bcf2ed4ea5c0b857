import { personStatusLabels, type PersonStatus } from '@underfoot/core';
import { cn } from '@/lib/cn';

const styles: Record<PersonStatus, string> = {
  active: 'border-success/40 bg-success-soft text-success',
  invited: 'border-caution/40 bg-caution-soft text-caution',
  disabled: 'border-line-strong bg-sand text-ink-muted',
};

// A mark per state, so the status never rests on colour alone: a tick, an envelope, a bar.
const marks: Record<PersonStatus, string> = {
  active: 'm2 6.5 2.5 2.5L10 3',
  invited: 'M1.5 3h9v6h-9zM1.5 3.5 6 7l4.5-3.5',
  disabled: 'M2.5 6h7',
};

export function PersonStatusBadge({ status }: { status: PersonStatus }) {
  return (
    <span
      className={cn(
        'inline-flex items-center gap-1.5 rounded-full border px-2.5 py-0.5 text-sm font-semibold whitespace-nowrap',
        styles[status],
      )}
    >
      <svg aria-hidden="true" viewBox="0 0 12 12" className="size-3 shrink-0" fill="none" stroke="currentColor" strokeWidth="1.6">
        <path d={marks[status]} strokeLinecap="round" strokeLinejoin="round" />
      </svg>
      {personStatusLabels[status]}
    </span>
  );
}
