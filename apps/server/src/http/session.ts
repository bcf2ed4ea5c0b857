import type { RequestHandler } from 'express';
import session from 'express-session';
import { ConnectSessionKnexStore } from 'connect-session-knex';
import type { Knex } from 'knex';
import { sessionSecretFor, type Config } from '../config.ts';

export const SESSION_COOKIE = 'underfoot.sid';

export function createSessionStore(db: Knex, config: Config): ConnectSessionKnexStore {
  return new ConnectSessionKnexStore({
    knex: db,
    tableName: 'sessions',
    createTable: false,
    // Tests create many short-lived apps; a cleanup timer would keep each alive.
    cleanupInterval: config.env === 'test' ? 0 : 15 * 60_000,
  });
}

export function sessionMiddleware(config: Config, store: ConnectSessionKnexStore): RequestHandler {
  return session({
    name: SESSION_COOKIE,
    secret: sessionSecretFor(config),
    store,
    resave: false,
    saveUninitialized: false,
    rolling: true,
    proxy: config.trustProxy,
    cookie: {
      httpOnly: true,
      sameSite: 'lax',
      // Secure whenever the public address is HTTPS, or the request came in over HTTPS through a trusted proxy.
      secure: config.secureCookies ? true : 'auto',
      maxAge: 14 * 24 * 60 * 60_000,
    },
  });
}
