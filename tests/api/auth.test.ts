import request from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { browserLikeAgent, createTestContext, linkIn, TEST_PASSWORD, waitForMail, type TestContext } from '../support/test-app.ts';

let ctx: TestContext;
beforeAll(async () => {
  ctx = await createTestContext({ SIGN_IN_LIMIT_PER_ACCOUNT: '4', SIGN_IN_LIMIT_PER_ADDRESS: '50' });
});
afterAll(() => ctx.close());
beforeEach(async () => {
  await ctx.services.db('rate_limits').delete();
  ctx.mail.clear();
});

describe('sign-in', () => {
  it('signs in, answers /me, and regenerates the session id', async () => {
    const client = await browserLikeAgent(ctx.app);
    const before = await client.agent.get('/api/auth/csrf');
    const res = await client.signIn(ctx.users.office.email);
    expect(res.status).toBe(200);
    expect(res.body.user).toMatchObject({ email: ctx.users.office.email, role: 'office', companyName: 'Mudlark Drain Testing' });
    expect(res.body.user.passwordHash).toBeUndefined();

    const cookieAfter = String(res.headers['set-cookie']);
    expect(cookieAfter).toMatch(/underfoot\.sid=/);
    expect(cookieAfter).toMatch(/HttpOnly/i);
    expect(cookieAfter).toMatch(/SameSite=Lax/i);
    const sidOf = (header: unknown) => String(header).match(/underfoot\.sid=([^;]+)/)?.[1];
    expect(sidOf(cookieAfter)).toBeDefined();
    expect(sidOf(cookieAfter)).not.toBe(sidOf(before.headers['set-cookie']));

    const me = await client.agent.get('/api/auth/me').expect(200);
    expect(me.body.user.role).toBe('office');
  });

  it('keeps a session in use alive without writing it on every request', async () => {
    const client = await browserLikeAgent(ctx.app);
    await client.signIn(ctx.users.agent.email);
    const db = ctx.services.db;
    const sid = decodeURIComponent(
      String((await client.agent.jar.getCookie('underfoot.sid', { domain: '127.0.0.1', path: '/', secure: false, script: false }))?.value),
    )
      .slice(2)
      .split('.')[0]!;
    // The drivers hand the row back differently (SQLite: text; PostgreSQL: a Date and parsed JSON).
    const stored = async () => {
      const row = await db('sessions').where({ sid }).first();
      return row && { expired: new Date(row.expired).getTime(), sess: typeof row.sess === 'string' ? JSON.parse(row.sess) : row.sess };
    };
    // The first request after sign-in notes when the session was last refreshed.
    await client.agent.get('/api/auth/me').expect(200);
    const before = await stored();
    expect(before).toBeDefined();

    // Plain reads leave the stored session alone (no write per request).
    await client.agent.get('/api/auth/me').expect(200);
    await client.agent.get('/api/auth/me').expect(200);
    expect((await stored()).expired).toBe(before.expired);

    // An hour on, the next request pushes the expiry forward and sends the cookie again.
    const sess = { ...before.sess };
    sess.refreshedAt = Date.now() - 61 * 60_000;
    await db('sessions')
      .where({ sid })
      .update({ sess: JSON.stringify(sess), expired: new Date(Date.now() + 60_000).toISOString() });
    const res = await client.agent.get('/api/auth/me').expect(200);
    expect(String(res.headers['set-cookie'])).toMatch(/underfoot\.sid=/);
    const after = await stored();
    expect(after.expired).toBeGreaterThan(Date.now() + 13 * 24 * 60 * 60_000);
    expect(after.sess.refreshedAt).toBeGreaterThan(Date.now() - 60_000);
  });

  it('accepts the e-mail in any case', async () => {
    const client = await browserLikeAgent(ctx.app);
    const res = await client.signIn('  OFFICE@Mudlark.TEST ');
    expect(res.status).toBe(200);
  });

  it('gives unknown e-mail and wrong password the same answer', async () => {
    const client = await browserLikeAgent(ctx.app);
    const wrong = await client.signIn(ctx.users.agent.email, 'not the password');
    const unknown = await client.signIn('nobody@nowhere.test', 'not the password');
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(wrong.body).toEqual(unknown.body);
    expect(wrong.body.detail).toBe('E-mail or password is incorrect.');
  });

  it('answers bad input with field errors', async () => {
    const client = await browserLikeAgent(ctx.app);
    const res = await client.signIn('not-an-email', '');
    expect(res.status).toBe(400);
    expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
    const paths = res.body.errors.map((e: { path: string }) => e.path);
    expect(paths).toEqual(expect.arrayContaining(['email', 'password']));
  });

  it('refuses a state-changing request without the CSRF token (403)', async () => {
    const res = await request(ctx.app).post('/api/auth/sign-in').send({ email: ctx.users.office.email, password: TEST_PASSWORD });
    expect(res.status).toBe(403);
    expect(res.body.code).toBe('csrf_invalid');
  });

  it('refuses a CSRF token from another session', async () => {
    const mine = await browserLikeAgent(ctx.app);
    const theirs = await browserLikeAgent(ctx.app);
    const res = await mine.agent
      .post('/api/auth/sign-in')
      .set('x-csrf-token', theirs.token)
      .send({ email: ctx.users.office.email, password: TEST_PASSWORD });
    expect(res.status).toBe(403);
  });

  it('throttles repeated failures per account with a clear 429', async () => {
    const client = await browserLikeAgent(ctx.app);
    for (let i = 0; i < 4; i++) expect((await client.signIn(ctx.users.client.email, 'wrong password')).status).toBe(401);
    const blocked = await client.signIn(ctx.users.client.email, TEST_PASSWORD);
    expect(blocked.status).toBe(429);
    expect(blocked.body.code).toBe('rate_limited');
    expect(blocked.body.detail).toMatch(/Too many sign-in attempts for this account/);
    expect(blocked.headers['ratelimit-policy'] ?? blocked.headers['ratelimit']).toBeDefined();
  });

  it('throttles per address across accounts', async () => {
    const local = await createTestContext({ SIGN_IN_LIMIT_PER_ADDRESS: '3', SIGN_IN_LIMIT_PER_ACCOUNT: '50' });
    try {
      const client = await browserLikeAgent(local.app);
      for (const email of ['a@x.test', 'b@x.test', 'c@x.test']) expect((await client.signIn(email, 'nope')).status).toBe(401);
      const blocked = await client.signIn('d@x.test', 'nope');
      expect(blocked.status).toBe(429);
      expect(blocked.body.detail).toMatch(/from this network/);
    } finally {
      await local.close();
    }
  });

  it('signs out and destroys the session', async () => {
    const client = await browserLikeAgent(ctx.app);
    await client.signIn(ctx.users.inspector.email);
    const sessionsBefore = await ctx.services.db('sessions').count({ n: '*' }).first();
    expect((await client.post('/api/auth/sign-out')).status).toBe(204);
    await client.agent.get('/api/auth/me').expect(401);
    const sessionsAfter = await ctx.services.db('sessions').count({ n: '*' }).first();
    expect(Number(sessionsAfter?.n)).toBe(Number(sessionsBefore?.n) - 1);
  });

  it('ends the session of a disabled account on its next request, and refuses sign-in', async () => {
    const person = await ctx.addUser('agent', 'soon-disabled@realty.test');
    const client = await browserLikeAgent(ctx.app);
    await client.signIn(person.email);
    await ctx.services.db('users').where({ id: person.id }).update({ disabled_at: new Date().toISOString() });
    await client.agent.get('/api/auth/me').expect(401);
    const again = await (await browserLikeAgent(ctx.app)).signIn(person.email);
    expect(again.status).toBe(403);
    expect(again.body.code).toBe('account_disabled');
  });
});

describe('forgotten password', () => {
  it('e-mails a single-use link that sets a new password and signs in', async () => {
    const client = await browserLikeAgent(ctx.app);
    const res = await client.post('/api/auth/password-reset', { email: ctx.users.agent.email });
    expect(res.status).toBe(202);
    const mail = await waitForMail(ctx.mail, ctx.users.agent.email, 'Reset');
    expect(mail.html).toContain('Mudlark Drain Testing');
    expect(mail.text).toContain('Mudlark Drain Testing');
    const link = new URL(linkIn(mail.text, '/reset-password?token='));
    expect(link.origin).toBe('http://underfoot.test');
    const token = link.searchParams.get('token')!;

    const stored = await ctx.services.db('one_time_tokens').where({ purpose: 'password_reset' }).select('token_hash');
    expect(stored.map((r) => r.token_hash)).not.toContain(token);

    const done = await client.post('/api/auth/password-reset/complete', { token, password: 'a brand new passphrase' });
    expect(done.status).toBe(200);
    expect(done.body.user.email).toBe(ctx.users.agent.email);
    await client.agent.get('/api/auth/me').expect(200);

    const reused = await client.post('/api/auth/password-reset/complete', { token, password: 'another new passphrase' });
    expect(reused.status).toBe(410);
    expect(reused.body.code).toBe('link_used');

    expect((await (await browserLikeAgent(ctx.app)).signIn(ctx.users.agent.email, 'a brand new passphrase')).status).toBe(200);
    expect((await (await browserLikeAgent(ctx.app)).signIn(ctx.users.agent.email, TEST_PASSWORD)).status).toBe(401);
    await ctx.services
      .db('users')
      .where({ id: ctx.users.agent.id })
      .update({ password_hash: (await ctx.services.db('users').where({ id: ctx.users.office.id }).first()).password_hash });
  });

  it('answers the same for an unknown address and sends nothing', async () => {
    const client = await browserLikeAgent(ctx.app);
    const known = await client.post('/api/auth/password-reset', { email: ctx.users.office.email });
    const unknown = await client.post('/api/auth/password-reset', { email: 'stranger@nowhere.test' });
    expect(unknown.status).toBe(known.status);
    expect(unknown.body).toEqual(known.body);
    await waitForMail(ctx.mail, ctx.users.office.email);
    await new Promise((r) => setTimeout(r, 200));
    expect(ctx.mail.messages().some((m) => m.to.includes('stranger@nowhere.test'))).toBe(false);
  });

  it('refuses an expired link with 410', async () => {
    const client = await browserLikeAgent(ctx.app);
    await client.post('/api/auth/password-reset', { email: ctx.users.inspector.email });
    const mail = await waitForMail(ctx.mail, ctx.users.inspector.email, 'Reset');
    const token = new URL(linkIn(mail.text, '/reset-password?token=')).searchParams.get('token')!;
    await ctx.services.db('one_time_tokens').where({ user_id: ctx.users.inspector.id }).update({ expires_at: '2000-01-01T00:00:00.000Z' });
    const res = await client.post('/api/auth/password-reset/complete', { token, password: 'a brand new passphrase' });
    expect(res.status).toBe(410);
    expect(res.body.code).toBe('link_expired');
  });

  it('refuses a made-up token and a too-short password', async () => {
    const client = await browserLikeAgent(ctx.app);
    const unknown = await client.post('/api/auth/password-reset/complete', { token: 'x'.repeat(43), password: 'a brand new passphrase' });
    expect(unknown.status).toBe(404);
    const weak = await client.post('/api/auth/password-reset/complete', { token: 'x'.repeat(43), password: 'short' });
    expect(weak.status).toBe(400);
    expect(weak.body.errors[0].path).toBe('password');
  });
});

describe('invitations', () => {
  it('the office invites an inspector, who sets a password from the e-mail and is signed in', async () => {
    const office = await browserLikeAgent(ctx.app);
    await office.signIn(ctx.users.office.email);
    const invited = await office.post('/api/users/invitations', {
      email: 'New.Inspector@Mudlark.test',
      name: 'Ada Field',
      role: 'inspector',
    });
    expect(invited.status).toBe(201);

    const mail = await waitForMail(ctx.mail, 'new.inspector@mudlark.test', 'invited you');
    const token = new URL(linkIn(mail.text, '/invitation?token=')).searchParams.get('token')!;

    const invitee = await browserLikeAgent(ctx.app);
    const described = await invitee.agent.get(`/api/auth/invitations/${token}`).expect(200);
    expect(described.body).toEqual({
      email: 'new.inspector@mudlark.test',
      name: 'Ada Field',
      role: 'inspector',
      companyName: 'Mudlark Drain Testing',
    });

    const accepted = await invitee.post('/api/auth/invitations/accept', {
      token,
      name: 'Ada Fieldwork',
      password: 'pipes all the way down',
    });
    expect(accepted.status).toBe(200);
    expect(accepted.body.user).toMatchObject({ role: 'inspector', name: 'Ada Fieldwork' });
    await invitee.agent.get('/api/auth/me').expect(200);

    const again = await invitee.post('/api/auth/invitations/accept', { token, name: 'Someone', password: 'pipes all the way down' });
    expect(again.status).toBe(410);

    const audit = await ctx.services.db('audit_log').whereIn('action', ['user.invited', 'auth.invitation_accepted']).select('action');
    expect(audit.map((a) => a.action)).toEqual(expect.arrayContaining(['user.invited', 'auth.invitation_accepted']));
  });

  it('an uninvited address cannot sign in before accepting', async () => {
    const office = await browserLikeAgent(ctx.app);
    await office.signIn(ctx.users.office.email);
    expect(
      (await office.post('/api/users/invitations', { email: 'pending@mudlark.test', name: 'Pat Pending', role: 'office' })).status,
    ).toBe(201);
    const res = await (await browserLikeAgent(ctx.app)).signIn('pending@mudlark.test', '');
    expect(res.status).toBe(400);
    const res2 = await (await browserLikeAgent(ctx.app)).signIn('pending@mudlark.test', 'anything at all');
    expect(res2.status).toBe(401);
  });

  it('refuses to invite an address that already has an account', async () => {
    const office = await browserLikeAgent(ctx.app);
    await office.signIn(ctx.users.office.email);
    const res = await office.post('/api/users/invitations', { email: ctx.users.agent.email.toUpperCase(), name: 'Dup', role: 'agent' });
    expect(res.status).toBe(409);
  });
});

describe('role gates', () => {
  it.each(['inspector', 'agent', 'client'] as const)('a signed-in %s cannot invite people (403)', async (role) => {
    const client = await browserLikeAgent(ctx.app);
    await client.signIn(ctx.users[role].email);
    const res = await client.post('/api/users/invitations', { email: 'someone@else.test', name: 'Some One', role: 'inspector' });
    expect(res.status).toBe(403);
    expect(res.body.code).toBe('forbidden');
  });

  it('signed-out callers get 401', async () => {
    const client = await browserLikeAgent(ctx.app);
    const res = await client.post('/api/users/invitations', { email: 'someone@else.test', name: 'Some One', role: 'inspector' });
    expect(res.status).toBe(401);
    await client.agent.get('/api/auth/me').expect(401);
  });
});
