import { existsSync, readdirSync } from 'node:fs';
import path from 'node:path';
import sharp from 'sharp';
import request from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { demoPriceBook, type PriceBook, type Role } from '@underfoot/core';
import { browserLikeAgent, createTestContext, linkIn, TEST_PASSWORD, waitForMail, type TestContext } from '../support/test-app.ts';

type Client = Awaited<ReturnType<typeof browserLikeAgent>>;
type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';

let ctx: TestContext;
const clients = {} as Record<Role, Client>;

beforeAll(async () => {
  ctx = await createTestContext();
  for (const role of ['office', 'inspector', 'agent', 'client'] as const) {
    clients[role] = await browserLikeAgent(ctx.app);
    expect((await clients[role].signIn(ctx.users[role].email)).status).toBe(200);
  }
});
afterAll(() => ctx.close());
beforeEach(async () => {
  await ctx.services.db('rate_limits').delete();
  ctx.mail.clear();
});

/** Any method, with the CSRF token the web app would send. */
function send(client: Client, method: Method, url: string, body?: object) {
  const req = client.agent[method](url).set('x-csrf-token', client.token);
  return body === undefined ? req : req.send(body);
}

const db = () => ctx.services.db;

async function newSignedIn(email: string, password = TEST_PASSWORD) {
  const client = await browserLikeAgent(ctx.app);
  const res = await client.signIn(email, password);
  expect(res.status).toBe(200);
  return client;
}

/** Invite someone as the office and accept from the mail, as the person would. */
async function inviteAndAccept(role: Role, email: string, name: string) {
  expect((await clients.office.post('/api/users/invitations', { email, name, role })).status).toBe(201);
  const mail = await waitForMail(ctx.mail, email, 'invited you');
  const token = new URL(linkIn(mail.text, '/invitation?token=')).searchParams.get('token')!;
  const person = await browserLikeAgent(ctx.app);
  const accepted = await person.post('/api/auth/invitations/accept', { token, name, password: TEST_PASSWORD });
  expect(accepted.status).toBe(200);
  return { client: person, id: accepted.body.user.id as string };
}

const validProfile = {
  name: 'Mudlark Drain Testing',
  licenceNumber: 'AF-PLB-0001',
  phone: '(555) 014-0000',
  email: 'OFFICE@mudlark.test',
  serviceArea: 'Alder Falls and the river towns',
  reportFooter: 'Mudlark Drain Testing, licensed in Alder Falls.',
  timeZone: 'America/Los_Angeles',
};

describe('who may manage the company (PRODUCT.md §10: price book, company settings, users: office only)', () => {
  const managed: { method: Method; url: string | (() => string); body?: () => object }[] = [
    { method: 'get', url: '/api/company' },
    { method: 'put', url: '/api/company/profile', body: () => validProfile },
    { method: 'patch', url: '/api/company/settings', body: () => ({ shareLinkDays: 21 }) },
    { method: 'get', url: '/api/company/fees' },
    { method: 'post', url: '/api/company/fees', body: () => ({ kind: 'add_on', name: 'Permission probe', priceCents: 100 }) },
    { method: 'put', url: '/api/company/price-book', body: () => demoPriceBook },
    { method: 'get', url: '/api/company/audit' },
    { method: 'get', url: '/api/company/audit/export' },
    { method: 'get', url: '/api/users' },
    { method: 'post', url: '/api/users/invitations', body: () => ({ email: 'probe@mudlark.test', name: 'Probe', role: 'inspector' }) },
    { method: 'put', url: () => `/api/users/${ctx.users.inspector.id}/role`, body: () => ({ role: 'office' }) },
    { method: 'post', url: () => `/api/users/${ctx.users.client.id}/disable` },
  ];
  const urlOf = (route: (typeof managed)[number]) => (typeof route.url === 'function' ? route.url() : route.url);

  for (const role of ['inspector', 'agent', 'client'] as const) {
    it(`refuses the ${role} every office action with 403, and changes nothing`, async () => {
      const auditBefore = await db()('audit_log').count({ n: '*' }).first();
      for (const route of managed) {
        const res = await send(clients[role], route.method, urlOf(route), route.body?.());
        expect(res.status, `${route.method} ${urlOf(route)}`).toBe(403);
        expect(res.body.code).toBe('forbidden');
      }
      expect(await db()('fee_items').where({ name: 'Permission probe' }).first()).toBeUndefined();
      expect(await db()('users').where({ email: 'probe@mudlark.test' }).first()).toBeUndefined();
      expect((await db()('users').where({ id: ctx.users.inspector.id }).first()).role).toBe('inspector');
      expect((await db()('users').where({ id: ctx.users.client.id }).first()).disabled_at).toBeNull();
      expect(await db()('price_books').first()).toBeUndefined();
      const auditAfter = await db()('audit_log').count({ n: '*' }).first();
      expect(Number(auditAfter?.n)).toBe(Number(auditBefore?.n));
    });
  }

  it('answers 401 to someone signed out', async () => {
    const stranger = await browserLikeAgent(ctx.app);
    for (const route of managed) {
      const res = await send(stranger, route.method, urlOf(route), route.body?.());
      expect(res.status, `${route.method} ${urlOf(route)}`).toBe(401);
    }
  });

  it('lets the office do each of them', async () => {
    for (const route of managed.filter((r) => r.method === 'get')) {
      expect((await send(clients.office, route.method, urlOf(route))).status, urlOf(route)).toBe(200);
    }
  });

  it('lets inspectors read the price book for their live preview, but not agents or clients', async () => {
    expect((await clients.inspector.agent.get('/api/company/price-book')).status).toBe(200);
    expect((await clients.agent.agent.get('/api/company/price-book')).status).toBe(403);
    expect((await clients.client.agent.get('/api/company/price-book')).status).toBe(403);
    expect((await request(ctx.app).get('/api/company/price-book')).status).toBe(401);
  });

  it('treats another company’s people as not there (404)', async () => {
    const elsewhere = await ctx.addCompany('Other Pipes Ltd');
    const stranger = await ctx.addUser('inspector', 'stranger@other.test', elsewhere);
    expect((await send(clients.office, 'put', `/api/users/${stranger.id}/role`, { role: 'office' })).status).toBe(404);
    expect((await send(clients.office, 'post', `/api/users/${stranger.id}/disable`)).status).toBe(404);
    const list = await clients.office.agent.get('/api/users').expect(200);
    expect(list.body.people.map((p: { email: string }) => p.email)).not.toContain('stranger@other.test');
  });
});

describe('company profile and report settings', () => {
  it('saves the profile and answers field errors from the shared schema', async () => {
    const bad = await send(clients.office, 'put', '/api/company/profile', {
      ...validProfile,
      name: '',
      timeZone: 'Alder/Falls',
      phone: 'call me',
    });
    expect(bad.status).toBe(400);
    expect(bad.body.errors.map((e: { path: string }) => e.path).sort()).toEqual(['name', 'phone', 'timeZone']);

    const saved = await send(clients.office, 'put', '/api/company/profile', validProfile);
    expect(saved.status).toBe(200);
    expect(saved.body.company.profile).toMatchObject({ ...validProfile, email: 'office@mudlark.test' });
    const row = await db()('companies').where({ id: ctx.companyId }).first();
    expect(row).toMatchObject({
      service_area: validProfile.serviceArea,
      report_footer: validProfile.reportFooter,
      email: 'office@mudlark.test',
    });
  });

  it('changes only the settings sent, and records old and new values', async () => {
    const bad = await send(clients.office, 'patch', '/api/company/settings', { shareLinkDays: 0 });
    expect(bad.status).toBe(400);
    expect(bad.body.errors[0].path).toBe('shareLinkDays');

    const res = await send(clients.office, 'patch', '/api/company/settings', { inspectorsMayPublish: true, shareLinkDays: 14 });
    expect(res.status).toBe(200);
    expect(res.body.company.settings).toMatchObject({ inspectorsMayPublish: true, shareLinkDays: 14, requirePaymentBeforeRelease: true });
    const audit = await db()('audit_log').where({ action: 'company.settings_updated' }).orderBy('id', 'desc').first();
    expect(JSON.parse(audit.detail)).toEqual({ inspectorsMayPublish: { from: false, to: true }, shareLinkDays: { from: 30, to: 14 } });
  });
});

describe('company logo', () => {
  const logosDir = () => path.join(ctx.config.dataDir, 'media', 'logos');
  const filesUnder = (dir: string): string[] =>
    existsSync(dir)
      ? readdirSync(dir, { recursive: true, withFileTypes: true })
          .filter((e) => e.isFile())
          .map((e) => e.name)
      : [];

  it('re-encodes an upload as a PNG inside the logo box, without metadata, served publicly', async () => {
    const photo = await sharp({ create: { width: 1600, height: 400, channels: 3, background: '#a0492a' } })
      .jpeg()
      .withMetadata({ exif: { IFD0: { Copyright: 'Mudlark', Artist: 'Camera person' } } })
      .toBuffer();
    expect((await sharp(photo).metadata()).exif).toBeDefined();

    const res = await clients.office.agent
      .post('/api/company/logo')
      .set('x-csrf-token', clients.office.token)
      .attach('logo', photo, 'logo.jpg');
    expect(res.status).toBe(201);
    const logo = res.body.company.logo;
    expect(logo).toMatchObject({ width: 600, height: 150 });
    expect(logo.url).toMatch(/^\/api\/company-logos\/[0-9a-f-]{36}\.png$/);

    // Anyone may load it (e-mails, the public portal), without a session.
    const served = await request(ctx.app).get(logo.url).buffer(true).expect(200);
    expect(served.headers['content-type']).toBe('image/png');
    const meta = await sharp(served.body as Buffer).metadata();
    expect(meta).toMatchObject({ format: 'png', width: 600, height: 150 });
    expect(meta.exif).toBeUndefined();

    const brand = await clients.agent.agent.get('/api/company/brand').expect(200);
    expect(brand.body.brand.logoUrl).toBe(logo.url);
  });

  it('shows the logo at the top of the company’s e-mails', async () => {
    const { url } = (await clients.office.agent.get('/api/company').expect(200)).body.company.logo;
    const person = await ctx.addUser('agent', 'logo-reader@realty.test');
    const me = await newSignedIn(person.email);
    expect(
      (await send(me, 'put', '/api/account/password', { currentPassword: TEST_PASSWORD, newPassword: 'another fine passphrase' })).status,
    ).toBe(200);
    const logo = `<img src="http://underfoot.test${url}"`;
    expect((await waitForMail(ctx.mail, person.email, 'password has changed')).html).toContain(logo);
    // Every kind of message carries it: a reset link asked for without a session, an invitation from the office.
    expect((await (await browserLikeAgent(ctx.app)).post('/api/auth/password-reset', { email: person.email })).status).toBe(202);
    expect((await waitForMail(ctx.mail, person.email, 'Reset')).html).toContain(logo);
    expect(
      (await clients.office.post('/api/users/invitations', { email: 'logo-invitee@mudlark.test', name: 'Lee Invitee', role: 'inspector' }))
        .status,
    ).toBe(201);
    expect((await waitForMail(ctx.mail, 'logo-invitee@mudlark.test', 'invited you')).html).toContain(logo);
  });

  it('refuses a file that is not a picture by its content, and leaves nothing behind', async () => {
    const before = filesUnder(logosDir());
    const rowsBefore = await db()('company_logos').count({ n: '*' }).first();
    const res = await clients.office.agent
      .post('/api/company/logo')
      .set('x-csrf-token', clients.office.token)
      .attach('logo', Buffer.from('<svg xmlns="http://www.w3.org/2000/svg"><script>alert(1)</script></svg>'), {
        filename: 'logo.png',
        contentType: 'image/png',
      });
    expect(res.status).toBe(415);
    expect(res.body.code).toBe('unsupported_image');
    expect(filesUnder(logosDir())).toEqual(before);
    expect((await db()('company_logos').count({ n: '*' }).first())?.n).toBe(rowsBefore?.n);
  });

  it('refuses a file over the size limit with 413', async () => {
    const res = await clients.office.agent
      .post('/api/company/logo')
      .set('x-csrf-token', clients.office.token)
      .attach('logo', Buffer.alloc(2 * 1024 * 1024 + 10, 1), 'huge.png');
    expect(res.status).toBe(413);
  });

  it('replaces and removes the logo, deleting the old files', async () => {
    const png = await sharp({ create: { width: 200, height: 200, channels: 4, background: '#1d5275' } })
      .png()
      .toBuffer();
    const up = await clients.office.agent
      .post('/api/company/logo')
      .set('x-csrf-token', clients.office.token)
      .attach('logo', png, 'mark.png');
    expect(up.status).toBe(201);
    expect(filesUnder(logosDir())).toHaveLength(1);
    const removed = await send(clients.office, 'delete', '/api/company/logo');
    expect(removed.body.company.logo).toBeNull();
    expect(filesUnder(logosDir())).toHaveLength(0);
    expect((await request(ctx.app).get(up.body.company.logo.url)).status).toBe(404);
  });
});

describe('people', () => {
  it('lists the company’s people with their state', async () => {
    const res = await clients.office.agent.get('/api/users').expect(200);
    const office = res.body.people.find((p: { id: string }) => p.id === ctx.users.office.id);
    expect(office).toMatchObject({ role: 'office', status: 'active', isYou: true, allowed: { disable: false, changeRole: true } });
    expect(office.lastSignInAt).toEqual(expect.any(String));
    const staffOnly = await clients.office.agent.get('/api/users?role=staff').expect(200);
    expect(new Set(staffOnly.body.people.map((p: { role: string }) => p.role))).toEqual(new Set(['office', 'inspector']));
  });

  it('re-sends an invitation with a fresh link; the old link stops working', async () => {
    await clients.office.post('/api/users/invitations', { email: 'slowpoke@mudlark.test', name: 'Sam Slow', role: 'inspector' });
    const first = await waitForMail(ctx.mail, 'slowpoke@mudlark.test', 'invited you');
    const oldToken = new URL(linkIn(first.text, '/invitation?token=')).searchParams.get('token')!;
    const person = await db()('users').where({ email: 'slowpoke@mudlark.test' }).first();
    ctx.mail.clear();

    const resent = await clients.office.post(`/api/users/${person.id}/invitation`);
    expect(resent.status).toBe(200);
    expect(resent.body.person.status).toBe('invited');
    const second = await waitForMail(ctx.mail, 'slowpoke@mudlark.test', 'invited you');
    const newToken = new URL(linkIn(second.text, '/invitation?token=')).searchParams.get('token')!;
    expect(newToken).not.toBe(oldToken);
    expect((await request(ctx.app).get(`/api/auth/invitations/${oldToken}`)).status).toBe(410);
    expect((await request(ctx.app).get(`/api/auth/invitations/${newToken}`)).status).toBe(200);
    expect(await db()('audit_log').where({ action: 'user.invitation_resent', subject_id: person.id }).first()).toBeDefined();
  });

  it('moves staff between office and inspector, and never turns agents or clients into staff', async () => {
    const { client, id } = await inviteAndAccept('inspector', 'rising@mudlark.test', 'Rae Rising');
    expect((await client.agent.get('/api/company')).status).toBe(403);
    const promoted = await send(clients.office, 'put', `/api/users/${id}/role`, { role: 'office' });
    expect(promoted.status).toBe(200);
    expect(promoted.body.person.role).toBe('office');
    // The next request already sees the new role: the session reloads the person each time.
    expect((await client.agent.get('/api/company')).status).toBe(200);
    const audit = await db()('audit_log').where({ action: 'user.role_changed', subject_id: id }).first();
    expect(JSON.parse(audit.detail)).toEqual({ field: 'role', from: 'inspector', to: 'office' });

    const agentChange = await send(clients.office, 'put', `/api/users/${ctx.users.agent.id}/role`, { role: 'inspector' });
    expect(agentChange.status).toBe(409);
    expect(agentChange.body.code).toBe('not_staff');
    const toAgent = await send(clients.office, 'put', `/api/users/${id}/role`, { role: 'agent' });
    expect(toAgent.status).toBe(400);
    expect(toAgent.body.errors[0].path).toBe('role');

    expect((await send(clients.office, 'put', `/api/users/${id}/role`, { role: 'inspector' })).status).toBe(200);
  });

  it('disabling an account ends its sessions at once; re-enabling lets it sign in again', async () => {
    const { id } = await inviteAndAccept('inspector', 'leaving@mudlark.test', 'Lee Leaving');
    const phone = await newSignedIn('leaving@mudlark.test');
    const laptop = await newSignedIn('leaving@mudlark.test');
    const sessionsOf = async () =>
      (await db()('sessions').select('sess')).filter((s) =>
        String(typeof s.sess === 'string' ? s.sess : JSON.stringify(s.sess)).includes(id),
      ).length;
    expect(await sessionsOf()).toBeGreaterThanOrEqual(2);

    const res = await clients.office.post(`/api/users/${id}/disable`);
    expect(res.status).toBe(200);
    expect(res.body.person.status).toBe('disabled');
    // Gone from the store before either device asks again.
    expect(await sessionsOf()).toBe(0);
    await phone.agent.get('/api/auth/me').expect(401);
    await laptop.agent.get('/api/auth/me').expect(401);
    const again = await (await browserLikeAgent(ctx.app)).signIn('leaving@mudlark.test');
    expect(again.status).toBe(403);
    expect(again.body.code).toBe('account_disabled');
    const audit = await db()('audit_log').where({ action: 'user.disabled', subject_id: id }).first();
    expect(JSON.parse(audit.detail).sessionsEnded).toBeGreaterThanOrEqual(2);

    expect((await clients.office.post(`/api/users/${id}/enable`)).body.person.status).toBe('active');
    expect((await (await browserLikeAgent(ctx.app)).signIn('leaving@mudlark.test')).status).toBe(200);
  });
});

describe('the last office user', () => {
  let solo: TestContext;
  let office: Client;
  beforeAll(async () => {
    solo = await createTestContext();
    office = await browserLikeAgent(solo.app);
    await office.signIn(solo.users.office.email);
  });
  afterAll(() => solo.close());

  it('cannot remove their own office role or disable themselves (409), while nobody else can run the company', async () => {
    const demote = await send(office, 'put', `/api/users/${solo.users.office.id}/role`, { role: 'inspector' });
    expect(demote.status).toBe(409);
    expect(demote.body.code).toBe('last_office_user');
    expect(demote.body.detail).toMatch(/You are the last office user/);
    const disable = await office.post(`/api/users/${solo.users.office.id}/disable`);
    expect(disable.status).toBe(409);
    expect(disable.body.code).toBe('last_office_user');
    const row = await solo.services.db('users').where({ id: solo.users.office.id }).first();
    expect(row).toMatchObject({ role: 'office', disabled_at: null });
    await office.agent.get('/api/auth/me').expect(200);
  });

  it('an invitation that is not accepted yet does not count as another office user', async () => {
    await office.post('/api/users/invitations', { email: 'maybe@mudlark.test', name: 'May Be', role: 'office' });
    expect((await send(office, 'put', `/api/users/${solo.users.office.id}/role`, { role: 'inspector' })).status).toBe(409);
  });

  it('can step down once another office user can sign in', async () => {
    const promoted = await send(office, 'put', `/api/users/${solo.users.inspector.id}/role`, { role: 'office' });
    expect(promoted.status).toBe(200);
    const stepDown = await send(office, 'put', `/api/users/${solo.users.office.id}/role`, { role: 'inspector' });
    expect(stepDown.status).toBe(200);
    // Now an inspector: the office screens are closed to them.
    expect((await office.agent.get('/api/company')).status).toBe(403);
  });
});

describe('price book', () => {
  it('starts from core’s documented defaults', async () => {
    const res = await clients.office.agent.get('/api/company/price-book').expect(200);
    expect(res.body).toMatchObject({ isDefault: true, updatedAt: null, updatedBy: null });
    expect(res.body.priceBook).toEqual(demoPriceBook);
  });

  it('refuses low above high, a unit outside the fixed list and a silly regional factor, saving nothing', async () => {
    const book = structuredClone(demoPriceBook) as PriceBook & { items: Record<string, { unit: string }> };
    book.items.spot_repair = { ...book.items.spot_repair!, lowCents: 400_000, highCents: 300_000 } as never;
    book.items.full_lining!.unit = 'per_visit';
    (book as { regionalFactor: number }).regionalFactor = 9;
    const res = await send(clients.office, 'put', '/api/company/price-book', book);
    expect(res.status).toBe(400);
    const paths = res.body.errors.map((e: { path: string }) => e.path);
    expect(paths).toEqual(expect.arrayContaining(['items.spot_repair.highCents', 'regionalFactor']));
    const unit = await send(clients.office, 'put', '/api/company/price-book', {
      ...demoPriceBook,
      items: { ...demoPriceBook.items, full_lining: { ...demoPriceBook.items.full_lining, unit: 'per_visit' } },
    });
    expect(unit.body.errors).toEqual([{ path: 'items.full_lining.unit', message: 'Cured-in-place lining is priced per foot.' }]);
    const missing = await send(clients.office, 'put', '/api/company/price-book', {
      ...demoPriceBook,
      items: { root_cutting: demoPriceBook.items.root_cutting },
    });
    expect(missing.status).toBe(400);
    expect(await db()('price_books').where({ company_id: ctx.companyId }).first()).toBeUndefined();
  });

  it('stores a valid book for the next reports and records what changed', async () => {
    const book: PriceBook = structuredClone(demoPriceBook);
    book.regionalFactor = 1.15;
    book.items.spot_repair.highCents = 350_000;
    const res = await send(clients.office, 'put', '/api/company/price-book', book);
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ isDefault: false, updatedBy: { id: ctx.users.office.id } });
    const read = await clients.inspector.agent.get('/api/company/price-book').expect(200);
    expect(read.body.priceBook).toEqual(book);
    const audit = await db()('audit_log').where({ action: 'price_book.updated' }).orderBy('id', 'desc').first();
    expect(JSON.parse(audit.detail)).toEqual({ changed: ['Regional factor', 'Spot repair by excavation'] });
  });
});

describe('fee list', () => {
  let baseId: string;
  let addOnId: string;

  it('adds fees; only one active inspection fee', async () => {
    const base = await clients.office.post('/api/company/fees', { kind: 'base', name: 'Sewer camera inspection', priceCents: 30000 });
    expect(base.status).toBe(201);
    baseId = base.body.item.id;
    const addOn = await clients.office.post('/api/company/fees', { kind: 'add_on', name: 'Second access point', priceCents: 9000 });
    addOnId = addOn.body.item.id;
    const second = await clients.office.post('/api/company/fees', { kind: 'base', name: 'Another inspection fee', priceCents: 100 });
    expect(second.status).toBe(400);
    expect(second.body.errors[0].path).toBe('kind');
    const negative = await clients.office.post('/api/company/fees', { kind: 'add_on', name: 'Refund', priceCents: -100 });
    expect(negative.body.errors[0]).toEqual({ path: 'priceCents', message: 'A price cannot be negative.' });
  });

  it('fee changes apply to new orders only', async () => {
    const deadline = new Date(Date.now() + 10 * 86_400_000).toISOString().slice(0, 10);
    const orderBody = {
      kind: 'pre_purchase',
      property: {
        address: { street: '12 Sluice Gate Road', city: 'Alder Falls', region: 'OR', postalCode: '97411' },
        yearBuilt: 1958,
        propertyType: 'single_family',
        occupancy: 'occupied',
      },
      contingencyDeadline: deadline,
      addOnIds: [addOnId],
      parties: [{ partyRole: 'buyer', name: 'Bo Buyer', email: ctx.users.client.email }],
      payer: 'client_before_release',
    };
    const placed = await clients.agent.post('/api/orders', orderBody);
    expect(placed.status).toBe(201);
    const orderId = placed.body.order.id;
    expect(placed.body.order.feeTotalCents).toBe(39000);

    // The office raises the inspection fee and retires the add-on.
    const raised = await send(clients.office, 'put', `/api/company/fees/${baseId}`, {
      kind: 'base',
      name: 'Sewer camera inspection',
      priceCents: 35000,
    });
    expect(raised.status).toBe(200);
    expect(raised.body.item.orderCount).toBe(1);
    await send(clients.office, 'put', `/api/company/fees/${addOnId}`, {
      kind: 'add_on',
      name: 'Second access point',
      priceCents: 9000,
      active: false,
    });

    const existing = await clients.agent.agent.get(`/api/orders/${orderId}`).expect(200);
    expect(existing.body.order.feeTotalCents).toBe(39000);
    expect(existing.body.order.feeLines).toEqual([
      { name: 'Sewer camera inspection', priceCents: 30000 },
      { name: 'Second access point', priceCents: 9000 },
    ]);
    const lines = await db()('order_fee_lines').where({ order_id: orderId }).orderBy('id');
    expect(lines.map((l) => l.price_cents)).toEqual([30000, 9000]);

    // A new order takes the new price, and the retired add-on is no longer offered.
    const next = await clients.agent.post('/api/orders', {
      ...orderBody,
      property: { ...orderBody.property, address: { ...orderBody.property.address, street: '14 Sluice Gate Road' } },
      addOnIds: [],
    });
    expect(next.status).toBe(201);
    expect(next.body.order.feeTotalCents).toBe(35000);
    const retired = await clients.agent.post('/api/orders', {
      ...orderBody,
      property: { ...orderBody.property, address: { ...orderBody.property.address, street: '16 Sluice Gate Road' } },
    });
    expect(retired.status).toBe(400);
    const offered = await clients.agent.agent.get('/api/fee-list').expect(200);
    expect(offered.body.items.map((f: { name: string }) => f.name)).toEqual(['Sewer camera inspection']);
  });

  it('reorders the list, refusing a list that does not match', async () => {
    const list = await clients.office.agent.get('/api/company/fees').expect(200);
    const ids: string[] = list.body.items.map((f: { id: string }) => f.id);
    const reversed = [...ids].reverse();
    const res = await send(clients.office, 'put', '/api/company/fees/order', { ids: reversed });
    expect(res.status).toBe(200);
    expect(res.body.items.filter((f: { kind: string }) => f.kind === 'add_on').map((f: { id: string }) => f.id)).toEqual(
      reversed.filter((id) => id !== baseId),
    );
    expect((await send(clients.office, 'put', '/api/company/fees/order', { ids: ids.slice(1) })).status).toBe(409);
  });
});

describe('audit trail', () => {
  it('filters by action, person, text and time, a page at a time, with names', async () => {
    const all = await clients.office.agent.get('/api/company/audit?pageSize=25').expect(200);
    expect(all.body.total).toBeGreaterThan(5);
    expect(all.body.entries.length).toBeLessThanOrEqual(25);
    const times = all.body.entries.map((e: { at: string }) => e.at);
    expect([...times].sort().reverse()).toEqual(times);

    const roleChanges = await clients.office.agent.get('/api/company/audit?action=user.role_changed').expect(200);
    expect(roleChanges.body.total).toBeGreaterThan(0);
    for (const e of roleChanges.body.entries) {
      expect(e).toMatchObject({
        action: 'user.role_changed',
        actionLabel: 'Changed a role',
        actor: { name: 'office person' },
        subject: { type: 'user' },
      });
      expect(e.detailText).toMatch(/role: inspector → office|role: office → inspector/);
    }

    const byAgent = await clients.office.agent.get(`/api/company/audit?actorId=${ctx.users.agent.id}`).expect(200);
    expect(byAgent.body.entries.every((e: { actor: { id: string } }) => e.actor.id === ctx.users.agent.id)).toBe(true);

    const search = await clients.office.agent.get('/api/company/audit?q=Leaving').expect(200);
    expect(search.body.entries.map((e: { action: string }) => e.action)).toEqual(expect.arrayContaining(['user.disabled', 'user.enabled']));
    // Searching by what the screen says, not only the code.
    const byLabel = await clients.office.agent.get(`/api/company/audit?q=${encodeURIComponent('changed the price book')}`).expect(200);
    expect(byLabel.body.entries.map((e: { action: string }) => e.action)).toContain('price_book.updated');
    // % is literal text, not a wildcard.
    expect((await clients.office.agent.get('/api/company/audit?q=%25%25%25').expect(200)).body.total).toBe(0);

    const future = new Date(Date.now() + 86_400_000).toISOString();
    expect((await clients.office.agent.get(`/api/company/audit?from=${future}`).expect(200)).body.total).toBe(0);
    const backwards = await clients.office.agent.get(`/api/company/audit?from=${future}&to=2020-01-01T00:00:00Z`);
    expect(backwards.status).toBe(400);
    expect(backwards.body.errors[0].path).toBe('to');

    const page2 = await clients.office.agent.get('/api/company/audit?pageSize=25&page=1').expect(200);
    expect(page2.body.entries[0]?.id).not.toBe(all.body.entries[0]?.id);

    const filters = await clients.office.agent.get('/api/company/audit/filters').expect(200);
    expect(filters.body.actions).toEqual(expect.arrayContaining([{ code: 'auth.sign_in', label: 'Signed in' }]));
    expect(filters.body.actors.map((a: { id: string }) => a.id)).toContain(ctx.users.office.id);
  });

  it('exports CSV with quoting and defused formulas, and records the export', async () => {
    // A name someone typed that a spreadsheet would run as a formula.
    expect((await send(clients.agent, 'put', '/api/account/name', { name: '=HYPERLINK("http://evil.test","x")' })).status).toBe(200);
    const res = await clients.office.agent.get(`/api/company/audit/export?actorId=${ctx.users.agent.id}`).buffer(true);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/^text\/csv/);
    expect(res.headers['content-disposition']).toMatch(/attachment; filename="audit-trail-\d{4}-\d{2}-\d{2}\.csv"/);
    const text = String(res.text ?? res.body).replace(/^\uFEFF/, '');
    const lines = text.split('\r\n').filter(Boolean);
    expect(lines[0]).toBe('"Time (UTC)","Person","E-mail","Action","Action code","Subject","Subject type","Details","IP address"');
    expect(text).toContain(`"'=HYPERLINK(""http://evil.test"",""x"")"`);
    expect(text).not.toMatch(/(^|,)"=/m);
    expect(lines.slice(1).every((l) => l.startsWith('"20'))).toBe(true);
    expect(lines.some((l) => l.includes('"Changed their name"'))).toBe(true);
    const exported = await db()('audit_log').where({ action: 'audit.exported' }).orderBy('id', 'desc').first();
    expect(exported.actor_user_id).toBe(ctx.users.office.id);
    expect(JSON.parse(exported.detail).rows).toBe(lines.length - 1);
    await send(clients.agent, 'put', '/api/account/name', { name: 'agent person' });
  });
});

describe('own account', () => {
  it('changes the name, with field errors from the shared schema', async () => {
    expect((await send(clients.client, 'put', '/api/account/name', { name: '   ' })).body.errors[0].path).toBe('name');
    const res = await send(clients.client, 'put', '/api/account/name', { name: 'Bo Buyer' });
    expect(res.body.user.name).toBe('Bo Buyer');
    expect((await clients.client.agent.get('/api/auth/me')).body.user.name).toBe('Bo Buyer');
  });

  it('changes the password, signing out the other devices but not this one', async () => {
    const person = await ctx.addUser('inspector', 'rotating@mudlark.test');
    const here = await newSignedIn(person.email);
    const there = await newSignedIn(person.email);
    expect((await here.agent.get('/api/account')).body.otherSessions).toBe(1);

    const wrong = await send(here, 'put', '/api/account/password', {
      currentPassword: 'not it at all',
      newPassword: 'a whole new passphrase',
    });
    expect(wrong.status).toBe(400);
    expect(wrong.body.errors).toEqual([{ path: 'currentPassword', message: 'That is not your current password.' }]);

    const res = await send(here, 'put', '/api/account/password', { currentPassword: TEST_PASSWORD, newPassword: 'a whole new passphrase' });
    expect(res.status).toBe(200);
    expect(res.body.otherSessionsEnded).toBe(1);
    await here.agent.get('/api/auth/me').expect(200);
    await there.agent.get('/api/auth/me').expect(401);
    await newSignedIn(person.email, 'a whole new passphrase');
    await waitForMail(ctx.mail, person.email, 'password has changed');
  });

  it('signs out of other devices on request', async () => {
    const person = await ctx.addUser('agent', 'many-devices@realty.test');
    const here = await newSignedIn(person.email);
    const others = [await newSignedIn(person.email), await newSignedIn(person.email)];
    const res = await here.post('/api/account/sessions/sign-out-others');
    expect(res.body.ended).toBe(2);
    for (const other of others) await other.agent.get('/api/auth/me').expect(401);
    await here.agent.get('/api/auth/me').expect(200);
    expect((await here.agent.get('/api/account')).body.otherSessions).toBe(0);
  });

  it('changes the e-mail address only after the new address confirms it', async () => {
    const person = await ctx.addUser('agent', 'old-address@realty.test');
    const me = await newSignedIn(person.email);
    // An address with an account of its own: the same answer as any other (no way to learn who has an
    // account), a note to that address without a link, and nothing ever changes.
    const taken = await me.post('/api/account/email', { newEmail: ctx.users.office.email, currentPassword: TEST_PASSWORD });
    expect(taken.status).toBe(202);
    expect(taken.body.pendingEmail.newEmail).toBe(ctx.users.office.email);
    const note = await waitForMail(ctx.mail, ctx.users.office.email, 'Someone tried to move');
    expect(note.text).not.toContain('/account/confirm-email');

    const asked = await me.post('/api/account/email', { newEmail: 'New-Address@Realty.test', currentPassword: TEST_PASSWORD });
    expect(asked.status).toBe(202);
    expect(asked.body.pendingEmail.newEmail).toBe('new-address@realty.test');
    // Nothing changes until the link is followed; the old address is told.
    expect((await db()('users').where({ id: person.id }).first()).email).toBe('old-address@realty.test');
    await waitForMail(ctx.mail, 'old-address@realty.test', 'about to change');
    const mail = await waitForMail(ctx.mail, 'new-address@realty.test', 'Confirm your new e-mail');
    const token = new URL(linkIn(mail.text, '/account/confirm-email?token=')).searchParams.get('token')!;

    // The link works without a session (another device).
    const confirmer = await browserLikeAgent(ctx.app);
    const confirmed = await confirmer.post('/api/account/email/confirm', { token });
    expect(confirmed.status).toBe(200);
    expect(confirmed.body.email).toBe('new-address@realty.test');
    expect((await confirmer.post('/api/account/email/confirm', { token })).status).toBe(410);
    await waitForMail(ctx.mail, 'old-address@realty.test', 'has changed');
    await newSignedIn('new-address@realty.test');
    expect((await (await browserLikeAgent(ctx.app)).signIn('old-address@realty.test')).status).toBe(401);
  });
});

describe('agent self sign-up', () => {
  it('is closed while the company only takes invited agents', async () => {
    await send(clients.office, 'patch', '/api/company/settings', { agentSignup: 'invite_only' });
    expect((await request(ctx.app).get(`/api/sign-up/companies/${ctx.companyId}`)).status).toBe(404);
    const visitor = await browserLikeAgent(ctx.app);
    expect((await visitor.post(`/api/sign-up/companies/${ctx.companyId}`, { name: 'Ann Agent', email: 'ann@realty.test' })).status).toBe(
      404,
    );
    expect((await clients.office.agent.get('/api/company')).body.company.agentSignUpUrl).toBeNull();
  });

  it('signs an agent up with e-mail verification when the company allows it', async () => {
    const settings = await send(clients.office, 'patch', '/api/company/settings', { agentSignup: 'self_signup' });
    expect(settings.body.company.agentSignUpUrl).toBe(`http://underfoot.test/join/${ctx.companyId}`);
    const page = await request(ctx.app).get(`/api/sign-up/companies/${ctx.companyId}`).expect(200);
    expect(page.body.companyName).toBe('Mudlark Drain Testing');

    const visitor = await browserLikeAgent(ctx.app);
    const bad = await visitor.post(`/api/sign-up/companies/${ctx.companyId}`, { name: '', email: 'nope' });
    expect(bad.body.errors.map((e: { path: string }) => e.path).sort()).toEqual(['email', 'name']);
    const asked = await visitor.post(`/api/sign-up/companies/${ctx.companyId}`, { name: 'Ann Agent', email: 'Ann@Realty.test' });
    expect(asked.status).toBe(202);
    // Not an account that can sign in until the address is proven.
    expect((await (await browserLikeAgent(ctx.app)).signIn('ann@realty.test', 'anything at all')).status).toBe(401);

    const mail = await waitForMail(ctx.mail, 'ann@realty.test', 'Confirm your e-mail');
    const token = new URL(linkIn(mail.text, '/join/verify?token=')).searchParams.get('token')!;
    const described = await visitor.agent.get(`/api/sign-up/verify/${token}`).expect(200);
    expect(described.body).toEqual({ email: 'ann@realty.test', name: 'Ann Agent', companyName: 'Mudlark Drain Testing' });
    const done = await visitor.post('/api/sign-up/verify', { token, name: 'Ann Agent', password: 'short' });
    expect(done.body.errors[0].path).toBe('password');
    const verified = await visitor.post('/api/sign-up/verify', { token, name: 'Ann Agent', password: 'agent passphrase here' });
    expect(verified.status).toBe(200);
    expect(verified.body.user).toMatchObject({ role: 'agent', email: 'ann@realty.test' });
    expect((await visitor.agent.get('/api/auth/me')).body.user.role).toBe('agent');
    const row = await db()('users').where({ email: 'ann@realty.test' }).first();
    expect(row.email_verified_at).not.toBeNull();
    expect((await visitor.post('/api/sign-up/verify', { token, name: 'Ann Agent', password: 'agent passphrase here' })).status).toBe(410);
  });

  it('answers the same for an address that has an account, and tells its owner instead', async () => {
    const visitor = await browserLikeAgent(ctx.app);
    const res = await visitor.post(`/api/sign-up/companies/${ctx.companyId}`, { name: 'Someone', email: ctx.users.inspector.email });
    expect(res.status).toBe(202);
    const mail = await waitForMail(ctx.mail, ctx.users.inspector.email, 'already have an Underfoot account');
    expect(mail.text).not.toMatch(/join\/verify/);
    expect((await db()('users').where({ id: ctx.users.inspector.id }).first()).role).toBe('inspector');
  });
});
