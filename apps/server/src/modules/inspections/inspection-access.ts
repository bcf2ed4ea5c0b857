import type { Knex } from 'knex';
import { can, type Actor, type OrderAccess } from '@underfoot/core';
import { HttpError, notFound } from '../../http/errors.ts';
import type { UserRecord } from '../auth/users.repo.ts';
import { findOrderRow, loadOrderAccess, type OrderRow } from '../orders/orders.repo.ts';

export const actorOfUser = (user: UserRecord): Actor => ({ kind: 'user', userId: user.id, role: user.role, companyId: user.companyId });

export interface InspectionAccess {
  order: OrderRow;
  access: OrderAccess;
  canEdit: boolean;
}

/**
 * The order behind an inspection or a file, for someone who may read it: the office and
 * the assigned inspector always, the parties once the report is released to their side.
 * Anyone else gets 404, so the answer never confirms that the order exists.
 */
export async function readableOrder(db: Knex, user: UserRecord, orderId: string, what = 'inspection'): Promise<InspectionAccess> {
  const order = await findOrderRow(db, orderId);
  if (!order) throw notFound(what);
  const access = await loadOrderAccess(db, order);
  const actor = actorOfUser(user);
  const canEdit = can(actor, 'inspection.edit', { order: access }) && order.status !== 'cancelled';
  if (!canEdit && !can(actor, 'report.read', { order: access })) throw notFound(what);
  return { order, access, canEdit };
}

/** As `readableOrder`, and the person may still change the inspection (PRODUCT.md §10: until published). */
export async function editableOrder(db: Knex, user: UserRecord, orderId: string, what = 'inspection'): Promise<InspectionAccess> {
  const found = await readableOrder(db, user, orderId, what);
  if (found.canEdit) return found;
  if (found.access.published) {
    throw new HttpError(
      403,
      'inspection_published',
      'This report is published, so its inspection can no longer be changed. Changes go into a new revision from the office.',
    );
  }
  if (found.order.status === 'cancelled')
    throw new HttpError(409, 'order_cancelled', 'This order was cancelled; its inspection is closed.');
  throw new HttpError(403, 'forbidden', 'Your account can read this inspection but not change it.');
}
