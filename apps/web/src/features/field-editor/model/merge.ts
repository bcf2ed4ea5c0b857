/**
 * Three-way merge of two edits of one inspection document: the version both started
 * from (`base`), this device's edit (`mine`) and the version saved elsewhere (`theirs`).
 *
 * - A value changed on one side only takes that side's change.
 * - Lists of records (access points, runs, sections, findings, depth readings) merge
 *   record by record, keyed by id (or by footage where records have no id): records
 *   added on either side are kept, records removed on one side are removed unless the
 *   other side changed them (then they are kept: nothing entered is lost).
 * - Lists of plain values (conditions checked and not found, still ids) merge as sets.
 * - Where both sides changed the same value differently, this device's value wins: the
 *   person merging is the one looking at it, and can change it back.
 */

type Json = null | boolean | number | string | Json[] | { [key: string]: Json };

const isObject = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

export function deepEqual(a: unknown, b: unknown): boolean {
  if (a === b) return true;
  if (Array.isArray(a) && Array.isArray(b)) return a.length === b.length && a.every((item, i) => deepEqual(item, b[i]));
  if (isObject(a) && isObject(b)) {
    const keys = new Set([...Object.keys(a), ...Object.keys(b)]);
    for (const key of keys) if (!deepEqual(a[key], b[key])) return false;
    return true;
  }
  return false;
}

/** How records in a list are told apart. */
function keyOf(item: unknown): string | null {
  if (!isObject(item)) return null;
  if (typeof item.id === 'string') return `id:${item.id}`;
  if (typeof item.at === 'number') return `at:${item.at}`;
  if (typeof item.from === 'number') return `from:${item.from}`;
  return null;
}

function mergeRecords(base: unknown[], mine: unknown[], theirs: unknown[]): unknown[] {
  const index = (list: unknown[]) => new Map(list.map((item) => [keyOf(item)!, item]));
  const baseBy = index(base);
  const mineBy = index(mine);
  const theirsBy = index(theirs);
  const result: unknown[] = [];
  const placed = new Set<string>();
  // Their order first (what is stored), then records only this device added, in its order.
  for (const item of theirs) {
    const key = keyOf(item)!;
    const inBase = baseBy.has(key);
    const inMine = mineBy.has(key);
    if (inBase && !inMine) {
      // Removed here; keep it only if they changed it since.
      if (deepEqual(item, baseBy.get(key))) continue;
      result.push(item);
    } else if (inMine) {
      result.push(inBase ? mergeValues(baseBy.get(key), mineBy.get(key), item) : mergeValues(undefined, mineBy.get(key), item));
    } else {
      result.push(item);
    }
    placed.add(key);
  }
  for (const item of mine) {
    const key = keyOf(item)!;
    if (placed.has(key)) continue;
    if (baseBy.has(key) && !theirsBy.has(key)) {
      // Removed elsewhere; keep it only if this device changed it.
      if (deepEqual(item, baseBy.get(key))) continue;
    }
    result.push(item);
    placed.add(key);
  }
  return result;
}

function mergeSets(base: unknown[], mine: unknown[], theirs: unknown[]): unknown[] {
  const has = (list: unknown[], v: unknown) => list.some((x) => deepEqual(x, v));
  const result = theirs.filter((v) => has(mine, v) || !has(base, v));
  for (const v of mine) if (!has(base, v) && !has(result, v)) result.push(v);
  return result;
}

export function mergeValues(base: unknown, mine: unknown, theirs: unknown): unknown {
  if (deepEqual(mine, theirs)) return theirs;
  if (deepEqual(mine, base)) return theirs;
  if (deepEqual(theirs, base)) return mine;
  if (Array.isArray(mine) && Array.isArray(theirs)) {
    const baseList = Array.isArray(base) ? base : [];
    const all = [...baseList, ...mine, ...theirs];
    if (all.every((item) => keyOf(item) !== null)) return mergeRecords(baseList, mine, theirs);
    if (all.every((item) => !isObject(item) && !Array.isArray(item))) return mergeSets(baseList, mine, theirs);
    return mine;
  }
  if (isObject(mine) && isObject(theirs)) {
    // A record whose kind changed on one side is taken whole, not field by field.
    if ('kind' in mine && mine.kind !== theirs.kind) return isObject(base) && base.kind === theirs.kind ? mine : theirs;
    const baseObject = isObject(base) ? base : {};
    const result: Record<string, unknown> = {};
    for (const key of new Set([...Object.keys(theirs), ...Object.keys(mine)])) {
      const merged = mergeValues(baseObject[key], mine[key], theirs[key]);
      if (merged !== undefined) result[key] = merged;
    }
    return result;
  }
  return mine;
}

export function mergeDocuments<T>(base: T, mine: T, theirs: T): T {
  return mergeValues(base as Json, mine as Json, theirs as Json) as T;
}
