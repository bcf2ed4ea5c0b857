import express, { Router } from 'express';
import { currentUser, requireSignIn } from '../../http/auth-guards.ts';
import type { PaymentsService } from './payments.service.ts';

/** Mounted before the JSON parser and CSRF check: the provider signs the raw body instead. */
export function paymentWebhookRouter(payments: PaymentsService): Router {
  const router = Router();
  router.post('/', express.raw({ type: 'application/json', limit: '1mb' }), async (req, res) => {
    const body = Buffer.isBuffer(req.body) ? req.body : Buffer.alloc(0);
    const { duplicate } = await payments.handleWebhook(body, req.get('stripe-signature'));
    res.json({ received: true, duplicate });
  });
  return router;
}

export function paymentsRouter(payments: PaymentsService): Router {
  const router = Router();
  router.post('/orders/:id/checkout', requireSignIn, async (req, res) => {
    res.json(await payments.startCheckout(currentUser(req), String(req.params.id)));
  });
  return router;
}
