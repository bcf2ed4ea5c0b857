import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { gradeInfo, orderStatuses } from '@underfoot/core';
import { addParties, insertOrder } from '../support/inspection-fixtures.ts';
import { browserLikeAgent, createTestContext, type TestContext } from '../support/test-app.ts';

/*
 * The order lists pick a page of ids first and read only those rows (orders.repo.ts listOrders):
 * the page, its order and the total must be what the whole list would give.
 */
let ctx: TestContext;

interface ListBody {
  total: number;
  orders: { id: string; street: string; grade: string | null }[];
}

async function signedIn(email: string) {
  const client = await browserLikeAgent(ctx.app);
  expect((await client.signIn(email)).status).toBe(200);
  return client;
}

async function list(client: Awaited<ReturnType<typeof signedIn>>, query: string): Promise<ListBody> {
  const res = await client.agent.get(`/api/orders?${query}`).expect(200);
  return res.body as ListBody;
}

/** An order with its own deadline, street and creation time. */
async function order(options: { deadline: string; street: string; createdAt: string; status?: 'requested' | 'scheduled' | 'published' }) {
  const id = await insertOrder(ctx, { status: options.status ?? 'requested' });
  const { db } = ctx.services;
  await db('orders').where({ id }).update({ contingency_deadline: options.deadline, created_at: options.createdAt });
  await db('order_parties').where({ order_id: id }).update({ contingency_deadline: options.deadline });
  const row = await db('orders').where({ id }).first('property_id');
  await db('properties').where({ id: row.property_id }).update({ street: options.street });
  return id;
}

const created = (minute: number) => `2026-11-01T10:${String(minute).padStart(2, '0')}:00.000Z`;

beforeAll(async () => {
  ctx = await createTestContext();
});

afterAll(async () => {
  await ctx.close();
});

describe('order lists', () => {
  it('pages through the whole list in the chosen order, with the total of all that match', async () => {
    const orders = [
      { deadline: '2099-03-05', street: '40 Heron Court', createdAt: created(1) },
      { deadline: '2099-01-10', street: '7 Quarry Lane', createdAt: created(2) },
      { deadline: '2099-02-20', street: '19 Ferry Lane', createdAt: created(3) },
      { deadline: '2099-01-02', street: '3 Weir Avenue', createdAt: created(4) },
      { deadline: '2099-02-01', street: '88 Mossbank Road', createdAt: created(5) },
      { deadline: '2099-04-11', street: '5 Tannery Way', createdAt: created(6) },
      { deadline: '2099-01-25', street: '61 Fennel Street', createdAt: created(7) },
    ];
    const ids = [];
    for (const o of orders) ids.push(await order(o));
    const office = await signedIn(ctx.users.office.email);

    const expectPages = async (query: string, expected: string[]) => {
      const seen: string[] = [];
      for (let offset = 0; offset < expected.length + 3; offset += 3) {
        const page = await list(office, `${query}&limit=3&offset=${offset}`);
        expect(page.total).toBe(expected.length);
        expect(page.orders.length).toBe(Math.max(0, Math.min(3, expected.length - offset)));
        seen.push(...page.orders.map((o) => o.id));
      }
      expect(seen).toEqual(expected);
    };
    const byDeadline = ids.map((id, i) => ({ id, ...orders[i]! })).sort((a, b) => a.deadline.localeCompare(b.deadline));
    await expectPages(
      'sort=deadline&direction=asc',
      byDeadline.map((o) => o.id),
    );
    await expectPages('sort=created&direction=desc', [...ids].reverse());
    const byStreet = ids.map((id, i) => ({ id, ...orders[i]! })).sort((a, b) => b.street.localeCompare(a.street));
    await expectPages(
      'sort=address&direction=desc',
      byStreet.map((o) => o.id),
    );
    // Search joins the property before the page is cut: the total counts only the matches.
    const lanes = byDeadline.filter((o) => o.street.includes('Lane'));
    await expectPages(
      'q=lane&sort=deadline&direction=asc',
      lanes.map((o) => o.id),
    );
  });

  it('an agent sees each order they are on once, only in their own company, with the grade once released to their side', async () => {
    const { db } = ctx.services;
    const agent = await ctx.addUser('agent', 'lists.agent@example.com');
    const both = await insertOrder(ctx, { partyUserId: agent.id, status: 'published' });
    // The same agent on both sides of one order: two party rows, one order in the list.
    await addParties(ctx, both, [[agent.id, 'listing_agent']]);
    const requested = await insertOrder(ctx, { partyUserId: agent.id, status: 'requested' });
    await insertOrder(ctx, { status: 'requested' });
    const elsewhere = await ctx.addCompany('Elsewhere Drain Co');
    await insertOrder(ctx, { companyId: elsewhere, partyUserId: agent.id, inspectorId: null });
    await db('orders')
      .where({ id: both })
      .update({ released_to: JSON.stringify(['buyer']) });
    await db('report_revisions').insert({
      id: crypto.randomUUID(),
      order_id: both,
      number: 1,
      kind: 'original',
      note: '',
      snapshot: '{}',
      grade: 'maintain',
      published_by: ctx.users.office.id,
      published_at: created(30),
    });

    const client = await signedIn(agent.email);
    const mine = await list(client, 'sort=deadline&direction=asc&limit=25');
    expect(mine.total).toBe(2);
    expect(mine.orders.map((o) => o.id).sort()).toEqual([both, requested].sort());
    expect(mine.orders.find((o) => o.id === both)?.grade).toBe(gradeInfo.maintain.name);
    expect(mine.orders.find((o) => o.id === requested)?.grade).toBeNull();
    const second = await list(client, 'sort=deadline&direction=asc&limit=1&offset=1');
    expect(second.total).toBe(2);
    expect(second.orders).toHaveLength(1);

    // Not yet released to the agent's side: no grade in the list.
    await db('orders').where({ id: both }).update({ released_to: '[]' });
    expect((await list(client, 'limit=25')).orders.find((o) => o.id === both)?.grade).toBeNull();
  });

  it('by default puts open orders first, nearest deadline first, then closed ones, latest deadline first', async () => {
    // An agent with years of orders must find this week's on page one, not the oldest deadline there is.
    const { db } = ctx.services;
    const agent = await ctx.addUser('agent', 'lists.attention@example.com');
    const orders: { deadline: string; status: 'requested' | 'scheduled' | 'recorded' | 'in_review' | 'published' | 'cancelled' }[] = [
      { deadline: '2024-03-01', status: 'published' },
      { deadline: '2099-05-01', status: 'requested' },
      { deadline: '2025-07-15', status: 'cancelled' },
      { deadline: '2026-01-10', status: 'in_review' },
      { deadline: '2099-02-01', status: 'scheduled' },
      { deadline: '2025-11-30', status: 'published' },
      { deadline: '2099-03-03', status: 'recorded' },
      { deadline: '2023-09-09', status: 'published' },
    ];
    const ids: string[] = [];
    for (const o of orders) {
      const id = await insertOrder(ctx, { partyUserId: agent.id, status: o.status });
      await db('orders').where({ id }).update({ contingency_deadline: o.deadline });
      await db('order_parties').where({ order_id: id }).update({ contingency_deadline: o.deadline });
      ids.push(id);
    }
    const closed = (s: string) => s === 'published' || s === 'cancelled';
    const expected = orders
      .map((o, i) => ({ ...o, id: ids[i]! }))
      .sort((a, b) =>
        closed(a.status) !== closed(b.status)
          ? Number(closed(a.status)) - Number(closed(b.status))
          : closed(a.status)
            ? b.deadline.localeCompare(a.deadline)
            : a.deadline.localeCompare(b.deadline),
      )
      .map((o) => o.id);
    // An overdue order still in review counts as open: it comes first, its deadline being the nearest.
    expect(expected[0]).toBe(ids[3]);

    const client = await signedIn(agent.email);
    const seen: string[] = [];
    for (let offset = 0; offset < orders.length; offset += 3) {
      const page = await list(client, `limit=3&offset=${offset}`);
      expect(page.total).toBe(orders.length);
      seen.push(...page.orders.map((o) => o.id));
    }
    expect(seen).toEqual(expected);
    // Asked for by name, the same; the office's whole list in that order holds them in the same order too.
    expect((await list(client, 'sort=attention&limit=25')).orders.map((o) => o.id)).toEqual(expected);
    const office = await signedIn(ctx.users.office.email);
    const all = (await list(office, 'sort=attention&limit=200')).orders.map((o) => o.id);
    expect(all.filter((id) => ids.includes(id))).toEqual(expected);
  });

  it("an agent's list by deadline, read from their party rows, is the list the orders give", async () => {
    // A person's list by deadline comes from their party rows, which carry each order's
    // deadline (orders.repo.ts personPageByDeadline); naming every status takes the general path
    // through the orders: the reference. Deadlines are often shared, so the visit time and id decide.
    const { db } = ctx.services;
    const busy = await ctx.addUser('agent', 'lists.busy@example.com');
    const day = (n: number) => new Date(Date.UTC(2098, 0, 1) + n * 86_400_000).toISOString().slice(0, 10);
    for (let i = 0; i < 120; i++) {
      for (const who of [busy.id, ctx.users.client.id]) {
        const id = await insertOrder(ctx, { partyUserId: who, status: 'requested' });
        const deadline = day(Math.floor(i / 4));
        await db('orders')
          .where({ id })
          .update({ contingency_deadline: deadline, window_start: i % 4 === 0 ? null : `${String(8 + (i % 3)).padStart(2, '0')}:00` });
        await db('order_parties').where({ order_id: id }).update({ contingency_deadline: deadline });
        // Now and then on both sides of one order: two party rows, one order.
        if (who === busy.id && i % 10 === 0) await addParties(ctx, id, [[busy.id, 'listing_agent']]);
      }
    }
    const client = await signedIn(busy.email);
    const everyStatus = orderStatuses.map((s) => `status=${s}`).join('&');
    const seen: string[] = [];
    for (const [offset, limit] of [
      [0, 25],
      [25, 25],
      [50, 7],
      [57, 50],
      [107, 25],
      [130, 25],
    ] as const) {
      const query = `sort=deadline&direction=asc&limit=${limit}&offset=${offset}`;
      const found = await list(client, query);
      const reference = await list(client, `${everyStatus}&${query}`);
      expect(found.total).toBe(120);
      expect(reference.total).toBe(120);
      expect(found.orders.map((o) => o.id)).toEqual(reference.orders.map((o) => o.id));
      expect(found.orders).toHaveLength(Math.max(0, Math.min(limit, 120 - offset)));
      seen.push(...found.orders.map((o) => o.id));
    }
    expect(new Set(seen).size).toBe(120);
  });
});
