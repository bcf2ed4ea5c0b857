import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { browserLikeAgent, createTestContext, linkIn, waitForMail, type TestContext } from '../support/test-app.ts';

let ctx: TestContext;
const inDays = (n: number) => new Date(Date.now() + n * 86_400_000).toISOString().slice(0, 10);
const BASE_FEE = 'fee-base-0000-0000-0000-000000000001';
const ADD_ON = 'fee-addon-000-0000-0000-000000000002';

function orderInput(overrides: Record<string, unknown> = {}) {
  return {
    kind: 'pre_purchase',
    property: {
      address: { street: '12 Willow Bend', unit: '', city: 'Alder Falls', region: 'OR', postalCode: '97411' },
      yearBuilt: 1961,
      propertyType: 'single_family',
      occupancy: 'occupied',
      accessNotes: 'Cleanout by the porch',
    },
    contingencyDeadline: inDays(10),
    preferredDates: [inDays(3)],
    addOnIds: [ADD_ON],
    parties: [{ partyRole: 'buyer', name: 'Robin Ashdown', email: 'robin.ashdown@example.com' }],
    payer: 'agent_now',
    ...overrides,
  };
}

async function signedIn(role: 'office' | 'inspector' | 'agent' | 'client', email?: string) {
  const client = await browserLikeAgent(ctx.app);
  const res = await client.signIn(email ?? ctx.users[role].email);
  expect(res.status).toBe(200);
  return client;
}

async function count(table: string) {
  const row = await ctx.services.db(table).count({ n: '*' }).first();
  return Number(row?.n);
}

beforeAll(async () => {
  ctx = await createTestContext();
  const now = new Date().toISOString();
  await ctx.services.db('fee_items').insert([
    {
      id: BASE_FEE,
      company_id: ctx.companyId,
      kind: 'base',
      name: 'Camera inspection',
      description: '',
      price_cents: 30000,
      active: true,
      sort_order: 0,
      created_at: now,
      updated_at: now,
    },
    {
      id: ADD_ON,
      company_id: ctx.companyId,
      kind: 'add_on',
      name: 'Depth readings',
      description: '',
      price_cents: 8500,
      active: true,
      sort_order: 1,
      created_at: now,
      updated_at: now,
    },
  ]);
});
afterAll(() => ctx.close());
beforeEach(() => {
  ctx.mail.clear();
  ctx.payments.setDown(false);
});

let streetNo = 100;
const freshAddress = () => ({ street: `${streetNo++} Willow Bend`, unit: '', city: 'Alder Falls', region: 'OR', postalCode: '97411' });

async function placeOrder(agent: Awaited<ReturnType<typeof signedIn>>, overrides: Record<string, unknown> = {}) {
  const input = orderInput(overrides);
  (input.property as { address: unknown }).address = freshAddress();
  const res = await agent.post('/api/orders', input);
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.order as { id: string; status: string; feeTotalCents: number; paymentState: string };
}

describe('ordering', () => {
  it('an agent orders, invites the buyer by e-mail, and everyone gets a confirmation', async () => {
    const agent = await signedIn('agent');
    const order = await placeOrder(agent);
    expect(order).toMatchObject({ status: 'requested', feeTotalCents: 38500, paymentState: 'unpaid' });

    const parties = await ctx.services.db('order_parties').where({ order_id: order.id }).orderBy('id');
    expect(parties.map((p) => p.party_role)).toEqual(['buyers_agent', 'buyer']);
    const buyer = await ctx.services.db('users').where({ email: 'robin.ashdown@example.com' }).first();
    expect(buyer).toMatchObject({ role: 'client', password_hash: null });
    const lines = await ctx.services.db('order_fee_lines').where({ order_id: order.id });
    expect(lines.map((l) => l.price_cents as number).sort((a, b) => a - b)).toEqual([8500, 30000]);
    const history = await ctx.services.db('order_events').where({ order_id: order.id });
    expect(history.map((h) => h.type)).toEqual(['created']);

    const invitation = await waitForMail(ctx.mail, 'robin.ashdown@example.com', 'Sewer line inspection ordered');
    expect(invitation.text).toContain('Mudlark Drain Testing');
    const token = new URL(linkIn(invitation.text, '/invitation?token=')).searchParams.get('token')!;
    const confirmation = await waitForMail(ctx.mail, ctx.users.agent.email, 'Order received');
    expect(confirmation.text).toContain('$385.00');

    // The invited buyer sets a password from the link and sees the order.
    const buyerClient = await browserLikeAgent(ctx.app);
    expect(
      (await buyerClient.post('/api/auth/invitations/accept', { token, name: 'Robin Ashdown', password: 'a long buyer passphrase' }))
        .status,
    ).toBe(200);
    const seen = await buyerClient.agent.get(`/api/orders/${order.id}`).expect(200);
    expect(seen.body.order.yourPartyRoles).toEqual(['buyer']);
    expect(seen.body.order.allowed).toMatchObject({ schedule: false, cancel: false, pay: true, recordInspection: false });
    // The same person invited again is linked, not duplicated.
    const again = await placeOrder(agent);
    expect((await ctx.services.db('users').where({ email: 'robin.ashdown@example.com' })).length).toBe(1);
    await waitForMail(ctx.mail, 'robin.ashdown@example.com', 'Order received');
    expect(again.id).not.toBe(order.id);
  });

  it('bad address and dates give field errors and save nothing', async () => {
    const agent = await signedIn('agent');
    const before = await Promise.all(['orders', 'properties', 'users', 'mail_outbox'].map(count));
    const res = await agent.post(
      '/api/orders',
      orderInput({
        property: {
          address: { street: 'x', city: '', region: 'OR', postalCode: '!!' },
          yearBuilt: 3000,
          propertyType: 'castle',
          occupancy: 'occupied',
        },
        contingencyDeadline: inDays(-2),
        preferredDates: ['not-a-date'],
      }),
    );
    expect(res.status).toBe(400);
    const paths = res.body.errors.map((e: { path: string }) => e.path);
    expect(paths).toEqual(
      expect.arrayContaining([
        'property.address.street',
        'property.address.city',
        'property.address.postalCode',
        'property.yearBuilt',
        'property.propertyType',
        'contingencyDeadline',
        'preferredDates.0',
      ]),
    );
    expect(await Promise.all(['orders', 'properties', 'users', 'mail_outbox'].map(count))).toEqual(before);
  });

  it('the client of the ordering side must be invited', async () => {
    const agent = await signedIn('agent');
    const res = await agent.post(
      '/api/orders',
      orderInput({ parties: [{ partyRole: 'seller', name: 'Sal Seller', email: 'sal@example.com' }] }),
    );
    expect(res.status).toBe(400);
    expect(res.body.errors).toEqual(
      expect.arrayContaining([expect.objectContaining({ path: 'parties', message: 'Invite the buyer you are ordering for.' })]),
    );
  });

  it('warns when the same property already has an open order, and orders anyway when confirmed', async () => {
    const agent = await signedIn('agent');
    const input = orderInput();
    (input.property as { address: unknown }).address = {
      street: '5 Duplicate Row',
      unit: '',
      city: 'Alder Falls',
      region: 'OR',
      postalCode: '97411',
    };
    expect((await agent.post('/api/orders', input)).status).toBe(201);
    const before = await count('orders');
    const second = await agent.post('/api/orders', {
      ...input,
      property: {
        ...input.property,
        address: { street: '5  duplicate row', unit: '', city: 'Alder Falls', region: 'OR', postalCode: '97411' },
      },
    });
    expect(second.status).toBe(409);
    expect(second.body.code).toBe('duplicate_property');
    expect(await count('orders')).toBe(before);
    expect((await agent.post('/api/orders', { ...input, confirmDuplicate: true })).status).toBe(201);
  });

  it.each(['inspector', 'client'] as const)('a %s cannot place an order (403)', async (role) => {
    const person = await signedIn(role);
    expect((await person.post('/api/orders', orderInput())).status).toBe(403);
  });

  it("another agent's order, or one in another company, is a 404", async () => {
    const agent = await signedIn('agent');
    const order = await placeOrder(agent);
    await ctx.addUser('agent', 'other.agent@realty.test');
    const other = await signedIn('agent', 'other.agent@realty.test');
    const res = await other.agent.get(`/api/orders/${order.id}`);
    expect(res.status).toBe(404);
    expect(JSON.stringify(res.body)).not.toContain('Willow');
    expect((await other.agent.get('/api/orders')).body.orders.map((o: { id: string }) => o.id)).not.toContain(order.id);
    const foreignCompany = await ctx.addCompany('Elsewhere Sewer Co');
    await ctx.addUser('office', 'office@elsewhere.test', foreignCompany);
    const foreignOffice = await signedIn('office', 'office@elsewhere.test');
    expect((await foreignOffice.agent.get(`/api/orders/${order.id}`)).status).toBe(404);
    expect(
      (
        await foreignOffice.post(`/api/orders/${order.id}/schedule`, {
          inspectorId: ctx.users.inspector.id,
          window: { date: inDays(1), startTime: '08:00', endTime: '10:00' },
        })
      ).status,
    ).toBe(404);
    expect((await other.post(`/api/orders/${order.id}/checkout`)).status).toBe(404);
  });

  it('lists only what each person may see, with filters and search', async () => {
    const agent = await signedIn('agent');
    const order = await placeOrder(agent);
    const office = await signedIn('office');
    const all = await office.agent.get('/api/orders?status=requested&sort=deadline').expect(200);
    expect(all.body.orders.map((o: { id: string }) => o.id)).toContain(order.id);
    const street = (
      await ctx.services.db('properties').join('orders', 'orders.property_id', 'properties.id').where('orders.id', order.id).first()
    ).street;
    const searched = await office.agent.get(`/api/orders?q=${encodeURIComponent(street.toUpperCase())}`).expect(200);
    expect(searched.body.orders.map((o: { id: string }) => o.id)).toEqual([order.id]);
    const inspector = await signedIn('inspector');
    expect((await inspector.agent.get('/api/orders')).body.orders.map((o: { id: string }) => o.id)).not.toContain(order.id);
    expect((await office.agent.get('/api/orders?status=bogus')).status).toBe(400);
  });
});

describe('scheduling', () => {
  it('the office assigns an inspector and a window; parties and the inspector are e-mailed; history records it', async () => {
    const agent = await signedIn('agent');
    const order = await placeOrder(agent);
    const office = await signedIn('office');
    const inspectors = await office.agent.get('/api/inspectors').expect(200);
    expect(inspectors.body.inspectors.map((i: { id: string }) => i.id)).toContain(ctx.users.inspector.id);

    const window = { date: inDays(2), startTime: '08:00', endTime: '10:00' };
    const scheduled = await office.post(`/api/orders/${order.id}/schedule`, {
      inspectorId: ctx.users.inspector.id,
      window,
      note: 'Gate code 4411',
    });
    expect(scheduled.status).toBe(200);
    expect(scheduled.body.order).toMatchObject({ status: 'scheduled', window, inspector: { id: ctx.users.inspector.id } });
    const mail = await waitForMail(ctx.mail, ctx.users.agent.email, 'Scheduled');
    expect(mail.text).toContain('between 08:00 and 10:00');
    expect(mail.text).toContain('Gate code 4411');
    await waitForMail(ctx.mail, ctx.users.inspector.email, 'Scheduled');

    const inspector = await signedIn('inspector');
    const jobs = await inspector.agent.get(`/api/field/jobs?date=${window.date}`).expect(200);
    expect(jobs.body.jobs.map((j: { id: string }) => j.id)).toContain(order.id);
    expect((await inspector.agent.get(`/api/orders/${order.id}`)).status).toBe(200);

    ctx.mail.clear();
    const moved = await office.post(`/api/orders/${order.id}/schedule`, {
      inspectorId: ctx.users.inspector.id,
      window: { ...window, startTime: '13:00', endTime: '15:00' },
    });
    expect(moved.status).toBe(200);
    await waitForMail(ctx.mail, ctx.users.agent.email, 'New time');
    const history = (await office.agent.get(`/api/orders/${order.id}`)).body.order.history.map((h: { type: string }) => h.type);
    expect(history).toEqual(['created', 'scheduled', 'rescheduled']);
  });

  it('refuses bad windows and unknown inspectors with field errors; agents cannot schedule', async () => {
    const agent = await signedIn('agent');
    const order = await placeOrder(agent);
    const office = await signedIn('office');
    const bad = await office.post(`/api/orders/${order.id}/schedule`, {
      inspectorId: ctx.users.agent.id,
      window: { date: inDays(-3), startTime: '10:00', endTime: '09:00' },
    });
    expect(bad.status).toBe(400);
    expect(bad.body.errors.map((e: { path: string }) => e.path)).toEqual(expect.arrayContaining(['window.endTime', 'window.date']));
    const wrongPerson = await office.post(`/api/orders/${order.id}/schedule`, {
      inspectorId: ctx.users.agent.id,
      window: { date: inDays(1), startTime: '08:00', endTime: '10:00' },
    });
    expect(wrongPerson.status).toBe(400);
    expect(wrongPerson.body.errors[0].path).toBe('inspectorId');
    expect(
      (
        await agent.post(`/api/orders/${order.id}/schedule`, {
          inspectorId: ctx.users.inspector.id,
          window: { date: inDays(1), startTime: '08:00', endTime: '10:00' },
        })
      ).status,
    ).toBe(403);
  });

  it('an agent may cancel before scheduling, not after; the office may cancel with a reason', async () => {
    const agent = await signedIn('agent');
    const first = await placeOrder(agent);
    const cancelled = await agent.post(`/api/orders/${first.id}/cancel`, { reason: 'Offer withdrawn' });
    expect(cancelled.status).toBe(200);
    expect(cancelled.body.order).toMatchObject({ status: 'cancelled', cancelReason: 'Offer withdrawn' });
    await waitForMail(ctx.mail, ctx.users.agent.email, 'Cancelled');

    const second = await placeOrder(agent);
    const office = await signedIn('office');
    await office.post(`/api/orders/${second.id}/schedule`, {
      inspectorId: ctx.users.inspector.id,
      window: { date: inDays(1), startTime: '08:00', endTime: '10:00' },
    });
    const refused = await agent.post(`/api/orders/${second.id}/cancel`, { reason: 'Changed our mind' });
    expect(refused.status).toBe(403);
    expect(refused.body.detail).toMatch(/only the office can cancel/);
    expect((await office.post(`/api/orders/${second.id}/cancel`, { reason: '' })).status).toBe(400);
    expect((await office.post(`/api/orders/${second.id}/cancel`, { reason: 'Seller refused access' })).body.order.status).toBe('cancelled');
  });
});

describe('payment', () => {
  async function paidOrder() {
    const agent = await signedIn('agent');
    const order = await placeOrder(agent);
    const checkout = await agent.post(`/api/orders/${order.id}/checkout`);
    expect(checkout.status).toBe(200);
    const session = ctx.payments.sessions().find((s) => s.url === checkout.body.url)!;
    expect(session.amount_total).toBe(order.feeTotalCents);
    return { agent, order, session };
  }

  async function waitForPaymentState(orderId: string, state: string) {
    for (let i = 0; i < 100; i++) {
      const row = await ctx.services.db('orders').where({ id: orderId }).first();
      if (row.payment_state === state) return;
      await new Promise((r) => setTimeout(r, 30));
    }
    throw new Error(`order ${orderId} never became ${state}`);
  }

  it('checkout through the provider marks the order paid once, by signed webhook, with a receipt', async () => {
    const { agent, order, session } = await paidOrder();
    // A second click reuses the open checkout instead of starting another.
    const again = await agent.post(`/api/orders/${order.id}/checkout`);
    expect(again.body.url).toBe(session.url);
    expect(Number((await ctx.services.db('payments').where({ order_id: order.id }).count({ n: '*' }).first())?.n)).toBe(1);

    await ctx.payments.paySession(session.id);
    await waitForPaymentState(order.id, 'paid');
    const receipt = await waitForMail(ctx.mail, ctx.users.agent.email, 'Receipt');
    expect(receipt.text).toContain('$385.00');

    // Replaying the same event changes nothing and sends nothing.
    const event = ctx.payments
      .events()
      .find((e) => e.type === 'checkout.session.completed' && (e.data.object as { id: string }).id === session.id)!;
    const mailsBefore = ctx.mail.messages().length;
    await ctx.payments.resendEvent(event.id);
    await new Promise((r) => setTimeout(r, 200));
    expect(ctx.mail.messages().length).toBe(mailsBefore);
    const history = await ctx.services.db('order_events').where({ order_id: order.id, type: 'paid' });
    expect(history).toHaveLength(1);
    expect((await agent.post(`/api/orders/${order.id}/checkout`)).status).toBe(409);
  });

  it('a webhook with a bad signature gets 400 and changes nothing', async () => {
    const { order, session } = await paidOrder();
    const payload = JSON.stringify({
      id: 'evt_forged',
      object: 'event',
      type: 'checkout.session.completed',
      data: { object: { ...session, payment_status: 'paid' } },
    });
    const res = await fetch(`${ctx.baseUrl}/api/payments/webhook`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', 'stripe-signature': 't=1,v1=deadbeef' },
      body: payload,
    });
    expect(res.status).toBe(400);
    expect(((await res.json()) as { code: string }).code).toBe('invalid_signature');
    expect((await ctx.services.db('orders').where({ id: order.id }).first()).payment_state).toBe('unpaid');
    expect(await ctx.services.db('payment_events').where({ event_id: 'evt_forged' }).first()).toBeUndefined();
  });

  it('events that arrive out of order still end in one consistent state', async () => {
    const { order, session } = await paidOrder();
    ctx.payments.pauseWebhooks();
    await ctx.payments.paySession(session.id);
    const intent = ctx.payments.sessions().find((s) => s.id === session.id)!.payment_intent as string;
    const provider = ctx.services.paymentProvider;
    await provider.refunds.create({ payment_intent: intent });
    const [completed, refunded] = [
      ctx.payments.events().find((e) => e.type === 'checkout.session.completed' && (e.data.object as { id: string }).id === session.id)!,
      ctx.payments
        .events()
        .find((e) => e.type === 'charge.refunded' && (e.data.object as { payment_intent: string }).payment_intent === intent)!,
    ];
    // The refund first: the app cannot place it yet and asks for it again later.
    await expect(ctx.payments.resendEvent(refunded.id)).rejects.toThrow();
    await ctx.payments.resendEvent(completed.id);
    await ctx.payments.resendEvent(refunded.id);
    await ctx.payments.resendEvent(completed.id);
    await waitForPaymentState(order.id, 'refunded');
    const types = (await ctx.services.db('order_events').where({ order_id: order.id }).orderBy('id')).map((e) => e.type);
    expect(types).toEqual(['created', 'paid', 'refunded']);
    ctx.payments.resumeWebhooks();
  });

  it('cancelling a paid order before the visit refunds it through the provider', async () => {
    const { order, session } = await paidOrder();
    await ctx.payments.paySession(session.id);
    await waitForPaymentState(order.id, 'paid');
    const office = await signedIn('office');
    const res = await office.post(`/api/orders/${order.id}/cancel`, { reason: 'Sale fell through' });
    expect(res.status).toBe(200);
    expect(res.body.order).toMatchObject({ status: 'cancelled', paymentState: 'refunded' });
    expect(
      ctx.payments.refunds().filter((r) => r.payment_intent === ctx.payments.sessions().find((s) => s.id === session.id)!.payment_intent),
    ).toHaveLength(1);
    const mail = await waitForMail(ctx.mail, ctx.users.agent.email, 'Cancelled');
    expect(mail.text).toContain('refunded');
  });

  it('the provider down while checking out: a clear 502, the order stays unpaid and nothing is half-made', async () => {
    const agent = await signedIn('agent');
    const order = await placeOrder(agent);
    ctx.payments.setDown(true);
    const res = await agent.post(`/api/orders/${order.id}/checkout`);
    expect(res.status).toBe(502);
    expect(res.body.code).toBe('payment_provider_unavailable');
    expect(res.body.detail).toMatch(/Nothing was charged/);
    expect(await ctx.services.db('payments').where({ order_id: order.id }).first()).toBeUndefined();
    ctx.payments.setDown(false);
    expect((await agent.post(`/api/orders/${order.id}/checkout`)).status).toBe(200);
  });

  it('only people on the order may pay; the office may not', async () => {
    const agent = await signedIn('agent');
    const order = await placeOrder(agent);
    const office = await signedIn('office');
    expect((await office.post(`/api/orders/${order.id}/checkout`)).status).toBe(403);
  });
});

describe('finishing the recording', () => {
  it('the assigned inspector marks a scheduled visit recorded once the line has a run; others may not', async () => {
    const agent = await signedIn('agent');
    const order = await placeOrder(agent);
    const office = await signedIn('office');
    await office.post(`/api/orders/${order.id}/schedule`, {
      inspectorId: ctx.users.inspector.id,
      window: { date: inDays(1), startTime: '08:00', endTime: '10:00' },
    });
    const inspector = await signedIn('inspector');
    const early = await inspector.post(`/api/orders/${order.id}/recorded`);
    expect(early.status).toBe(409);
    expect(early.body.code).toBe('no_runs');

    const { sampleDocument } = await import('../support/inspection-fixtures.ts');
    const saved = await inspector.agent
      .put(`/api/orders/${order.id}/inspection`)
      .set('x-csrf-token', inspector.token)
      .send({ baseVersion: 0, document: sampleDocument(order.id) });
    expect(saved.status, JSON.stringify(saved.body)).toBe(200);
    expect((await agent.post(`/api/orders/${order.id}/recorded`)).status).toBe(403);
    const done = await inspector.post(`/api/orders/${order.id}/recorded`);
    expect(done.status).toBe(200);
    expect(done.body.order.status).toBe('recorded');
    expect(done.body.order.allowed.finishRecording).toBe(false);
    expect((await inspector.post(`/api/orders/${order.id}/recorded`)).status).toBe(409);
  });
});
