import type { Knex } from 'knex';
import type { OrderAccess, OrderKind, OrderStatus, PartyRole, PaymentState, Payer, Side } from '@underfoot/core';

export interface OrderRow {
  id: string;
  company_id: string;
  property_id: string;
  kind: OrderKind;
  ordering_side: Side;
  status: OrderStatus;
  contingency_deadline: string;
  preferred_dates: string;
  payer: Payer;
  fee_total_cents: number;
  payment_state: PaymentState;
  assigned_inspector_id: string | null;
  window_date: string | null;
  window_start: string | null;
  window_end: string | null;
  note: string;
  cancel_reason: string | null;
  /** JSON list of the sides the published report is released to. */
  released_to: string;
  release_held: number | boolean;
  created_by: string | null;
  created_at: string;
  updated_at: string;
}

export interface PartyRecord {
  userId: string;
  partyRole: PartyRole;
  name: string;
  email: string;
  /** False while the person has not yet accepted their invitation. */
  active: boolean;
}

/** Normalised street + unit + postal code, used to notice the same property ordered twice. */
export function addressKey(a: { street: string; unit: string; postalCode: string }): string {
  return [a.street, a.unit, a.postalCode].map((s) => s.toLowerCase().replace(/[.,#]/g, ' ').replace(/\s+/g, ' ').trim()).join('|');
}

export async function findOrderRow(db: Knex, id: string): Promise<OrderRow | undefined> {
  return db<OrderRow>('orders').where({ id }).first();
}

export async function listParties(db: Knex, orderId: string): Promise<PartyRecord[]> {
  const rows = await db('order_parties')
    .join('users', 'users.id', 'order_parties.user_id')
    .where('order_parties.order_id', orderId)
    .orderBy('order_parties.id')
    .select('order_parties.user_id', 'order_parties.party_role', 'users.name', 'users.email', 'users.password_hash');
  return rows.map((r) => ({ userId: r.user_id, partyRole: r.party_role, name: r.name, email: r.email, active: r.password_hash !== null }));
}

/** What core's `can` needs to decide about one order. */
export async function loadOrderAccess(db: Knex, order: OrderRow, known: { published?: boolean } = {}): Promise<OrderAccess> {
  const parties = await db('order_parties').where({ order_id: order.id }).select('user_id', 'party_role');
  return {
    companyId: order.company_id,
    status: order.status,
    assignedInspectorId: order.assigned_inspector_id,
    orderingSide: order.ordering_side,
    parties: parties.map((p) => ({ userId: p.user_id, partyRole: p.party_role })),
    releasedTo: JSON.parse(order.released_to || '[]') as Side[],
    // The report is the order's: it exists once a first revision is published.
    reportId: (known.published ?? (await db('report_revisions').where({ order_id: order.id }).first('id'))) ? order.id : null,
    published: order.status === 'published',
  };
}

export async function addOrderEvent(
  db: Knex,
  event: { orderId: string; actorUserId: string | null; type: string; detail?: Record<string, unknown> },
): Promise<void> {
  await db('order_events').insert({
    order_id: event.orderId,
    actor_user_id: event.actorUserId,
    type: event.type,
    detail: event.detail ? JSON.stringify(event.detail) : null,
    created_at: new Date().toISOString(),
  });
}

export async function listOrderEvents(db: Knex, orderId: string) {
  const rows = await db('order_events')
    .leftJoin('users', 'users.id', 'order_events.actor_user_id')
    .where('order_events.order_id', orderId)
    .orderBy('order_events.id')
    .select('order_events.id', 'order_events.type', 'order_events.detail', 'order_events.created_at', 'users.name as actor_name');
  return rows.map((r) => ({
    id: r.id as number,
    type: r.type as string,
    detail: r.detail ? (JSON.parse(r.detail) as Record<string, unknown>) : {},
    at: r.created_at as string,
    actorName: (r.actor_name as string | null) ?? null,
  }));
}

export interface OrderListFilter {
  companyId: string;
  /** Restrict to orders this person is a party on, or assigned to; undefined = the whole company (office). */
  partyUserId?: string;
  inspectorId?: string;
  statuses?: OrderStatus[] | undefined;
  /** Only visits on this date (YYYY-MM-DD). */
  windowDate?: string | undefined;
  search?: string | undefined;
  /** `attention`: open orders first, nearest deadline first; then closed ones, latest deadline first (direction ignored). */
  sort: 'attention' | 'deadline' | 'created' | 'status' | 'address' | 'window';
  direction: 'asc' | 'desc';
  limit: number;
  offset: number;
}

type Ordering = { column: string | Knex.Raw; order: 'asc' | 'desc' }[];

/** Orders with nothing left to do: a published report or a cancellation. */
const CLOSED = "orders.status in ('published', 'cancelled')";

/**
 * The order a list is shown in, ending in the visit and the id so pages never overlap.
 * `attention` ("open first") puts what is still open first, most urgent first, and below it what is
 * done, most recent first: an agent with years of orders still finds this week's on page one.
 */
function listOrdering(db: Knex, filter: Pick<OrderListFilter, 'sort' | 'direction'>): Ordering {
  const tail: Ordering = [
    { column: 'orders.window_start', order: 'asc' },
    { column: 'orders.id', order: 'asc' },
  ];
  if (filter.sort === 'attention') {
    return [
      { column: db.raw(`case when ${CLOSED} then 1 else 0 end`), order: 'asc' },
      { column: db.raw(`case when ${CLOSED} then '' else orders.contingency_deadline end`), order: 'asc' },
      { column: db.raw(`case when ${CLOSED} then orders.contingency_deadline else '' end`), order: 'desc' },
      ...tail,
    ];
  }
  const sortColumn = {
    deadline: 'orders.contingency_deadline',
    created: 'orders.created_at',
    status: 'orders.status',
    address: 'properties.street',
    window: 'orders.window_date',
  }[filter.sort];
  return [{ column: sortColumn, order: filter.direction }, ...tail];
}

/**
 * One page of orders and the count of all that match. The page's ids come first from indexes
 * alone (migrations/202612020010_indexes.ts, 202612020020_party_order_keys.ts), and only those
 * rows are read and joined: with 100 000 orders, joining every match before the limit cost
 * seconds. The property is joined early only to search or sort by address; every order has
 * exactly one (property_id is NOT NULL with a foreign key) and the inspector join is a left
 * join on a primary key, so the count needs neither.
 */
export async function listOrders(db: Knex, filter: OrderListFilter) {
  const narrowed = Boolean(filter.statuses?.length || filter.windowDate || filter.search || filter.inspectorId);
  const matching = (withProperty: boolean) => {
    const q = db('orders').where('orders.company_id', filter.companyId);
    if (withProperty) q.join('properties', 'properties.id', 'orders.property_id');
    if (filter.partyUserId) {
      q.whereIn('orders.id', partyRowsOf(db, filter).select('order_id'));
    }
    if (filter.inspectorId) q.where('orders.assigned_inspector_id', filter.inspectorId);
    if (filter.statuses?.length) q.whereIn('orders.status', filter.statuses);
    if (filter.windowDate) q.where('orders.window_date', filter.windowDate);
    if (filter.search) {
      const like = `%${filter.search.toLowerCase().replace(/[%_]/g, (c) => `\\${c}`)}%`;
      q.where((w) =>
        w
          .whereRaw("lower(properties.street) like ? escape '\\'", [like])
          .orWhereRaw("lower(properties.city) like ? escape '\\'", [like])
          .orWhereRaw("lower(properties.postal_code) like ? escape '\\'", [like]),
      );
    }
    return q;
  };
  // Each party row carries its order's company, so with no other filter the person's party rows alone give the count.
  const countRow =
    filter.partyUserId && !narrowed
      ? await db.from(personOrders(db, filter).select('order_id').as('mine')).count({ n: '*' }).first()
      : await matching(Boolean(filter.search)).count({ n: '*' }).first();
  const total = Number(countRow?.n ?? 0);
  const order = listOrdering(db, filter);

  // A person's list by deadline (the column sort) comes from their party rows.
  const ids =
    filter.partyUserId && !narrowed && filter.sort === 'deadline' && filter.direction === 'asc'
      ? await personPageByDeadline(db, filter, order)
      : (
          await matching(Boolean(filter.search) || filter.sort === 'address')
            .select('orders.id')
            .orderBy(order)
            .limit(filter.limit)
            .offset(filter.offset)
        ).map((r: { id: string }) => r.id);
  if (ids.length === 0) return { rows: [], total };

  const rows = await db('orders')
    .join('properties', 'properties.id', 'orders.property_id')
    .leftJoin('users as inspectors', 'inspectors.id', 'orders.assigned_inspector_id')
    .whereIn('orders.id', ids)
    .select(
      'orders.*',
      'properties.street',
      'properties.unit',
      'properties.city',
      'properties.region',
      'properties.postal_code',
      'properties.year_built',
      'properties.property_type',
      'properties.access_notes',
      'inspectors.name as inspector_name',
    )
    .orderBy(order);
  return { rows, total };
}

/**
 * A person's page, nearest deadline first, from their party rows (which carry each order's
 * deadline): the deadline the page ends on is read off the index, and only the orders due by
 * then are looked up and put in the list's full order (deadline, then visit, then id). Looking
 * up every one of an agent's thousands of orders to sort them cost more than the rest of the request.
 */
async function personPageByDeadline(db: Knex, filter: OrderListFilter, order: Ordering): Promise<string[]> {
  const pageEnd: { contingency_deadline: string } | undefined = await personOrders(db, filter)
    .select('contingency_deadline')
    .orderBy('contingency_deadline')
    .offset(filter.offset + filter.limit - 1)
    .first();
  const candidates = partyRowsOf(db, filter).select('order_id');
  // No order that far down the list: the page is the last, and every order is a candidate.
  if (pageEnd) candidates.where('contingency_deadline', '<=', pageEnd.contingency_deadline);
  const rows: { id: string }[] = await db('orders')
    .whereIn('orders.id', candidates)
    .select('orders.id')
    .orderBy(order)
    .limit(filter.limit)
    .offset(filter.offset);
  return rows.map((r) => r.id);
}

function partyRowsOf(db: Knex, filter: OrderListFilter) {
  return db('order_parties').where({ user_id: filter.partyUserId!, company_id: filter.companyId });
}

/**
 * The orders a person is on, each once (on both sides of one order they have two party rows):
 * grouped in the order of their index, so read straight off it with no sort.
 */
function personOrders(db: Knex, filter: OrderListFilter) {
  return partyRowsOf(db, filter).groupBy('contingency_deadline', 'order_id');
}

export async function openOrdersForAddress(db: Knex, companyId: string, key: string): Promise<{ id: string; status: OrderStatus }[]> {
  return db('orders')
    .join('properties', 'properties.id', 'orders.property_id')
    .where({ 'orders.company_id': companyId, 'properties.address_key': key })
    .whereNotIn('orders.status', ['published', 'cancelled'])
    .select('orders.id', 'orders.status');
}
