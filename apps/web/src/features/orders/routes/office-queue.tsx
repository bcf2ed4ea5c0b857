import { useQuery } from '@tanstack/react-query';
import { formatMoney, orderKindLabels } from '@underfoot/core';
import { useState, type ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { Alert } from '@/components/ui/alert';
import { Button, ButtonLink } from '@/components/ui/button';
import { CardList, WideTable } from '@/components/ui/data-table';
import { Dialog } from '@/components/ui/dialog';
import { EmptyState } from '@/components/ui/empty-state';
import { ClipboardIcon } from '@/components/ui/icons';
import { LoadFailed } from '@/components/ui/load-failed';
import { PageHeader } from '@/components/ui/page-header';
import { SectionLoading } from '@/components/ui/spinner';
import { paths } from '@/config/paths';
import { errorMessage } from '@/lib/api-client';
import { useCurrentUser } from '@/lib/auth';
import { useDocumentTitle } from '@/lib/use-document-title';
import { orderListQueryOptions, orderQueryOptions, type OrderListItem } from '../api';
import { PaymentBadge } from '../components/badges';
import { CancelOrderDialog, type CancelTarget } from '../components/cancel-order-dialog';
import { DaysLeft } from '../components/days-left';
import { formatCompactDay, formatDay, formatTimes, orderHref } from '../components/order-format';
import { ScheduleForm } from '../components/schedule-form';

/** The most the API returns in one page; a queue longer than this says so. */
const QUEUE_LIMIT = 200;

function ScheduleDialogBody({ orderId, onClose }: { orderId: string; onClose: () => void }) {
  // The list row lacks the preferred dates; the order itself has them.
  const order = useQuery(orderQueryOptions(orderId));
  if (order.isPending) return <SectionLoading label="Opening the order…" />;
  if (order.isError) {
    return (
      <Alert tone="danger" title="The order could not be opened">
        <p>{errorMessage(order.error)}</p>
      </Alert>
    );
  }
  if (!order.data.allowed.schedule) {
    return <Alert tone="info">This order is {order.data.status.replace('_', ' ')} and can no longer be scheduled.</Alert>;
  }
  return (
    <>
      {order.data.property.accessNotes ? (
        <p className="mb-3 rounded-lg bg-sand/70 px-3 py-2 text-sm">
          <span className="font-semibold">Access: </span>
          {order.data.property.accessNotes}
        </p>
      ) : null}
      <ScheduleForm order={order.data} onDone={onClose} onCancel={onClose} />
    </>
  );
}

function QueueActions({
  order,
  onSchedule,
  onCancel,
}: {
  order: OrderListItem;
  onSchedule: (order: OrderListItem) => void;
  onCancel: (order: OrderListItem) => void;
}) {
  const label = order.street;
  return (
    <div className="flex flex-wrap gap-2">
      <Button
        size="sm"
        variant={order.status === 'scheduled' ? 'secondary' : 'primary'}
        onClick={() => onSchedule(order)}
        aria-label={`${order.status === 'scheduled' ? 'Reschedule' : 'Schedule'} ${label}`}
      >
        {order.status === 'scheduled' ? 'Reschedule' : 'Schedule'}
      </Button>
      <Button size="sm" variant="secondary" onClick={() => onCancel(order)} aria-label={`Cancel ${label}`}>
        Cancel
      </Button>
    </div>
  );
}

function QueueSection({
  title,
  description,
  orders,
  empty,
  onSchedule,
  onCancel,
}: {
  title: string;
  description: string;
  orders: OrderListItem[];
  empty: ReactNode;
  onSchedule: (order: OrderListItem) => void;
  onCancel: (order: OrderListItem) => void;
}) {
  const headingId = `queue-${title.toLowerCase().replace(/\W+/g, '-')}`;
  return (
    <section aria-labelledby={headingId} className="space-y-3">
      <div>
        <h2 id={headingId} className="text-lg font-semibold">
          {title} <span className="numeric font-normal text-ink-muted">({orders.length})</span>
        </h2>
        <p className="text-sm text-ink-muted">{description}</p>
      </div>
      {orders.length === 0 ? (
        <p className="rounded-card border border-dashed border-line-strong bg-sheet px-4 py-5 text-ink-muted">{empty}</p>
      ) : (
        <>
          {/* Dense table for the office desk. */}
          <WideTable caption={title} className="table-fixed text-sm">
            {/* The same widths in both sections, so their columns line up. */}
            <colgroup>
              <col className="w-[30%]" />
              <col className="w-[14%]" />
              <col className="w-[20%]" />
              <col className="w-[16%]" />
              <col className="w-[20%]" />
            </colgroup>
            <thead className="border-b border-line bg-sand/60 text-ink-muted">
              <tr>
                <th scope="col" className="py-2 pr-3 pl-4 font-semibold">
                  Address
                </th>
                <th scope="col" className="px-3 py-2 font-semibold">
                  Deadline
                </th>
                <th scope="col" className="px-3 py-2 font-semibold">
                  Visit
                </th>
                <th scope="col" className="px-3 py-2 font-semibold">
                  Payment
                </th>
                <th scope="col" className="px-3 py-2 font-semibold">
                  <span className="sr-only">Actions</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {orders.map((order) => (
                <tr key={order.id} className="border-b border-line align-top last:border-b-0 hover:bg-paper" data-order-id={order.id}>
                  <td className="py-2.5 pr-3 pl-4">
                    <Link to={orderHref('office', order.id)} className="font-semibold text-ink underline-offset-2 hover:underline">
                      {order.street}
                    </Link>
                    <span className="block text-ink-muted">
                      {order.city} · <span className="whitespace-nowrap">{orderKindLabels[order.kind]}</span>
                    </span>
                  </td>
                  <td className="px-3 py-2.5 whitespace-nowrap">
                    <span className="numeric block">{formatCompactDay(order.contingencyDeadline)}</span>
                    <DaysLeft daysLeft={order.daysLeft} status={order.status} />
                  </td>
                  <td className="px-3 py-2.5">
                    {order.window ? (
                      <span className="numeric block whitespace-nowrap">
                        {formatCompactDay(order.window.date)} · {formatTimes(order.window)}
                        <span className="block text-ink-muted">{order.inspectorName}</span>
                      </span>
                    ) : (
                      <span className="text-ink-muted">Not scheduled</span>
                    )}
                  </td>
                  <td className="px-3 py-2.5">
                    <PaymentBadge state={order.paymentState} payer={order.payer} />
                    <span className="numeric block text-ink-muted">{formatMoney(order.feeTotalCents)}</span>
                  </td>
                  <td className="px-3 py-2.5 pr-4">
                    <div className="flex justify-end">
                      <QueueActions order={order} onSchedule={onSchedule} onCancel={onCancel} />
                    </div>
                  </td>
                </tr>
              ))}
            </tbody>
          </WideTable>

          {/* Cards on a phone. */}
          <CardList label={title}>
            {orders.map((order) => (
              <li key={order.id} className="rounded-card border border-line bg-sheet p-4 shadow-sheet" data-order-id={order.id}>
                <div className="flex items-start justify-between gap-3">
                  <div className="min-w-0">
                    <Link to={orderHref('office', order.id)} className="font-semibold break-words text-ink">
                      {order.street}
                    </Link>
                    <p className="text-sm text-ink-muted">
                      {order.city} · <span className="whitespace-nowrap">{orderKindLabels[order.kind]}</span>
                    </p>
                  </div>
                </div>
                <dl className="mt-3 grid grid-cols-2 gap-x-3 gap-y-2 text-sm">
                  <div>
                    <dt className="text-ink-muted">Deadline</dt>
                    <dd>
                      <span className="numeric block">{formatDay(order.contingencyDeadline)}</span>
                      <DaysLeft daysLeft={order.daysLeft} status={order.status} />
                    </dd>
                  </div>
                  <div>
                    <dt className="text-ink-muted">Visit</dt>
                    <dd className="numeric">
                      {order.window ? (
                        <>
                          {formatCompactDay(order.window.date)} · {formatTimes(order.window)}
                          <span className="block text-ink-muted">{order.inspectorName}</span>
                        </>
                      ) : (
                        'Not scheduled'
                      )}
                    </dd>
                  </div>
                  <div className="col-span-2">
                    <dt className="sr-only">Payment</dt>
                    <dd className="flex flex-wrap items-center gap-2">
                      <PaymentBadge state={order.paymentState} payer={order.payer} />
                      <span className="numeric text-ink-muted">{formatMoney(order.feeTotalCents)}</span>
                    </dd>
                  </div>
                </dl>
                <div className="mt-3">
                  <QueueActions order={order} onSchedule={onSchedule} onCancel={onCancel} />
                </div>
              </li>
            ))}
          </CardList>
        </>
      )}
    </section>
  );
}

/** The office's home: orders waiting for a visit, nearest deadline first, new requests before booked visits. */
export function OfficeQueueRoute() {
  useDocumentTitle('Office');
  const user = useCurrentUser();
  const queue = useQuery(
    orderListQueryOptions({ statuses: ['requested', 'scheduled'], sort: 'deadline', direction: 'asc', limit: QUEUE_LIMIT }),
  );
  const [scheduling, setScheduling] = useState<OrderListItem | null>(null);
  const [cancelling, setCancelling] = useState<CancelTarget | null>(null);
  if (!user) return null;

  const requested = queue.data?.orders.filter((o) => o.status === 'requested') ?? [];
  const scheduled = queue.data?.orders.filter((o) => o.status === 'scheduled') ?? [];

  let body: ReactNode;
  if (queue.isPending) {
    body = <SectionLoading label="Loading the queue…" />;
  } else if (queue.isError && !queue.data) {
    body = <LoadFailed what="queue" error={queue.error} onRetry={() => void queue.refetch()} />;
  } else if (queue.data.total === 0) {
    body = (
      <EmptyState icon={<ClipboardIcon />} title="Nothing waiting">
        <p>
          New orders appear here, nearest contingency deadline first, ready to assign an inspector and an arrival window. Finished and
          cancelled orders are under All orders.
        </p>
      </EmptyState>
    );
  } else {
    body = (
      <div className="space-y-8">
        <QueueSection
          title="To schedule"
          description="New orders, nearest deadline first. Assign an inspector and an arrival window; everyone on the order is e-mailed."
          orders={requested}
          empty="Every order has a visit booked."
          onSchedule={setScheduling}
          onCancel={setCancelling}
        />
        <QueueSection
          title="Scheduled"
          description="Visits booked and not yet recorded. Rescheduling e-mails everyone the new time."
          orders={scheduled}
          empty="No visits are booked right now."
          onSchedule={setScheduling}
          onCancel={setCancelling}
        />
        {queue.data.total > queue.data.orders.length ? (
          <p className="text-sm text-ink-muted">
            Showing the {queue.data.orders.length} nearest deadlines of {queue.data.total}. Find the others under{' '}
            <Link to={paths.office.orders.getHref()}>All orders</Link>.
          </p>
        ) : null}
      </div>
    );
  }

  return (
    <>
      <PageHeader
        title="Office"
        description={`${user.companyName}: orders waiting for a visit.`}
        actions={
          <ButtonLink to={paths.office.newOrder.getHref()} variant="secondary">
            New order
          </ButtonLink>
        }
      />
      {body}
      <Dialog
        open={scheduling !== null}
        onClose={() => setScheduling(null)}
        title={scheduling?.status === 'scheduled' ? 'Reschedule the visit' : 'Schedule the visit'}
        description={
          scheduling ? (
            <>
              {scheduling.address}
              <br />
              Deadline <span className="numeric">{formatDay(scheduling.contingencyDeadline)}</span>
            </>
          ) : null
        }
      >
        {scheduling ? <ScheduleDialogBody key={scheduling.id} orderId={scheduling.id} onClose={() => setScheduling(null)} /> : null}
      </Dialog>
      <CancelOrderDialog order={cancelling} onClose={() => setCancelling(null)} />
    </>
  );
}
