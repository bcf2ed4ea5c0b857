import type { ErrorRequestHandler, RequestHandler } from 'express';
import type { z } from 'zod';

export interface FieldError {
  path: string;
  message: string;
}

/** The one error type the services throw; the error middleware turns it into problem+json (RFC 9457). */
export class HttpError extends Error {
  constructor(
    public readonly status: number,
    public readonly code: string,
    public readonly detail: string,
    public readonly errors?: FieldError[],
  ) {
    super(detail);
    this.name = 'HttpError';
  }
}

const titles: Record<number, string> = {
  400: 'Bad request',
  401: 'Not signed in',
  403: 'Not allowed',
  404: 'Not found',
  409: 'Conflict',
  410: 'Gone',
  413: 'Too large',
  415: 'Unsupported media type',
  422: 'Cannot be processed',
  429: 'Too many requests',
  500: 'Something went wrong',
  502: 'A connected service failed',
  503: 'Temporarily unavailable',
};

export const badRequest = (detail: string, errors?: FieldError[]) => new HttpError(400, 'invalid_input', detail, errors);
export const unauthorized = (detail = 'Please sign in.') => new HttpError(401, 'unauthenticated', detail);
export const forbidden = (detail = 'Your account cannot do this.') => new HttpError(403, 'forbidden', detail);
/** Also used where saying "forbidden" would reveal that something exists. */
export const notFound = (what = 'page') => new HttpError(404, 'not_found', `We could not find that ${what}.`);
export const conflict = (detail: string, code = 'conflict') => new HttpError(409, code, detail);
export const gone = (detail: string, code = 'gone') => new HttpError(410, code, detail);

export function fieldErrorsFrom(error: z.ZodError): FieldError[] {
  return error.issues.map((issue) => ({ path: issue.path.join('.'), message: issue.message }));
}

/** Parse input with a core schema; a failure becomes a 400 listing each field. */
export function parseInput<S extends z.ZodType>(schema: S, input: unknown): z.output<S> {
  const result = schema.safeParse(input ?? {});
  if (!result.success) {
    throw badRequest('Some fields need attention.', fieldErrorsFrom(result.error));
  }
  return result.data;
}

export const apiNotFound: RequestHandler = (req, _res, next) => {
  next(new HttpError(404, 'no_such_route', `There is no API route ${req.method} ${req.path}.`));
};

interface BodyParserError {
  type?: string;
  status?: number;
  limit?: number;
}

/** Map the errors raised by Express' own middleware onto clear problems. */
function fromFrameworkError(err: unknown): HttpError | undefined {
  const e = err as BodyParserError;
  if (e?.type === 'entity.too.large') {
    return new HttpError(
      413,
      'body_too_large',
      `The request body is larger than the ${Math.round((e.limit ?? 0) / 1024)} KB this endpoint accepts.`,
    );
  }
  if (e?.type === 'entity.parse.failed') return new HttpError(400, 'malformed_json', 'The request body is not valid JSON.');
  if (e?.type === 'encoding.unsupported' || e?.type === 'charset.unsupported') {
    return new HttpError(415, 'unsupported_encoding', 'The request body uses an encoding this server does not accept.');
  }
  if ((err as { code?: string })?.code === 'EBADCSRFTOKEN' || (err as { message?: string })?.message === 'invalid csrf token') {
    return new HttpError(403, 'csrf_invalid', 'The security token for this form is missing or out of date. Reload the page and try again.');
  }
  return undefined;
}

export function errorMiddleware(log: (err: unknown, message: string) => void): ErrorRequestHandler {
  return (err, req, res, next) => {
    if (res.headersSent) return next(err);
    const known = err instanceof HttpError ? err : fromFrameworkError(err);
    const problem = known ?? new HttpError(500, 'internal', 'Something went wrong on our side. Nothing was changed; please try again.');
    if (!known) log(err, 'unhandled error');
    res
      .status(problem.status)
      .type('application/problem+json')
      .json({
        type: `about:blank#${problem.code}`,
        title: titles[problem.status] ?? 'Error',
        status: problem.status,
        detail: problem.detail,
        code: problem.code,
        instance: req.originalUrl.split('?')[0],
        ...(problem.errors ? { errors: problem.errors } : {}),
      });
  };
}
