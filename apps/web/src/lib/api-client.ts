/**
 * The one way the web app talks to the API: JSON over same-origin fetch, a CSRF
 * token on every state-changing request, and every failure as an `ApiError`.
 */

export interface ProblemFieldError {
  /** The input field the message belongs to, e.g. "email". */
  path: string;
  message: string;
}

/** The API's error body (RFC 9457 problem details plus our `code` and `errors`). */
export interface Problem {
  type: string;
  title: string;
  status: number;
  detail: string;
  code: string;
  errors?: ProblemFieldError[];
}

export class ApiError extends Error {
  override readonly name = 'ApiError';
  readonly status: number;
  readonly code: string;
  readonly title: string;
  readonly detail: string;
  readonly type: string;
  readonly fieldErrors: readonly ProblemFieldError[];

  constructor(problem: Problem, options?: { cause?: unknown }) {
    super(problem.detail, options);
    this.status = problem.status;
    this.code = problem.code;
    this.title = problem.title;
    this.detail = problem.detail;
    this.type = problem.type;
    this.fieldErrors = problem.errors ?? [];
  }
}

export function isApiError(error: unknown, status?: number): error is ApiError {
  return error instanceof ApiError && (status === undefined || error.status === status);
}

/** A sentence for a person, whatever was thrown. */
export function errorMessage(error: unknown): string {
  if (error instanceof ApiError) return error.detail;
  return 'Something went wrong on this page. Try again, and reload the page if it keeps happening.';
}

type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';

export interface RequestOptions {
  body?: unknown;
  signal?: AbortSignal;
  headers?: Record<string, string>;
}

const CSRF_PATH = '/api/auth/csrf';
const CSRF_HEADER = 'x-csrf-token';

let csrfToken: Promise<string> | null = null;

/** Forget the cached CSRF token; call when the session changes (sign-in, sign-out). */
export function resetCsrfToken(): void {
  csrfToken = null;
}

function getCsrfToken(): Promise<string> {
  csrfToken ??= request<{ token: string }>('GET', CSRF_PATH, {})
    .then((body) => body.token)
    .catch((error: unknown) => {
      // Do not cache a failure: the next request asks again.
      csrfToken = null;
      throw error;
    });
  return csrfToken;
}

function fallbackProblem(status: number, statusText: string): Problem {
  let detail: string;
  if (status === 404) detail = 'That could not be found.';
  else if (status === 413) detail = 'That is too large to send.';
  else if (status === 429) detail = 'Too many attempts. Wait a moment and try again.';
  else if (status >= 500) detail = 'The server ran into a problem. Try again in a moment.';
  else detail = `The request could not be completed (${status}${statusText ? ` ${statusText}` : ''}).`;
  return { type: 'about:blank', title: statusText || 'Request failed', status, detail, code: `http_${status}` };
}

function isProblemShape(value: unknown): value is Partial<Problem> {
  return typeof value === 'object' && value !== null && ('detail' in value || 'title' in value || 'code' in value);
}

async function readProblem(response: Response): Promise<Problem> {
  const fallback = fallbackProblem(response.status, response.statusText);
  const contentType = response.headers.get('content-type') ?? '';
  if (!contentType.includes('json')) return fallback;
  let body: unknown;
  try {
    body = await response.json();
  } catch {
    return fallback;
  }
  if (!isProblemShape(body)) return fallback;
  const rawErrors: unknown = body.errors;
  const errors = Array.isArray(rawErrors)
    ? rawErrors.filter(
        (e: unknown): e is ProblemFieldError =>
          typeof e === 'object' &&
          e !== null &&
          typeof (e as ProblemFieldError).path === 'string' &&
          typeof (e as ProblemFieldError).message === 'string',
      )
    : undefined;
  const title = typeof body.title === 'string' && body.title ? body.title : undefined;
  const detail = typeof body.detail === 'string' && body.detail ? body.detail : undefined;
  return {
    type: typeof body.type === 'string' ? body.type : fallback.type,
    title: title ?? fallback.title,
    status: response.status,
    detail: detail ?? title ?? fallback.detail,
    code: typeof body.code === 'string' ? body.code : fallback.code,
    ...(errors ? { errors } : {}),
  };
}

async function readBody<T>(response: Response): Promise<T> {
  // 202/204 and other empty answers carry no JSON.
  const text = await response.text();
  if (!text) return undefined as T;
  try {
    return JSON.parse(text) as T;
  } catch (cause) {
    throw new ApiError(
      {
        type: 'about:blank',
        title: 'Unreadable response',
        status: response.status,
        detail: 'The server sent an answer this page cannot read. Reload the page and try again.',
        code: 'unreadable_response',
      },
      { cause },
    );
  }
}

function isCsrfRejection(error: ApiError): boolean {
  return error.status === 403 && (error.code === 'csrf_invalid' || error.code === 'csrf_missing');
}

async function send(method: Method, path: string, options: RequestOptions, token: string | null): Promise<Response> {
  const headers: Record<string, string> = { accept: 'application/json', ...options.headers };
  let body: BodyInit | undefined;
  if (options.body instanceof FormData) {
    body = options.body;
  } else if (options.body !== undefined) {
    body = JSON.stringify(options.body);
    headers['content-type'] = 'application/json';
  }
  if (token) headers[CSRF_HEADER] = token;
  try {
    // globalThis.fetch is read at call time so tests can replace it.
    return await globalThis.fetch(path, {
      method,
      headers,
      body,
      credentials: 'same-origin',
      signal: options.signal,
    });
  } catch (cause) {
    if (options.signal?.aborted) throw cause;
    throw new ApiError(
      {
        type: 'about:blank',
        title: 'Network error',
        status: 0,
        detail: 'Could not reach Underfoot. Check your connection and try again.',
        code: 'network_error',
      },
      { cause },
    );
  }
}

async function request<T>(method: Method, path: string, options: RequestOptions): Promise<T> {
  const needsToken = method !== 'GET';
  for (let attempt = 0; ; attempt++) {
    const token = needsToken ? await getCsrfToken() : null;
    const response = await send(method, path, options, token);
    if (response.ok) return readBody<T>(response);
    const error = new ApiError(await readProblem(response));
    // The token expires with the session: fetch a fresh one and try exactly once more.
    if (needsToken && attempt === 0 && isCsrfRejection(error)) {
      resetCsrfToken();
      continue;
    }
    throw error;
  }
}

export const api = {
  get: <T>(path: string, options: Omit<RequestOptions, 'body'> = {}) => request<T>('GET', path, options),
  post: <T>(path: string, body?: unknown, options: RequestOptions = {}) => request<T>('POST', path, { ...options, body }),
  put: <T>(path: string, body?: unknown, options: RequestOptions = {}) => request<T>('PUT', path, { ...options, body }),
  patch: <T>(path: string, body?: unknown, options: RequestOptions = {}) => request<T>('PATCH', path, { ...options, body }),
  delete: <T>(path: string, options: RequestOptions = {}) => request<T>('DELETE', path, options),
};
