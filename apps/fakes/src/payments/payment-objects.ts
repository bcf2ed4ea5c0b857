import { randomInt } from 'node:crypto';
import type Stripe from 'stripe';

/** A checkout session as the fake returns it: the subset of the SDK's `Checkout.Session` the app relies on. */
export interface FakeCheckoutSession {
  id: string;
  object: 'checkout.session';
  amount_subtotal: number;
  amount_total: number;
  cancel_url: string | null;
  client_reference_id: string | null;
  created: number;
  currency: string;
  customer: null;
  customer_email: string | null;
  expires_at: number;
  livemode: false;
  locale: null;
  metadata: Record<string, string>;
  mode: 'payment';
  payment_intent: string | null;
  payment_method_types: string[];
  payment_status: 'paid' | 'unpaid';
  status: 'open' | 'complete' | 'expired';
  submit_type: null;
  success_url: string;
  ui_mode: 'hosted_page';
  /** Null once the session is no longer open, as with the real provider. */
  url: string | null;
}

export interface FakePaymentIntent {
  id: string;
  object: 'payment_intent';
  amount: number;
  amount_received: number;
  created: number;
  currency: string;
  description: string | null;
  latest_charge: string;
  livemode: false;
  metadata: Record<string, string>;
  receipt_email: string | null;
  status: 'succeeded';
}

export interface FakeCharge {
  id: string;
  object: 'charge';
  amount: number;
  amount_captured: number;
  amount_refunded: number;
  captured: true;
  created: number;
  currency: string;
  description: string | null;
  livemode: false;
  metadata: Record<string, string>;
  paid: true;
  payment_intent: string;
  receipt_email: string | null;
  refunded: boolean;
  status: 'succeeded';
}

export interface FakeRefund {
  id: string;
  object: 'refund';
  amount: number;
  charge: string;
  created: number;
  currency: string;
  metadata: Record<string, string>;
  payment_intent: string;
  reason: 'duplicate' | 'fraudulent' | 'requested_by_customer' | null;
  status: 'succeeded';
}

/** The event types the fake sends to the webhook endpoint. */
export type FakeEventType = 'checkout.session.completed' | 'checkout.session.expired' | 'charge.refunded';

export interface FakeEvent {
  id: string;
  object: 'event';
  api_version: string;
  created: number;
  data: { object: FakeCheckoutSession | FakeCharge; previous_attributes?: Record<string, unknown> };
  livemode: false;
  pending_webhooks: number;
  request: { id: string | null; idempotency_key: string | null };
  type: FakeEventType;
}

/** One attempt to deliver an event to the webhook endpoint. */
export interface FakeDelivery {
  eventId: string;
  attempt: number;
  at: string;
  url: string;
  /** HTTP status the endpoint answered, or null when it could not be reached. */
  status: number | null;
  error: string | null;
  ok: boolean;
}

// Compile-time guards: each fake object must stay assignable to the SDK's own type for the fields it has,
// so code written against the SDK types reads the fake's objects correctly.
type Conforms<T extends U, U> = [T, U];
type _ShapeChecks = [
  Conforms<FakeCheckoutSession, Pick<Stripe.Checkout.Session, keyof FakeCheckoutSession>>,
  Conforms<FakePaymentIntent, Pick<Stripe.PaymentIntent, keyof FakePaymentIntent>>,
  Conforms<FakeCharge, Pick<Stripe.Charge, keyof FakeCharge>>,
  Conforms<FakeRefund, Pick<Stripe.Refund, keyof FakeRefund>>,
  Conforms<FakeEvent, Pick<Stripe.Event, Exclude<keyof FakeEvent, 'type' | 'data'>>>,
  Conforms<FakeEventType, Stripe.Event.Type>,
];

const ALPHABET = '0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz';

/** Provider-style ids (`cs_test_…`, `pi_…`): a prefix and random base-62 characters. */
export function newId(prefix: string, length = 24): string {
  let out = prefix;
  for (let i = 0; i < length; i++) out += ALPHABET[randomInt(ALPHABET.length)];
  return out;
}

export const nowSeconds = (): number => Math.floor(Date.now() / 1000);
