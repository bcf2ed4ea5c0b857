import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { browserLikeAgent, createTestContext, linkIn, TEST_PASSWORD, waitForMail, type TestContext } from '../support/test-app.ts';

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

  it('two sign-ups for one new address at once: one account, no error', async () => {
    const office = await browserLikeAgent(ctx.app);
    expect((await office.signIn(ctx.users.office.email)).status).toBe(200);
    await office.agent.patch('/api/company/settings').set('x-csrf-token', office.token).send({ agentSignup: 'self_signup' }).expect(200);
    const visitors = await Promise.all([1, 2, 3].map(() => browserLikeAgent(ctx.app)));
    const asked = await Promise.all(
      visitors.map((v) => v.post(`/api/sign-up/companies/${ctx.companyId}`, { name: 'Tamsin Reed', email: 'tamsin.reed@realty.test' })),
    );
    expect(asked.map((r) => r.status)).toEqual([202, 202, 202]);
    expect(await ctx.services.db('users').where({ email: 'tamsin.reed@realty.test' })).toHaveLength(1);
  });

  it('two invitations to one new address at once: one pending account, no error', async () => {
    const [first, second] = await Promise.all([1, 2].map(() => browserLikeAgent(ctx.app)));
    expect((await first!.signIn(ctx.users.office.email)).status).toBe(200);
    expect((await second!.signIn('second.office@mudlark.test')).status).toBe(200);
    const sent = await Promise.all(
      [first!, second!].map((c) =>
        c.post('/api/users/invitations', { email: 'idris.vane@mudlark.test', name: 'Idris Vane', role: 'inspector' }),
      ),
    );
    expect(sent.map((r) => r.status)).toEqual([201, 201]);
    expect(await ctx.services.db('users').where({ email: 'idris.vane@mudlark.test' })).toHaveLength(1);
  });

  it('two orders inviting one new client at once: both placed, one account for the client', async () => {
    const { db } = ctx.services;
    if (!(await db('fee_items').where({ company_id: ctx.companyId, kind: 'base', active: true }).first())) {
      throw new Error('an earlier test in this file makes the inspection fee');
    }
    const agents = await Promise.all([1, 2].map(() => browserLikeAgent(ctx.app)));
    for (const agent of agents) expect((await agent.signIn(ctx.users.agent.email)).status).toBe(200);
    const day = (n: number) => new Date(Date.now() + n * 86_400_000).toISOString().slice(0, 10);
    const placed = await Promise.all(
      agents.map((agent, i) =>
        agent.post('/api/orders', {
          kind: 'pre_purchase',
          property: {
            address: { street: `${40 + i} Kestrel Row`, unit: '', city: 'Alder Falls', region: 'OR', postalCode: '97411' },
            yearBuilt: 1972,
            propertyType: 'single_family',
            occupancy: 'occupied',
            accessNotes: '',
          },
          contingencyDeadline: day(12),
          preferredDates: [day(4)],
          addOnIds: [],
          parties: [{ partyRole: 'buyer', name: 'Noor Haddad', email: 'noor.haddad@example.com' }],
          payer: 'client_before_release',
        }),
      ),
    );
    expect(
      placed.map((r) => r.status),
      JSON.stringify(placed.map((r) => r.body)),
    ).toEqual([201, 201]);
    expect(await db('users').where({ email: 'noor.haddad@example.com' })).toHaveLength(1);
  });

  it('two accounts moving to one address at once: one gets it, the other a clear refusal', async () => {
    const movers = [await ctx.addUser('agent', 'mover.one@realty.test'), await ctx.addUser('agent', 'mover.two@realty.test')];
    const tokens: string[] = [];
    for (const mover of movers) {
      const client = await browserLikeAgent(ctx.app);
      expect((await client.signIn(mover.email)).status).toBe(200);
      ctx.mail.clear();
      expect((await client.post('/api/account/email', { newEmail: 'wanted@realty.test', currentPassword: TEST_PASSWORD })).status).toBe(
        202,
      );
      const mail = await waitForMail(ctx.mail, 'wanted@realty.test', 'Confirm your new e-mail');
      tokens.push(new URL(linkIn(mail.text, '/account/confirm-email?token=')).searchParams.get('token')!);
    }
    const confirmers = await Promise.all(tokens.map(() => browserLikeAgent(ctx.app)));
    const confirmed = await Promise.all(confirmers.map((c, i) => c.post('/api/account/email/confirm', { token: tokens[i] })));
    expect(confirmed.map((r) => r.status).sort()).toEqual([200, 409]);
    expect(confirmed.find((r) => r.status === 409)?.body.code).toBe('email_taken');
    expect(await ctx.services.db('users').where({ email: 'wanted@realty.test' })).toHaveLength(1);
  });
});
