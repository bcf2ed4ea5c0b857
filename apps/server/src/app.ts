import { existsSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import compression from 'compression';
import express, { type Express } from 'express';
import helmet from 'helmet';
import type { Config } from './config.ts';
import { csrf } from './http/csrf.ts';
import { apiNotFound, errorMiddleware } from './http/errors.ts';
import { requestLog } from './http/request-log.ts';
import { sessionMiddleware } from './http/session.ts';
import { authRouter, createPassport } from './modules/auth/auth.router.ts';
import { createAuthService } from './modules/auth/auth.service.ts';
import { mailboxRouter } from './modules/dev-mailbox/mailbox.router.ts';
import { usersRouter } from './modules/users/users.router.ts';
import { accountRouter } from './modules/users/account.router.ts';
import { createAccountService } from './modules/users/account.service.ts';
import { createPeopleService } from './modules/users/people.service.ts';
import { signUpRouter } from './modules/users/sign-up.router.ts';
import { createSignUpService } from './modules/users/sign-up.service.ts';
import { companyLogoRouter, companyRouter } from './modules/company/company.router.ts';
import { createCompanyService } from './modules/company/company.service.ts';
import { ordersRouter } from './modules/orders/orders.router.ts';
import { createOrdersService } from './modules/orders/orders.service.ts';
import { paymentsRouter, paymentWebhookRouter } from './modules/payments/payments.router.ts';
import { createPaymentsService } from './modules/payments/payments.service.ts';
import { reportsRouter } from './modules/reports/reports.router.ts';
import { createReportsService } from './modules/reports/reports.service.ts';
import { FIRST_VIEW_BOOT_PATH, reportFirstView } from './modules/reports/report-first-view.ts';
import type { Services } from './services.ts';
import { inspectionsRouter } from './modules/inspections/inspections.router.ts';
import { createInspectionsService } from './modules/inspections/inspections.service.ts';
import { mediaRouter } from './modules/media/media.router.ts';
import { createMediaService } from './modules/media/media.service.ts';

export const webDistDir = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../web/dist');
/** The web app's server-rendered first view of a report (built next to the app by `npm run build`). */
const reportFirstViewEntry = path.resolve(
  path.dirname(fileURLToPath(import.meta.url)),
  '../../web/dist-server/report-first-view.server.js',
);

/** Build the Express app without listening; main.ts listens, tests use supertest. */
export function createApp(config: Config, services: Services): Express {
  const { db, logger } = services;
  const app = express();
  app.disable('x-powered-by');
  if (config.trustProxy) app.set('trust proxy', 1);

  app.use(requestLog(logger));
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          defaultSrc: ["'self'"],
          scriptSrc: ["'self'"],
          // Inline style attributes come from React and from rendered e-mails in the demo mailbox.
          styleSrc: ["'self'", "'unsafe-inline'"],
          imgSrc: ["'self'", 'data:', 'blob:'],
          mediaSrc: ["'self'", 'blob:'],
          fontSrc: ["'self'"],
          connectSrc: ["'self'"],
          frameSrc: ["'self'"],
          frameAncestors: ["'none'"],
          formAction: ["'self'"],
          objectSrc: ["'none'"],
          baseUri: ["'self'"],
          upgradeInsecureRequests: config.secureCookies ? [] : null,
        },
      },
      hsts: config.secureCookies,
    }),
  );

  // gzip for the app's scripts, styles and JSON (about 3× fewer bytes on a phone); images and video are already compressed and pass through.
  app.use(compression());

  app.get('/api/health', (_req, res) => {
    res.json({ status: 'ok' });
  });

  const mailQueued = () => void services.mail.kick();
  const reports = createReportsService({ db, publicUrl: config.publicUrl, mailQueued, storage: services.storage });
  const payments = createPaymentsService({
    onPaid: (trx, orderId) => reports.releaseHeld(trx, orderId),
    db,
    provider: services.paymentProvider,
    webhookSecret: config.payments.webhookSecret,
    publicUrl: config.publicUrl,
    mailQueued,
    log: logger,
  });
  // Signed by the provider, not by a session: before the JSON parser (it needs the raw body) and the CSRF check.
  app.use('/api/payments/webhook', paymentWebhookRouter(payments));

  // A whole inspection document (hundreds of findings) is larger than a form; parsed here before the general limit.
  app.use('/api/orders/:orderId/inspection', express.json({ limit: '2mb' }));
  app.use('/api', express.json({ limit: '100kb' }));
  const sessions = sessionMiddleware(config, services.sessionStore);
  app.use('/api', sessions);
  // The office runs the company (profile, fee list, price book, audit trail); everyone keeps their own account.
  const company = createCompanyService({ db, storage: services.storage, publicUrl: config.publicUrl, log: logger });
  const accountDeps = {
    db,
    publicUrl: config.publicUrl,
    passwordHashCost: config.passwordHashCost,
    mailQueued,
    mailBrand: company.mailBrand,
  };
  const auth = createAuthService(accountDeps);
  const passport = createPassport(db, auth);
  app.use('/api', passport.initialize());
  app.use('/api', passport.session());
  // Every state-changing /api request carries the session's CSRF token.
  app.use('/api', csrf.csrfSynchronisedProtection);

  app.use('/api/auth', authRouter(config, db, auth, passport));
  app.use('/api/company-logos', companyLogoRouter(company));
  app.use('/api/users', usersRouter(auth, createPeopleService({ db, auth })));
  app.use('/api/account', accountRouter(config, db, createAccountService(accountDeps)));
  app.use('/api/sign-up', signUpRouter(config, db, createSignUpService({ ...accountDeps, brand: company.brand })));
  app.use('/api', companyRouter(company));
  const orders = createOrdersService({ db, publicUrl: config.publicUrl, mailQueued, refundOrderPayment: payments.refundOrderPayment });
  app.use('/api', ordersRouter(db, orders));
  app.use('/api', reportsRouter(reports, services.storage));
  app.use('/api', paymentsRouter(payments));
  app.use('/api', inspectionsRouter(createInspectionsService({ db })));
  app.use('/api', mediaRouter(db, services.storage, createMediaService({ db, storage: services.storage, limits: config.media })));
  if (services.fakeMailApiUrl) app.use('/api/dev/mailbox', mailboxRouter(services.fakeMailApiUrl));
  app.use('/api', apiNotFound);

  if (existsSync(path.join(webDistDir, 'index.html'))) {
    app.use(express.static(webDistDir, { index: false, maxAge: '1h', setHeaders: immutableAssets }));
    const firstView = reportFirstView({ reports, webDistDir, serverEntry: reportFirstViewEntry, log: logger });
    app.get('/portal/reports/:orderId', sessions, passport.initialize(), passport.session(), firstView.page);
    app.get('/shared/:token', firstView.sharedPage);
    app.get(FIRST_VIEW_BOOT_PATH, firstView.boot);
    // Client-side routes: every other GET gets the app shell.
    app.get('/{*splat}', (_req, res) => {
      res.set('Cache-Control', 'no-cache').sendFile(path.join(webDistDir, 'index.html'));
    });
  }

  app.use(errorMiddleware((err, msg) => logger.error({ err }, msg)));
  return app;
}

/** Vite fingerprints files under /assets, so they can be cached for good. */
function immutableAssets(res: express.Response, filePath: string) {
  if (filePath.includes(`${path.sep}assets${path.sep}`)) res.setHeader('Cache-Control', 'public, max-age=31536000, immutable');
}
