import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { gradeGuidance, type GradeLevel, type InspectionInput, type PartyRole } from '@underfoot/core';
import { phoneJpeg } from '../support/media-samples.ts';
import { addParties, sampleDocument } from '../support/inspection-fixtures.ts';
import { pdfPages } from '../support/pdf-text.ts';
import { browserLikeAgent, createTestContext, type TestContext } from '../support/test-app.ts';

/*
 * Review, publish and the portal (PRODUCT.md §3 journeys 4–8, §10): who may publish, who may
 * read what and when, payment before release, disclosure, share links, views, questions,
 * amendments, the PDF and guests' media.
 */

let ctx: TestContext;
type Client = Awaited<ReturnType<typeof browserLikeAgent>>;
const clients = new Map<string, Client>();
let people: Record<'listingAgent' | 'seller' | 'otherAgent' | 'otherInspector' | 'foreignOffice', { id: string; email: string }>;

beforeAll(async () => {
  ctx = await createTestContext();
  const elsewhere = await ctx.addCompany('Elsewhere Sewer Co');
  people = {
    listingAgent: await ctx.addUser('agent', 'listing@realty.test'),
    seller: await ctx.addUser('client', 'seller@home.test'),
    otherAgent: await ctx.addUser('agent', 'other-agent@realty.test'),
    otherInspector: await ctx.addUser('inspector', 'other-inspector@mudlark.test'),
    foreignOffice: await ctx.addUser('office', 'office@elsewhere.test', elsewhere),
  };
});
afterAll(() => ctx.close());

async function as(email: string): Promise<Client> {
  const existing = clients.get(email);
  if (existing) return existing;
  const client = await browserLikeAgent(ctx.app);
  expect((await client.signIn(email)).status).toBe(200);
  clients.set(email, client);
  return client;
}
const office = () => as(ctx.users.office.email);
const inspector = () => as(ctx.users.inspector.email);
const buyersAgent = () => as(ctx.users.agent.email);
const buyer = () => as(ctx.users.client.email);
const listingAgent = () => as(people.listingAgent.email);
const seller = () => as(people.seller.email);

const db = () => ctx.services.db;
const setCompany = (patch: Record<string, unknown>) => db()('companies').where({ id: ctx.companyId }).update(patch);

/** An order straight into the tables with both sides on it, assigned to the test inspector. */
async function makeOrder(options: { kind?: 'pre_purchase' | 'pre_listing'; paid?: boolean; street?: string } = {}) {
  const kind = options.kind ?? 'pre_purchase';
  const now = new Date().toISOString();
  const propertyId = crypto.randomUUID();
  const orderId = crypto.randomUUID();
  await db()('properties').insert({
    id: propertyId,
    company_id: ctx.companyId,
    street: options.street ?? '12 Sluice Row',
    unit: '',
    city: 'Alder Falls',
    region: 'OR',
    postal_code: '97411',
    address_key: `sluice-${orderId}`,
    year_built: 1956,
    property_type: 'single_family',
    occupancy: 'occupied',
    access_notes: '',
    created_at: now,
  });
  await db()('orders').insert({
    id: orderId,
    company_id: ctx.companyId,
    property_id: propertyId,
    kind,
    ordering_side: kind === 'pre_purchase' ? 'buyer' : 'seller',
    status: 'scheduled',
    contingency_deadline: '2099-01-31',
    payer: 'agent_now',
    fee_total_cents: 32500,
    payment_state: options.paid === false ? 'unpaid' : 'paid',
    assigned_inspector_id: ctx.users.inspector.id,
    window_date: '2099-01-20',
    window_start: '08:00',
    window_end: '10:00',
    created_at: now,
    updated_at: now,
  });
  await db()('order_fee_lines').insert({ order_id: orderId, fee_item_id: null, name: 'Sewer line camera inspection', price_cents: 32500 });
  const parties: [string, PartyRole][] = [
    [ctx.users.agent.id, 'buyers_agent'],
    [ctx.users.client.id, 'buyer'],
    [people.listingAgent.id, 'listing_agent'],
    [people.seller.id, 'seller'],
  ];
  await addParties(ctx, orderId, parties);
  return orderId;
}

const put = async (client: Client, url: string, body: object) => client.agent.put(url).set('x-csrf-token', client.token).send(body);

/** The inspector records the sample line and a still on the serious offset, marked up; returns the still's id. */
async function record(orderId: string, document: InspectionInput = sampleDocument(orderId)) {
  const field = await inspector();
  const upload = await field.agent
    .post(`/api/orders/${orderId}/media/stills`)
    .set('x-csrf-token', field.token)
    .field('origin', 'photo')
    .field('runId', 'run-1')
    .field('observationId', 'obs-3')
    .attach('image', await phoneJpeg(), 'offset.jpg');
  expect(upload.status).toBe(201);
  const stillId: string = upload.body.media.id;
  const markup = await put(field, `/api/media/${stillId}/markup`, {
    baseVersion: 0,
    markup: { shapes: [{ id: 'm1', type: 'arrow', colour: 'sun', x1: 0.1, y1: 0.1, x2: 0.4, y2: 0.4 }] },
  });
  expect(markup.status).toBe(200);
  const doc = structuredClone(document);
  const obs = doc.runs?.[0]?.observations?.find((o) => o.id === 'obs-3');
  if (obs) obs.stillIds = [stillId];
  const current = await field.agent.get(`/api/orders/${orderId}/inspection`).expect(200);
  const saved = await put(field, `/api/orders/${orderId}/inspection`, { baseVersion: current.body.inspection.version, document: doc });
  expect(saved.status).toBe(200);
  return { stillId, version: saved.body.version as number };
}

async function publishAsOffice(orderId: string, body: object = { note: '' }) {
  const res = await (await office()).post(`/api/orders/${orderId}/publish`, body);
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body as { revision: number; grade: string; releaseHeld: boolean };
}

async function publishedOrder(options: { kind?: 'pre_purchase' | 'pre_listing' } = {}) {
  const orderId = await makeOrder(options);
  const { stillId } = await record(orderId);
  await publishAsOffice(orderId);
  return { orderId, stillId };
}

const binary = (client: Client, url: string, headers: Record<string, string> = {}) =>
  client.agent
    .get(url)
    .set(headers)
    .buffer(true)
    .parse((res, callback) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => callback(null, Buffer.concat(chunks)));
    });
const guestBinary = (url: string, headers: Record<string, string> = {}) =>
  request(ctx.app)
    .get(url)
    .set(headers)
    .buffer(true)
    .parse((res, callback) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => callback(null, Buffer.concat(chunks)));
    });
/** Wait for a mail to this person whose text mentions this order (earlier tests mail the same people). */
async function mailAbout(to: string, subject: string, text: string) {
  for (let i = 0; i < 200; i++) {
    const found = ctx.mail.messages().find((m) => m.to.includes(to) && m.subject.includes(subject) && m.text.includes(text));
    if (found) return found;
    await new Promise((r) => setTimeout(r, 25));
  }
  throw new Error(`no "${subject}" mail to ${to} about ${text}`);
}
const tokenOf = (url: string) => url.split('/shared/')[1]!;

describe('publishing', () => {
  it('is for the office, and for the assigned inspector only where the company allows it', async () => {
    const orderId = await makeOrder();
    await record(orderId);
    expect((await (await buyersAgent()).post(`/api/orders/${orderId}/publish`, { note: '' })).status).toBe(403);
    // Not assigned, or another company: the order does not exist for them.
    expect((await (await as(people.otherInspector.email)).post(`/api/orders/${orderId}/publish`, {})).status).toBe(404);
    expect((await (await as(people.foreignOffice.email)).post(`/api/orders/${orderId}/publish`, {})).status).toBe(404);
    await setCompany({ inspectors_may_publish: false });
    const refused = await (await inspector()).post(`/api/orders/${orderId}/publish`, {});
    expect(refused.status).toBe(403);
    expect(refused.body.detail).toMatch(/office publish/);
    await setCompany({ inspectors_may_publish: true });
    const published = await (await inspector()).post(`/api/orders/${orderId}/publish`, {});
    expect(published.status).toBe(201);
    expect(published.body).toEqual({ revision: 1, grade: 'repair_now', releaseHeld: false });
    await setCompany({ inspectors_may_publish: false });

    // Published once; a second publish needs a reopen first. Nothing was half-done.
    const again = await (await office()).post(`/api/orders/${orderId}/publish`, {});
    expect(again.status).toBe(409);
    expect(await db()('report_revisions').where({ order_id: orderId })).toHaveLength(1);
    const audit = await db()('audit_log').where({ subject_id: orderId, action: 'report.published' });
    expect(audit).toHaveLength(1);
    // The inspection is frozen once published.
    const edit = await put(await inspector(), `/api/orders/${orderId}/inspection`, { baseVersion: 2, document: sampleDocument(orderId) });
    expect(edit.status).toBe(403);
  });

  it('refuses an inspection that changed after the reviewer looked, and an order with nothing recorded', async () => {
    const orderId = await makeOrder();
    expect((await (await office()).post(`/api/orders/${orderId}/publish`, {})).body.code).toBe('no_inspection');
    const { version } = await record(orderId);
    const stale = await (await office()).post(`/api/orders/${orderId}/publish`, { note: '', inspectionVersion: version - 1 });
    expect(stale.status).toBe(409);
    expect(stale.body.code).toBe('inspection_changed');
    expect((await (await office()).post(`/api/orders/${orderId}/publish`, { inspectionVersion: version })).status).toBe(201);
  });

  it('keeps a grade override with its reason in the inspection and the audit trail', async () => {
    const orderId = await makeOrder();
    const { version } = await record(orderId);
    const client = await office();
    const review = await client.agent.get(`/api/orders/${orderId}/review`).expect(200);
    expect(review.body.allowed).toEqual({ publish: true, reopen: false, override: true });
    expect(review.body.inspectionVersion).toBe(version);
    const short = await client.post(`/api/orders/${orderId}/grade-override`, {
      baseVersion: version,
      override: { level: 'plan_repair', reason: 'no' },
    });
    expect(short.status).toBe(400);
    expect(short.body.errors[0].path).toBe('override.reason');
    const stale = await client.post(`/api/orders/${orderId}/grade-override`, {
      baseVersion: version + 5,
      override: { level: 'plan_repair', reason: 'The offset is at a fitting, not a break.' },
    });
    expect(stale.status).toBe(409);
    const saved = await client.post(`/api/orders/${orderId}/grade-override`, {
      baseVersion: version,
      override: { level: 'plan_repair', reason: 'The offset is at a fitting, not a break.' },
    });
    expect(saved.status).toBe(200);
    expect(saved.body.version).toBe(version + 1);
    const audit = await db()('audit_log').where({ subject_id: orderId, action: 'report.overridden' }).first();
    expect(JSON.parse(audit.detail)).toMatchObject({
      computed: 'repair_now',
      to: 'plan_repair',
      reason: 'The offset is at a fitting, not a break.',
    });
    expect((await publishAsOffice(orderId)).grade).toBe('plan_repair');
    // Published: overriding needs a reopen, and the review says so.
    expect((await client.agent.get(`/api/orders/${orderId}/review`)).body.allowed).toEqual({
      publish: false,
      reopen: true,
      override: false,
    });
    const late = await client.post(`/api/orders/${orderId}/grade-override`, { baseVersion: version + 1, override: null });
    expect(late.status).toBe(403);
    // Parties have no review screen.
    expect((await (await buyersAgent()).agent.get(`/api/orders/${orderId}/review`)).status).toBe(404);
  });
});

describe('who reads the report', () => {
  it('answers 404 alike for a guessed id, another agent, the other side before disclosure and an unassigned inspector', async () => {
    const { orderId } = await publishedOrder();
    const other = await makeOrder();
    await db()('order_parties').where({ order_id: other }).delete();
    await addParties(ctx, other, [[people.otherAgent.id, 'buyers_agent']]);
    const nobody = [
      [await office(), crypto.randomUUID()],
      [await as(people.otherAgent.email), orderId],
      [await listingAgent(), orderId],
      [await seller(), orderId],
      [await as(people.otherInspector.email), orderId],
      [await as(people.foreignOffice.email), orderId],
    ] as const;
    for (const [client, id] of nobody) {
      for (const url of [`/api/reports/${id}`, `/api/reports/${id}/pdf`, `/api/reports/${id}/questions`]) {
        const res = await client.agent.get(url);
        expect(res.status, url).toBe(404);
        expect(res.body.detail).toBe('We could not find that report.');
      }
    }
    for (const client of [await office(), await inspector(), await buyersAgent(), await buyer()]) {
      expect((await client.agent.get(`/api/reports/${orderId}`)).status).toBe(200);
    }
    expect((await request(ctx.app).get(`/api/reports/${orderId}`)).status).toBe(401);
    // Signed-in readers get the files the report shows through the media routes; the other side does not.
    const still = (await (await buyer()).agent.get(`/api/reports/${orderId}`)).body.revision.snapshot.media[0];
    expect((await binary(await buyer(), `/api/media/${still.renderedId}/file`)).status).toBe(200);
    expect((await binary(await seller(), `/api/media/${still.renderedId}/file`)).status).toBe(404);
  });

  it('holds the report until the fee is paid, then releases it on the payment webhook and mails the buyer side', async () => {
    await setCompany({ require_payment_before_release: true });
    const orderId = await makeOrder({ paid: false });
    await record(orderId);
    const published = await publishAsOffice(orderId);
    expect(published.releaseHeld).toBe(true);
    expect((await (await buyer()).agent.get(`/api/reports/${orderId}`)).status).toBe(404);
    expect((await (await buyersAgent()).agent.get(`/api/reports/${orderId}`)).status).toBe(404);
    const officeView = await (await office()).agent.get(`/api/reports/${orderId}`).expect(200);
    expect(officeView.body).toMatchObject({ releaseHeld: true, releasedTo: [] });
    // The held side cannot pass it on to a guest either.
    expect((await (await buyersAgent()).post(`/api/reports/${orderId}/share-links`, { label: 'Lender' })).status).toBe(403);

    const checkout = await (await buyersAgent()).post(`/api/orders/${orderId}/checkout`);
    expect(checkout.status).toBe(200);
    const session = ctx.payments.sessions().find((s) => s.url === checkout.body.url)!;
    await ctx.payments.paySession(session.id);
    for (let i = 0; i < 100 && (await db()('orders').where({ id: orderId }).first()).release_held; i++)
      await new Promise((r) => setTimeout(r, 30));
    const read = await (await buyer()).agent.get(`/api/reports/${orderId}`);
    expect(read.status).toBe(200);
    expect(read.body).toMatchObject({ releaseHeld: false, releasedTo: ['buyer'], readerSide: 'buyer' });
    await mailAbout(ctx.users.client.email, 'report is ready', `/portal/reports/${orderId}`);
    // Not the seller side: nothing was disclosed.
    expect(ctx.mail.messages().some((m) => m.to.includes(people.seller.email) && m.text.includes(orderId))).toBe(false);
  });

  it('lets the ordering side disclose to the other side and withdraw it again', async () => {
    const { orderId } = await publishedOrder();
    // The other side cannot disclose what it cannot read; the office does not disclose for a side.
    expect((await (await listingAgent()).post(`/api/reports/${orderId}/disclose`)).status).toBe(404);
    expect((await (await office()).post(`/api/reports/${orderId}/disclose`)).status).toBe(403);
    const agentView = (await (await buyersAgent()).agent.get(`/api/reports/${orderId}`)).body;
    expect(agentView.allowed).toMatchObject({ disclose: true, withdraw: false, share: true, viewLog: true, ask: true, answer: false });
    const disclosed = await (await buyer()).post(`/api/reports/${orderId}/disclose`);
    expect(disclosed.status).toBe(200);
    expect(disclosed.body.releasedTo).toEqual(['buyer', 'seller']);
    await mailAbout(people.seller.email, 'report is ready', orderId);
    const sellerView = await (await seller()).agent.get(`/api/reports/${orderId}`);
    expect(sellerView.status).toBe(200);
    expect(sellerView.body.readerSide).toBe('seller');
    // The other side reads; it does not share, see the view log or disclose.
    expect(sellerView.body.allowed).toMatchObject({ disclose: false, withdraw: false, share: false, viewLog: false, ask: true });
    expect((await (await listingAgent()).agent.get(`/api/reports/${orderId}/views`)).status).toBe(403);
    expect((await (await listingAgent()).post(`/api/reports/${orderId}/share-links`, {})).status).toBe(403);

    const withdrawn = await (await buyersAgent()).post(`/api/reports/${orderId}/withdraw-disclosure`);
    expect(withdrawn.body.releasedTo).toEqual(['buyer']);
    expect((await (await seller()).agent.get(`/api/reports/${orderId}`)).status).toBe(404);
    const events = await db()('order_events').where({ order_id: orderId }).whereIn('type', ['disclosed', 'disclosure_withdrawn']);
    expect(events.map((e) => e.type)).toEqual(['disclosed', 'disclosure_withdrawn']);
  });
});

describe('share links and guests', () => {
  it('work until they expire or are revoked, with the same 404 for unknown, expired and revoked links', async () => {
    const { orderId, stillId } = await publishedOrder();
    const agent = await buyersAgent();
    const made = await agent.post(`/api/reports/${orderId}/share-links`, { label: 'Lender', expiresInDays: 7, showCosts: false });
    expect(made.status).toBe(201);
    const token = tokenOf(made.body.url);
    const stored = await db()('share_links').where({ id: made.body.id }).first();
    expect(stored.token_hash).not.toContain(token);

    const guest = await request(ctx.app).get(`/api/shared/${token}`).expect(200);
    expect(guest.body.revision.costsHidden).toBe(true);
    expect(guest.body.revision.snapshot.analysis.costs.options).toEqual([]);
    expect(guest.body.revision.snapshot.analysis.summary.text).not.toContain('$');
    expect(JSON.stringify(guest.body)).not.toContain('"allowed"');

    // Guests fetch the files the report shows, with byte ranges, and nothing else.
    const media = guest.body.revision.snapshot.media[0];
    expect(media.id).toBe(stillId);
    const rendered = await guestBinary(`/api/shared/${token}/media/${media.renderedId}/file`).expect(200);
    expect(rendered.headers['content-type']).toBe('image/jpeg');
    const part = await guestBinary(`/api/shared/${token}/media/${media.id}/file`, { Range: 'bytes=0-9' }).expect(206);
    expect((part.body as Buffer).length).toBe(10);
    expect((await guestBinary(`/api/shared/${token}/media/${media.id}/thumbnail`)).status).toBe(200);
    const otherOrder = await publishedOrder();
    expect((await request(ctx.app).get(`/api/shared/${token}/media/${otherOrder.stillId}/file`)).status).toBe(404);
    expect((await request(ctx.app).get(`/api/shared/${token}/media/${media.id}/original`)).status).toBe(404);

    const unknown = await request(ctx.app).get(`/api/shared/${'x'.repeat(43)}`);
    expect(unknown.status).toBe(404);
    await db()('share_links')
      .where({ id: made.body.id })
      .update({ expires_at: new Date(Date.now() - 1000).toISOString() });
    const expired = await request(ctx.app).get(`/api/shared/${token}`);
    expect(expired.status).toBe(404);
    expect(expired.body.detail).toBe(unknown.body.detail);
    expect((await request(ctx.app).get(`/api/shared/${token}/media/${media.id}/file`)).status).toBe(404);

    const second = await agent.post(`/api/reports/${orderId}/share-links`, { label: 'Contractor' });
    const token2 = tokenOf(second.body.url);
    expect((await request(ctx.app).get(`/api/shared/${token2}`)).body.revision.costsHidden).toBe(false);
    expect((await agent.post(`/api/reports/${orderId}/share-links/${second.body.id}/revoke`)).status).toBe(204);
    const revoked = await request(ctx.app).get(`/api/shared/${token2}`);
    expect(revoked.status).toBe(404);
    expect(revoked.body.detail).toBe(unknown.body.detail);
    expect((await agent.post(`/api/reports/${orderId}/share-links/${second.body.id}/revoke`)).status).toBe(404);

    const list = await agent.agent.get(`/api/reports/${orderId}/share-links`).expect(200);
    expect(list.body.links.map((l: { label: string; active: boolean; views: number }) => [l.label, l.active, l.views])).toEqual([
      ['Contractor', false, 1],
      ['Lender', false, 1],
    ]);
    // Buyers read; they do not manage links (PRODUCT.md §10).
    expect((await (await buyer()).post(`/api/reports/${orderId}/share-links`, {})).status).toBe(403);
    const audit = await db()('audit_log').where({ subject_id: orderId }).whereIn('action', ['share_link.created', 'share_link.revoked']);
    expect(audit).toHaveLength(3);
  });

  it('gives pre-listing reports a disclosure link that does not expire', async () => {
    const { orderId } = await publishedOrder({ kind: 'pre_listing' });
    const wrong = await (await office()).post(`/api/reports/${(await publishedOrder()).orderId}/share-links`, { purpose: 'disclosure' });
    expect(wrong.status).toBe(400);
    const made = await (await listingAgent()).post(`/api/reports/${orderId}/share-links`, { purpose: 'disclosure', label: 'Listing' });
    expect(made.status).toBe(201);
    expect(made.body.expiresAt).toBeNull();
    const read = await request(ctx.app)
      .get(`/api/shared/${tokenOf(made.body.url)}`)
      .expect(200);
    expect(read.body.purpose).toBe('disclosure');
    // Whoever opens a listing's disclosure link is a prospective buyer: the grade speaks to the buyer,
    // on the page and in the PDF, not to the seller who ordered it.
    expect(read.body.readerSide).toBe('buyer');
    const level = read.body.revision.snapshot.analysis.grade.level as GradeLevel;
    const pdf = (await pdfPages((await guestBinary(`/api/shared/${tokenOf(made.body.url)}/pdf`).expect(200)).body as Buffer)).join(' ');
    const opening = (text: string) => text.slice(0, text.indexOf('.') + 1);
    expect(pdf).toContain(opening(gradeGuidance.buyer[level]));
    expect(pdf).not.toContain(opening(gradeGuidance.seller[level]));

    // A guest link made by the ordering side reads as that side's report, addressed to no one.
    const guest = await (await listingAgent()).post(`/api/reports/${orderId}/share-links`, { label: 'Stager' });
    const guestRead = await request(ctx.app)
      .get(`/api/shared/${tokenOf(guest.body.url)}`)
      .expect(200);
    expect(guestRead.body.readerSide).toBeNull();
  });
});

describe('views, questions and the PDF', () => {
  it('counts a reader coming back to the same revision within ten minutes as one opening', async () => {
    const { orderId } = await publishedOrder();
    const reader = await buyer();
    for (let i = 0; i < 3; i++) await reader.agent.get(`/api/reports/${orderId}`).expect(200);
    const logged = () => db()('report_views').where({ order_id: orderId, what: 'report' }).orderBy('id');
    expect(await logged()).toHaveLength(1);
    // Eleven minutes later it is a new opening.
    const first = (await logged())[0]!;
    await db()('report_views')
      .where({ id: first.id })
      .update({ viewed_at: new Date(Date.now() - 11 * 60_000).toISOString() });
    await reader.agent.get(`/api/reports/${orderId}`).expect(200);
    expect(await logged()).toHaveLength(2);
    // Someone else reading is their own opening.
    await (await buyersAgent()).agent.get(`/api/reports/${orderId}`).expect(200);
    expect(await logged()).toHaveLength(3);
  });

  it('logs every view and download; the ordering agent and the office see who opened what', async () => {
    const { orderId } = await publishedOrder();
    const link = await (await buyersAgent()).post(`/api/reports/${orderId}/share-links`, { label: 'Insurer' });
    await (await buyer()).agent.get(`/api/reports/${orderId}`).expect(200);
    await request(ctx.app)
      .get(`/api/shared/${tokenOf(link.body.url)}`)
      .expect(200);
    const pdf = await binary(await buyer(), `/api/reports/${orderId}/pdf`);
    expect(pdf.status).toBe(200);
    const views = await (await buyersAgent()).agent.get(`/api/reports/${orderId}/views`).expect(200);
    const rows = views.body.views as { who: string; what: string; role: string; partyRole: string | null }[];
    expect(rows[0]).toMatchObject({ what: 'pdf', role: 'client', partyRole: 'buyer' });
    expect(rows.some((v) => v.who === 'Guest link: Insurer' && v.what === 'report')).toBe(true);
    expect(rows.some((v) => v.partyRole === 'buyer' && v.what === 'report')).toBe(true);
    expect((await (await office()).agent.get(`/api/reports/${orderId}/views`)).status).toBe(200);
    expect((await (await buyer()).agent.get(`/api/reports/${orderId}/views`)).status).toBe(403);
    expect((await (await inspector()).agent.get(`/api/reports/${orderId}/views`)).status).toBe(403);
  });

  it('takes questions from the parties and answers from the company, e-mailing both sides of the thread', async () => {
    const { orderId } = await publishedOrder();
    const asker = await buyer();
    const empty = await asker.post(`/api/reports/${orderId}/questions`, { body: '  ' });
    expect(empty.status).toBe(400);
    expect(empty.body.errors[0].path).toBe('body');
    expect((await asker.post(`/api/reports/${orderId}/questions`, { body: 'x'.repeat(2001) })).body.errors[0].path).toBe('body');
    expect((await (await office()).post(`/api/reports/${orderId}/questions`, { body: 'Can the office ask?' })).status).toBe(403);

    const asked = await asker.post(`/api/reports/${orderId}/questions`, { body: 'How urgent is the offset at 41 feet?' });
    expect(asked.status).toBe(201);
    await mailAbout(ctx.users.office.email, 'Question about the report', `/office/reports/${orderId}`);
    await mailAbout(ctx.users.inspector.email, 'Question about the report', `/field/reports/${orderId}`);

    expect(
      (await (await buyersAgent()).post(`/api/reports/${orderId}/questions/${asked.body.id}/answers`, { body: 'I think so' })).status,
    ).toBe(403);
    const answered = await (
      await inspector()
    ).post(`/api/reports/${orderId}/questions/${asked.body.id}/answers`, {
      body: 'Fix it within a few months; it catches paper.',
    });
    expect(answered.status).toBe(201);
    const reply = await mailAbout(ctx.users.client.email, 'Answer about the report', orderId);
    expect(reply.text).toContain('catches paper');
    await mailAbout(ctx.users.agent.email, 'Answer about the report', orderId);

    const thread = await (await buyersAgent()).agent.get(`/api/reports/${orderId}/questions`).expect(200);
    expect(thread.body.questions).toHaveLength(1);
    expect(thread.body.questions[0].answers[0].body).toMatch(/catches paper/);
    // After disclosure the seller side reads the report, not the buyer side's questions.
    await (await buyersAgent()).post(`/api/reports/${orderId}/disclose`);
    expect((await (await seller()).agent.get(`/api/reports/${orderId}/questions`)).body.questions).toEqual([]);
    expect(ctx.mail.messages().some((m) => m.to.includes(people.listingAgent.email) && m.subject.includes('Answer'))).toBe(false);
  });

  it('makes a real PDF, as an attachment with a clean name, for readers and for guests', async () => {
    const { orderId } = await publishedOrder();
    const res = await binary(await buyer(), `/api/reports/${orderId}/pdf`);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/pdf');
    expect(res.headers['content-disposition']).toBe('attachment; filename="sewer-line-report-12-sluice-row.pdf"');
    const bytes = res.body as Buffer;
    expect(bytes.subarray(0, 5).toString()).toBe('%PDF-');
    const pages = bytes.toString('latin1').match(/\/Type \/Page\b/g) ?? [];
    expect(pages.length).toBeGreaterThanOrEqual(2);
    // The shipped font is embedded, and the marked-up still with it.
    expect(bytes.toString('latin1')).toMatch(/Inter/);
    expect(bytes.toString('latin1')).toMatch(/\/Subtype \/Image/);
    expect(bytes.length).toBeLessThan(3_000_000);
    const logged = await db()('report_views').where({ order_id: orderId, what: 'pdf' });
    expect(logged).toHaveLength(1);

    const link = await (await buyersAgent()).post(`/api/reports/${orderId}/share-links`, { showCosts: false });
    const guest = await guestBinary(`/api/shared/${tokenOf(link.body.url)}/pdf`).expect(200);
    expect((guest.body as Buffer).subarray(0, 5).toString()).toBe('%PDF-');
    expect((await request(ctx.app).get(`/api/shared/${'y'.repeat(43)}/pdf`)).status).toBe(404);
  });
});

describe('amendments and re-inspections', () => {
  it('reopen keeps the published revision readable; the next revision needs a note and shows what changed', async () => {
    const { orderId } = await publishedOrder();
    expect((await (await buyersAgent()).post(`/api/orders/${orderId}/reopen`)).status).toBe(403);
    expect((await (await office()).post(`/api/orders/${orderId}/reopen`)).status).toBe(204);
    expect((await db()('orders').where({ id: orderId }).first()).status).toBe('in_review');
    expect((await (await buyer()).agent.get(`/api/reports/${orderId}`)).status).toBe(200);

    // After the repair: the offset is gone, the roots were cut back.
    const field = await inspector();
    const current = await field.agent.get(`/api/orders/${orderId}/inspection`).expect(200);
    const doc = current.body.inspection.document;
    doc.runs[0].observations = doc.runs[0].observations.filter((o: { id: string }) => o.id !== 'obs-3');
    doc.runs[0].observations.find((o: { id: string }) => o.id === 'obs-2').severity = 2;
    expect(
      (await put(field, `/api/orders/${orderId}/inspection`, { baseVersion: current.body.inspection.version, document: doc })).status,
    ).toBe(200);

    const noNote = await (await office()).post(`/api/orders/${orderId}/publish`, { note: '', kind: 'reinspection' });
    expect(noNote.status).toBe(400);
    expect(noNote.body.errors[0].path).toBe('note');
    const second = await publishAsOffice(orderId, { note: 'Re-inspected after the spot repair at 41 ft.', kind: 'reinspection' });
    expect(second).toMatchObject({ revision: 2, grade: 'clear', releaseHeld: false });
    await mailAbout(ctx.users.client.email, 'Updated report', orderId);

    const latest = await (await buyer()).agent.get(`/api/reports/${orderId}`).expect(200);
    expect(latest.body.revision).toMatchObject({ number: 2, kind: 'reinspection', note: 'Re-inspected after the spot repair at 41 ft.' });
    expect(latest.body.revisions.map((r: { number: number; grade: string }) => [r.number, r.grade])).toEqual([
      [1, 'repair_now'],
      [2, 'clear'],
    ]);
    expect(latest.body.changes.gradeText).toBe('The grade improved from Repair now to Clear.');
    expect(latest.body.changes.changes.map((c: { kind: string }) => c.kind).sort()).toEqual(['better', 'resolved']);
    const first = await (await buyer()).agent.get(`/api/reports/${orderId}?revision=1`).expect(200);
    expect(first.body.revision.number).toBe(1);
    expect(first.body.changes).toBeNull();
    expect((await (await buyer()).agent.get(`/api/reports/${orderId}?revision=3`)).status).toBe(404);
    expect(await db()('audit_log').where({ subject_id: orderId, action: 'report.amended' })).toHaveLength(1);
  });
});

describe('files a published revision shows', () => {
  it('survive an amendment: new markup keeps the old rendered copy, and deleting the still is refused', async () => {
    const { orderId, stillId } = await publishedOrder();
    expect((await (await office()).post(`/api/orders/${orderId}/reopen`)).status).toBe(204);
    const field = await inspector();
    const before = await db()('media').where({ source_media_id: stillId, kind: 'rendered' });
    expect(before).toHaveLength(1);
    const remarked = await put(field, `/api/media/${stillId}/markup`, {
      baseVersion: 1,
      markup: { shapes: [{ id: 'm2', type: 'box', colour: 'sun', x: 0.2, y: 0.2, w: 0.3, h: 0.3 }] },
    });
    expect(remarked.status, JSON.stringify(remarked.body)).toBe(200);
    const after = await db()('media').where({ source_media_id: stillId, kind: 'rendered' });
    expect(after.map((r) => r.id)).toContain(before[0].id);
    expect(after).toHaveLength(2);
    // Revision 1 still serves its rendered copy.
    const oldCopy = await binary(await buyer(), `/api/media/${before[0].id}/file`);
    expect(oldCopy.status).toBe(200);

    const removed = await field.agent.delete(`/api/media/${stillId}`).set('x-csrf-token', field.token);
    expect(removed.status).toBe(409);
    expect(removed.body.code).toBe('in_published_revision');
  });
});
