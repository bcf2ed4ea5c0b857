import type { InspectionInput, OrderStatus, PartyRole } from '@underfoot/core';
import { feet, feetAndInches } from '@underfoot/core';
import type { TestContext } from './test-app.ts';

/** An order straight into the tables (the ordering flow has its own tests), assigned as asked. */
export async function insertOrder(
  ctx: TestContext,
  options: { status?: OrderStatus; inspectorId?: string | null; companyId?: string; partyUserId?: string } = {},
): Promise<string> {
  const { db } = ctx.services;
  const companyId = options.companyId ?? ctx.companyId;
  const now = new Date().toISOString();
  const propertyId = crypto.randomUUID();
  const orderId = crypto.randomUUID();
  await db('properties').insert({
    id: propertyId,
    company_id: companyId,
    street: '12 Sluice Row',
    unit: '',
    city: 'Alder Falls',
    region: 'OR',
    postal_code: '97411',
    address_key: `12 sluice row||97411-${orderId}`,
    year_built: 1956,
    property_type: 'single_family',
    occupancy: 'occupied',
    access_notes: 'Cleanout by the front steps.',
    created_at: now,
  });
  await db('orders').insert({
    id: orderId,
    company_id: companyId,
    property_id: propertyId,
    kind: 'pre_purchase',
    ordering_side: 'buyer',
    status: options.status ?? 'scheduled',
    contingency_deadline: '2099-01-31',
    payer: 'agent_now',
    fee_total_cents: 32500,
    assigned_inspector_id: options.inspectorId === undefined ? ctx.users.inspector.id : options.inspectorId,
    window_date: '2099-01-20',
    window_start: '08:00',
    window_end: '10:00',
    created_at: now,
    updated_at: now,
  });
  await addParties(ctx, orderId, [[options.partyUserId ?? ctx.users.agent.id, 'buyers_agent']]);
  return orderId;
}

/** People on an order, each party row carrying the order's company and deadline as the app writes them. */
export async function addParties(ctx: TestContext, orderId: string, parties: [userId: string, role: PartyRole][]): Promise<void> {
  const { db } = ctx.services;
  const order = await db('orders').where({ id: orderId }).first('company_id', 'contingency_deadline');
  const now = new Date().toISOString();
  await db('order_parties').insert(
    parties.map(([user_id, party_role]) => ({
      order_id: orderId,
      company_id: order.company_id,
      contingency_deadline: order.contingency_deadline,
      user_id,
      party_role,
      created_at: now,
    })),
  );
}

/** A small recorded line: one cleanout, one run toward the main with two sections and three findings. */
export function sampleDocument(orderId: string): InspectionInput {
  return {
    id: orderId,
    property: { yearBuilt: 1956, type: 'single_family', notes: '' },
    accessPoints: [{ id: 'ap-1', kind: 'cleanout_two_way', locationNote: 'By the front steps' }],
    runs: [
      {
        id: 'run-1',
        accessPointId: 'ap-1',
        direction: 'toward_main',
        distanceReached: feet(62),
        endReason: 'reached_main',
        sections: [
          { id: 'sec-1', from: 0, to: feet(30), material: 'cast_iron', diameterIn: 4 },
          { id: 'sec-2', from: feet(30), to: feet(62), material: 'vitrified_clay', diameterIn: 4 },
        ],
        observations: [
          { id: 'obs-1', kind: 'bend', at: feet(12), angle: 'deg_45' },
          { id: 'obs-2', kind: 'roots', at: feetAndInches(24, 6), severity: 3, clock: 12, note: 'Fine roots at the joint' },
          { id: 'obs-3', kind: 'joint_offset', at: feet(41), severity: 4 },
        ],
      },
    ],
    checkedNotFound: ['standing_water'],
  };
}
