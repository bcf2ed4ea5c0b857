import {
  isObject,
  readArray,
  readInteger,
  readMetadata,
  readObject,
  readString,
  readUrl,
  requireString,
  type FormObject,
} from './form-params.ts';
import { invalidRequest, missingParam, noSuchObject } from './provider-error.ts';

/** One line of a checkout, kept for the hosted page (the session object itself does not carry its items). */
export interface CheckoutLine {
  name: string;
  description: string | null;
  quantity: number;
  unitAmount: number;
  amountTotal: number;
}

export interface SessionParams {
  lines: CheckoutLine[];
  currency: string;
  amountTotal: number;
  successUrl: string;
  cancelUrl: string | null;
  clientReferenceId: string | null;
  customerEmail: string | null;
  metadata: Record<string, string>;
  paymentIntentMetadata: Record<string, string>;
  paymentIntentDescription: string | null;
  expiresAt: number;
}

export interface RefundParams {
  paymentIntent: string | undefined;
  charge: string | undefined;
  amount: number | undefined;
  reason: 'duplicate' | 'fraudulent' | 'requested_by_customer' | null;
  metadata: Record<string, string>;
}

const MAX_AMOUNT = 99_999_999;
const MIN_EXPIRY = 30 * 60;
const MAX_EXPIRY = 24 * 60 * 60;
const CURRENCIES = new Set(Intl.supportedValuesOf('currency').map((c) => c.toLowerCase()));
const EMAIL = /^[^\s@]+@[^\s@]+\.[^\s@]+$/;

/** Expansions the fake can answer; anything else is refused rather than silently returned unexpanded. */
export function readExpand(value: unknown, allowed: readonly string[]): string[] {
  const list = readArray(value, 'expand') ?? [];
  return list.map((item, i) => {
    const path = readString(item, `expand[${i}]`) ?? '';
    if (!allowed.includes(path)) {
      throw invalidRequest(
        `This local payment stand-in cannot expand '${path}'. It can expand: ${allowed.join(', ') || 'nothing'}.`,
        'expand',
      );
    }
    return path;
  });
}

function readLine(item: unknown, i: number): { line: CheckoutLine; currency: string } {
  const at = `line_items[${i}]`;
  if (!isObject(item)) throw invalidRequest(`Invalid object: ${at} must be a hash of parameters.`, at);
  // The pre-2022 inline fields were removed from the API version this SDK pins; refuse them as the real API does.
  for (const legacy of ['amount', 'name', 'currency', 'description', 'images']) {
    if (item[legacy] !== undefined) {
      throw invalidRequest(
        `Received unknown parameter: ${at}[${legacy}]. Inline line item amounts were removed; use ${at}[price_data].`,
        `${at}[${legacy}]`,
      );
    }
  }
  if (item.price !== undefined) {
    throw noSuchObject('price', String(item.price), `${at}[price]`);
  }
  const priceData = readObject(item.price_data, `${at}[price_data]`);
  if (!priceData) throw missingParam(`${at}[price_data]`);
  const quantity = readInteger(item.quantity, `${at}[quantity]`, 1, 999_999);
  if (quantity === undefined) throw missingParam(`${at}[quantity]`);
  return readPriceData(priceData, `${at}[price_data]`, quantity);
}

function readPriceData(data: FormObject, at: string, quantity: number): { line: CheckoutLine; currency: string } {
  const currency = requireString(data.currency, `${at}[currency]`).toLowerCase();
  if (!CURRENCIES.has(currency)) throw invalidRequest(`Invalid currency: ${currency}.`, `${at}[currency]`);
  if (data.recurring !== undefined) {
    throw invalidRequest(
      'You must use mode=subscription for recurring prices; this stand-in only supports mode=payment.',
      `${at}[recurring]`,
    );
  }
  if (data.product !== undefined) throw noSuchObject('product', String(data.product), `${at}[product]`);
  const product = readObject(data.product_data, `${at}[product_data]`);
  if (!product) throw missingParam(`${at}[product_data]`);
  const name = requireString(product.name, `${at}[product_data][name]`, 250);
  const description = readString(product.description, `${at}[product_data][description]`, 1000) || null;

  if (data.unit_amount !== undefined && data.unit_amount_decimal !== undefined) {
    throw invalidRequest('You may only specify one of these parameters: unit_amount, unit_amount_decimal.', `${at}[unit_amount]`);
  }
  let unitAmount = readInteger(data.unit_amount, `${at}[unit_amount]`, 0, MAX_AMOUNT);
  if (unitAmount === undefined && data.unit_amount_decimal !== undefined) {
    const text = readString(data.unit_amount_decimal, `${at}[unit_amount_decimal]`) ?? '';
    if (!/^\d+(\.\d{1,12})?$/.test(text)) throw invalidRequest(`Invalid decimal: ${text}`, `${at}[unit_amount_decimal]`);
    unitAmount = Number(text);
  }
  if (unitAmount === undefined) throw missingParam(`${at}[unit_amount]`);
  return {
    currency,
    line: { name, description, quantity, unitAmount, amountTotal: Math.round(unitAmount * quantity) },
  };
}

/** Validates a `POST /v1/checkout/sessions` body for mode=payment, as strictly as the real API does for these fields. */
export function parseSessionParams(body: FormObject, now: number): SessionParams {
  const mode = readString(body.mode, 'mode');
  if (mode !== undefined && mode !== 'payment') {
    throw invalidRequest(`This local payment stand-in only supports mode=payment (got '${mode}').`, 'mode');
  }
  const uiMode = readString(body.ui_mode, 'ui_mode');
  if (uiMode !== undefined && uiMode !== 'hosted_page') {
    throw invalidRequest(`This local payment stand-in only supports ui_mode=hosted_page (got '${uiMode}').`, 'ui_mode');
  }

  const items = readArray(body.line_items, 'line_items');
  if (!items || items.length === 0) throw missingParam('line_items');
  if (items.length > 100) throw invalidRequest('A Checkout Session in payment mode can have at most 100 line items.', 'line_items');
  const read = items.map((item, i) => readLine(item, i));
  const currency = read[0]!.currency;
  read.forEach((r, i) => {
    if (r.currency !== currency) {
      throw invalidRequest('All line items must use the same currency.', `line_items[${i}][price_data][currency]`);
    }
  });
  const lines = read.map((r) => r.line);
  const amountTotal = lines.reduce((sum, line) => sum + line.amountTotal, 0);
  // The real API refuses totals below the card minimum ($0.50 in USD) and above its maximum.
  const minimum = currency === 'usd' ? 50 : 1;
  if (amountTotal < minimum) {
    throw invalidRequest(
      `The Checkout Session's total amount due must add up to at least ${currency === 'usd' ? '$0.50 usd' : `1 ${currency}`}.`,
      'line_items',
      'amount_too_small',
    );
  }
  if (amountTotal > MAX_AMOUNT)
    throw invalidRequest('The Checkout Session total is above the maximum amount.', 'line_items', 'amount_too_large');

  const successUrl = readUrl(body.success_url, 'success_url');
  if (!successUrl) throw missingParam('success_url');
  const cancelUrl = readUrl(body.cancel_url, 'cancel_url') ?? null;

  const customerEmail = readString(body.customer_email, 'customer_email', 800) || null;
  if (customerEmail && !EMAIL.test(customerEmail)) {
    throw invalidRequest(`Invalid email address: ${customerEmail}`, 'customer_email', 'email_invalid');
  }

  const expiresAt = readInteger(body.expires_at, 'expires_at', 0, Number.MAX_SAFE_INTEGER) ?? now + MAX_EXPIRY;
  if (expiresAt < now + MIN_EXPIRY || expiresAt > now + MAX_EXPIRY) {
    throw invalidRequest(
      'The `expires_at` timestamp must be between 30 minutes and 24 hours after the Checkout Session is created.',
      'expires_at',
    );
  }

  const paymentIntentData = readObject(body.payment_intent_data, 'payment_intent_data') ?? {};
  return {
    lines,
    currency,
    amountTotal,
    successUrl,
    cancelUrl,
    clientReferenceId: readString(body.client_reference_id, 'client_reference_id', 200) || null,
    customerEmail,
    metadata: readMetadata(body.metadata, 'metadata'),
    paymentIntentMetadata: readMetadata(paymentIntentData.metadata, 'payment_intent_data[metadata]'),
    paymentIntentDescription: readString(paymentIntentData.description, 'payment_intent_data[description]', 1000) || null,
    expiresAt,
  };
}

const REASONS = ['duplicate', 'fraudulent', 'requested_by_customer'] as const;

/** Validates a `POST /v1/refunds` body: a payment intent or a charge, and an optional partial amount. */
export function parseRefundParams(body: FormObject): RefundParams {
  const paymentIntent = readString(body.payment_intent, 'payment_intent') || undefined;
  const charge = readString(body.charge, 'charge') || undefined;
  if (!paymentIntent && !charge) throw missingParam('payment_intent');
  if (paymentIntent && charge) throw invalidRequest('You may only specify one of these parameters: charge, payment_intent.', 'charge');
  const reason = readString(body.reason, 'reason') || null;
  if (reason !== null && !(REASONS as readonly string[]).includes(reason)) {
    throw invalidRequest(`Invalid reason: must be one of ${REASONS.join(', ')}`, 'reason');
  }
  return {
    paymentIntent,
    charge,
    amount: readInteger(body.amount, 'amount', 1, MAX_AMOUNT),
    reason: reason as RefundParams['reason'],
    metadata: readMetadata(body.metadata, 'metadata'),
  };
}
