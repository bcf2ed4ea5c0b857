import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import express, { type NextFunction, type Request, type Response } from 'express';
import Stripe from 'stripe';
import { pageHeaders, renderCheckoutPage, renderNoticePage } from './checkout-page.ts';
import { createEventOutbox } from './event-outbox.ts';
import type { FormObject } from './form-params.ts';
import {
  newId,
  nowSeconds,
  type FakeCharge,
  type FakeCheckoutSession,
  type FakeDelivery,
  type FakeEvent,
  type FakePaymentIntent,
  type FakeRefund,
} from './payment-objects.ts';
import { invalidRequest, noSuchObject, ProviderError } from './provider-error.ts';
import { parseRefundParams, parseSessionParams, readExpand, type SessionParams } from './session-params.ts';

export interface FakePaymentsOptions {
  host?: string;
  /** 0 (the default) picks any free port. */
  port?: number;
  /** Where signed events are POSTed; must be on this machine. */
  webhookUrl: string;
  webhookSecret: string;
  /** The secret key the SDK must present (default `sk_test_underfoot_fake`). */
  apiKey?: string;
  /** Base URL browsers use to reach the checkout page, when it differs from `http://host:port`. */
  publicUrl?: string;
  /** Waits between automatic webhook retries (default 1 s, 2 s, 4 s, 8 s: five attempts in all). */
  webhookRetryDelaysMs?: number[];
  /** How long one webhook attempt may take before it counts as failed (default 5 s). */
  webhookTimeoutMs?: number;
}

/** `unavailable`: API calls get HTTP 503 in the provider's error shape; `reset`: their connections are dropped. */
export type FakeDownMode = 'unavailable' | 'reset';

export interface FakePayments {
  host: string;
  port: number;
  /** Where the SDK should be pointed: `new Stripe(apiKey, { host, port, protocol: 'http' })`. */
  url: string;
  apiKey: string;
  webhookSecret: string;
  sessions(): FakeCheckoutSession[];
  refunds(): FakeRefund[];
  /** Every event emitted, oldest first, as sent to the webhook endpoint. */
  events(): FakeEvent[];
  /** Every delivery attempt, optionally for one event. */
  deliveries(eventId?: string): FakeDelivery[];
  /** What pressing "Pay" on the checkout page does, without a browser. Resolves after the first webhook attempt. */
  paySession(sessionId: string): Promise<FakeCheckoutSession>;
  /** Expires an open session (as `POST /v1/checkout/sessions/:id/expire` does) and emits `checkout.session.expired`. */
  expireSession(sessionId: string): FakeCheckoutSession;
  /** While down, API calls fail (see FakeDownMode) and checkout pages answer 503. */
  setDown(down: boolean, mode?: FakeDownMode): void;
  setWebhookUrl(url: string): void;
  /** Hold automatic webhook delivery, so a test can send events by hand in any order. */
  pauseWebhooks(): void;
  /** Deliver the held events not yet sent by hand, oldest first, and go back to automatic delivery. */
  resumeWebhooks(): Promise<void>;
  /** One freshly signed delivery of an event, now. Rejects (WebhookDeliveryError) unless the endpoint answers 2xx. */
  resendEvent(eventId: string): Promise<FakeDelivery>;
  /** Same as resendEvent. */
  deliverWebhook(eventId: string): Promise<FakeDelivery>;
  /** Forget all sessions, payments, refunds, events and idempotency keys; come back up. */
  reset(): void;
  close(): Promise<void>;
}

interface SessionRecord {
  session: FakeCheckoutSession;
  params: SessionParams;
}

interface PaymentRecord {
  intent: FakePaymentIntent;
  charge: FakeCharge;
}

interface SavedResponse {
  fingerprint: string;
  status: number;
  body: unknown;
}

const NO_REQUEST: FakeEvent['request'] = { id: null, idempotency_key: null };

const maskKey = (key: string) => (key.length > 12 ? `${key.slice(0, 8)}${'*'.repeat(key.length - 12)}${key.slice(-4)}` : '****');

/**
 * A local stand-in for the payment provider, driven by its official SDK: checkout sessions, refunds and a
 * hosted checkout page, with signed webhooks to the app. Listens on 127.0.0.1 and sends nothing anywhere else.
 */
export async function startFakePayments(options: FakePaymentsOptions): Promise<FakePayments> {
  const host = options.host ?? '127.0.0.1';
  const apiKey = options.apiKey ?? 'sk_test_underfoot_fake';
  const { webhookSecret } = options;
  if (!webhookSecret) throw new Error('startFakePayments needs a webhookSecret to sign events with');

  const outbox = createEventOutbox({
    webhookUrl: options.webhookUrl,
    webhookSecret,
    retryDelaysMs: options.webhookRetryDelaysMs ?? [1000, 2000, 4000, 8000],
    timeoutMs: options.webhookTimeoutMs ?? 5000,
  });

  const sessions = new Map<string, SessionRecord>();
  const payments = new Map<string, PaymentRecord>();
  const chargeToIntent = new Map<string, string>();
  const refunds = new Map<string, FakeRefund>();
  const idempotent = new Map<string, SavedResponse>();
  let down: FakeDownMode | null = null;
  let publicUrl = '';

  // ---- state changes shared by the API, the page and the test handle ----

  function expire(record: SessionRecord, request: FakeEvent['request']): void {
    record.session.status = 'expired';
    record.session.url = null;
    void outbox.emit('checkout.session.expired', record.session, request).firstAttempt;
  }

  /** Sessions lapse lazily: the first look after `expires_at` expires them, as a sweep would. */
  function current(record: SessionRecord): SessionRecord {
    if (record.session.status === 'open' && nowSeconds() >= record.session.expires_at) expire(record, NO_REQUEST);
    return record;
  }

  /** Marks the session paid, creates its payment, and emits `checkout.session.completed`. Only ever once per session. */
  function complete(record: SessionRecord): Promise<void> {
    const { session, params } = record;
    const created = nowSeconds();
    const intentId = newId('pi_');
    const chargeId = newId('ch_');
    const intent: FakePaymentIntent = {
      id: intentId,
      object: 'payment_intent',
      amount: session.amount_total,
      amount_received: session.amount_total,
      created,
      currency: session.currency,
      description: params.paymentIntentDescription,
      latest_charge: chargeId,
      livemode: false,
      metadata: { ...params.paymentIntentMetadata },
      receipt_email: session.customer_email,
      status: 'succeeded',
    };
    const charge: FakeCharge = {
      id: chargeId,
      object: 'charge',
      amount: session.amount_total,
      amount_captured: session.amount_total,
      amount_refunded: 0,
      captured: true,
      created,
      currency: session.currency,
      description: params.paymentIntentDescription,
      livemode: false,
      metadata: { ...params.paymentIntentMetadata },
      paid: true,
      payment_intent: intentId,
      receipt_email: session.customer_email,
      refunded: false,
      status: 'succeeded',
    };
    payments.set(intentId, { intent, charge });
    chargeToIntent.set(chargeId, intentId);
    session.status = 'complete';
    session.payment_status = 'paid';
    session.payment_intent = intentId;
    session.url = null;
    return outbox.emit('checkout.session.completed', session, NO_REQUEST).firstAttempt;
  }

  const successTarget = (record: SessionRecord) => record.session.success_url.replaceAll('{CHECKOUT_SESSION_ID}', record.session.id);

  // ---- the REST API the SDK calls ----

  const api = express.Router();

  const reply = (res: Response, body: unknown, status = 200) => {
    const pending = res.locals.idempotency as { key: string; fingerprint: string } | undefined;
    // Only completed requests are remembered; a request refused by validation may be retried with the same key.
    if (pending) idempotent.set(pending.key, { fingerprint: pending.fingerprint, status, body: structuredClone(body) });
    res.status(status).json(body);
  };

  const requestOf = (req: Request, res: Response): FakeEvent['request'] => ({
    id: res.locals.requestId as string,
    idempotency_key: req.get('idempotency-key') ?? null,
  });

  const findSession = (id: string): SessionRecord => {
    const record = sessions.get(id);
    if (!record) throw noSuchObject('checkout.session', id, 'session', 404);
    return current(record);
  };

  const findPayment = (intentId: string, param: string): PaymentRecord => {
    const payment = payments.get(intentId);
    if (!payment) throw noSuchObject('payment_intent', intentId, param);
    return payment;
  };

  const withExpansions = (session: FakeCheckoutSession, expand: string[]) =>
    expand.includes('payment_intent') && session.payment_intent
      ? { ...structuredClone(session), payment_intent: structuredClone(findPayment(session.payment_intent, 'expand').intent) }
      : structuredClone(session);

  api.use((req, res, next) => {
    res.locals.requestId = newId('req_', 14);
    res.set({ 'Request-Id': res.locals.requestId as string, 'Stripe-Version': req.get('stripe-version') ?? Stripe.API_VERSION });
    const key = req.get('idempotency-key');
    if (key) res.set('Idempotency-Key', key);
    next();
  });

  api.use((req, _res, next) => {
    if (down === 'reset') {
      req.socket.destroy();
      return;
    }
    if (down === 'unavailable') {
      throw new ProviderError(503, 'api_error', 'The payment provider is unavailable right now (the local stand-in was set down).');
    }
    next();
  });

  api.use((req, _res, next) => {
    const header = req.get('authorization') ?? '';
    const bearer = /^Bearer\s+(\S+)\s*$/i.exec(header)?.[1];
    const basic = /^Basic\s+(\S+)\s*$/i.exec(header)?.[1];
    const key = bearer ?? (basic ? Buffer.from(basic, 'base64').toString('utf8').split(':')[0] : undefined);
    if (!key) {
      throw new ProviderError(
        401,
        'authentication_error',
        "You did not provide an API key. Provide it in the Authorization header, using Bearer auth (e.g. 'Authorization: Bearer YOUR_SECRET_KEY').",
      );
    }
    if (key !== apiKey) throw new ProviderError(401, 'authentication_error', `Invalid API Key provided: ${maskKey(key)}`);
    next();
  });

  api.use(express.urlencoded({ extended: true, limit: '256kb' }));

  // The SDK sends an Idempotency-Key on every POST (and reuses it on retries); a repeat gets the first answer back.
  api.use((req, res, next) => {
    const key = req.get('idempotency-key');
    if (req.method !== 'POST' || !key) return next();
    if (key.length > 255) throw invalidRequest('Idempotency keys can be at most 255 characters long.', 'idempotency_key');
    const fingerprint = `${req.method} ${req.baseUrl}${req.path}\n${JSON.stringify(req.body ?? {})}`;
    const saved = idempotent.get(key);
    if (!saved) {
      res.locals.idempotency = { key, fingerprint };
      return next();
    }
    if (saved.fingerprint !== fingerprint) {
      throw new ProviderError(
        400,
        'idempotency_error',
        `Keys for idempotent requests can only be used with the same parameters they were first used with. Try using a key other than '${key}' if you meant to execute a different request.`,
      );
    }
    res.set('Idempotent-Replayed', 'true').status(saved.status).json(saved.body);
  });

  const bodyOf = (req: Request): FormObject => (req.body ?? {}) as FormObject;

  api.post('/checkout/sessions', (req, res) => {
    const body = bodyOf(req);
    const now = nowSeconds();
    const params = parseSessionParams(body, now);
    const expand = readExpand(body.expand, ['payment_intent']);
    const id = newId('cs_test_', 58);
    const session: FakeCheckoutSession = {
      id,
      object: 'checkout.session',
      amount_subtotal: params.amountTotal,
      amount_total: params.amountTotal,
      cancel_url: params.cancelUrl,
      client_reference_id: params.clientReferenceId,
      created: now,
      currency: params.currency,
      customer: null,
      customer_email: params.customerEmail,
      expires_at: params.expiresAt,
      livemode: false,
      locale: null,
      metadata: params.metadata,
      mode: 'payment',
      payment_intent: null,
      payment_method_types: ['card'],
      payment_status: 'unpaid',
      status: 'open',
      submit_type: null,
      success_url: params.successUrl,
      ui_mode: 'hosted_page',
      url: `${publicUrl}/checkout/${id}`,
    };
    sessions.set(id, { session, params });
    reply(res, withExpansions(session, expand));
  });

  api.get('/checkout/sessions/:id', (req, res) => {
    const expand = readExpand(req.query.expand, ['payment_intent']);
    reply(res, withExpansions(findSession(req.params.id).session, expand));
  });

  api.post('/checkout/sessions/:id/expire', (req, res) => {
    const record = findSession(req.params.id);
    if (record.session.status !== 'open') {
      throw invalidRequest(
        `Only Checkout Sessions with a status in ["open"] can be expired. This Checkout Session has a status of "${record.session.status}".`,
      );
    }
    expire(record, requestOf(req, res));
    reply(res, structuredClone(record.session));
  });

  api.post('/refunds', (req, res) => {
    const params = parseRefundParams(bodyOf(req));
    let intentId = params.paymentIntent;
    if (params.charge) {
      intentId = chargeToIntent.get(params.charge);
      if (!intentId) throw noSuchObject('charge', params.charge, 'charge');
    }
    const { charge } = findPayment(intentId!, 'payment_intent');
    const remaining = charge.amount - charge.amount_refunded;
    if (remaining === 0) throw invalidRequest(`Charge ${charge.id} has already been refunded.`, undefined, 'charge_already_refunded');
    const amount = params.amount ?? remaining;
    if (amount > remaining) {
      throw invalidRequest(
        `Refund amount (${amount}) is greater than unrefunded amount on charge (${remaining}).`,
        'amount',
        'amount_too_large',
      );
    }
    const refund: FakeRefund = {
      id: newId('re_'),
      object: 'refund',
      amount,
      charge: charge.id,
      created: nowSeconds(),
      currency: charge.currency,
      metadata: params.metadata,
      payment_intent: charge.payment_intent,
      reason: params.reason,
      status: 'succeeded',
    };
    refunds.set(refund.id, refund);
    const previous: Record<string, unknown> = { amount_refunded: charge.amount_refunded };
    charge.amount_refunded += amount;
    if (charge.amount_refunded === charge.amount) {
      charge.refunded = true;
      previous.refunded = false;
    }
    // Delivered in the background, like the real provider: the API answer does not wait for the app's webhook.
    void outbox.emit('charge.refunded', charge, requestOf(req, res), previous).firstAttempt;
    reply(res, structuredClone(refund));
  });

  api.get('/refunds/:id', (req, res) => {
    const refund = refunds.get(req.params.id);
    if (!refund) throw noSuchObject('refund', req.params.id, 'id', 404);
    reply(res, structuredClone(refund));
  });

  api.get('/payment_intents/:id', (req, res) => {
    const payment = payments.get(req.params.id);
    if (!payment) throw noSuchObject('payment_intent', req.params.id, 'intent', 404);
    reply(res, structuredClone(payment.intent));
  });

  api.use((req) => {
    throw new ProviderError(
      404,
      'invalid_request_error',
      `Unrecognized request URL (${req.method}: ${req.originalUrl.split('?')[0]}). This local payment stand-in answers checkout sessions, refunds and payment intents only.`,
    );
  });

  api.use((err: unknown, _req: Request, res: Response, _next: NextFunction) => {
    if (err instanceof ProviderError) {
      res.status(err.status).json(err.toBody());
      return;
    }
    // Body-parser failures (malformed or oversized form bodies) carry their own 4xx status.
    const status = (err as { status?: number }).status;
    if (status && status >= 400 && status < 500) {
      res.status(status).json(invalidRequest(`Could not read the request body: ${(err as Error).message}`).toBody());
      return;
    }
    res.status(500).json(new ProviderError(500, 'api_error', 'The local payment stand-in hit an internal error.').toBody());
    console.error('[fake-payments]', err);
  });

  // ---- the hosted checkout page ----

  const pages = express.Router();

  const sendPage = (res: Response, status: number, html: string, record?: SessionRecord) => {
    res
      .status(status)
      .set(pageHeaders(record ? [record.session.success_url, record.session.cancel_url] : []))
      .send(html);
  };

  const pageState = (res: Response, record: SessionRecord | undefined): record is SessionRecord => {
    if (down) {
      sendPage(
        res,
        503,
        renderNoticePage('Payment service unavailable', 'The payment service is not answering right now. Try again in a moment.'),
      );
      return false;
    }
    if (!record) {
      sendPage(
        res,
        404,
        renderNoticePage('Checkout not found', 'There is no checkout at this address. Go back to the site and start the payment again.'),
      );
      return false;
    }
    current(record);
    return true;
  };

  const expiredPage = (res: Response, record: SessionRecord) =>
    sendPage(
      res,
      410,
      renderNoticePage(
        'This checkout has expired',
        'Nothing was charged. Go back to the site to start a new payment.',
        record.session.cancel_url ? { href: record.session.cancel_url, label: 'Back to the site' } : undefined,
      ),
      record,
    );

  const paidPage = (res: Response, record: SessionRecord) =>
    sendPage(
      res,
      200,
      renderNoticePage('Already paid', 'This checkout has been paid. Nothing more to do here.', {
        href: successTarget(record),
        label: 'Back to the site',
      }),
      record,
    );

  pages.get('/:id', (req, res) => {
    const record = sessions.get(req.params.id);
    if (!pageState(res, record)) return;
    if (record.session.status === 'expired') return expiredPage(res, record);
    if (record.session.status === 'complete') return paidPage(res, record);
    sendPage(
      res,
      200,
      renderCheckoutPage(record.session.id, {
        lines: record.params.lines,
        currency: record.session.currency,
        amountTotal: record.session.amount_total,
        customerEmail: record.session.customer_email,
        clientReferenceId: record.session.client_reference_id,
      }),
      record,
    );
  });

  pages.post('/:id/pay', async (req, res) => {
    const record = sessions.get(req.params.id);
    if (!pageState(res, record)) return;
    if (record.session.status === 'expired') return expiredPage(res, record);
    // Paying twice (a double click, a refresh) changes nothing: back to the success page without a second event.
    if (record.session.status === 'open') {
      // Waiting for the first webhook attempt means the app usually knows about the payment before the browser arrives.
      await complete(record);
    }
    res.redirect(303, successTarget(record));
  });

  pages.post('/:id/decline', (req, res) => {
    const record = sessions.get(req.params.id);
    if (!pageState(res, record)) return;
    if (record.session.status === 'expired') return expiredPage(res, record);
    if (record.session.status === 'complete') return paidPage(res, record);
    // The session stays open and unpaid, so the payer can come back and pay later.
    if (record.session.cancel_url) return res.redirect(303, record.session.cancel_url);
    sendPage(res, 200, renderNoticePage('Payment declined', 'Nothing was charged. You can close this page.'), record);
  });

  // ---- the server ----

  const app = express();
  app.disable('x-powered-by');
  app.set('query parser', 'extended'); // the SDK sends GET parameters in bracket notation too (expand[0]=…)
  app.get('/', (_req, res) => {
    res.json({ service: 'underfoot-fake-payments', down: down !== null });
  });
  app.use('/v1', api);
  app.use('/checkout', pages);
  app.use((_req, res) => {
    res.status(404).set(pageHeaders([])).send(renderNoticePage('Not found', 'There is nothing at this address.'));
  });

  const server: Server = await new Promise((resolve, reject) => {
    const s = app.listen(options.port ?? 0, host, (err?: Error) => (err ? reject(err) : resolve(s)));
  });
  const port = (server.address() as AddressInfo).port;
  const url = `http://${host}:${port}`;
  publicUrl = (options.publicUrl ?? url).replace(/\/+$/, '');

  const handleSession = (id: string): SessionRecord => {
    const record = sessions.get(id);
    if (!record) throw new Error(`No such checkout session: ${id}`);
    return current(record);
  };

  return {
    host,
    port,
    url,
    apiKey,
    webhookSecret,
    sessions: () => [...sessions.values()].map((r) => structuredClone(current(r).session)),
    refunds: () => [...refunds.values()].map((r) => structuredClone(r)),
    events: () => outbox.events(),
    deliveries: (eventId) => outbox.deliveries(eventId),
    paySession: async (id) => {
      const record = handleSession(id);
      if (record.session.status === 'expired') throw new Error(`Checkout session ${id} has expired`);
      if (record.session.status === 'open') await complete(record);
      return structuredClone(record.session);
    },
    expireSession: (id) => {
      const record = handleSession(id);
      if (record.session.status !== 'open') throw new Error(`Checkout session ${id} is ${record.session.status}, not open`);
      expire(record, NO_REQUEST);
      return structuredClone(record.session);
    },
    setDown: (isDown, mode = 'unavailable') => {
      down = isDown ? mode : null;
    },
    setWebhookUrl: (next) => outbox.setUrl(next),
    pauseWebhooks: () => outbox.pause(),
    resumeWebhooks: () => outbox.resume(),
    resendEvent: (eventId) => outbox.resend(eventId),
    deliverWebhook: (eventId) => outbox.resend(eventId),
    reset: () => {
      sessions.clear();
      payments.clear();
      chargeToIntent.clear();
      refunds.clear();
      idempotent.clear();
      outbox.reset();
      down = null;
    },
    close: async () => {
      outbox.close();
      // The SDK keeps connections alive; drop them so close() does not wait for their idle timeout.
      server.closeAllConnections();
      await new Promise<void>((resolve) => server.close(() => resolve()));
    },
  };
}
