import { csrfSync } from 'csrf-sync';
import { HttpError } from './errors.ts';

/**
 * Synchronizer-token CSRF protection: the token lives in the session, comes from
 * GET /api/auth/csrf and returns in the x-csrf-token header on every
 * state-changing request (OWASP CSRF Prevention Cheat Sheet).
 */
export const csrf = csrfSync({
  getTokenFromRequest: (req) => req.get('x-csrf-token') ?? undefined,
  errorConfig: { statusCode: 403, code: 'EBADCSRFTOKEN', message: 'invalid csrf token' },
});

export const csrfError = () =>
  new HttpError(403, 'csrf_invalid', 'The security token for this form is missing or out of date. Reload the page and try again.');
