import { Router } from 'express';
import { rateLimit } from 'express-rate-limit';
import type { Knex } from 'knex';
import { accountNameSchema, emailChangeConfirmSchema, emailChangeSchema, passwordChangeSchema } from '@underfoot/core';
import type { Config } from '../../config.ts';
import { currentUser, requireSignIn } from '../../http/auth-guards.ts';
import { HttpError, parseInput } from '../../http/errors.ts';
import { KnexRateLimitStore } from '../../http/rate-limit-store.ts';
import type { AccountService } from './account.service.ts';

/** The signed-in person's own account, whatever their role. */
export function accountRouter(config: Config, db: Knex, account: AccountService): Router {
  const router = Router();
  const minutes = Math.round(config.signInLimits.windowMs / 60_000);

  // Forms that check the current password would otherwise let a borrowed session guess it.
  const passwordChecks = rateLimit({
    windowMs: config.signInLimits.windowMs,
    limit: config.signInLimits.perAccount,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    skipSuccessfulRequests: true,
    store: new KnexRateLimitStore(db, 'account-password'),
    keyGenerator: (req) => req.user?.id ?? 'signed-out',
    handler: (_req, _res, next) =>
      next(
        new HttpError(
          429,
          'rate_limited',
          `Too many wrong passwords. Wait ${minutes} minutes, or reset your password from the sign-in page.`,
        ),
      ),
  });

  router.get('/', requireSignIn, async (req, res) => {
    res.json(await account.overview(currentUser(req).id, req.sessionID));
  });

  router.put('/name', requireSignIn, async (req, res) => {
    const { name } = parseInput(accountNameSchema, req.body);
    res.json({ user: await account.changeName(currentUser(req).id, name, req.ip) });
  });

  router.post('/email', requireSignIn, passwordChecks, async (req, res) => {
    const { newEmail, currentPassword } = parseInput(emailChangeSchema, req.body);
    res.status(202).json({ pendingEmail: await account.requestEmailChange(currentUser(req).id, newEmail, currentPassword, req.ip) });
  });

  // The link from the e-mail: the token is the proof, so no session is needed (it may be opened on another device).
  router.post('/email/confirm', async (req, res) => {
    const { token } = parseInput(emailChangeConfirmSchema, req.body);
    res.json(await account.confirmEmailChange(token, req.ip));
  });

  router.put('/password', requireSignIn, passwordChecks, async (req, res) => {
    const { currentPassword, newPassword } = parseInput(passwordChangeSchema, req.body);
    res.json(await account.changePassword(currentUser(req).id, req.sessionID, currentPassword, newPassword, req.ip));
  });

  router.post('/sessions/sign-out-others', requireSignIn, async (req, res) => {
    res.json(await account.signOutOthers(currentUser(req).id, req.sessionID, req.ip));
  });

  return router;
}
