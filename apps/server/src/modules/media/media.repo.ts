import type { Knex } from 'knex';
import { markupSchema, type Markup } from '@underfoot/core';

export type MediaKind = 'video' | 'still' | 'rendered';
export type MediaOrigin = 'upload' | 'frame_grab' | 'photo' | 'markup';

export interface MediaRow {
  id: string;
  order_id: string;
  kind: MediaKind;
  run_id: string | null;
  observation_id: string | null;
  source_media_id: string | null;
  storage_key: string;
  thumbnail_key: string | null;
  mime: string;
  size_bytes: number | string;
  width: number | null;
  height: number | null;
  duration_seconds: number | null;
  video_time: number | null;
  footage: number | null;
  origin: MediaOrigin;
  original_name: string;
  markup: string | null;
  markup_version: number;
  created_by: string | null;
  created_at: string;
  updated_at: string;
}

/** A video or still as the API shows it; rendered copies are folded into their still. */
export interface MediaView {
  id: string;
  kind: 'video' | 'still';
  orderId: string;
  runId: string | null;
  observationId: string | null;
  mime: string;
  sizeBytes: number;
  width: number | null;
  height: number | null;
  durationSeconds: number | null;
  videoTime: number | null;
  footage: number | null;
  origin: MediaOrigin;
  originalName: string;
  createdAt: string;
  url: string;
  thumbnailUrl: string | null;
  markup: Markup | null;
  markupVersion: number;
  /** The still with its markup burned in, when it has any. */
  renderedUrl: string | null;
}

export const mediaFileUrl = (id: string) => `/api/media/${id}/file`;

function parseMarkup(text: string | null): Markup | null {
  if (!text) return null;
  const parsed = markupSchema.safeParse(JSON.parse(text));
  return parsed.success ? parsed.data : null;
}

export function toMediaView(row: MediaRow, rendered: MediaRow | undefined): MediaView {
  return {
    id: row.id,
    kind: row.kind === 'video' ? 'video' : 'still',
    orderId: row.order_id,
    runId: row.run_id,
    observationId: row.observation_id,
    mime: row.mime,
    sizeBytes: Number(row.size_bytes),
    width: row.width,
    height: row.height,
    durationSeconds: row.duration_seconds,
    videoTime: row.video_time,
    footage: row.footage,
    origin: row.origin,
    originalName: row.original_name,
    createdAt: row.created_at,
    url: mediaFileUrl(row.id),
    thumbnailUrl: row.thumbnail_key ? `/api/media/${row.id}/thumbnail` : null,
    markup: parseMarkup(row.markup),
    markupVersion: row.markup_version,
    renderedUrl: rendered ? mediaFileUrl(rendered.id) : null,
  };
}

export async function findMedia(db: Knex, id: string): Promise<MediaRow | undefined> {
  return db<MediaRow>('media').where({ id }).first();
}

export async function findRenderedFor(db: Knex, stillId: string): Promise<MediaRow | undefined> {
  // Older rendered copies may be kept for published revisions: the newest is the current one.
  return db<MediaRow>('media').where({ source_media_id: stillId, kind: 'rendered' }).orderBy('created_at', 'desc').first();
}

/** Videos and stills of an order, oldest first, each still with its rendered copy. */
export async function listOrderMedia(db: Knex, orderId: string): Promise<MediaView[]> {
  const rows = await db<MediaRow>('media')
    .where({ order_id: orderId })
    .orderBy([{ column: 'created_at' }, { column: 'id' }]);
  const renderedBySource = new Map(rows.filter((r) => r.kind === 'rendered' && r.source_media_id).map((r) => [r.source_media_id!, r]));
  return rows.filter((r) => r.kind !== 'rendered').map((r) => toMediaView(r, renderedBySource.get(r.id)));
}

/** Kinds of the given media ids that belong to this order (ids of other orders are simply absent). */
export async function mediaKindsOnOrder(db: Knex, orderId: string, ids: readonly string[]): Promise<Map<string, MediaKind>> {
  if (ids.length === 0) return new Map();
  const rows = await db('media')
    .where({ order_id: orderId })
    .whereIn('id', [...new Set(ids)])
    .select('id', 'kind');
  return new Map(rows.map((r: { id: string; kind: MediaKind }) => [r.id, r.kind]));
}

export async function insertMedia(db: Knex, row: MediaRow): Promise<void> {
  await db('media').insert(row);
}
