import Stripe from 'stripe';
import { newId, nowSeconds, type FakeDelivery, type FakeEvent, type FakeEventType } from './payment-objects.ts';

export interface OutboxOptions {
  webhookUrl: string;
  webhookSecret: string;
  /** Waits between automatic attempts; one more attempt than entries (default 4 retries: 1 s, 2 s, 4 s, 8 s). */
  retryDelaysMs: number[];
  timeoutMs: number;
}

/** Webhooks go to this machine only: the fake must never send traffic anywhere else. */
export function assertLoopbackUrl(url: string): void {
  let parsed: URL;
  try {
    parsed = new URL(url);
  } catch {
    throw new Error(`Webhook URL is not a valid URL: ${url}`);
  }
  if (parsed.protocol !== 'http:' && parsed.protocol !== 'https:') throw new Error(`Webhook URL must be http(s): ${url}`);
  if (!['127.0.0.1', 'localhost', '[::1]'].includes(parsed.hostname)) {
    throw new Error(`Webhook URL must point at this machine (127.0.0.1, localhost or [::1]): ${url}`);
  }
}

/** Thrown by a manual delivery that the endpoint did not accept; carries the attempt. */
export class WebhookDeliveryError extends Error {
  constructor(readonly delivery: FakeDelivery) {
    super(
      `Webhook ${delivery.eventId} was not accepted by ${delivery.url}: ${delivery.status !== null ? `HTTP ${delivery.status}` : delivery.error}`,
    );
  }
}

/**
 * Keeps every event the fake emits and delivers it to the webhook endpoint, signed with the provider's
 * scheme (`Stripe-Signature: t=<unix time>,v1=<HMAC-SHA256 of "t.payload">`). Each attempt is signed
 * afresh, so a retry or replay minutes later still passes the SDK's 300-second tolerance.
 */
export function createEventOutbox(options: OutboxOptions) {
  assertLoopbackUrl(options.webhookUrl);
  let webhookUrl = options.webhookUrl;
  let paused = false;
  let closed = false;
  // Bumped by reset() so retries scheduled before it stop instead of re-sending cleared events.
  let generation = 0;
  const events: FakeEvent[] = [];
  const delivered = new Set<string>();
  const held: string[] = [];
  const attempts: FakeDelivery[] = [];
  const timers = new Set<NodeJS.Timeout>();
  const aborter = new AbortController();

  const find = (eventId: string): FakeEvent => {
    const event = events.find((e) => e.id === eventId);
    if (!event) throw new Error(`No such event: ${eventId}`);
    return event;
  };

  async function attempt(event: FakeEvent): Promise<FakeDelivery> {
    const payload = JSON.stringify(event, null, 2);
    const signature = Stripe.webhooks.generateTestHeaderString({ payload, secret: options.webhookSecret });
    const record: FakeDelivery = {
      eventId: event.id,
      attempt: attempts.filter((a) => a.eventId === event.id).length + 1,
      at: new Date().toISOString(),
      url: webhookUrl,
      status: null,
      error: null,
      ok: false,
    };
    attempts.push(record);
    try {
      const res = await fetch(webhookUrl, {
        method: 'POST',
        headers: {
          'Content-Type': 'application/json; charset=utf-8',
          'Stripe-Signature': signature,
          'User-Agent': 'UnderfootFakePayments/1.0 (local test stand-in)',
        },
        body: payload,
        redirect: 'manual',
        signal: AbortSignal.any([aborter.signal, AbortSignal.timeout(options.timeoutMs)]),
      });
      await res.arrayBuffer().catch(() => undefined);
      record.status = res.status;
      // Like the real provider, only a 2xx counts; a redirect is a failure.
      record.ok = res.status >= 200 && res.status < 300;
    } catch (err) {
      record.error = err instanceof Error ? (err.cause instanceof Error ? err.cause.message : err.message) : String(err);
    }
    if (record.ok) delivered.add(event.id);
    return record;
  }

  /** Automatic delivery: resolves after the first attempt; failures are retried in the background with back-off. */
  async function deliverWithRetries(event: FakeEvent, retry = 0, since = generation): Promise<void> {
    if (closed || since !== generation || delivered.has(event.id)) return;
    const record = await attempt(event);
    if (record.ok || closed || since !== generation) return;
    const delay = options.retryDelaysMs[retry];
    if (delay === undefined) return; // bounded: give up after the last retry; resend() still works
    const timer = setTimeout(() => {
      timers.delete(timer);
      void deliverWithRetries(event, retry + 1, since);
    }, delay);
    timer.unref();
    timers.add(timer);
  }

  return {
    /** Records an event and starts delivering it; the promise settles after the first attempt. */
    emit(
      type: FakeEventType,
      object: FakeEvent['data']['object'],
      request: FakeEvent['request'],
      previousAttributes?: Record<string, unknown>,
    ): { event: FakeEvent; firstAttempt: Promise<void> } {
      const event: FakeEvent = {
        id: newId('evt_'),
        object: 'event',
        api_version: Stripe.API_VERSION,
        created: nowSeconds(),
        // A snapshot: later changes to the object must not rewrite an event already sent.
        data: structuredClone(previousAttributes ? { object, previous_attributes: previousAttributes } : { object }),
        livemode: false,
        pending_webhooks: 1,
        request,
        type,
      };
      events.push(event);
      if (paused) {
        held.push(event.id);
        return { event, firstAttempt: Promise.resolve() };
      }
      return { event, firstAttempt: deliverWithRetries(event) };
    },
    events: (): FakeEvent[] => structuredClone(events),
    deliveries: (eventId?: string): FakeDelivery[] => attempts.filter((a) => !eventId || a.eventId === eventId).map((a) => ({ ...a })),
    /** One signed attempt now, whatever happened before (a replay if it was delivered already). */
    async resend(eventId: string): Promise<FakeDelivery> {
      const record = await attempt(find(eventId));
      if (!record.ok) throw new WebhookDeliveryError(record);
      return { ...record };
    },
    setUrl(url: string): void {
      assertLoopbackUrl(url);
      webhookUrl = url;
    },
    pause(): void {
      paused = true;
    },
    /** Stops holding events; those held and not yet delivered by hand go out now, oldest first. */
    async resume(): Promise<void> {
      paused = false;
      const pending = held.splice(0).filter((id) => !delivered.has(id));
      for (const id of pending) await deliverWithRetries(find(id));
    },
    reset(): void {
      generation++;
      for (const timer of timers) clearTimeout(timer);
      timers.clear();
      events.length = 0;
      attempts.length = 0;
      held.length = 0;
      delivered.clear();
      paused = false;
    },
    close(): void {
      closed = true;
      aborter.abort();
      for (const timer of timers) clearTimeout(timer);
      timers.clear();
    },
  };
}

export type EventOutbox = ReturnType<typeof createEventOutbox>;
