import type { Knex } from 'knex';
import { formatAddress, inspectionSchema, propertyTypes, type Inspection, type OrderStatus, type PropertyType } from '@underfoot/core';
import { z } from 'zod';
import { badRequest, fieldErrorsFrom, HttpError, type FieldError } from '../../http/errors.ts';
import { nowIso } from '../../lib/clock.ts';
import type { UserRecord } from '../auth/users.repo.ts';
import { listOrderMedia, mediaKindsOnOrder, type MediaView } from '../media/media.repo.ts';
import type { OrderRow } from '../orders/orders.repo.ts';
import { editableOrder, readableOrder } from './inspection-access.ts';
import { mediaReferenceProblems, rawDocumentProblems, referencedMediaIds } from './inspection-rules.ts';
import { findInspection, insertFirstVersion, updateIfVersion, type StoredInspection } from './inspections.repo.ts';

export interface InspectionView {
  orderId: string;
  document: Inspection;
  /** 0 until the first save. */
  version: number;
  updatedAt: string | null;
  updatedBy: { id: string; name: string } | null;
}

export interface InspectionPage {
  inspection: InspectionView;
  order: {
    id: string;
    status: OrderStatus;
    address: string;
    yearBuilt: number | null;
    propertyType: string;
    accessNotes: string;
    inspectorName: string | null;
    windowDate: string | null;
  };
  media: MediaView[];
  allowed: { edit: boolean };
}

/** A stale save: the answer carries the version that is stored now, so the editor can offer reload or merge. */
export class VersionConflict extends HttpError {
  constructor(public readonly current: InspectionView) {
    super(
      409,
      'version_conflict',
      current.updatedBy
        ? `${current.updatedBy.name} saved a newer version of this inspection. Reload it, or merge your changes into it.`
        : 'A newer version of this inspection was saved. Reload it, or merge your changes into it.',
    );
  }
}

export const saveInspectionSchema = z.object({
  baseVersion: z.int({ error: 'Say which version this save started from.' }).min(0),
  document: z.unknown(),
});

const viewOf = (stored: StoredInspection): InspectionView => ({
  orderId: stored.orderId,
  document: stored.document,
  version: stored.version,
  updatedAt: stored.updatedAt,
  updatedBy: stored.updatedBy,
});

/** The document an inspector starts from: the property as ordered, nothing recorded yet. */
function emptyDocument(orderId: string, property: { year_built: number | null; property_type: string }): Inspection {
  const type = (propertyTypes as readonly string[]).includes(property.property_type) ? (property.property_type as PropertyType) : 'other';
  return inspectionSchema.parse({
    id: orderId,
    property: { yearBuilt: property.year_built ?? null, type, notes: '' },
  });
}

export function createInspectionsService(deps: { db: Knex }) {
  const { db } = deps;

  async function currentView(order: OrderRow): Promise<InspectionView> {
    const stored = await findInspection(db, order.id);
    if (stored) return viewOf(stored);
    const property = await db('properties').where({ id: order.property_id }).first('year_built', 'property_type');
    return { orderId: order.id, document: emptyDocument(order.id, property), version: 0, updatedAt: null, updatedBy: null };
  }

  async function getInspection(user: UserRecord, orderId: string): Promise<InspectionPage> {
    const { order, canEdit } = await readableOrder(db, user, orderId);
    const property = await db('properties').where({ id: order.property_id }).first();
    const inspector = order.assigned_inspector_id ? await db('users').where({ id: order.assigned_inspector_id }).first('name') : undefined;
    return {
      inspection: await currentView(order),
      order: {
        id: order.id,
        status: order.status,
        address: formatAddress({
          street: property.street,
          unit: property.unit,
          city: property.city,
          region: property.region,
          postalCode: property.postal_code,
        }),
        yearBuilt: property.year_built ?? null,
        propertyType: property.property_type,
        accessNotes: property.access_notes ?? '',
        inspectorName: (inspector?.name as string | undefined) ?? null,
        windowDate: order.window_date,
      },
      media: await listOrderMedia(db, order.id),
      allowed: { edit: canEdit },
    };
  }

  /**
   * Save the whole document if it still starts from the stored version. Bad input is
   * refused field by field; a stale version gets a VersionConflict carrying what is stored.
   */
  async function saveInspection(user: UserRecord, orderId: string, input: { baseVersion: number; document: unknown }) {
    const { order } = await editableOrder(db, user, orderId);
    const prefix = 'document.';
    const rawProblems = rawDocumentProblems(input.document, prefix);
    const parsed = inspectionSchema.safeParse(input.document ?? {});
    const problems: FieldError[] = [...rawProblems];
    if (!parsed.success) {
      problems.push(...fieldErrorsFrom(parsed.error).map((e) => ({ path: `${prefix}${e.path}`, message: e.message })));
    } else {
      if (parsed.data.id !== order.id) problems.push({ path: `${prefix}id`, message: 'This document belongs to another inspection.' });
      const kinds = await mediaKindsOnOrder(db, order.id, referencedMediaIds(parsed.data));
      problems.push(...mediaReferenceProblems(parsed.data, kinds, prefix));
    }
    if (problems.length > 0 || !parsed.success) throw badRequest('Some fields need attention.', problems);

    const now = nowIso();
    const document = parsed.data;
    const saved =
      input.baseVersion === 0
        ? await insertFirstVersion(db, { orderId, document, userId: user.id, now })
        : await updateIfVersion(db, { orderId, baseVersion: input.baseVersion, document, userId: user.id, now });
    if (!saved) throw new VersionConflict(await currentView(order));
    return { version: input.baseVersion + 1, updatedAt: now };
  }

  return { getInspection, saveInspection };
}

export type InspectionsService = ReturnType<typeof createInspectionsService>;
