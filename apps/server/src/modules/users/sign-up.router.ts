import { Router, type Request } from 'express';
import { rateLimit } from 'express-rate-limit';
import type { Knex } from 'knex';
import { agentSignUpCompleteSchema, agentSignUpSchema, tokenSchema } from '@underfoot/core';
import type { Config } from '../../config.ts';
import { csrf } from '../../http/csrf.ts';
import { HttpError, parseInput } from '../../http/errors.ts';
import { KnexRateLimitStore } from '../../http/rate-limit-store.ts';
import { publicUser, type UserRecord } from '../auth/users.repo.ts';
import type { SignUpService } from './sign-up.service.ts';

function signIn(req: Request, user: UserRecord): Promise<void> {
  // passport regenerates the session id on login (no session fixation).
  return new Promise((resolve, reject) => req.login(user, (err) => (err ? reject(err) : resolve())));
}

/** Public: agents signing themselves up to a company that allows it. */
export function signUpRouter(config: Config, db: Knex, signUp: SignUpService): Router {
  const router = Router();
  const minutes = Math.round(config.signInLimits.windowMs / 60_000);
  const tooMany = (detail: string) => new HttpError(429, 'rate_limited', detail);

  // The form sends e-mail, so both the address and the network are limited (like password-reset requests).
  const perAddress = rateLimit({
    windowMs: config.signInLimits.windowMs,
    limit: config.signInLimits.perAccount,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    store: new KnexRateLimitStore(db, 'sign-up-email'),
    keyGenerator: (req) =>
      String((req.body as { email?: unknown })?.email ?? '')
        .trim()
        .toLowerCase(),
    handler: (_req, _res, next) =>
      next(tooMany(`Too many sign-up requests for this address. Wait ${minutes} minutes and check your inbox.`)),
  });
  const perNetwork = rateLimit({
    windowMs: config.signInLimits.windowMs,
    limit: config.signInLimits.perAddress,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    store: new KnexRateLimitStore(db, 'sign-up-ip'),
    handler: (_req, _res, next) => next(tooMany(`Too many sign-up requests from this network. Wait ${minutes} minutes.`)),
  });

  router.get('/companies/:companyId', async (req, res) => {
    res.json(await signUp.describe(String(req.params.companyId)));
  });

  router.post('/companies/:companyId', perNetwork, perAddress, async (req, res) => {
    const input = parseInput(agentSignUpSchema, req.body);
    await signUp.request(String(req.params.companyId), input, req.ip);
    res.status(202).json({
      detail: `We have sent a link to ${input.email}. Open it to confirm the address and choose your password.`,
    });
  });

  router.get('/verify/:token', async (req, res) => {
    const token = parseInput(tokenSchema, req.params.token);
    res.json(await signUp.describeToken(token));
  });

  router.post('/verify', async (req, res) => {
    const { token, name, password } = parseInput(agentSignUpCompleteSchema, req.body);
    const user = await signUp.complete(token, name, password, req.ip);
    await signIn(req, user);
    res.json({ user: publicUser(user), csrfToken: csrf.generateToken(req, true) });
  });

  return router;
}
