import type { Knex } from 'knex';
import type { FeeItem } from '@underfoot/core';
import { isSqlite } from '../../db.ts';
import { nowIso } from '../../lib/clock.ts';
import { newId } from '../../lib/ids.ts';

/** A fee as the office's fee list shows it, with how many orders carry a copy of it. */
export interface FeeListItem extends FeeItem {
  sortOrder: number;
  /** Orders that copied this fee when they were placed; they keep that copy whatever changes here. */
  orderCount: number;
  updatedAt: string;
}

interface FeeItemRow {
  id: string;
  kind: 'base' | 'add_on';
  name: string;
  description: string;
  price_cents: number;
  active: number | boolean;
  sort_order: number;
  updated_at: string;
  order_count?: number | string;
}

const toItem = (row: FeeItemRow): FeeListItem => ({
  id: row.id,
  kind: row.kind,
  name: row.name,
  description: row.description,
  priceCents: row.price_cents,
  active: Boolean(row.active),
  sortOrder: row.sort_order,
  orderCount: Number(row.order_count ?? 0),
  updatedAt: row.updated_at,
});

/** Every fee of the company, retired ones too: base fee first, then the office's order. */
export async function listFeeItems(db: Knex, companyId: string): Promise<FeeListItem[]> {
  const counts = db('order_fee_lines').select('fee_item_id').count({ order_count: '*' }).groupBy('fee_item_id').as('counts');
  const rows: FeeItemRow[] = await db('fee_items')
    .leftJoin(counts, 'counts.fee_item_id', 'fee_items.id')
    .where('fee_items.company_id', companyId)
    .select('fee_items.*', 'counts.order_count')
    .orderBy([{ column: 'fee_items.kind', order: 'desc' }, 'fee_items.sort_order', 'fee_items.name']);
  return rows.map(toItem);
}

export async function findFeeItem(db: Knex, companyId: string, id: string): Promise<FeeListItem | undefined> {
  // A fee list is a handful of rows; reading it whole keeps the order count in one place.
  return (await listFeeItems(db, companyId)).find((item) => item.id === id);
}

/**
 * Inside a transaction, queue fee list changes of one company behind each other: on PostgreSQL two
 * saves would otherwise both find no other inspection fee and both make one. SQLite runs one write
 * transaction at a time anyway.
 */
export async function lockFeeList(trx: Knex, companyId: string): Promise<void> {
  if (!isSqlite(trx)) await trx('companies').where({ id: companyId }).forUpdate().first('id');
}

export async function activeBaseFee(db: Knex, companyId: string, exceptId?: string): Promise<FeeListItem | undefined> {
  const query = db('fee_items').where({ company_id: companyId, kind: 'base', active: true });
  if (exceptId) query.whereNot('id', exceptId);
  const row: FeeItemRow | undefined = await query.first();
  return row ? toItem(row) : undefined;
}

type FeeFields = Omit<FeeItem, 'id'>;

export async function insertFeeItem(db: Knex, companyId: string, item: FeeFields): Promise<string> {
  const id = newId();
  const now = nowIso();
  const last = await db('fee_items').where({ company_id: companyId }).max({ max: 'sort_order' }).first();
  await db('fee_items').insert({
    id,
    company_id: companyId,
    kind: item.kind,
    name: item.name,
    description: item.description,
    price_cents: item.priceCents,
    active: item.active,
    sort_order: Number(last?.max ?? -1) + 1,
    created_at: now,
    updated_at: now,
  });
  return id;
}

export async function updateFeeItem(db: Knex, companyId: string, id: string, item: FeeFields): Promise<void> {
  await db('fee_items').where({ id, company_id: companyId }).update({
    kind: item.kind,
    name: item.name,
    description: item.description,
    price_cents: item.priceCents,
    active: item.active,
    updated_at: nowIso(),
  });
}

export async function setFeeOrder(db: Knex, companyId: string, ids: readonly string[]): Promise<void> {
  for (const [index, id] of ids.entries()) {
    await db('fee_items').where({ id, company_id: companyId }).update({ sort_order: index });
  }
}
