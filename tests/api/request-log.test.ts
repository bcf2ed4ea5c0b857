import { Writable } from 'node:stream';
import express from 'express';
import { pino } from 'pino';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { requestLog, urlForLog } from '@underfoot/server';

/** An app with only the request log in front, writing its lines to an array. */
function loggedApp() {
  const lines: Record<string, unknown>[] = [];
  const sink = new Writable({
    write(chunk: Buffer, _encoding, done) {
      lines.push(JSON.parse(chunk.toString()) as Record<string, unknown>);
      done();
    },
  });
  const app = express();
  app.use(requestLog(pino({ level: 'info' }, sink)));
  app.get('/{*splat}', (_req, res) => res.json({ ok: true }));
  return { app, lines };
}

describe('the request log', () => {
  it('writes one line per request with the method, address, status and time, and the request id it answered with', async () => {
    const { app, lines } = loggedApp();
    const res = await request(app).get('/api/orders?page=2').set('User-Agent', 'field-phone');
    expect(lines).toHaveLength(1);
    const line = lines[0] as { req: Record<string, unknown>; res: Record<string, unknown>; responseTime: unknown };
    expect(line.req).toMatchObject({ id: res.headers['x-request-id'], method: 'GET', url: '/api/orders?page=2', userAgent: 'field-phone' });
    expect(line.res).toEqual({ statusCode: 200 });
    expect(typeof line.responseTime).toBe('number');
  });

  it('keeps the session cookie, the CSRF token and link tokens out of the log', async () => {
    const { app, lines } = loggedApp();
    const secrets = ['s%3Asession-secret', 'csrf-secret', 'guest-link-secret', 'reset-secret', 'invite-secret', 'verify-secret'];
    await request(app)
      .get('/api/shared/guest-link-secret/media/m1/file')
      .set('Cookie', `underfoot.sid=${secrets[0]}`)
      .set('x-csrf-token', secrets[1]!);
    await request(app).get('/reset-password?token=reset-secret&next=1');
    await request(app).get('/api/auth/invitations/invite-secret');
    await request(app).get('/api/sign-up/verify/verify-secret');
    const text = JSON.stringify(lines);
    for (const secret of secrets) expect(text).not.toContain(secret);
    expect(lines.map((l) => (l.req as { url: string }).url)).toEqual([
      '/api/shared/[token]/media/m1/file',
      '/reset-password?token=[token]&next=1',
      '/api/auth/invitations/[token]',
      '/api/sign-up/verify/[token]',
    ]);
  });

  it('masks a token wherever a link puts one', () => {
    expect(urlForLog('/shared/abc')).toBe('/shared/[token]');
    expect(urlForLog('/invitation?next=x&token=abc')).toBe('/invitation?next=x&token=[token]');
    expect(urlForLog('/api/reports/o-1/share-links')).toBe('/api/reports/o-1/share-links');
  });

  it('leaves the health check out', async () => {
    const { app, lines } = loggedApp();
    await request(app).get('/api/health');
    expect(lines).toEqual([]);
  });
});
