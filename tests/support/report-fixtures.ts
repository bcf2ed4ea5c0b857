import { expect } from 'vitest';
import type { OrderAccess, PartyRole, Side } from '@underfoot/core';
import { addParties, insertOrder, sampleDocument } from './inspection-fixtures.ts';
import { phoneJpeg } from './media-samples.ts';
import type { browserLikeAgent, TestContext } from './test-app.ts';

type Client = Awaited<ReturnType<typeof browserLikeAgent>>;

export interface ReportFixture {
  id: string;
  /** The order as `can` sees it, written out from what this fixture made (not read back from the server). */
  access: OrderAccess;
  stillId: string;
  renderedId: string;
}

/**
 * A paid pre-purchase order with these parties, the sample line recorded by the test inspector
 * (`field`) with a marked-up still on the serious offset, published by `office`, then released to
 * the given sides.
 */
export async function publishReport(
  ctx: TestContext,
  options: { field: Client; office: Client; parties: [string, PartyRole][]; releasedTo: Side[] },
): Promise<ReportFixture> {
  const db = ctx.services.db;
  const { field, office, parties, releasedTo } = options;
  const orderId = await insertOrder(ctx);
  await db('orders').where({ id: orderId }).update({ payment_state: 'paid' });
  await db('order_parties').where({ order_id: orderId }).delete();
  await addParties(ctx, orderId, parties);

  const upload = await field.agent
    .post(`/api/orders/${orderId}/media/stills`)
    .set('x-csrf-token', field.token)
    .field('origin', 'photo')
    .field('runId', 'run-1')
    .field('observationId', 'obs-3')
    .attach('image', await phoneJpeg(), 'offset.jpg');
  expect(upload.status).toBe(201);
  const stillId: string = upload.body.media.id;
  const markup = await field.agent
    .put(`/api/media/${stillId}/markup`)
    .set('x-csrf-token', field.token)
    .send({ baseVersion: 0, markup: { shapes: [{ id: 'm1', type: 'arrow', colour: 'sun', x1: 0.1, y1: 0.1, x2: 0.4, y2: 0.4 }] } });
  expect(markup.status).toBe(200);
  const doc = sampleDocument(orderId);
  const obs = doc.runs?.[0]?.observations?.find((o) => o.id === 'obs-3');
  if (obs) obs.stillIds = [stillId];
  const current = await field.agent.get(`/api/orders/${orderId}/inspection`).expect(200);
  const saved = await field.agent
    .put(`/api/orders/${orderId}/inspection`)
    .set('x-csrf-token', field.token)
    .send({ baseVersion: current.body.inspection.version, document: doc });
  expect(saved.status).toBe(200);
  expect((await office.post(`/api/orders/${orderId}/publish`, { note: '' })).status).toBe(201);
  await db('orders')
    .where({ id: orderId })
    .update({ released_to: JSON.stringify(releasedTo) });

  const read = await office.agent.get(`/api/reports/${orderId}`).expect(200);
  const media = read.body.revision.snapshot.media[0] as { id: string; renderedId: string };
  expect(media.id).toBe(stillId);
  return {
    id: orderId,
    access: {
      companyId: ctx.companyId,
      status: 'published',
      assignedInspectorId: ctx.users.inspector.id,
      orderingSide: 'buyer',
      parties: parties.map(([userId, partyRole]) => ({ userId, partyRole })),
      releasedTo,
      reportId: orderId,
      published: true,
    },
    stillId,
    renderedId: media.renderedId,
  };
}
