import type { Knex } from 'knex';
import type Stripe from 'stripe';
import { can, formatAddress, formatMoney, type Actor } from '@underfoot/core';
import { conflict, forbidden, HttpError } from '../../http/errors.ts';
import { nowIso } from '../../lib/clock.ts';
import { newId } from '../../lib/ids.ts';
import { recordAudit } from '../audit/audit.repo.ts';
import type { UserRecord } from '../auth/users.repo.ts';
import { mailBrandOf } from '../company/brand.ts';
import { enqueueMail } from '../mail/outbox.repo.ts';
import { addOrderEvent, findOrderRow, loadOrderAccess, type OrderRow } from '../orders/orders.repo.ts';

export interface PaymentsServiceDeps {
  db: Knex;
  provider: Stripe;
  webhookSecret: string;
  publicUrl: string;
  mailQueued: () => void;
  log: { warn(obj: object, msg: string): void };
  /** Called inside the payment's transaction once an order is paid (releases a report held for payment). */
  onPaid?: (trx: Knex.Transaction, orderId: string) => Promise<unknown>;
}

const providerDown = () =>
  new HttpError(
    502,
    'payment_provider_unavailable',
    'The payment service is not answering right now. Nothing was charged; please try again in a minute.',
  );

function isProviderConnectionError(err: unknown): boolean {
  const type = (err as { type?: string })?.type;
  return type === 'StripeConnectionError' || type === 'StripeAPIError' || (err as { statusCode?: number })?.statusCode === 503;
}

export function createPaymentsService(deps: PaymentsServiceDeps) {
  const { db, provider } = deps;

  /** Open (or reopen) the provider's hosted checkout for an order's fee; returns where to send the payer. */
  async function startCheckout(actor: UserRecord, orderId: string): Promise<{ url: string }> {
    const order = await findOrderRow(db, orderId);
    const access = order ? await loadOrderAccess(db, order) : undefined;
    const asActor: Actor = { kind: 'user', userId: actor.id, role: actor.role, companyId: actor.companyId };
    if (!order || !access || !can(asActor, 'order.view', { order: access }))
      throw new HttpError(404, 'not_found', 'We could not find that order.');
    if (!can(asActor, 'order.pay', { order: access })) throw forbidden('Payment is made by the agent or client on the order.');
    if (order.status === 'cancelled') throw conflict('This order was cancelled; there is nothing to pay.', 'order_cancelled');
    if (order.payment_state !== 'unpaid') throw conflict('This order is already paid.', 'already_paid');

    // A checkout that is still open is reused, so two clicks never make two charges.
    const open = await db('payments').where({ order_id: orderId, status: 'open' }).orderBy('created_at', 'desc').first();
    if (open) {
      try {
        const session = await provider.checkout.sessions.retrieve(open.checkout_session_id);
        if (session.status === 'open' && session.url) return { url: session.url };
        if (session.status === 'expired') await db('payments').where({ id: open.id }).update({ status: 'expired', updated_at: nowIso() });
      } catch (err) {
        if (isProviderConnectionError(err)) throw providerDown();
        throw err;
      }
    }

    const lines = await db('order_fee_lines').where({ order_id: orderId }).orderBy('id');
    const property = await db('properties').where({ id: order.property_id }).first();
    const address = formatAddress({
      street: property.street,
      unit: property.unit,
      city: property.city,
      region: property.region,
      postalCode: property.postal_code,
    });
    const paymentId = newId();
    const returnTo = `${deps.publicUrl}/portal/orders/${orderId}`;
    let session: Stripe.Checkout.Session;
    try {
      session = await provider.checkout.sessions.create(
        {
          mode: 'payment',
          line_items: lines.map((l) => ({
            quantity: 1,
            price_data: { currency: 'usd', unit_amount: l.price_cents, product_data: { name: `${l.name} — ${address}` } },
          })),
          customer_email: actor.email,
          client_reference_id: orderId,
          metadata: { orderId, paymentId },
          success_url: `${returnTo}?payment=success`,
          cancel_url: `${returnTo}?payment=cancelled`,
        },
        { idempotencyKey: `checkout-${paymentId}` },
      );
    } catch (err) {
      if (isProviderConnectionError(err)) throw providerDown();
      throw err;
    }
    if (!session.url) throw providerDown();
    const now = nowIso();
    await db('payments').insert({
      id: paymentId,
      order_id: orderId,
      checkout_session_id: session.id,
      checkout_url: session.url,
      amount_cents: session.amount_total ?? order.fee_total_cents,
      currency: session.currency ?? 'usd',
      status: 'open',
      created_by: actor.id,
      created_at: now,
      updated_at: now,
    });
    return { url: session.url };
  }

  /** Refund the paid payment of an order (used when an order is cancelled before the visit). */
  async function refundOrderPayment(order: OrderRow, actor: UserRecord): Promise<number | null> {
    const paid = await db('payments').where({ order_id: order.id, status: 'paid' }).first();
    if (!paid?.payment_intent_id) return null;
    let refund: Stripe.Refund;
    try {
      refund = await provider.refunds.create({ payment_intent: paid.payment_intent_id }, { idempotencyKey: `refund-${paid.id}` });
    } catch (err) {
      if (isProviderConnectionError(err)) {
        throw new HttpError(
          502,
          'payment_provider_unavailable',
          'The payment service is not answering, so the refund could not be made. The order was not cancelled; please try again in a minute.',
        );
      }
      throw err;
    }
    await db('payments').where({ id: paid.id }).update({ status: 'refunded', refund_id: refund.id, updated_at: nowIso() });
    await recordAudit(db, {
      companyId: order.company_id,
      actorUserId: actor.id,
      action: 'payment.refunded',
      subjectType: 'order',
      subjectId: order.id,
      detail: { amountCents: refund.amount },
    });
    return refund.amount;
  }

  /** Verify, deduplicate and apply one webhook from the provider. */
  async function handleWebhook(rawBody: Buffer, signature: string | undefined): Promise<{ duplicate: boolean }> {
    let event: Stripe.Event;
    try {
      event = provider.webhooks.constructEvent(rawBody, signature ?? '', deps.webhookSecret);
    } catch {
      throw new HttpError(400, 'invalid_signature', 'The webhook signature does not match.');
    }
    let mailed = false;
    const outcome = await db.transaction(async (trx) => {
      // One statement claims the event id: on PostgreSQL a copy arriving at the same moment waits for
      // this transaction and then finds the id taken, instead of failing on the primary key.
      const claimed = await trx('payment_events')
        .insert({ event_id: event.id, type: event.type, received_at: nowIso() })
        .onConflict('event_id')
        .ignore()
        .returning('event_id');
      if (claimed.length === 0) return { duplicate: true };
      if (event.type === 'checkout.session.completed' || event.type === 'checkout.session.async_payment_succeeded') {
        mailed = await markPaid(trx, event.data.object);
      } else if (event.type === 'checkout.session.expired') {
        await trx('payments')
          .where({ checkout_session_id: event.data.object.id, status: 'open' })
          .update({ status: 'expired', updated_at: nowIso() });
      } else if (event.type === 'charge.refunded') {
        const intent =
          typeof event.data.object.payment_intent === 'string' ? event.data.object.payment_intent : event.data.object.payment_intent?.id;
        if (intent) mailed = await markRefunded(trx, intent);
      } else if (event.type === 'refund.created' || event.type === 'refund.updated') {
        const intent =
          typeof event.data.object.payment_intent === 'string' ? event.data.object.payment_intent : event.data.object.payment_intent?.id;
        if (intent && event.data.object.status === 'succeeded') mailed = await markRefunded(trx, intent);
      }
      return { duplicate: false };
    });
    if (mailed) deps.mailQueued();
    return outcome;
  }

  async function markPaid(trx: Knex.Transaction, session: Stripe.Checkout.Session): Promise<boolean> {
    if (session.payment_status !== 'paid') return false;
    const payment = await trx('payments').where({ checkout_session_id: session.id }).first();
    if (!payment) {
      deps.log.warn({ session: session.id }, 'payment webhook for an unknown checkout session');
      return false;
    }
    // Already settled (paid twice, or refunded first by an out-of-order event): change nothing.
    if (payment.status !== 'open' && payment.status !== 'expired') return false;
    const intent = typeof session.payment_intent === 'string' ? session.payment_intent : (session.payment_intent?.id ?? null);
    const now = nowIso();
    await trx('payments').where({ id: payment.id }).update({ status: 'paid', payment_intent_id: intent, updated_at: now });
    await trx('orders').where({ id: payment.order_id, payment_state: 'unpaid' }).update({ payment_state: 'paid', updated_at: now });
    await addOrderEvent(trx, {
      orderId: payment.order_id,
      actorUserId: payment.created_by,
      type: 'paid',
      detail: { amountCents: payment.amount_cents },
    });
    await deps.onPaid?.(trx, payment.order_id);

    const order = (await findOrderRow(trx, payment.order_id))!;
    const payer = payment.created_by ? await trx('users').where({ id: payment.created_by }).first() : undefined;
    const company = await trx('companies').where({ id: order.company_id }).first();
    const property = await trx('properties').where({ id: order.property_id }).first();
    const lines = await trx('order_fee_lines').where({ order_id: order.id }).orderBy('id');
    await recordAudit(trx, {
      companyId: order.company_id,
      actorUserId: payment.created_by,
      action: 'payment.received',
      subjectType: 'order',
      subjectId: order.id,
      detail: { amountCents: payment.amount_cents },
    });
    if (!payer) return false;
    await enqueueMail(trx, {
      companyId: order.company_id,
      ...mailBrandOf(company, deps.publicUrl),
      to: payer.email,
      template: 'payment_receipt',
      vars: {
        name: payer.name,
        url: `${deps.publicUrl}/portal/orders/${order.id}`,
        address: formatAddress({
          street: property.street,
          unit: property.unit,
          city: property.city,
          region: property.region,
          postalCode: property.postal_code,
        }),
        amountText: formatMoney(payment.amount_cents),
        paidAt: new Intl.DateTimeFormat('en-US', { dateStyle: 'long', timeZone: company.time_zone }).format(new Date()),
        lines: lines.map((l) => `${l.name}: ${formatMoney(l.price_cents)}`),
        reference: payment.id,
      },
    });
    return true;
  }

  async function markRefunded(trx: Knex.Transaction, paymentIntentId: string): Promise<boolean> {
    const payment = await trx('payments').where({ payment_intent_id: paymentIntentId }).first();
    // A refund can overtake the payment it refunds. Answer non-2xx (rolling back the event record) so the provider retries it later.
    if (!payment) throw new HttpError(409, 'payment_not_seen_yet', 'This refund is for a payment not recorded yet; send it again later.');
    const order = (await findOrderRow(trx, payment.order_id))!;
    const firstTime = payment.status !== 'refunded';
    await trx('payments').where({ id: payment.id }).update({ status: 'refunded', updated_at: nowIso() });
    await trx('orders').where({ id: order.id }).update({ payment_state: 'refunded', updated_at: nowIso() });
    if (!firstTime) return false;
    await addOrderEvent(trx, { orderId: order.id, actorUserId: null, type: 'refunded', detail: { amountCents: payment.amount_cents } });
    const payer = payment.created_by ? await trx('users').where({ id: payment.created_by }).first() : undefined;
    if (!payer) return false;
    const company = await trx('companies').where({ id: order.company_id }).first();
    const property = await trx('properties').where({ id: order.property_id }).first();
    await enqueueMail(trx, {
      companyId: order.company_id,
      ...mailBrandOf(company, deps.publicUrl),
      to: payer.email,
      template: 'payment_refunded',
      vars: {
        name: payer.name,
        url: `${deps.publicUrl}/portal/orders/${order.id}`,
        address: formatAddress({
          street: property.street,
          unit: property.unit,
          city: property.city,
          region: property.region,
          postalCode: property.postal_code,
        }),
        amountText: formatMoney(payment.amount_cents),
      },
    });
    return true;
  }

  return { startCheckout, refundOrderPayment, handleWebhook };
}

export type PaymentsService = ReturnType<typeof createPaymentsService>;
