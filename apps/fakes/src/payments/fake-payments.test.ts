import { createServer, type IncomingHttpHeaders, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import Stripe from 'stripe';
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import { startFakePayments, WebhookDeliveryError, type FakeCheckoutSession, type FakePayments } from '../index.ts';

const SECRET = 'whsec_underfoot_test_secret';

interface Received {
  headers: IncomingHttpHeaders;
  body: Buffer;
}

/** A tiny webhook endpoint: records raw bodies and answers with whatever status the test sets. */
async function startReceiver() {
  const received: Received[] = [];
  const statuses: number[] = [];
  const server: Server = createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on('data', (c: Buffer) => chunks.push(c));
    req.on('end', () => {
      received.push({ headers: req.headers, body: Buffer.concat(chunks) });
      res.statusCode = statuses.shift() ?? 200;
      res.end();
    });
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  return {
    url: `http://127.0.0.1:${(server.address() as AddressInfo).port}/webhooks/payments`,
    received,
    /** Answer the next requests with these statuses, then 200 again. */
    answerNext: (...codes: number[]) => statuses.push(...codes),
    close: () =>
      new Promise<void>((resolve) => {
        server.closeAllConnections();
        server.close(() => resolve());
      }),
  };
}

async function waitFor(check: () => boolean, timeoutMs = 5000): Promise<void> {
  const until = Date.now() + timeoutMs;
  while (!check()) {
    if (Date.now() > until) throw new Error('timed out waiting');
    await new Promise((r) => setTimeout(r, 10));
  }
}

const verify = (r: Received) => Stripe.webhooks.constructEvent(r.body, r.headers['stripe-signature'] as string, SECRET);

let receiver: Awaited<ReturnType<typeof startReceiver>>;
let fake: FakePayments;
let stripe: Stripe;

const sdkFor = (port: number, key: string) =>
  new Stripe(key, { host: '127.0.0.1', port, protocol: 'http', maxNetworkRetries: 0, telemetry: false });

const inspectionCheckout = (overrides: Partial<Stripe.Checkout.SessionCreateParams> = {}) =>
  stripe.checkout.sessions.create({
    mode: 'payment',
    line_items: [
      {
        quantity: 1,
        price_data: { currency: 'usd', unit_amount: 30000, product_data: { name: 'Sewer camera inspection' } },
      },
      {
        quantity: 1,
        price_data: {
          currency: 'usd',
          unit_amount: 5000,
          product_data: { name: 'Root intrusion add-on', description: 'Footage review of root ingress points' },
        },
      },
    ],
    success_url: 'http://127.0.0.1:5173/orders/42/paid?session={CHECKOUT_SESSION_ID}',
    cancel_url: 'http://127.0.0.1:5173/orders/42/pay',
    client_reference_id: 'order-42',
    customer_email: 'buyer@example.com',
    metadata: { orderId: '42' },
    payment_intent_data: { metadata: { orderId: '42' } },
    ...overrides,
  });

const post = (url: string) => fetch(url, { method: 'POST', redirect: 'manual' });

beforeAll(async () => {
  receiver = await startReceiver();
  fake = await startFakePayments({ webhookUrl: receiver.url, webhookSecret: SECRET, webhookRetryDelaysMs: [20, 40, 80, 160] });
  stripe = sdkFor(fake.port, fake.apiKey);
});

afterEach(async () => {
  // Let retries scheduled by a test finish before the next one resets the log.
  await new Promise((r) => setTimeout(r, 20));
  fake.reset();
  receiver.received.length = 0;
});

afterAll(async () => {
  await fake.close();
  await receiver.close();
});

describe('checkout sessions through the official SDK', () => {
  it('creates an open, unpaid session shaped like the real one', async () => {
    const session = await inspectionCheckout();
    expect(session.id).toMatch(/^cs_test_[A-Za-z0-9]+$/);
    expect(session).toMatchObject({
      object: 'checkout.session',
      status: 'open',
      payment_status: 'unpaid',
      amount_total: 35000,
      currency: 'usd',
      mode: 'payment',
      payment_intent: null,
      livemode: false,
      client_reference_id: 'order-42',
      customer_email: 'buyer@example.com',
      metadata: { orderId: '42' },
      cancel_url: 'http://127.0.0.1:5173/orders/42/pay',
    });
    expect(session.url).toBe(`${fake.url}/checkout/${session.id}`);
    expect(session.expires_at - session.created).toBe(24 * 60 * 60);
    expect(fake.sessions().map((s) => s.id)).toEqual([session.id]);
  });

  it('serves a plain, script-free checkout page with the items and the total', async () => {
    const session = await inspectionCheckout({
      line_items: [{ quantity: 1, price_data: { currency: 'usd', unit_amount: 35000, product_data: { name: '<b>Camera</b> & "scope"' } } }],
    });
    const res = await fetch(session.url!);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/text\/html/);
    const csp = res.headers.get('content-security-policy')!;
    expect(csp).toContain("default-src 'none'");
    expect(csp).not.toContain('script-src');
    expect(csp).toContain('form-action');
    const html = await res.text();
    expect(html).toContain('<title>Test checkout — no real money moves</title>');
    expect(html).toContain('no real money moves');
    expect(html).toContain('Pay $350.00</button>');
    expect(html).toContain('Decline payment</button>');
    expect(html).toContain(`<form method="post" action="${session.id}/pay">`);
    expect(html).toContain('&lt;b&gt;Camera&lt;/b&gt; &amp; &quot;scope&quot;');
    expect(html).not.toMatch(/<script/i);
    expect(html).toContain('font-variant-numeric: tabular-nums');
  });

  it('paying sends a signed checkout.session.completed webhook, then redirects to success_url', async () => {
    const session = await inspectionCheckout();
    const res = await post(`${fake.url}/checkout/${session.id}/pay`);
    expect(res.status).toBe(303);
    expect(res.headers.get('location')).toBe(`http://127.0.0.1:5173/orders/42/paid?session=${session.id}`);

    // The redirect waits for the first delivery attempt, so the webhook is already there.
    expect(receiver.received).toHaveLength(1);
    const delivery = receiver.received[0]!;
    expect(delivery.headers['content-type']).toMatch(/application\/json/);
    const event = verify(delivery);
    expect(event.type).toBe('checkout.session.completed');
    expect(event.id).toMatch(/^evt_/);
    expect(event.livemode).toBe(false);
    expect(event.api_version).toBe(Stripe.API_VERSION);
    const paid = event.data.object as Stripe.Checkout.Session;
    expect(paid).toMatchObject({ id: session.id, status: 'complete', payment_status: 'paid', metadata: { orderId: '42' } });
    expect(paid.payment_intent).toMatch(/^pi_/);

    const retrieved = await stripe.checkout.sessions.retrieve(session.id);
    expect(retrieved).toMatchObject({ status: 'complete', payment_status: 'paid', payment_intent: paid.payment_intent, url: null });

    const expanded = await stripe.checkout.sessions.retrieve(session.id, { expand: ['payment_intent'] });
    expect(expanded.payment_intent).toMatchObject({ id: paid.payment_intent, status: 'succeeded', amount_received: 35000 });
    const intent = await stripe.paymentIntents.retrieve(paid.payment_intent as string);
    expect(intent.metadata).toEqual({ orderId: '42' });
  });

  it('a second press of Pay changes nothing and sends no second event', async () => {
    const session = await inspectionCheckout();
    await post(`${fake.url}/checkout/${session.id}/pay`);
    const again = await post(`${fake.url}/checkout/${session.id}/pay`);
    expect(again.status).toBe(303);
    expect(fake.events()).toHaveLength(1);
    const page = await fetch(`${fake.url}/checkout/${session.id}`);
    expect(await page.text()).toContain('Already paid');
  });

  it('declining returns to cancel_url and leaves the session open and unpaid', async () => {
    const session = await inspectionCheckout();
    const res = await post(`${fake.url}/checkout/${session.id}/decline`);
    expect(res.status).toBe(303);
    expect(res.headers.get('location')).toBe('http://127.0.0.1:5173/orders/42/pay');
    const retrieved = await stripe.checkout.sessions.retrieve(session.id);
    expect(retrieved).toMatchObject({ status: 'open', payment_status: 'unpaid', payment_intent: null });
    expect(fake.events()).toEqual([]);
  });

  it('expiring a session emits checkout.session.expired and the page no longer takes payment', async () => {
    const session = await inspectionCheckout();
    const expired = await stripe.checkout.sessions.expire(session.id);
    expect(expired).toMatchObject({ status: 'expired', url: null, payment_status: 'unpaid' });
    await waitFor(() => receiver.received.length === 1);
    expect(verify(receiver.received[0]!).type).toBe('checkout.session.expired');

    const pay = await post(`${fake.url}/checkout/${session.id}/pay`);
    expect(pay.status).toBe(410);
    expect(fake.sessions()[0]!.payment_status).toBe('unpaid');
    await expect(stripe.checkout.sessions.expire(session.id)).rejects.toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
  });

  it('lets an open session lapse at expires_at, as the real provider does', async () => {
    const session = await inspectionCheckout();
    vi.useFakeTimers({ toFake: ['Date'] });
    try {
      vi.setSystemTime((session.expires_at + 1) * 1000);
      const lapsed = await stripe.checkout.sessions.retrieve(session.id);
      expect(lapsed).toMatchObject({ status: 'expired', url: null });
      await waitFor(() => receiver.received.length === 1);
      expect(verify(receiver.received[0]!).type).toBe('checkout.session.expired');
    } finally {
      vi.useRealTimers();
    }
  });

  it('builds checkout URLs from publicUrl when browsers reach the fake another way', async () => {
    const proxied = await startFakePayments({
      webhookUrl: receiver.url,
      webhookSecret: SECRET,
      apiKey: 'sk_test_other',
      publicUrl: 'http://localhost:4000/fake-pay/',
    });
    try {
      const session = await sdkFor(proxied.port, 'sk_test_other').checkout.sessions.create({
        line_items: [{ quantity: 1, price_data: { currency: 'usd', unit_amount: 35000, product_data: { name: 'Inspection' } } }],
        success_url: 'http://127.0.0.1:5173/done',
      });
      expect(session.url).toBe(`http://localhost:4000/fake-pay/checkout/${session.id}`);
    } finally {
      await proxied.close();
    }
  });
});

describe('refunds', () => {
  const paidSession = async (): Promise<FakeCheckoutSession> => {
    const session = await inspectionCheckout();
    return fake.paySession(session.id);
  };

  it('refunds once, sends a signed charge.refunded webhook, and refuses a second refund', async () => {
    const paid = await paidSession();
    const refund = await stripe.refunds.create({ payment_intent: paid.payment_intent! });
    expect(refund).toMatchObject({
      object: 'refund',
      status: 'succeeded',
      amount: 35000,
      currency: 'usd',
      payment_intent: paid.payment_intent,
    });
    expect(refund.id).toMatch(/^re_/);

    await waitFor(() => receiver.received.length === 2);
    const event = verify(receiver.received[1]!);
    expect(event.type).toBe('charge.refunded');
    expect(event.data.object).toMatchObject({
      object: 'charge',
      payment_intent: paid.payment_intent,
      amount: 35000,
      amount_refunded: 35000,
      refunded: true,
      metadata: { orderId: '42' },
    });
    expect(event.data.previous_attributes).toEqual({ amount_refunded: 0, refunded: false });
    expect(event.request).toMatchObject({ id: expect.stringMatching(/^req_/), idempotency_key: expect.any(String) });

    const second = stripe.refunds.create({ payment_intent: paid.payment_intent! });
    await expect(second).rejects.toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    await expect(second).rejects.toMatchObject({ statusCode: 400, code: 'charge_already_refunded' });
    expect(fake.refunds()).toHaveLength(1);
  });

  it('allows partial refunds up to the amount paid', async () => {
    const paid = await paidSession();
    await stripe.refunds.create({ payment_intent: paid.payment_intent!, amount: 5000, reason: 'requested_by_customer' });
    await expect(stripe.refunds.create({ payment_intent: paid.payment_intent!, amount: 40000 })).rejects.toMatchObject({
      code: 'amount_too_large',
      param: 'amount',
    });
    const rest = await stripe.refunds.create({ payment_intent: paid.payment_intent! });
    expect(rest.amount).toBe(30000);
    expect((await stripe.refunds.retrieve(rest.id)).amount).toBe(30000);
  });

  it('refuses to refund a payment that does not exist (an unpaid checkout has none)', async () => {
    const session = await inspectionCheckout();
    expect(session.payment_intent).toBeNull();
    await expect(stripe.refunds.create({ payment_intent: 'pi_never_paid' })).rejects.toMatchObject({
      type: 'StripeInvalidRequestError',
      code: 'resource_missing',
      param: 'payment_intent',
    });
  });
});

describe('bad input and faults', () => {
  it('rejects a wrong API key with an authentication error', async () => {
    const intruder = sdkFor(fake.port, 'sk_test_wrong_key_123456');
    const attempt = intruder.checkout.sessions.retrieve('cs_test_x');
    await expect(attempt).rejects.toBeInstanceOf(Stripe.errors.StripeAuthenticationError);
    await expect(attempt).rejects.toMatchObject({ statusCode: 401 });
  });

  it('answers invalid parameters with typed invalid-request errors naming the parameter', async () => {
    const cases: [Partial<Stripe.Checkout.SessionCreateParams>, string][] = [
      [{ success_url: undefined }, 'success_url'],
      [{ success_url: 'not a url' }, 'success_url'],
      [{ line_items: [] }, 'line_items'],
      [{ line_items: [{ price: 'price_123', quantity: 1 }] }, 'line_items[0][price]'],
      [
        { line_items: [{ quantity: 1, price_data: { currency: 'usd', product_data: { name: 'x' } } }] },
        'line_items[0][price_data][unit_amount]',
      ],
      [{ line_items: [{ price_data: { currency: 'usd', unit_amount: 100, product_data: { name: 'x' } } }] }, 'line_items[0][quantity]'],
      [{ line_items: [{ quantity: 1, price_data: { currency: 'usd', unit_amount: 10, product_data: { name: 'x' } } }] }, 'line_items'],
      [{ customer_email: 'not-an-email' }, 'customer_email'],
      [{ mode: 'subscription' }, 'mode'],
    ];
    for (const [overrides, param] of cases) {
      const err: unknown = await inspectionCheckout(overrides).catch((e: unknown) => e);
      expect(err, param).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
      expect((err as Stripe.errors.StripeError).param, param).toBe(param);
    }
    expect(fake.sessions()).toEqual([]);
  });

  it('answers an unknown session with a 404 in the provider error shape', async () => {
    const err = await stripe.checkout.sessions.retrieve('cs_test_unknown').catch((e: unknown) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(err).toMatchObject({ statusCode: 404, code: 'resource_missing' });
    const page = await fetch(`${fake.url}/checkout/cs_test_unknown`);
    expect(page.status).toBe(404);
  });

  it('replays the first answer for a repeated idempotency key instead of creating a second session', async () => {
    const first = await inspectionCheckout();
    const params: Stripe.Checkout.SessionCreateParams = {
      line_items: [{ quantity: 1, price_data: { currency: 'usd', unit_amount: 35000, product_data: { name: 'Inspection' } } }],
      success_url: 'http://127.0.0.1:5173/done',
    };
    const a = await stripe.checkout.sessions.create(params, { idempotencyKey: 'order-42-attempt-1' });
    const b = await stripe.checkout.sessions.create(params, { idempotencyKey: 'order-42-attempt-1' });
    expect(b.id).toBe(a.id);
    expect(b.lastResponse.headers['idempotent-replayed']).toBe('true');
    expect(fake.sessions().map((s) => s.id)).toEqual([first.id, a.id]);

    const reused = stripe.checkout.sessions.create({ ...params, client_reference_id: 'other' }, { idempotencyKey: 'order-42-attempt-1' });
    await expect(reused).rejects.toBeInstanceOf(Stripe.errors.StripeIdempotencyError);
  });

  it('setDown(true) makes SDK calls fail until it comes back up', async () => {
    fake.setDown(true);
    const err = await inspectionCheckout().catch((e: unknown) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeAPIError);
    expect(err).toMatchObject({ statusCode: 503 });
    expect((await fetch(`${fake.url}/checkout/cs_test_any`)).status).toBe(503);

    fake.setDown(true, 'reset');
    await expect(stripe.checkout.sessions.retrieve('cs_test_any')).rejects.toBeInstanceOf(Stripe.errors.StripeConnectionError);

    fake.setDown(false);
    expect(fake.sessions()).toEqual([]);
    await expect(inspectionCheckout()).resolves.toMatchObject({ status: 'open' });
  });

  it('retries a failed webhook with back-off, signing each attempt afresh', async () => {
    receiver.answerNext(500, 503);
    const session = await inspectionCheckout();
    await post(`${fake.url}/checkout/${session.id}/pay`);
    // Wait on the fake's own log: the receiver sees the body before the fake has read the answer.
    await waitFor(() => fake.deliveries().some((d) => d.ok));
    const [event] = fake.events();
    expect(fake.deliveries(event!.id).map((d) => [d.attempt, d.status, d.ok])).toEqual([
      [1, 500, false],
      [2, 503, false],
      [3, 200, true],
    ]);
    for (const r of receiver.received) expect(verify(r).id).toBe(event!.id);
  });

  it('gives up after five attempts, and resendEvent delivers on demand', async () => {
    receiver.answerNext(500, 500, 500, 500, 500);
    const session = await inspectionCheckout();
    const paid = await fake.paySession(session.id);
    expect(paid.payment_status).toBe('paid');
    await waitFor(() => receiver.received.length === 5);
    await new Promise((r) => setTimeout(r, 300));
    expect(receiver.received).toHaveLength(5);

    const [event] = fake.events();
    const delivery = await fake.resendEvent(event!.id);
    expect(delivery).toMatchObject({ attempt: 6, status: 200, ok: true });
    expect(verify(receiver.received[5]!).id).toBe(event!.id);

    receiver.answerNext(400);
    await expect(fake.deliverWebhook(event!.id)).rejects.toBeInstanceOf(WebhookDeliveryError);
  });

  it('delivers to an app that comes up later, at the new address', async () => {
    const later = await startReceiver();
    fake.setWebhookUrl('http://127.0.0.1:9/unreachable');
    const session = await inspectionCheckout();
    await fake.paySession(session.id);
    const [event] = fake.events();
    expect(fake.deliveries(event!.id)[0]).toMatchObject({ status: null, ok: false });
    fake.setWebhookUrl(later.url);
    await waitFor(() => later.received.length === 1);
    expect(verify(later.received[0]!).type).toBe('checkout.session.completed');
    await later.close();
    fake.setWebhookUrl(receiver.url);
  });

  it('lets a test hold webhooks and deliver them out of order', async () => {
    fake.pauseWebhooks();
    const session = await inspectionCheckout();
    const paid = await fake.paySession(session.id);
    await stripe.refunds.create({ payment_intent: paid.payment_intent! });
    expect(receiver.received).toHaveLength(0);

    const [completed, refunded] = fake.events();
    expect([completed!.type, refunded!.type]).toEqual(['checkout.session.completed', 'charge.refunded']);
    await fake.resendEvent(refunded!.id);
    await fake.resendEvent(completed!.id);
    await fake.resendEvent(completed!.id); // a replay: same event id again
    expect(receiver.received.map((r) => verify(r).id)).toEqual([refunded!.id, completed!.id, completed!.id]);

    await fake.resumeWebhooks(); // both were delivered by hand, so nothing more goes out
    expect(receiver.received).toHaveLength(3);
  });

  it('refuses webhook addresses off this machine', async () => {
    expect(() => fake.setWebhookUrl('https://example.com/hook')).toThrow(/this machine/);
    await expect(startFakePayments({ webhookUrl: 'http://10.0.0.5/hook', webhookSecret: SECRET })).rejects.toThrow(/this machine/);
  });
});
