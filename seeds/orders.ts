import type { Knex } from 'knex';
import { orderingSideOf, type OrderKind, type OrderStatus, type PartyRole, type Payer } from '@underfoot/core';
import { demoAccounts, demoCompany } from './demo.ts';

/**
 * The demo's fee list and orders: a dozen invented houses in the made-up town of
 * Alder Falls, in every status the office works through. Dates are relative to
 * the day the demo is seeded, so deadlines are always ahead.
 */

// Prices are invented demo values inside the camera-inspection band of consumer cost guides ($150–400, CHECKS.md).
export const demoFeeItems = [
  {
    id: 'f0000000-0000-4000-8000-000000000001',
    kind: 'base',
    name: 'Sewer line camera inspection',
    description: 'One access point, both directions, report with stills and cost ranges.',
    priceCents: 32500,
    sort: 0,
  },
  {
    id: 'f0000000-0000-4000-8000-000000000002',
    kind: 'add_on',
    name: 'Second access point',
    description: 'A second cleanout, a pulled toilet or a roof vent.',
    priceCents: 9500,
    sort: 1,
  },
  {
    id: 'f0000000-0000-4000-8000-000000000003',
    kind: 'add_on',
    name: 'Cleaning before filming',
    description: 'Hydro-jetting so the camera can see the pipe wall.',
    priceCents: 27500,
    sort: 2,
  },
  {
    id: 'f0000000-0000-4000-8000-000000000004',
    kind: 'add_on',
    name: 'Locating and depth readings',
    description: 'Marks the line on the ground and records its depth.',
    priceCents: 8500,
    sort: 3,
  },
] as const;

const account = (email: string) => {
  const found = demoAccounts.find((a) => a.email.startsWith(email));
  if (!found) throw new Error(`no demo account ${email}`);
  return found.id;
};

interface DemoOrder {
  id: string;
  street: string;
  postalCode: string;
  yearBuilt: number;
  propertyType: string;
  occupancy: 'occupied' | 'vacant';
  accessNotes: string;
  kind: OrderKind;
  status: OrderStatus;
  /** Days from today. */
  deadlineIn: number;
  windowIn?: number;
  window?: [string, string];
  inspector?: string;
  payer: Payer;
  paid: boolean;
  addOns: number[];
  parties: [string, PartyRole][];
  cancelReason?: string;
}

const orders: DemoOrder[] = [
  {
    id: 'a0000000-0000-4000-8000-000000000001',
    street: '418 Larkspur Lane',
    postalCode: '97411',
    yearBuilt: 1958,
    propertyType: 'single_family',
    occupancy: 'occupied',
    accessNotes: 'Two-way cleanout by the driveway, left of the garage door.',
    kind: 'pre_purchase',
    status: 'requested',
    deadlineIn: 9,
    payer: 'agent_now',
    paid: true,
    addOns: [],
    parties: [
      ['theo', 'buyers_agent'],
      ['riley', 'buyer'],
    ],
  },
  {
    id: 'a0000000-0000-4000-8000-000000000002',
    street: '77 Quarry Road',
    postalCode: '97412',
    yearBuilt: 1931,
    propertyType: 'single_family',
    occupancy: 'vacant',
    accessNotes: 'No cleanout known; lockbox on the back door.',
    kind: 'pre_purchase',
    status: 'requested',
    deadlineIn: 4,
    payer: 'client_before_release',
    paid: false,
    addOns: [1],
    parties: [
      ['sam', 'buyers_agent'],
      ['noor', 'buyer'],
    ],
  },
  {
    id: 'a0000000-0000-4000-8000-000000000003',
    street: '1290 Heron Bend Drive',
    postalCode: '97411',
    yearBuilt: 1974,
    propertyType: 'townhouse',
    occupancy: 'occupied',
    accessNotes: 'Cleanout in the front planter bed.',
    kind: 'pre_listing',
    status: 'requested',
    deadlineIn: 16,
    payer: 'agent_now',
    paid: false,
    addOns: [],
    parties: [
      ['june', 'listing_agent'],
      ['walt', 'seller'],
    ],
  },
  {
    id: 'a0000000-0000-4000-8000-000000000004',
    street: '9 Millwright Court',
    postalCode: '97413',
    yearBuilt: 1949,
    propertyType: 'single_family',
    occupancy: 'occupied',
    accessNotes: 'Basement cleanout under the stairs; dog in the yard.',
    kind: 'pre_purchase',
    status: 'scheduled',
    deadlineIn: 6,
    windowIn: 1,
    window: ['08:00', '10:00'],
    inspector: 'marco',
    payer: 'agent_now',
    paid: true,
    addOns: [3],
    parties: [
      ['theo', 'buyers_agent'],
      ['noor', 'buyer'],
      ['june', 'listing_agent'],
      ['bea', 'seller'],
    ],
  },
  {
    id: 'a0000000-0000-4000-8000-000000000005',
    street: '301 Cinder Street',
    postalCode: '97412',
    yearBuilt: 1965,
    propertyType: 'multi_family',
    occupancy: 'occupied',
    accessNotes: 'Roof vent access only; ladder needed.',
    kind: 'pre_purchase',
    status: 'scheduled',
    deadlineIn: 8,
    windowIn: 1,
    window: ['11:00', '13:00'],
    inspector: 'marco',
    payer: 'client_before_release',
    paid: false,
    addOns: [],
    parties: [
      ['sam', 'buyers_agent'],
      ['riley', 'buyer'],
    ],
  },
  {
    id: 'a0000000-0000-4000-8000-000000000006',
    street: '56 Orchard Terrace',
    postalCode: '97411',
    yearBuilt: 1988,
    propertyType: 'single_family',
    occupancy: 'vacant',
    accessNotes: 'Cleanout at the side yard gate.',
    kind: 'pre_listing',
    status: 'scheduled',
    deadlineIn: 12,
    windowIn: 2,
    window: ['09:00', '11:00'],
    inspector: 'priya',
    payer: 'agent_now',
    paid: true,
    addOns: [2],
    parties: [
      ['june', 'listing_agent'],
      ['bea', 'seller'],
    ],
  },
  {
    id: 'a0000000-0000-4000-8000-000000000007',
    street: '2204 Beacon Hill Road',
    postalCode: '97413',
    yearBuilt: 1926,
    propertyType: 'single_family',
    occupancy: 'occupied',
    accessNotes: 'Clay lateral; cleanout near the sidewalk.',
    kind: 'pre_purchase',
    status: 'recorded',
    deadlineIn: 3,
    windowIn: 0,
    window: ['08:00', '10:00'],
    inspector: 'priya',
    payer: 'agent_now',
    paid: true,
    addOns: [],
    parties: [
      ['theo', 'buyers_agent'],
      ['riley', 'buyer'],
    ],
  },
  {
    id: 'a0000000-0000-4000-8000-000000000008',
    street: '15 Fernwood Lane',
    postalCode: '97411',
    yearBuilt: 1962,
    propertyType: 'single_family',
    occupancy: 'occupied',
    accessNotes: 'Toilet pulled for access.',
    kind: 'pre_purchase',
    status: 'in_review',
    deadlineIn: 5,
    windowIn: -1,
    window: ['13:00', '15:00'],
    inspector: 'marco',
    payer: 'client_before_release',
    paid: false,
    addOns: [1],
    parties: [
      ['sam', 'buyers_agent'],
      ['noor', 'buyer'],
    ],
  },
  {
    id: 'a0000000-0000-4000-8000-000000000009',
    street: '640 Tannery Way',
    postalCode: '97412',
    yearBuilt: 1953,
    propertyType: 'condominium',
    occupancy: 'vacant',
    accessNotes: 'HOA cleanout; key at the office.',
    kind: 'pre_purchase',
    status: 'cancelled',
    deadlineIn: 10,
    payer: 'agent_now',
    paid: false,
    addOns: [],
    parties: [
      ['theo', 'buyers_agent'],
      ['noor', 'buyer'],
    ],
    cancelReason: 'The buyers withdrew their offer.',
  },
];

export async function seedDemoOrders(db: Knex): Promise<void> {
  if (await db('fee_items').where({ company_id: demoCompany.id }).first()) return;
  const now = new Date();
  const nowIso = now.toISOString();
  const dayFromToday = (days: number) =>
    new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth(), now.getUTCDate() + days)).toISOString().slice(0, 10);

  await db.transaction(async (trx) => {
    await trx('fee_items').insert(
      demoFeeItems.map((f) => ({
        id: f.id,
        company_id: demoCompany.id,
        kind: f.kind,
        name: f.name,
        description: f.description,
        price_cents: f.priceCents,
        active: true,
        sort_order: f.sort,
        created_at: nowIso,
        updated_at: nowIso,
      })),
    );
    for (const o of orders) {
      const propertyId = o.id.replace(/^a/, 'b');
      const lines = [demoFeeItems[0], ...o.addOns.map((i) => demoFeeItems[i]!)];
      const total = lines.reduce((sum, f) => sum + f.priceCents, 0);
      await trx('properties').insert({
        id: propertyId,
        company_id: demoCompany.id,
        street: o.street,
        unit: '',
        city: 'Alder Falls',
        region: 'OR',
        postal_code: o.postalCode,
        address_key: [o.street, '', o.postalCode].map((s) => s.toLowerCase()).join('|'),
        year_built: o.yearBuilt,
        property_type: o.propertyType,
        occupancy: o.occupancy,
        access_notes: o.accessNotes,
        created_at: nowIso,
      });
      const orderingAgent = o.parties[0]![0];
      const deadline = dayFromToday(o.deadlineIn);
      await trx('orders').insert({
        id: o.id,
        company_id: demoCompany.id,
        property_id: propertyId,
        kind: o.kind,
        ordering_side: orderingSideOf(o.kind),
        status: o.status,
        contingency_deadline: deadline,
        preferred_dates: JSON.stringify([dayFromToday(Math.min(2, o.deadlineIn - 1))]),
        payer: o.payer,
        fee_total_cents: total,
        payment_state: o.paid ? 'paid' : 'unpaid',
        assigned_inspector_id: o.inspector ? account(o.inspector) : null,
        window_date: o.windowIn !== undefined ? dayFromToday(o.windowIn) : null,
        window_start: o.window?.[0] ?? null,
        window_end: o.window?.[1] ?? null,
        note: '',
        cancel_reason: o.cancelReason ?? null,
        created_by: account(orderingAgent),
        created_at: nowIso,
        updated_at: nowIso,
      });
      await trx('order_fee_lines').insert(
        lines.map((f) => ({ order_id: o.id, fee_item_id: f.id, name: f.name, price_cents: f.priceCents })),
      );
      await trx('order_parties').insert(
        o.parties.map(([who, role]) => ({
          order_id: o.id,
          company_id: demoCompany.id,
          contingency_deadline: deadline,
          user_id: account(who),
          party_role: role,
          created_at: nowIso,
        })),
      );
      const events: { type: string; detail?: object }[] = [{ type: 'created', detail: { feeTotalCents: total } }];
      if (o.paid) events.push({ type: 'paid', detail: { amountCents: total } });
      if (o.window)
        events.push({
          type: 'scheduled',
          detail: {
            inspectorName: demoAccounts.find((a) => a.id === account(o.inspector!))!.name,
            date: dayFromToday(o.windowIn!),
            startTime: o.window[0],
            endTime: o.window[1],
          },
        });
      if (o.status === 'cancelled') events.push({ type: 'cancelled', detail: { reason: o.cancelReason } });
      await trx('order_events').insert(
        events.map((e) => ({
          order_id: o.id,
          actor_user_id: account(orderingAgent),
          type: e.type,
          detail: e.detail ? JSON.stringify(e.detail) : null,
          created_at: nowIso,
        })),
      );
      if (o.paid) {
        await trx('payments').insert({
          id: o.id.replace(/^a/, 'c'),
          order_id: o.id,
          checkout_session_id: `cs_demo_${o.id.slice(-4)}`,
          checkout_url: 'about:blank',
          payment_intent_id: `pi_demo_${o.id.slice(-4)}`,
          amount_cents: total,
          currency: 'usd',
          status: 'paid',
          created_by: account(orderingAgent),
          created_at: nowIso,
          updated_at: nowIso,
        });
      }
    }
  });
}
