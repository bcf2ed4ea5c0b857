import { vi } from 'vitest';

export interface RecordedRequest {
  method: string;
  url: string;
  headers: Headers;
  body: unknown;
}

type Handler = (request: RecordedRequest) => Response | Promise<Response>;

export function json(body: unknown, status = 200): Response {
  return new Response(JSON.stringify(body), { status, headers: { 'content-type': 'application/json' } });
}

export function problem(
  status: number,
  fields: { code: string; detail: string; title?: string; errors?: { path: string; message: string }[] },
) {
  return new Response(JSON.stringify({ type: 'about:blank', title: fields.title ?? 'Error', status, ...fields }), {
    status,
    headers: { 'content-type': 'application/problem+json' },
  });
}

/**
 * Replaces global fetch with a table of "METHOD /path" handlers (query string
 * ignored) and records every request. Unknown routes answer 404 problems.
 */
export function mockFetch(routes: Record<string, Handler | Handler[]>) {
  const requests: RecordedRequest[] = [];
  const queues = new Map(Object.entries(routes).map(([key, h]) => [key, Array.isArray(h) ? [...h] : h]));
  const fetchMock = vi.fn(async (input: RequestInfo | URL, init: RequestInit = {}) => {
    const url = typeof input === 'string' ? input : input instanceof URL ? input.href : input.url;
    const method = (init.method ?? 'GET').toUpperCase();
    const rawBody = init.body;
    const request: RecordedRequest = {
      method,
      url,
      headers: new Headers(init.headers),
      body: typeof rawBody === 'string' ? JSON.parse(rawBody) : rawBody,
    };
    requests.push(request);
    const path = new URL(url, 'http://localhost').pathname;
    const entry = queues.get(`${method} ${path}`);
    // A list answers in order, its last handler repeating.
    const handler = Array.isArray(entry) ? (entry.length > 1 ? entry.shift() : entry[0]) : entry;
    if (!handler) return problem(404, { code: 'not_found', detail: `No mock for ${method} ${path}` });
    return handler(request);
  });
  vi.stubGlobal('fetch', fetchMock);
  return { requests, fetchMock };
}
