import type { RequestHandler } from 'express';
import session from 'express-session';
import { ConnectSessionKnexStore } from 'connect-session-knex';
import type { Knex } from 'knex';
import { sessionSecretFor, type Config } from '../config.ts';

export const SESSION_COOKIE = 'underfoot.sid';

/** How long a session lasts without use. */
const SESSION_MAX_AGE_MS = 14 * 24 * 60 * 60_000;
/**
 * Activity pushes the expiry forward at most this often. Writing the session row on
 * every request (express-session's `touch`) made each read a database write.
 */
const SESSION_REFRESH_MS = 60 * 60_000;

declare module 'express-session' {
  interface SessionData {
    /** When activity last pushed the expiry forward (ms since the epoch). */
    refreshedAt?: number;
  }
}

export function createSessionStore(db: Knex, config: Config): ConnectSessionKnexStore {
  const store = new ConnectSessionKnexStore({
    knex: db,
    tableName: 'sessions',
    createTable: false,
    // Tests create many short-lived apps; a cleanup timer would keep each alive.
    cleanupInterval: config.env === 'test' ? 0 : 15 * 60_000,
  });
  // Expiry moves forward through `refreshActiveSession` instead (one write an hour, not one a request).
  store.touch = async (_sid, _session, callback) => callback?.();
  return store;
}

export function sessionMiddleware(config: Config, store: ConnectSessionKnexStore): RequestHandler[] {
  const base = session({
    name: SESSION_COOKIE,
    secret: sessionSecretFor(config),
    store,
    resave: false,
    saveUninitialized: false,
    proxy: config.trustProxy,
    cookie: {
      httpOnly: true,
      sameSite: 'lax',
      // Secure whenever the public address is HTTPS, or the request came in over HTTPS through a trusted proxy.
      secure: config.secureCookies ? true : 'auto',
      maxAge: SESSION_MAX_AGE_MS,
    },
  });
  return [base, refreshActiveSession];
}

/**
 * A session in use stays alive: once an hour the stored session and its cookie get a fresh
 * expiry (changing the session makes express-session save it and send the cookie again).
 */
const refreshActiveSession: RequestHandler = (req, _res, next) => {
  const s = req.session as (typeof req.session & { passport?: unknown }) | undefined;
  if (s?.passport && Date.now() - (s.refreshedAt ?? 0) > SESSION_REFRESH_MS) s.refreshedAt = Date.now();
  next();
};
