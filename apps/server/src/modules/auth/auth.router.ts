import { Router, type Request } from 'express';
import { rateLimit } from 'express-rate-limit';
import type { Knex } from 'knex';
import { Passport } from 'passport';

type PassportInstance = InstanceType<typeof Passport>;
import { Strategy as LocalStrategy } from 'passport-local';
import {
  invitationAcceptSchema,
  passwordResetCompleteSchema,
  passwordResetRequestSchema,
  signInSchema,
  tokenSchema,
} from '@underfoot/core';
import type { Config } from '../../config.ts';
import { csrf } from '../../http/csrf.ts';
import { HttpError, parseInput, unauthorized } from '../../http/errors.ts';
import { KnexRateLimitStore } from '../../http/rate-limit-store.ts';
import { SESSION_COOKIE } from '../../http/session.ts';
import { recordAudit } from '../audit/audit.repo.ts';
import type { AuthService } from './auth.service.ts';
import { findUserById, publicUser, type UserRecord } from './users.repo.ts';

const INVALID_CREDENTIALS = 'E-mail or password is incorrect.';

/** One Passport per app (not the module singleton), so several apps can live in one process. */
export function createPassport(db: Knex, auth: AuthService): PassportInstance {
  const passport = new Passport();
  passport.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password' }, (email, password, done) => {
      auth
        .checkCredentials(email, password)
        .then((result) => {
          if (result.outcome === 'ok') done(null, result.user);
          else done(null, false, { message: result.outcome });
        })
        .catch(done);
    }),
  );
  passport.serializeUser<string>((user, done) => done(null, user.id));
  passport.deserializeUser<string>((id, done) => {
    findUserById(db, id)
      // A disabled or deleted account loses its session on its next request.
      .then((user) => done(null, user && !user.disabledAt ? user : false))
      .catch(done);
  });
  return passport;
}

function signIn(req: Request, user: UserRecord): Promise<void> {
  // passport ≥ 0.6 regenerates the session id here, closing session fixation.
  return new Promise((resolve, reject) => req.login(user, (err) => (err ? reject(err) : resolve())));
}

function authenticate(passport: PassportInstance, req: Request): Promise<{ user: UserRecord | false; reason?: string }> {
  return new Promise((resolve, reject) => {
    passport.authenticate('local', { session: false }, (err: unknown, user: UserRecord | false, info?: { message?: string }) => {
      if (err) reject(err);
      else resolve({ user, reason: info?.message });
    })(req);
  });
}

function tooMany(detail: string) {
  return new HttpError(429, 'rate_limited', detail);
}

export function authRouter(config: Config, db: Knex, auth: AuthService, passport: PassportInstance): Router {
  const router = Router();
  const minutes = Math.round(config.signInLimits.windowMs / 60_000);

  const perAddress = rateLimit({
    windowMs: config.signInLimits.windowMs,
    limit: config.signInLimits.perAddress,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    skipSuccessfulRequests: true,
    store: new KnexRateLimitStore(db, 'sign-in-ip'),
    handler: (_req, _res, next) =>
      next(tooMany(`Too many sign-in attempts from this network. Wait ${minutes} minutes, or reset your password.`)),
  });
  const perAccount = rateLimit({
    windowMs: config.signInLimits.windowMs,
    limit: config.signInLimits.perAccount,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    skipSuccessfulRequests: true,
    store: new KnexRateLimitStore(db, 'sign-in-account'),
    keyGenerator: (req) =>
      String((req.body as { email?: unknown })?.email ?? '')
        .trim()
        .toLowerCase(),
    handler: (_req, _res, next) =>
      next(tooMany(`Too many sign-in attempts for this account. Wait ${minutes} minutes, or reset your password.`)),
  });
  const resetRequests = rateLimit({
    windowMs: config.signInLimits.windowMs,
    limit: config.signInLimits.perAccount,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    store: new KnexRateLimitStore(db, 'reset-request'),
    keyGenerator: (req) =>
      String((req.body as { email?: unknown })?.email ?? '')
        .trim()
        .toLowerCase(),
    handler: (_req, _res, next) => next(tooMany(`Too many reset requests for this address. Wait ${minutes} minutes and check your inbox.`)),
  });

  router.get('/csrf', (req, res) => {
    res.json({ token: csrf.generateToken(req) });
  });

  router.get('/me', (req, res) => {
    if (!req.user) throw unauthorized();
    res.json({ user: publicUser(req.user) });
  });

  router.post('/sign-in', perAddress, perAccount, async (req, res) => {
    // passport reads the normalised values (trimmed, lower-cased e-mail).
    req.body = parseInput(signInSchema, req.body);
    const { user, reason } = await authenticate(passport, req);
    if (!user) {
      if (reason === 'disabled')
        throw new HttpError(403, 'account_disabled', 'This account has been disabled. Contact the company office.');
      throw new HttpError(401, 'invalid_credentials', INVALID_CREDENTIALS);
    }
    await signIn(req, user);
    await recordAudit(db, {
      companyId: user.companyId,
      actorUserId: user.id,
      action: 'auth.sign_in',
      subjectType: 'user',
      subjectId: user.id,
      ip: req.ip,
    });
    // The session is new; so is its CSRF token.
    res.json({ user: publicUser(user), csrfToken: csrf.generateToken(req, true) });
  });

  router.post('/sign-out', async (req, res) => {
    const user = req.user;
    await new Promise<void>((resolve, reject) => req.logout((err) => (err ? reject(err) : resolve())));
    await new Promise<void>((resolve, reject) => req.session.destroy((err) => (err ? reject(err) : resolve())));
    if (user)
      await recordAudit(db, {
        companyId: user.companyId,
        actorUserId: user.id,
        action: 'auth.sign_out',
        subjectType: 'user',
        subjectId: user.id,
        ip: req.ip,
      });
    res.clearCookie(SESSION_COOKIE, { path: '/' });
    res.status(204).end();
  });

  router.post('/password-reset', resetRequests, async (req, res) => {
    const { email } = parseInput(passwordResetRequestSchema, req.body);
    await auth.requestPasswordReset(email, req.ip);
    res.status(202).json({ detail: 'If an account exists for that address, we have sent a link to reset the password.' });
  });

  router.post('/password-reset/complete', async (req, res) => {
    const { token, password } = parseInput(passwordResetCompleteSchema, req.body);
    const user = await auth.completePasswordReset(token, password, req.ip);
    await signIn(req, user);
    res.json({ user: publicUser(user), csrfToken: csrf.generateToken(req, true) });
  });

  router.get('/invitations/:token', async (req, res) => {
    const token = parseInput(tokenSchema, req.params.token);
    res.json(await auth.describeInvitation(token));
  });

  router.post('/invitations/accept', async (req, res) => {
    const { token, name, password } = parseInput(invitationAcceptSchema, req.body);
    const user = await auth.acceptInvitation(token, name, password, req.ip);
    await signIn(req, user);
    res.json({ user: publicUser(user), csrfToken: csrf.generateToken(req, true) });
  });

  return router;
}
