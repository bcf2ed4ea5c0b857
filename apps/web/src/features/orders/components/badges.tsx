import { orderStatusLabels, type OrderStatus, type Payer, type PaymentState } from '@underfoot/core';
import type { ReactNode } from 'react';
import { cn } from '@/lib/cn';

const statusStyles: Record<OrderStatus, string> = {
  requested: 'border-caution/40 bg-caution-soft text-caution',
  scheduled: 'border-accent/30 bg-accent-soft text-accent-strong',
  recorded: 'border-accent/30 bg-accent-soft text-accent-strong',
  in_review: 'border-accent/30 bg-accent-soft text-accent-strong',
  published: 'border-success/40 bg-success-soft text-success',
  cancelled: 'border-line-strong bg-sand text-ink-muted',
};

// A different mark per stage, so the status never rests on colour alone.
const statusMarks: Record<OrderStatus, string> = {
  requested: 'M6 1.5a4.5 4.5 0 1 0 0 9 4.5 4.5 0 0 0 0-9Z',
  scheduled: 'M2 3h8v7H2zM2 5.5h8',
  recorded: 'M1.5 4h6v4h-6zM7.5 6l3-2v4z',
  in_review: 'M5 2a3 3 0 1 0 0 6 3 3 0 0 0 0-6ZM7.2 7.2 10 10',
  published: 'm2 6.5 2.5 2.5L10 3',
  cancelled: 'M3 3l6 6M9 3 3 9',
};

function Pill({ className, mark, children }: { className: string; mark: string; children: ReactNode }) {
  return (
    <span
      className={cn(
        'inline-flex items-center gap-1.5 rounded-full border px-2.5 py-0.5 text-sm font-semibold whitespace-nowrap',
        className,
      )}
    >
      <svg aria-hidden="true" viewBox="0 0 12 12" className="size-3 shrink-0" fill="none" stroke="currentColor" strokeWidth="1.6">
        <path d={mark} strokeLinecap="round" strokeLinejoin="round" />
      </svg>
      {children}
    </span>
  );
}

export function StatusBadge({ status }: { status: OrderStatus }) {
  return (
    <Pill className={statusStyles[status]} mark={statusMarks[status]}>
      {orderStatusLabels[status]}
    </Pill>
  );
}

export const paymentStateLabels: Record<PaymentState, string> = {
  unpaid: 'Unpaid',
  paid: 'Paid',
  refunded: 'Refunded',
};

/** "Unpaid" reads as a problem only when the agent meant to pay now; a client paying before release is the plan. */
export function paymentLabel(state: PaymentState, payer: Payer): string {
  if (state === 'unpaid' && payer === 'client_before_release') return 'Due before release';
  return paymentStateLabels[state];
}

export function PaymentBadge({ state, payer }: { state: PaymentState; payer: Payer }) {
  const style =
    state === 'paid'
      ? 'border-success/40 bg-success-soft text-success'
      : state === 'refunded'
        ? 'border-line-strong bg-sand text-ink-muted'
        : payer === 'agent_now'
          ? 'border-caution/40 bg-caution-soft text-caution'
          : 'border-line-strong bg-sheet text-ink-muted';
  const mark = state === 'paid' ? 'm2 6.5 2.5 2.5L10 3' : state === 'refunded' ? 'M9.5 4.5h-6l2-2M3.5 4.5l2 2' : 'M6 3v3.5l2 1.2';
  return (
    <Pill className={style} mark={mark}>
      {paymentLabel(state, payer)}
    </Pill>
  );
}
