import type { Knex } from 'knex';
import { demoPriceBook, priceBookSchema, type PriceBook } from '@underfoot/core';
import { nowIso } from '../../lib/clock.ts';

export interface StoredPriceBook {
  priceBook: PriceBook;
  /** True while the company has not saved its own: core's documented defaults apply. */
  isDefault: boolean;
  updatedAt: string | null;
  updatedBy: { id: string; name: string } | null;
}

/**
 * A stored book that no longer parses (core added an item since it was saved)
 * keeps the company's prices and takes the defaults only for what is missing.
 */
function parseStored(json: string): PriceBook | null {
  let stored: Partial<PriceBook>;
  try {
    stored = JSON.parse(json) as Partial<PriceBook>;
  } catch {
    return null;
  }
  const direct = priceBookSchema.safeParse(stored);
  if (direct.success) return direct.data;
  const merged = priceBookSchema.safeParse({
    ...demoPriceBook,
    ...stored,
    items: { ...demoPriceBook.items, ...stored.items },
    depth: { ...demoPriceBook.depth, ...stored.depth },
  });
  return merged.success ? merged.data : null;
}

/**
 * The price book a company's cost ranges use. The review and report features
 * call this when they compute a report that is not yet published, so a saved
 * change applies to those reports and never to published ones.
 */
export async function loadPriceBook(db: Knex, companyId: string): Promise<StoredPriceBook> {
  const row = await db('price_books')
    .leftJoin('users', 'users.id', 'price_books.updated_by')
    .where('price_books.company_id', companyId)
    .first('price_books.book', 'price_books.updated_at', 'price_books.updated_by', 'users.name as updated_by_name');
  const priceBook = row ? parseStored(row.book) : null;
  if (!row || !priceBook) return { priceBook: demoPriceBook, isDefault: true, updatedAt: null, updatedBy: null };
  return {
    priceBook,
    isDefault: false,
    updatedAt: row.updated_at,
    updatedBy: row.updated_by ? { id: row.updated_by, name: row.updated_by_name ?? '' } : null,
  };
}

export async function savePriceBook(db: Knex, companyId: string, book: PriceBook, userId: string): Promise<void> {
  await db('price_books')
    .insert({ company_id: companyId, book: JSON.stringify(book), updated_by: userId, updated_at: nowIso() })
    .onConflict('company_id')
    .merge(['book', 'updated_by', 'updated_at']);
}
