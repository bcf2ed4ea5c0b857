import { existsSync } from 'node:fs';
import path from 'node:path';
import request from 'supertest';
import type { Express } from 'express';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { webDistDir } from '@underfoot/server';
import { browserLikeAgent, createTestContext, type TestContext } from '../support/test-app.ts';

interface RouteEntry {
  method: string;
  path: string;
}

interface LayerLike {
  rawPath?: unknown;
  route?: { path: unknown; methods: Record<string, boolean> };
  handle?: { stack?: LayerLike[] };
}

/** Every route the app answers, read from Express' own router (so a new route is covered without editing this test). */
function enumerateRoutes(app: Express): RouteEntry[] {
  const routes: RouteEntry[] = [];
  const walk = (stack: LayerLike[], prefix: string) => {
    for (const layer of stack) {
      const here = typeof layer.rawPath === 'string' && layer.rawPath !== '/' ? layer.rawPath : '';
      if (layer.route && typeof layer.route.path === 'string') {
        for (const [method, on] of Object.entries(layer.route.methods))
          if (on && method !== '_all') routes.push({ method, path: `${prefix}${layer.route.path}` });
      } else if (layer.handle?.stack) {
        walk(layer.handle.stack, `${prefix}${here}`);
      }
    }
  };
  walk((app as unknown as { router: { stack: LayerLike[] } }).router.stack, '');
  return routes;
}

const concrete = (path: string) => path.replace(/:[A-Za-z]+/g, '8d6f1c2e-4b1a-4f0e-9a51-3c7d2e9b0a99');
/** Routes that authenticate by something other than the session, and so carry no CSRF token. */
const exempt = new Set(['/api/payments/webhook/']);

let ctx: TestContext;
beforeAll(async () => {
  ctx = await createTestContext();
});
afterAll(() => ctx.close());

describe('security', () => {
  it('finds the routes it checks', () => {
    const routes = enumerateRoutes(ctx.app);
    expect(routes.length).toBeGreaterThan(20);
    expect(routes).toContainEqual({ method: 'post', path: '/api/auth/sign-in' });
    expect(routes).toContainEqual({ method: 'post', path: '/api/orders' });
  });

  it('refuses every state-changing route without the CSRF token, even signed in', async () => {
    const client = await browserLikeAgent(ctx.app);
    expect((await client.signIn(ctx.users.office.email)).status).toBe(200);
    const unsafe = enumerateRoutes(ctx.app).filter((r) => r.method !== 'get' && r.method !== 'head' && !exempt.has(r.path));
    expect(unsafe.length).toBeGreaterThan(10);
    const failures: string[] = [];
    for (const route of unsafe) {
      const res = await (client.agent as unknown as Record<string, (url: string) => Promise<{ status: number; body: { code?: string } }>>)[
        route.method
      ]!(concrete(route.path));
      if (res.status !== 403 || res.body.code !== 'csrf_invalid')
        failures.push(`${route.method.toUpperCase()} ${route.path} → ${res.status} ${res.body.code ?? ''}`);
    }
    expect(failures).toEqual([]);
  });

  it('the webhook, the one exemption, insists on its own signature instead', async () => {
    const res = await fetch(`${ctx.baseUrl}/api/payments/webhook`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: '{}',
    });
    expect(res.status).toBe(400);
  });

  it('error bodies carry no stack traces or SQL', async () => {
    const client = await browserLikeAgent(ctx.app);
    await client.signIn(ctx.users.office.email);
    const probes = await Promise.all([
      client.agent.get('/api/orders/not-a-real-id'),
      client.agent.get('/api/orders?limit=-5'),
      client.post('/api/orders', { kind: 'nonsense', property: 'x' }),
      client.agent.get("/api/orders?q=' OR 1=1 --"),
      client.agent.get('/api/nope'),
    ]);
    for (const res of probes) {
      const text = JSON.stringify(res.body);
      expect(text).not.toMatch(/\bat .+\.(ts|js):\d+/);
      expect(text).not.toMatch(/select .* from|insert into|sqlite|knex/i);
    }
  });

  // The built app (npm test builds it first) must run under the policy: no inline script anywhere.
  it.skipIf(!existsSync(path.join(webDistDir, 'index.html')))(
    'the content security policy allows no inline script, and the built app needs none',
    async () => {
      const res = await request(ctx.app).get('/sign-in');
      const policy = String(res.headers['content-security-policy']);
      expect(policy).toMatch(/script-src 'self'(;|$)/);
      expect(policy).not.toMatch(/script-src[^;]*unsafe-(inline|eval)/);
      expect(policy).toMatch(/object-src 'none'/);
      expect(policy).toMatch(/frame-ancestors 'none'/);
      const html = res.text;
      const scripts = [...html.matchAll(/<script\b[^>]*>([\s\S]*?)<\/script>/g)];
      expect(scripts.length).toBeGreaterThan(0);
      for (const [tag, body] of scripts) {
        expect(tag).toMatch(/\ssrc="\/assets\//);
        expect(body!.trim()).toBe('');
      }
      // No inline event handlers either (they count as inline script).
      expect(html).not.toMatch(/\son[a-z]+="/i);
    },
  );

  it('cookies are HttpOnly and SameSite=Lax; Secure when served over HTTPS', async () => {
    // A first visit: the session (and its cookie) starts here.
    const res = await request(ctx.app).get('/api/auth/csrf');
    const cookie = String(res.headers['set-cookie']);
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    // Behind a TLS-terminating proxy: the proxy says the request came over HTTPS.
    const https = await createTestContext({ PUBLIC_URL: 'https://underfoot.example', TRUST_PROXY: 'true' });
    try {
      const secure = await request(https.app).get('/api/auth/csrf').set('X-Forwarded-Proto', 'https');
      expect(String(secure.headers['set-cookie'])).toMatch(/Secure/i);
      expect(secure.headers['strict-transport-security']).toBeDefined();
    } finally {
      await https.close();
    }
  });
});
