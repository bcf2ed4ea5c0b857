import type { Knex } from 'knex';
import type { Inspection } from '@underfoot/core';
import { isUniqueViolation } from '../../db.ts';

export interface StoredInspection {
  orderId: string;
  document: Inspection;
  version: number;
  createdAt: string;
  updatedAt: string;
  updatedBy: { id: string; name: string } | null;
}

interface InspectionRow {
  order_id: string;
  document: string;
  version: number;
  created_at: string;
  updated_at: string;
  updated_by: string | null;
  updated_by_name: string | null;
}

export async function findInspection(db: Knex, orderId: string): Promise<StoredInspection | undefined> {
  const row: InspectionRow | undefined = await db('inspections')
    .leftJoin('users', 'users.id', 'inspections.updated_by')
    .where('inspections.order_id', orderId)
    .first('inspections.*', 'users.name as updated_by_name');
  if (!row) return undefined;
  return {
    orderId: row.order_id,
    document: JSON.parse(row.document) as Inspection,
    version: Number(row.version),
    createdAt: row.created_at,
    updatedAt: row.updated_at,
    updatedBy: row.updated_by ? { id: row.updated_by, name: row.updated_by_name ?? '' } : null,
  };
}

/** The first save of an order's inspection; false when someone else's first save got there before. */
export async function insertFirstVersion(
  db: Knex,
  input: { orderId: string; document: Inspection; userId: string; now: string },
): Promise<boolean> {
  try {
    await db('inspections').insert({
      order_id: input.orderId,
      document: JSON.stringify(input.document),
      version: 1,
      created_at: input.now,
      updated_at: input.now,
      updated_by: input.userId,
    });
    return true;
  } catch (err) {
    if (isUniqueViolation(err)) return false;
    throw err;
  }
}

/** Compare-and-set: write only if the stored version is still the one the save started from. */
export async function updateIfVersion(
  db: Knex,
  input: { orderId: string; baseVersion: number; document: Inspection; userId: string; now: string },
): Promise<boolean> {
  const updated = await db('inspections')
    .where({ order_id: input.orderId, version: input.baseVersion })
    .update({
      document: JSON.stringify(input.document),
      version: input.baseVersion + 1,
      updated_at: input.now,
      updated_by: input.userId,
    });
  return Number(updated) === 1;
}
