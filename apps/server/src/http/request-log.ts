import { randomUUID } from 'node:crypto';
import type { IncomingMessage } from 'node:http';
import type { Logger } from 'pino';
import { pinoHttp } from 'pino-http';

/**
 * A link token is a permission (a password reset, an invitation, a guest's view of a report),
 * so a log line must not carry one: whoever reads the log could use it.
 */
const TOKEN_IN_PATH = /(\/(?:shared|verify|invitations)\/)[^/?#]+/g;
const TOKEN_IN_QUERY = /([?&]token=)[^&#]*/g;

export function urlForLog(url: string): string {
  return url.replace(TOKEN_IN_PATH, '$1[token]').replace(TOKEN_IN_QUERY, '$1[token]');
}

/** What pino's standard request serializer hands over (the raw request stays out of the log). */
interface SerializedRequest {
  id: unknown;
  method: string;
  url: string;
  remoteAddress?: string;
  headers: IncomingMessage['headers'];
}

/**
 * One line per answered request: who asked (address, browser), what, the status and the time.
 * Headers stay out: they hold the session cookie and the CSRF token, and serialising
 * them for every request was a large share of a small request's cost.
 */
export function requestLog(logger: Logger) {
  return pinoHttp({
    logger,
    genReqId: (req, res) => {
      const incoming = req.headers['x-request-id'];
      const id = typeof incoming === 'string' && /^[\w-]{1,100}$/.test(incoming) ? incoming : randomUUID();
      res.setHeader('X-Request-Id', id);
      return id;
    },
    autoLogging: { ignore: (req) => req.url === '/api/health' },
    serializers: {
      req: (req: SerializedRequest) => ({
        id: req.id,
        method: req.method,
        url: urlForLog(req.url),
        remoteAddress: req.remoteAddress,
        userAgent: req.headers['user-agent'],
      }),
      res: (res: { statusCode: number }) => ({ statusCode: res.statusCode }),
    },
  });
}
