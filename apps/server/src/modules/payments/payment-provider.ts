import Stripe from 'stripe';
import { FAKE_PAYMENTS_API_KEY, type Config } from '../../config.ts';

/**
 * The payment provider's official SDK. With no key configured it talks to the
 * local fake provider (apps/fakes) over loopback, exactly as it would to the real one.
 */
export function createPaymentClient(config: Config, fake?: { host: string; port: number }): Stripe {
  if (config.payments.secretKey) return new Stripe(config.payments.secretKey, { maxNetworkRetries: 2, timeout: 20_000 });
  return new Stripe(FAKE_PAYMENTS_API_KEY, {
    host: fake?.host ?? '127.0.0.1',
    port: fake?.port ?? config.payments.fakePort,
    protocol: 'http',
    maxNetworkRetries: 0,
    timeout: 5_000,
  });
}
