import { formatMoney } from '@underfoot/core';
import { formatDateTime } from '@/lib/format';
import type { OrderHistoryEvent } from '../api';
import { formatDay } from './order-format';

const str = (value: unknown): string | null => (typeof value === 'string' && value ? value : null);
const num = (value: unknown): number | null => (typeof value === 'number' && Number.isFinite(value) ? value : null);

function windowOf(detail: Record<string, unknown>): string | null {
  const date = str(detail.date);
  const start = str(detail.startTime);
  const end = str(detail.endTime);
  return date && start && end ? `${formatDay(date)}, ${start}–${end}` : null;
}

/** One line of the order's history in plain words; events from later features fall back to their name. */
export function describeEvent(event: OrderHistoryEvent): { title: string; detail: string | null } {
  const d = event.detail;
  switch (event.type) {
    case 'created': {
      const fee = num(d.feeTotalCents);
      return { title: 'Order placed', detail: fee !== null ? `Fee ${formatMoney(fee)}` : null };
    }
    case 'scheduled':
    case 'rescheduled': {
      const when = windowOf(d);
      const who = str(d.inspectorName);
      const note = str(d.note);
      const parts = [who && when ? `${who}, ${when}` : (who ?? when), note ? `Note: ${note}` : null].filter(Boolean);
      return { title: event.type === 'scheduled' ? 'Visit scheduled' : 'Visit rescheduled', detail: parts.join(' · ') || null };
    }
    case 'cancelled': {
      const refunded = num(d.refundedCents);
      const parts = [str(d.reason), refunded !== null ? `${formatMoney(refunded)} refunded` : null].filter(Boolean);
      return { title: 'Order cancelled', detail: parts.join(' · ') || null };
    }
    case 'paid': {
      const amount = num(d.amountCents);
      return { title: 'Fee paid', detail: amount !== null ? formatMoney(amount) : null };
    }
    case 'refunded': {
      const amount = num(d.amountCents);
      return { title: 'Fee refunded', detail: amount !== null ? formatMoney(amount) : null };
    }
    default: {
      const name = event.type.replace(/[_.]/g, ' ');
      return { title: name.charAt(0).toUpperCase() + name.slice(1), detail: null };
    }
  }
}

export function OrderHistory({ events }: { events: OrderHistoryEvent[] }) {
  if (events.length === 0) return <p className="text-ink-muted">No changes recorded yet.</p>;
  return (
    <ol className="relative space-y-4 border-l-2 border-line pl-5">
      {events.map((event) => {
        const { title, detail } = describeEvent(event);
        return (
          <li key={event.id} className="relative">
            <span aria-hidden="true" className="absolute top-1.5 -left-[1.72rem] size-3 rounded-full border-2 border-sheet bg-brand" />
            <p className="font-semibold">{title}</p>
            {detail ? <p className="text-sm break-words">{detail}</p> : null}
            <p className="text-sm text-ink-muted">
              <time dateTime={event.at}>{formatDateTime(event.at)}</time>
              {event.actorName ? ` · ${event.actorName}` : null}
            </p>
          </li>
        );
      })}
    </ol>
  );
}
