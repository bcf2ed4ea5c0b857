import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { json, mockFetch, problem } from '@/test/fetch-mock';
import { api, ApiError, resetCsrfToken } from './api-client';

beforeEach(() => {
  resetCsrfToken();
});

afterEach(() => {
  vi.unstubAllGlobals();
});

describe('api client', () => {
  it('turns a problem+json answer into an ApiError with its field errors', async () => {
    mockFetch({
      'GET /api/auth/csrf': () => json({ token: 'token-1' }),
      'POST /api/things': () =>
        problem(400, {
          title: 'Invalid input',
          code: 'validation_failed',
          detail: 'Check the highlighted fields.',
          errors: [{ path: 'email', message: 'Enter a valid e-mail address.' }],
        }),
    });

    const error = await api.post('/api/things', { email: 'nope' }).catch((e: unknown) => e);

    expect(error).toBeInstanceOf(ApiError);
    const apiError = error as ApiError;
    expect(apiError.status).toBe(400);
    expect(apiError.code).toBe('validation_failed');
    expect(apiError.title).toBe('Invalid input');
    expect(apiError.detail).toBe('Check the highlighted fields.');
    expect(apiError.message).toBe('Check the highlighted fields.');
    expect(apiError.fieldErrors).toEqual([{ path: 'email', message: 'Enter a valid e-mail address.' }]);
  });

  it('sends the CSRF token on state-changing requests, fetches it once, and never on GET', async () => {
    const { requests } = mockFetch({
      'GET /api/auth/csrf': () => json({ token: 'token-1' }),
      'GET /api/things': () => json({ things: [] }),
      'POST /api/things': () => json({ ok: true }, 201),
      'DELETE /api/things/1': () => new Response(null, { status: 204 }),
    });

    await expect(api.get('/api/things')).resolves.toEqual({ things: [] });
    await expect(api.post('/api/things', { name: 'a' })).resolves.toEqual({ ok: true });
    await expect(api.delete('/api/things/1')).resolves.toBeUndefined();

    const get = requests.find((r) => r.method === 'GET' && r.url === '/api/things');
    expect(get?.headers.has('x-csrf-token')).toBe(false);
    const post = requests.find((r) => r.method === 'POST');
    expect(post?.headers.get('x-csrf-token')).toBe('token-1');
    expect(post?.headers.get('content-type')).toBe('application/json');
    expect(post?.body).toEqual({ name: 'a' });
    expect(requests.find((r) => r.method === 'DELETE')?.headers.get('x-csrf-token')).toBe('token-1');
    expect(requests.filter((r) => r.url === '/api/auth/csrf')).toHaveLength(1);
  });

  it('sends same-origin credentials', async () => {
    const { fetchMock } = mockFetch({ 'GET /api/things': () => json({}) });
    await api.get('/api/things');
    expect(fetchMock.mock.calls[0]?.[1]).toMatchObject({ credentials: 'same-origin', method: 'GET' });
  });

  it('fetches a fresh token and retries once when the server rejects the token', async () => {
    const { requests } = mockFetch({
      'GET /api/auth/csrf': [() => json({ token: 'stale' }), () => json({ token: 'fresh' })],
      'POST /api/things': [
        () => problem(403, { code: 'csrf_invalid', detail: 'The form has expired. Reload the page.' }),
        () => json({ ok: true }),
      ],
    });

    await expect(api.post('/api/things', {})).resolves.toEqual({ ok: true });

    const posts = requests.filter((r) => r.method === 'POST');
    expect(posts.map((r) => r.headers.get('x-csrf-token'))).toEqual(['stale', 'fresh']);
  });

  it('gives up after one retry and reports the rejection', async () => {
    const { requests } = mockFetch({
      'GET /api/auth/csrf': () => json({ token: 'always-bad' }),
      'POST /api/things': () => problem(403, { code: 'csrf_invalid', detail: 'The form has expired. Reload the page.' }),
    });

    await expect(api.post('/api/things', {})).rejects.toMatchObject({ status: 403, code: 'csrf_invalid' });
    expect(requests.filter((r) => r.method === 'POST')).toHaveLength(2);
  });

  it('does not retry other 403s', async () => {
    const { requests } = mockFetch({
      'GET /api/auth/csrf': () => json({ token: 't' }),
      'POST /api/things': () => problem(403, { code: 'forbidden', detail: 'You cannot do that.' }),
    });

    await expect(api.post('/api/things', {})).rejects.toMatchObject({ status: 403, code: 'forbidden' });
    expect(requests.filter((r) => r.method === 'POST')).toHaveLength(1);
  });

  it('describes answers that are not problem documents, and network failures', async () => {
    mockFetch({
      'GET /api/html': () =>
        new Response('<h1>Bad gateway</h1>', { status: 502, statusText: 'Bad Gateway', headers: { 'content-type': 'text/html' } }),
    });
    await expect(api.get('/api/html')).rejects.toMatchObject({
      status: 502,
      code: 'http_502',
      detail: 'The server ran into a problem. Try again in a moment.',
    });

    vi.stubGlobal(
      'fetch',
      vi.fn(() => Promise.reject(new TypeError('Failed to fetch'))),
    );
    await expect(api.get('/api/things')).rejects.toMatchObject({ status: 0, code: 'network_error' });
  });
});
