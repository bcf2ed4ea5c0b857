import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ConfigError, parseConfig } from '@underfoot/server';
import { browserLikeAgent, createTestContext, type TestContext } from '../support/test-app.ts';

describe('server foundation', () => {
  let ctx: TestContext;
  beforeAll(async () => {
    ctx = await createTestContext();
  });
  afterAll(() => ctx.close());

  it('answers the health check', async () => {
    const res = await request(ctx.app).get('/api/health').expect(200);
    expect(res.body).toEqual({ status: 'ok' });
    expect(res.headers['x-request-id']).toMatch(/[\w-]+/);
  });

  it('answers unknown API routes with a JSON problem, not the web app', async () => {
    const res = await request(ctx.app).get('/api/no-such-thing').expect(404);
    expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(res.body).toMatchObject({ status: 404, code: 'no_such_route', title: 'Not found' });
  });

  it('sends security headers', async () => {
    const res = await request(ctx.app).get('/api/health');
    expect(res.headers['content-security-policy']).toContain("default-src 'self'");
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['x-frame-options']).toBe('SAMEORIGIN');
    expect(res.headers['x-powered-by']).toBeUndefined();
  });

  it('rejects a too-large body with a clear problem', async () => {
    const agent = request.agent(ctx.app);
    const csrf = await agent.get('/api/auth/csrf');
    const res = await agent
      .post('/api/auth/sign-in')
      .set('x-csrf-token', csrf.body.token)
      .set('content-type', 'application/json')
      .send(JSON.stringify({ email: 'a@b.test', password: 'x'.repeat(200_000) }))
      .expect(413);
    expect(res.body).toMatchObject({ code: 'body_too_large', status: 413 });
    expect(res.body.detail).toContain('KB');
  });

  it('compresses JSON for clients that accept gzip', async () => {
    const client = await browserLikeAgent(ctx.app);
    await client.signIn(ctx.users.office.email);
    const res = await client.agent.get('/api/company/price-book').set('Accept-Encoding', 'gzip');
    expect(res.status).toBe(200);
    expect(res.headers['content-encoding']).toBe('gzip');
    expect(res.body.priceBook).toBeDefined();
  });

  it('answers malformed JSON with 400 and no stack trace', async () => {
    const agent = request.agent(ctx.app);
    const { body } = await agent.get('/api/auth/csrf');
    const res = await agent
      .post('/api/auth/sign-in')
      .set('x-csrf-token', body.token)
      .set('content-type', 'application/json')
      .send('{"email":');
    expect(res.status).toBe(400);
    expect(res.body.code).toBe('malformed_json');
    expect(JSON.stringify(res.body)).not.toMatch(/at .*\.ts:\d+|node_modules/);
  });
});

describe('configuration', () => {
  it('lists every bad setting at once, readably', () => {
    let error: unknown;
    try {
      parseConfig({ PORT: 'eighty', PUBLIC_URL: 'not a url', NODE_ENV: 'staging' });
    } catch (err) {
      error = err;
    }
    expect(error).toBeInstanceOf(ConfigError);
    const message = (error as ConfigError).message;
    expect(message).toContain('PORT');
    expect(message).toContain('PUBLIC_URL');
    expect(message).toContain('NODE_ENV');
  });

  it('requires a session secret and public address in production', () => {
    expect(() => parseConfig({ NODE_ENV: 'production' })).toThrow(/SESSION_SECRET[\s\S]*PUBLIC_URL/);
  });

  it('marks cookies Secure when the public address is HTTPS', () => {
    const config = parseConfig({ NODE_ENV: 'test', PUBLIC_URL: 'https://underfoot.example' });
    expect(config.secureCookies).toBe(true);
  });
});

describe('the database connection', () => {
  let ctx: TestContext;
  beforeAll(async () => {
    ctx = await createTestContext();
  });
  afterAll(() => ctx.close());

  it('reads first rows and pages the same on either database', async () => {
    const { db } = ctx.services;
    const ids = (await db('users').orderBy('email').select('id')).map((r: { id: string }) => r.id);
    expect(ids.length).toBeGreaterThanOrEqual(3);
    expect((await db('users').orderBy('email').first('id'))?.id).toBe(ids[0]);
    const page = await db('users').orderBy('email').limit(2).offset(1).select('id');
    expect(page.map((r: { id: string }) => r.id)).toEqual(ids.slice(1, 3));
  });

  // SQLite plans a statement again each time a bound LIMIT changes, which defeats keeping statements prepared.
  it.skipIf(Boolean(process.env.DATABASE_URL))('writes the limit into SQLite statements and binds everything else', () => {
    const { db } = ctx.services;
    expect(db('users').where({ id: 'x' }).first().toSQL()).toMatchObject({ sql: expect.stringMatching(/limit 1$/), bindings: ['x'] });
    expect(db('users').limit(25).offset(50).toSQL()).toMatchObject({ sql: expect.stringMatching(/limit 25 offset \?$/), bindings: [50] });
  });
});
