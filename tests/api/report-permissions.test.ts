import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { can, type Actor, type PartyRole, type Side } from '@underfoot/core';
import { publishReport, type ReportFixture } from '../support/report-fixtures.ts';
import { browserLikeAgent, createTestContext, type TestContext } from '../support/test-app.ts';

/*
 * Every portal route × every kind of person × own or other order × disclosed or not, against
 * PRODUCT.md §10 through core's `can`. The expected answer is worked out here from the fixture,
 * not read back from the server: 401 signed out; 404 where answering would reveal the report
 * (or, for order-level routes, the order); 403 for someone who may see it but not do this.
 */

let ctx: TestContext;
type Client = Awaited<ReturnType<typeof browserLikeAgent>>;

const actorNames = [
  'office',
  'otherCompanyOffice',
  'assignedInspector',
  'unassignedInspector',
  'buyersAgent',
  'buyer',
  'listingAgent',
  'seller',
  'unrelatedAgent',
  'unrelatedClient',
  'signedOut',
  'guestValidLink',
  'guestExpiredLink',
  'guestRevokedLink',
] as const;
type ActorName = (typeof actorNames)[number];
const orderNames = ['undisclosed', 'disclosed', 'otherParties'] as const;
type OrderName = (typeof orderNames)[number];

interface Person {
  id: string;
  email: string;
  companyId: string;
  role: 'office' | 'inspector' | 'agent' | 'client';
}
interface Fixture extends ReportFixture {
  questionId: string;
}

const people = new Map<ActorName, Person>();
const clients = new Map<ActorName, Client>();
const orders = new Map<OrderName, Fixture>();
const tokens = { valid: '', expired: '', revoked: '' };
let guestOrder: Fixture;

const db = () => ctx.services.db;
const fixture = (name: OrderName) => orders.get(name)!;

async function signedIn(email: string): Promise<Client> {
  const client = await browserLikeAgent(ctx.app);
  expect((await client.signIn(email)).status).toBe(200);
  return client;
}

beforeAll(async () => {
  ctx = await createTestContext();
  const elsewhere = await ctx.addCompany('Elsewhere Sewer Co');
  const add = async (name: ActorName, role: Person['role'], email: string, companyId = ctx.companyId) => {
    const { id } = await ctx.addUser(role, email, companyId);
    people.set(name, { id, email, companyId, role });
  };
  people.set('office', { ...ctx.users.office, companyId: ctx.companyId, role: 'office' });
  people.set('assignedInspector', { ...ctx.users.inspector, companyId: ctx.companyId, role: 'inspector' });
  people.set('buyersAgent', { ...ctx.users.agent, companyId: ctx.companyId, role: 'agent' });
  people.set('buyer', { ...ctx.users.client, companyId: ctx.companyId, role: 'client' });
  await add('otherCompanyOffice', 'office', 'office@elsewhere.test', elsewhere);
  await add('unassignedInspector', 'inspector', 'second-inspector@mudlark.test');
  await add('listingAgent', 'agent', 'listing@realty.test');
  await add('seller', 'client', 'seller@home.test');
  await add('unrelatedAgent', 'agent', 'unrelated-agent@realty.test');
  await add('unrelatedClient', 'client', 'unrelated-client@home.test');
  for (const [name, person] of people) clients.set(name, await signedIn(person.email));
  // No session, but the CSRF token a browser would hold, so a refusal is about the session, not the form.
  for (const name of ['signedOut', 'guestValidLink', 'guestExpiredLink', 'guestRevokedLink'] as const) {
    clients.set(name, await browserLikeAgent(ctx.app));
  }

  const id = (name: ActorName) => people.get(name)!.id;
  const bothSides: [string, PartyRole][] = [
    [id('buyersAgent'), 'buyers_agent'],
    [id('buyer'), 'buyer'],
    [id('listingAgent'), 'listing_agent'],
    [id('seller'), 'seller'],
  ];
  const publishedOrder = (parties: [string, PartyRole][], releasedTo: Side[]) =>
    publishReport(ctx, { field: clients.get('assignedInspector')!, office: clients.get('office')!, parties, releasedTo });
  const undisclosed = await publishedOrder(bothSides, ['buyer']);
  const disclosed = await publishedOrder(bothSides, ['buyer', 'seller']);
  // The same company's order for other people, assigned to the second inspector.
  const other = await publishedOrder(
    [
      [id('unrelatedAgent'), 'buyers_agent'],
      [id('unrelatedClient'), 'buyer'],
    ],
    ['buyer'],
  );
  await db()('orders')
    .where({ id: other.id })
    .update({ assigned_inspector_id: id('unassignedInspector') });
  other.access = { ...other.access, assignedInspectorId: id('unassignedInspector') };

  const ask = async (who: ActorName, orderId: string) => {
    const res = await clients.get(who)!.post(`/api/reports/${orderId}/questions`, { body: 'Is the offset urgent?' });
    expect(res.status).toBe(201);
    return res.body.id as string;
  };
  orders.set('undisclosed', { ...undisclosed, questionId: await ask('buyer', undisclosed.id) });
  orders.set('disclosed', { ...disclosed, questionId: await ask('seller', disclosed.id) });
  orders.set('otherParties', { ...other, questionId: await ask('unrelatedClient', other.id) });

  // Guest links on the undisclosed order: one live, one past its expiry, one revoked.
  guestOrder = fixture('undisclosed');
  const link = async (body: object) => {
    const res = await clients.get('buyersAgent')!.post(`/api/reports/${guestOrder.id}/share-links`, body);
    expect(res.status).toBe(201);
    return { id: res.body.id as string, token: (res.body.url as string).split('/shared/')[1]! };
  };
  tokens.valid = (await link({ label: 'Lender', showCosts: false })).token;
  const expired = await link({ label: 'Insurer', expiresInDays: 1 });
  await db()('share_links')
    .where({ id: expired.id })
    .update({ expires_at: new Date(Date.now() - 1000).toISOString() });
  tokens.expired = expired.token;
  const revoked = await link({ label: 'Contractor' });
  expect((await clients.get('buyersAgent')!.post(`/api/reports/${guestOrder.id}/share-links/${revoked.id}/revoke`)).status).toBe(204);
  tokens.revoked = revoked.token;
}, 60_000);
afterAll(() => ctx.close());

/** What `can` says for a signed-in person, or null for someone without a session. */
function actorOf(name: ActorName): Actor | null {
  const person = people.get(name);
  return person ? { kind: 'user', userId: person.id, role: person.role, companyId: person.companyId } : null;
}

type Gate = 'report.read' | 'order.view';
interface RouteCase {
  name: string;
  method: 'get' | 'post';
  /** Without this, the route answers 404 so as not to confirm the report (or the order) exists. */
  gate: Gate;
  /** With the gate passed but without this, 403. */
  action: Parameters<typeof can>[1];
  ok: number;
  url: (order: Fixture) => string | Promise<string>;
  body?: object;
  /** Undo a state change so every cell starts from the fixture. */
  restore?: (order: Fixture) => Promise<void>;
}

const restoreDisclosure = async (order: Fixture) => {
  await db()('orders')
    .where({ id: order.id })
    .update({ released_to: JSON.stringify(order.access.releasedTo) });
};

const routes: RouteCase[] = [
  { name: 'GET report', method: 'get', gate: 'report.read', action: 'report.read', ok: 200, url: (o) => `/api/reports/${o.id}` },
  { name: 'GET pdf', method: 'get', gate: 'report.read', action: 'report.read', ok: 200, url: (o) => `/api/reports/${o.id}/pdf` },
  { name: 'GET views', method: 'get', gate: 'order.view', action: 'report.viewLog', ok: 200, url: (o) => `/api/reports/${o.id}/views` },
  {
    name: 'GET share-links',
    method: 'get',
    gate: 'order.view',
    action: 'shareLink.manage',
    ok: 200,
    url: (o) => `/api/reports/${o.id}/share-links`,
  },
  {
    name: 'GET questions',
    method: 'get',
    gate: 'report.read',
    action: 'report.read',
    ok: 200,
    url: (o) => `/api/reports/${o.id}/questions`,
  },
  {
    name: 'POST disclose',
    method: 'post',
    gate: 'report.read',
    action: 'report.disclose',
    ok: 200,
    url: (o) => `/api/reports/${o.id}/disclose`,
    restore: restoreDisclosure,
  },
  {
    name: 'POST withdraw-disclosure',
    method: 'post',
    gate: 'report.read',
    action: 'report.disclose',
    ok: 200,
    url: (o) => `/api/reports/${o.id}/withdraw-disclosure`,
    restore: restoreDisclosure,
  },
  {
    name: 'POST share-links',
    method: 'post',
    gate: 'order.view',
    action: 'shareLink.manage',
    ok: 201,
    url: (o) => `/api/reports/${o.id}/share-links`,
    body: { label: 'Matrix' },
  },
  {
    name: 'POST revoke',
    method: 'post',
    gate: 'order.view',
    action: 'shareLink.manage',
    ok: 204,
    // A fresh live link each time, made by the office, so a refusal is never just "no such link".
    url: async (o) => {
      const made = await clients.get('office')!.post(`/api/reports/${o.id}/share-links`, { label: 'To revoke' });
      expect(made.status).toBe(201);
      return `/api/reports/${o.id}/share-links/${made.body.id}/revoke`;
    },
  },
  {
    name: 'POST questions',
    method: 'post',
    gate: 'report.read',
    action: 'question.ask',
    ok: 201,
    url: (o) => `/api/reports/${o.id}/questions`,
    body: { body: 'Does the belly hold water?' },
  },
  {
    name: 'POST answers',
    method: 'post',
    gate: 'order.view',
    action: 'question.answer',
    ok: 201,
    url: (o) => `/api/reports/${o.id}/questions/${o.questionId}/answers`,
    body: { body: 'Yes, about an inch at 38 feet.' },
  },
  // The files a still in the report is served from: the burned-in copy and the original's thumbnail.
  {
    name: 'GET media file',
    method: 'get',
    gate: 'report.read',
    action: 'report.read',
    ok: 200,
    url: (o) => `/api/media/${o.renderedId}/file`,
  },
  {
    name: 'GET media thumbnail',
    method: 'get',
    gate: 'report.read',
    action: 'report.read',
    ok: 200,
    url: (o) => `/api/media/${o.stillId}/thumbnail`,
  },
];

function expected(route: RouteCase, actorName: ActorName, order: Fixture): number {
  const actor = actorOf(actorName);
  if (!actor) return 401;
  if (!can(actor, route.gate, { order: order.access })) return 404;
  if (!can(actor, route.action, { order: order.access })) return 403;
  return route.ok;
}

describe.each(routes)('$name', (route) => {
  const cells = orderNames.flatMap((orderName) => actorNames.map((actorName) => ({ orderName, actorName })));
  it.each(cells)('$actorName on the $orderName order', async ({ orderName, actorName }) => {
    const order = fixture(orderName);
    const want = expected(route, actorName, order);
    const url = await route.url(order);
    const client = clients.get(actorName)!;
    const res = route.method === 'get' ? await client.agent.get(url) : await client.post(url, route.body);
    try {
      expect(res.status, `${route.name} ${url}: ${JSON.stringify(res.body)}`).toBe(want);
      if (want === 404 && route.gate === 'report.read') {
        // No content and no hint: the same words as for an id nobody has.
        expect(JSON.stringify(res.body)).not.toContain('Sluice');
        expect(res.headers['content-type']).toMatch(/json/);
      }
    } finally {
      await route.restore?.(order);
    }
  });
});

describe('guest links', () => {
  type LinkState = 'valid' | 'expired' | 'revoked' | 'unknown';
  const states: LinkState[] = ['valid', 'expired', 'revoked', 'unknown'];
  const tokenFor = (state: LinkState) => (state === 'unknown' ? 'z'.repeat(43) : tokens[state]);
  const guestRoutes: { name: string; url: (t: string) => string; servable: boolean }[] = [
    { name: 'the report', url: (t) => `/api/shared/${t}`, servable: true },
    { name: 'the pdf', url: (t) => `/api/shared/${t}/pdf`, servable: true },
    { name: 'a still it shows', url: (t) => `/api/shared/${t}/media/${guestOrder.renderedId}/file`, servable: true },
    { name: "a still's thumbnail", url: (t) => `/api/shared/${t}/media/${guestOrder.stillId}/thumbnail`, servable: true },
    { name: "a still's original", url: (t) => `/api/shared/${t}/media/${guestOrder.stillId}/original`, servable: false },
    { name: "another order's still", url: (t) => `/api/shared/${t}/media/${fixture('disclosed').renderedId}/file`, servable: false },
  ];
  const cells = states.flatMap((state) => guestRoutes.map((route) => ({ state, route, label: route.name })));
  it.each(cells)('$state link: $label', async ({ state, route }) => {
    // The rule behind it: only a live link is a guest actor, and it reads its own report.
    const live = state === 'valid';
    const guest: Actor | null = live ? { kind: 'guest', reportId: guestOrder.id } : null;
    const want = route.servable && can(guest, 'report.read', { order: guestOrder.access }) ? 200 : 404;
    const res = await request(ctx.app).get(route.url(tokenFor(state)));
    expect(res.status).toBe(want);
    if (want === 404) expect(JSON.stringify(res.body)).not.toContain('Sluice');
  });
});
