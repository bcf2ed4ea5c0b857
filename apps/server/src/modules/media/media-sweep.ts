import type { Knex } from 'knex';
import type { MediaStorage } from '../../storage/media-storage.ts';

/**
 * Remove stored files under `orders/` that no media row names and that nothing has written
 * for an hour. A crash between storing a file and inserting its row (upload, markup), or
 * between deleting a row and its file, leaves one; a file some row names always stays.
 * The hour spares a file another server process stored a moment ago and is about to name.
 */
export async function sweepOrphanMedia(db: Knex, storage: MediaStorage, olderThanMs = 60 * 60_000): Promise<string[]> {
  const cutoff = Date.now() - olderThanMs;
  const removed: string[] = [];
  let batch: string[] = [];
  const settle = async () => {
    if (batch.length === 0) return;
    const rows: { storage_key: string; thumbnail_key: string | null }[] = await db('media')
      .whereIn('storage_key', batch)
      .orWhereIn('thumbnail_key', batch)
      .select('storage_key', 'thumbnail_key');
    const named = new Set(rows.flatMap((r) => [r.storage_key, r.thumbnail_key]));
    for (const key of batch) {
      if (named.has(key)) continue;
      await storage.delete(key);
      removed.push(key);
    }
    batch = [];
  };
  for await (const { key, modifiedAt } of storage.list('orders/')) {
    if (modifiedAt.getTime() >= cutoff) continue;
    batch.push(key);
    // Two lists of 400 stay far below the 32,766 bound values SQLite allows (sqlite.org/limits.html, SQLITE_MAX_VARIABLE_NUMBER).
    if (batch.length >= 400) await settle();
  }
  await settle();
  return removed;
}
