import { useQuery } from '@tanstack/react-query';
import { formatMoney, homeAreaOf, orderKindLabels, partyRoleLabels, propertyTypeNames } from '@underfoot/core';
import { useEffect, useState, type ReactNode } from 'react';
import { Link, useLocation, useParams, useSearchParams } from 'react-router-dom';
import { ErrorPage } from '@/components/errors/error-page';
import { Alert } from '@/components/ui/alert';
import { Button, ButtonLink } from '@/components/ui/button';
import { Card, CardBody } from '@/components/ui/card';
import { SectionLoading, Spinner } from '@/components/ui/spinner';
import { paths, type Area } from '@/config/paths';
import { errorMessage, isApiError } from '@/lib/api-client';
import { useCurrentUser } from '@/lib/auth';
import { useDocumentTitle } from '@/lib/use-document-title';
import { orderQueryOptions, type OrderDetail } from '../api';
import { PaymentBadge, StatusBadge } from '../components/badges';
import { CancelOrderDialog } from '../components/cancel-order-dialog';
import { DaysLeft } from '../components/days-left';
import { OrderHistory } from '../components/order-history';
import { formatDay, formatLongDay, formatTimes } from '../components/order-format';
import { PayButton } from '../components/pay-button';
import { InspectionLink } from '../components/inspection-link';
import { ReportLink } from '../components/report-link';
import { ScheduleForm } from '../components/schedule-form';
import type { CheckoutProblemState } from './new-order';

/** The provider confirms a payment by webhook, usually within a second or two; after this long the page stops asking. */
export const PAYMENT_CONFIRM_TIMEOUT_MS = 20_000;
const PAYMENT_POLL_MS = 1_000;

const areaHomes: Record<Area, string> = {
  office: paths.office.home.getHref(),
  field: paths.field.home.getHref(),
  portal: paths.portal.home.getHref(),
};

function Section({ title, children, actions, className }: { title: string; children: ReactNode; actions?: ReactNode; className?: string }) {
  const id = `section-${title.toLowerCase().replace(/\W+/g, '-')}`;
  return (
    <Card className={className}>
      <CardBody>
        <section aria-labelledby={id}>
          <div className="mb-3 flex flex-wrap items-center justify-between gap-2">
            <h2 id={id} className="text-lg font-semibold">
              {title}
            </h2>
            {actions}
          </div>
          {children}
        </section>
      </CardBody>
    </Card>
  );
}

function Fact({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div>
      <dt className="text-sm text-ink-muted">{label}</dt>
      <dd className="break-words">{children}</dd>
    </div>
  );
}

function PaymentBanner({
  order,
  status,
  timedOut,
  onCheckAgain,
}: {
  order: OrderDetail;
  status: string | null;
  timedOut: boolean;
  onCheckAgain: () => void;
}) {
  if (status === 'success') {
    if (order.paymentState === 'paid') {
      return (
        <Alert tone="success" title="Payment received">
          Thank you. The receipt is on its way to your e-mail.
        </Alert>
      );
    }
    if (!timedOut) {
      return (
        <Alert tone="info" title="Confirming your payment…">
          <span className="inline-flex items-center gap-2">
            <Spinner />
            The payment service is telling us; this usually takes a few seconds.
          </span>
        </Alert>
      );
    }
    return (
      <Alert tone="caution" title="Your payment is not confirmed yet">
        <p>
          The payment service has not confirmed it to us yet. If you paid, it will show here shortly and you will get a receipt by e-mail;
          you will not be charged twice.
        </p>
        <Button size="sm" variant="secondary" className="mt-2" onClick={onCheckAgain}>
          Check again
        </Button>
      </Alert>
    );
  }
  if (status === 'cancelled' && order.paymentState === 'unpaid') {
    return (
      <Alert tone="caution" title="Payment not completed">
        Nothing was charged. You can pay any time from this page.
      </Alert>
    );
  }
  return null;
}

function VisitSection({ order, area }: { order: OrderDetail; area: Area }) {
  const [editing, setEditing] = useState(false);
  const showForm = order.allowed.schedule && (order.status === 'requested' || editing);
  return (
    <Section
      title="Visit"
      className="order-1"
      actions={
        order.allowed.schedule && order.status === 'scheduled' && !editing ? (
          <Button size="sm" variant="secondary" onClick={() => setEditing(true)}>
            Reschedule
          </Button>
        ) : null
      }
    >
      {order.window ? (
        <dl className="grid gap-3 sm:grid-cols-2">
          <Fact label="Arrival window">
            <span className="numeric">
              {formatLongDay(order.window.date)}, <span className="whitespace-nowrap">{formatTimes(order.window)}</span>
            </span>
          </Fact>
          <Fact label="Inspector">{order.inspector?.name ?? '—'}</Fact>
        </dl>
      ) : order.status === 'cancelled' ? (
        <p className="text-ink-muted">No visit: the order is cancelled.</p>
      ) : (
        <p className="text-ink-muted">
          Not scheduled yet.{' '}
          {area === 'office' ? 'Assign an inspector and an arrival window below.' : 'The office will e-mail everyone the arrival window.'}
        </p>
      )}
      {showForm ? (
        <div className="mt-4 border-t border-line pt-4">
          <h3 className="mb-3 font-semibold">{order.status === 'scheduled' ? 'New time' : 'Schedule the visit'}</h3>
          <ScheduleForm order={order} onDone={() => setEditing(false)} onCancel={editing ? () => setEditing(false) : undefined} />
        </div>
      ) : null}
    </Section>
  );
}

function OrderBody({ order, area }: { order: OrderDetail; area: Area }) {
  const location = useLocation();
  const [cancelling, setCancelling] = useState(false);
  const checkoutError = (location.state as Partial<CheckoutProblemState> | null)?.checkoutError ?? null;
  const p = order.property;

  return (
    <>
      {/*
        Two columns on a wide screen. On a phone the columns dissolve (display: contents) into one
        list ordered by what matters on the go: the visit, the deadline and the fee before the details.
      */}
      <div className="flex flex-col gap-6 lg:grid lg:grid-cols-[minmax(0,1.6fr)_minmax(0,1fr)] lg:items-start">
        <div className="contents lg:flex lg:flex-col lg:gap-6">
          <VisitSection order={order} area={area} />

          <Section title="Property" className="order-3">
            <dl className="grid gap-3 sm:grid-cols-2">
              <Fact label="Address">{p.address}</Fact>
              <Fact label="Property type">{propertyTypeNames[p.propertyType] ?? p.propertyType}</Fact>
              <Fact label="Year built">
                <span className="numeric">{p.yearBuilt}</span>
              </Fact>
              <Fact label="Occupancy">{p.occupancy === 'occupied' ? 'Occupied' : 'Vacant'}</Fact>
              <div className="sm:col-span-2">
                <Fact label="Cleanout and access">
                  <span className="whitespace-pre-line">{p.accessNotes || 'No access notes were given.'}</span>
                </Fact>
              </div>
              {order.note ? (
                <div className="sm:col-span-2">
                  <Fact label="Note for the office">
                    <span className="whitespace-pre-line">{order.note}</span>
                  </Fact>
                </div>
              ) : null}
            </dl>
          </Section>

          <Section title="People on this order" className="order-4">
            <ul className="divide-y divide-line">
              {order.parties.map((party) => (
                <li
                  key={`${party.userId}-${party.partyRole}`}
                  className="flex flex-wrap items-baseline justify-between gap-x-4 gap-y-1 py-2.5"
                >
                  <span className="min-w-0">
                    <span className="block font-semibold">{party.name}</span>
                    {party.email ? <span className="block text-sm break-all text-ink-muted">{party.email}</span> : null}
                  </span>
                  <span className="text-sm">
                    {partyRoleLabels[party.partyRole]}
                    {party.active ? null : <span className="text-ink-muted"> · invitation sent</span>}
                  </span>
                </li>
              ))}
            </ul>
          </Section>

          {area === 'portal' && order.history.length === 0 ? null : (
            <Section title="History" className="order-5">
              <OrderHistory events={order.history} />
            </Section>
          )}
        </div>

        <div className="contents lg:flex lg:flex-col lg:gap-6">
          <Section title="Deadline" className="order-2">
            <p className="numeric text-lg font-semibold">{formatLongDay(order.contingencyDeadline)}</p>
            <DaysLeft daysLeft={order.daysLeft} status={order.status} />
            {order.preferredDates.length > 0 ? (
              <p className="mt-3 text-sm">
                <span className="text-ink-muted">Preferred visit dates: </span>
                <span className="numeric">{order.preferredDates.map(formatDay).join(' · ')}</span>
              </p>
            ) : null}
          </Section>

          <Section title="Fee and payment" className="order-2">
            <table className="w-full text-sm">
              <caption className="sr-only">Fee lines</caption>
              <tbody>
                {order.feeLines.map((line, i) => (
                  <tr key={`${line.name}-${i}`} className="border-b border-line">
                    <th scope="row" className="py-2 pr-3 text-left font-normal">
                      {line.name}
                    </th>
                    <td className="numeric py-2 text-right">{formatMoney(line.priceCents)}</td>
                  </tr>
                ))}
              </tbody>
              <tfoot>
                <tr>
                  <th scope="row" className="pt-2 pr-3 text-left font-semibold">
                    Total
                  </th>
                  <td className="numeric pt-2 text-right font-semibold">{formatMoney(order.feeTotalCents)}</td>
                </tr>
              </tfoot>
            </table>
            <div className="mt-4 flex flex-wrap items-center gap-2">
              <PaymentBadge state={order.paymentState} payer={order.payer} />
              <span className="text-sm text-ink-muted">
                {order.paymentState === 'paid'
                  ? 'Paid by card.'
                  : order.paymentState === 'refunded'
                    ? 'Refunded to the card it was paid with.'
                    : order.payer === 'agent_now'
                      ? 'The ordering agent pays by card.'
                      : 'The client pays before the report is released.'}
              </span>
            </div>
            {order.allowed.pay ? (
              <div className="mt-4">
                <PayButton orderId={order.id} amountCents={order.feeTotalCents} initialError={checkoutError} />
              </div>
            ) : null}
          </Section>

          {order.allowed.cancel ? (
            <Section title="Cancel" className="order-2">
              <p className="mb-3 text-sm text-ink-muted">
                {order.paymentState === 'paid'
                  ? 'Cancelling before the visit refunds the fee. Everyone on the order is e-mailed.'
                  : 'Everyone on the order is e-mailed the reason.'}
              </p>
              <Button variant="secondary" onClick={() => setCancelling(true)} className="w-full">
                Cancel the order
              </Button>
            </Section>
          ) : null}
        </div>
      </div>
      <CancelOrderDialog
        order={
          cancelling ? { id: order.id, address: p.address, paymentState: order.paymentState, feeTotalCents: order.feeTotalCents } : null
        }
        onClose={() => setCancelling(false)}
      />
    </>
  );
}

/** One order, for whoever may see it: the office, the assigned inspector, and the parties on it. */
export function OrderDetailRoute() {
  const { orderId = '' } = useParams();
  const user = useCurrentUser();
  const [searchParams] = useSearchParams();
  const paymentStatus = searchParams.get('payment');
  const placed = searchParams.get('placed') === '1';
  const [timedOut, setTimedOut] = useState(false);
  const waitingForPayment = paymentStatus === 'success' && !timedOut;
  const order = useQuery({
    ...orderQueryOptions(orderId),
    // Back from the checkout: the provider's webhook marks the order paid a moment later.
    refetchInterval: (query) => (waitingForPayment && query.state.data?.paymentState === 'unpaid' ? PAYMENT_POLL_MS : false),
    ...(paymentStatus === 'success' ? { staleTime: 0 } : {}),
  });

  useEffect(() => {
    if (paymentStatus !== 'success') return;
    const timer = setTimeout(() => setTimedOut(true), PAYMENT_CONFIRM_TIMEOUT_MS);
    return () => clearTimeout(timer);
  }, [paymentStatus]);

  useDocumentTitle(order.data ? order.data.property.street : 'Order');
  if (!user) return null;
  const area = homeAreaOf[user.role];

  if (order.isPending) return <SectionLoading label="Loading the order…" />;
  if (order.isError) {
    if (isApiError(order.error, 404)) {
      return (
        <ErrorPage
          eyebrow="Order not found"
          title="We could not find that order"
          actions={<ButtonLink to={areaHomes[area]}>Back to your orders</ButtonLink>}
        >
          <p>It may have been mistyped, or it is not one of the orders you are part of.</p>
        </ErrorPage>
      );
    }
    return (
      <Alert tone="danger" title="The order could not be loaded">
        <p>{errorMessage(order.error)}</p>
        <Button size="sm" variant="secondary" className="mt-2" onClick={() => void order.refetch()}>
          Try again
        </Button>
      </Alert>
    );
  }

  const data = order.data;
  const unit = data.property.unit ? `, ${data.property.unit}` : '';
  return (
    <>
      <p className="mb-2 text-sm">
        <Link to={areaHomes[area]}>← {area === 'field' ? 'Your jobs' : area === 'office' ? 'Office' : 'Your reports'}</Link>
      </p>
      <div className="mb-6 flex flex-wrap items-start justify-between gap-3">
        <div className="min-w-0">
          <h1 className="text-2xl font-bold tracking-tight break-words sm:text-3xl">
            {data.property.street}
            {unit}
          </h1>
          <p className="mt-1 text-ink-muted">
            {data.property.city}, {data.property.region} {data.property.postalCode} · {orderKindLabels[data.kind]} inspection
          </p>
        </div>
        <StatusBadge status={data.status} />
      </div>
      <div className="mb-6 space-y-3 empty:hidden">
        {placed ? (
          <Alert tone="success" title="Order placed">
            Everyone on the order has been e-mailed: a confirmation for you, and an invitation for the people you added. The office will
            schedule the visit.
          </Alert>
        ) : null}
        <PaymentBanner
          order={data}
          status={paymentStatus}
          timedOut={timedOut}
          onCheckAgain={() => {
            void order.refetch();
          }}
        />
        <InspectionLink order={data} area={area} />
        <ReportLink order={data} area={area} />
        {data.status === 'cancelled' ? (
          <Alert tone="caution" title="This order is cancelled">
            {data.cancelReason ? <p>Reason: {data.cancelReason}</p> : null}
          </Alert>
        ) : null}
      </div>
      <OrderBody order={data} area={area} />
    </>
  );
}
