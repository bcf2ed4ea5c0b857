import type { Knex } from 'knex';
import type { FeeItem } from '@underfoot/core';

interface FeeItemRow {
  id: string;
  kind: 'base' | 'add_on';
  name: string;
  description: string;
  price_cents: number;
  active: number | boolean;
}

const toFeeItem = (row: FeeItemRow): FeeItem => ({
  id: row.id,
  kind: row.kind,
  name: row.name,
  description: row.description,
  priceCents: row.price_cents,
  active: Boolean(row.active),
});

/** The company's fee list as an order form shows it: active items, base fee first. */
export async function listActiveFeeItems(db: Knex, companyId: string): Promise<FeeItem[]> {
  const rows: FeeItemRow[] = await db('fee_items')
    .where({ company_id: companyId, active: true })
    .orderBy([{ column: 'kind', order: 'desc' }, 'sort_order', 'name']);
  return rows.map(toFeeItem);
}
