import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { browserLikeAgent, createTestContext, type TestContext } from '../support/test-app.ts';

/*
 * Requests that arrive at the same moment. SQLite runs one write transaction at a time, so these
 * mostly prove themselves under `npm run test:pg`, where PostgreSQL serves several connections at
 * once and a read-then-write can let two requests past the same check.
 */

const SIGN_IN_LIMIT = 4;
let ctx: TestContext;
beforeAll(async () => {
  ctx = await createTestContext({ SIGN_IN_LIMIT_PER_ACCOUNT: String(SIGN_IN_LIMIT), SIGN_IN_LIMIT_PER_ADDRESS: '100' });
});
afterAll(() => ctx.close());

const tally = (statuses: number[]) => statuses.reduce<Record<number, number>>((t, s) => ({ ...t, [s]: (t[s] ?? 0) + 1 }), {});

describe('at the same moment', () => {
  it('a burst of wrong passwords for one account gets no more tries than the limit', async () => {
    const client = await browserLikeAgent(ctx.app);
    const burst = await Promise.all(
      Array.from({ length: SIGN_IN_LIMIT * 3 }, () => client.signIn(ctx.users.client.email, 'not the password')),
    );
    expect(tally(burst.map((r) => r.status))).toEqual({ 401: SIGN_IN_LIMIT, 429: SIGN_IN_LIMIT * 2 });
    const counter = await ctx.services
      .db('rate_limits')
      .where({ key: `sign-in-account:${ctx.users.client.email}` })
      .first();
    expect(Number(counter?.hits)).toBe(SIGN_IN_LIMIT * 3);
  });

  it('two office users making the inspection fee at once: one is taken, the others are refused', async () => {
    const first = await browserLikeAgent(ctx.app);
    const second = await browserLikeAgent(ctx.app);
    expect((await first.signIn(ctx.users.office.email)).status).toBe(200);
    const otherOffice = await ctx.addUser('office', 'second.office@mudlark.test');
    expect((await second.signIn(otherOffice.email)).status).toBe(200);

    const attempts = await Promise.all(
      [first, second, first, second].map((client, i) =>
        client.post('/api/company/fees', { kind: 'base', name: `Camera inspection ${i + 1}`, priceCents: 30_000 + i }),
      ),
    );
    expect(tally(attempts.map((r) => r.status))).toEqual({ 201: 1, 400: 3 });
    const activeBase = await ctx.services.db('fee_items').where({ company_id: ctx.companyId, kind: 'base', active: true });
    expect(activeBase).toHaveLength(1);
  });
});
