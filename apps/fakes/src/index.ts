export { startFakeSmtp, type CaughtMessage, type FakeSmtp, type FakeSmtpOptions } from './mail/fake-smtp.ts';
export { startFakePayments, type FakeDownMode, type FakePayments, type FakePaymentsOptions } from './payments/fake-payments.ts';
export { WebhookDeliveryError } from './payments/event-outbox.ts';
export type {
  FakeCharge,
  FakeCheckoutSession,
  FakeDelivery,
  FakeEvent,
  FakeEventType,
  FakePaymentIntent,
  FakeRefund,
} from './payments/payment-objects.ts';
export { startFakeS3, type FakeS3, type FakeS3Options } from './storage/fake-s3.ts';
