import { createWriteStream } from 'node:fs';
import { rm } from 'node:fs/promises';
import path from 'node:path';
import { pipeline } from 'node:stream/promises';
import { fileTypeFromFile } from 'file-type';
import type { Knex } from 'knex';
import { footageSchema, markupSchema, type Markup } from '@underfoot/core';
import { z } from 'zod';
import { badRequest, HttpError, notFound } from '../../http/errors.ts';
import { nowIso } from '../../lib/clock.ts';
import { newId } from '../../lib/ids.ts';
import type { MediaStorage } from '../../storage/media-storage.ts';
import type { UserRecord } from '../auth/users.repo.ts';
import { editableOrder, readableOrder } from '../inspections/inspection-access.ts';
import { ImageRefused, ingestStill, renderMarkedUp, stillTypes } from './image-pipeline.ts';
import { findMedia, findRenderedFor, insertMedia, toMediaView, type MediaRow, type MediaView } from './media.repo.ts';
import { probeVideo, VideoDamaged } from './video-probe.ts';

export interface MediaLimits {
  maxVideoBytes: number;
  maxStillBytes: number;
  maxStillPixels: number;
}

/** What arrives from multer: a finished temporary file. */
export interface UploadedFile {
  path: string;
  size: number;
  originalname: string;
}

/** Video containers accepted, by what their content says they are. */
const videoTypes: Record<string, { container: 'mp4' | 'mov' | 'webm'; mime: string; ext: string }> = {
  mp4: { container: 'mp4', mime: 'video/mp4', ext: 'mp4' },
  m4v: { container: 'mp4', mime: 'video/mp4', ext: 'mp4' },
  mov: { container: 'mov', mime: 'video/quicktime', ext: 'mov' },
  webm: { container: 'webm', mime: 'video/webm', ext: 'webm' },
};

/**
 * The largest picture a video may declare, a side. Cameras record at most 8K: 7680 × 4320
 * (ITU-R BT.2020, SMPTE ST 2036-1), or 8192 wide in DCI 8K. A larger claim is a bomb aimed at
 * the players that will open the file.
 */
const MAX_VIDEO_SIDE = 8192;

const optionalNumber = (schema: z.ZodType<number>) =>
  z.preprocess((v) => (v === undefined || v === '' || v === null ? null : typeof v === 'string' ? Number(v) : v), schema.nullable());

/** The text fields sent with a still (multipart fields are strings). */
export const stillFieldsSchema = z.object({
  origin: z.enum(['frame_grab', 'photo'], { error: 'Say whether this is a frame from the video or a photo.' }).default('photo'),
  runId: z.string().trim().min(1).max(64).optional(),
  observationId: z.string().trim().min(1).max(64).optional(),
  videoTime: optionalNumber(z.number({ error: 'Video time is a number of seconds.' }).min(0).max(86_400)).default(null),
  footage: optionalNumber(footageSchema).default(null),
});
export type StillFields = z.output<typeof stillFieldsSchema>;

export const videoFieldsSchema = z.object({ runId: z.string().trim().min(1).max(64).optional() });

export const markupInputSchema = z.object({
  baseVersion: z.int({ error: 'Say which version of the markup this started from.' }).min(0),
  markup: markupSchema,
});

/** A cleaned-up copy of the client's file name for people to read. */
const displayName = (name: string) => name.normalize('NFC').slice(0, 255);

function describeType(detected: { mime: string } | undefined, fallback: string) {
  return detected ? `it is ${detected.mime}` : fallback;
}

export function createMediaService(deps: { db: Knex; storage: MediaStorage; limits: MediaLimits }) {
  const { db, storage, limits } = deps;

  async function removeQuietly(...files: string[]) {
    await Promise.all(files.map((f) => rm(f, { force: true }).catch(() => undefined)));
  }

  async function uploadVideo(user: UserRecord, orderId: string, file: UploadedFile | undefined, fields: unknown): Promise<MediaView> {
    try {
      await editableOrder(db, user, orderId, 'order');
      if (!file) throw badRequest('Attach the video in the form field named "video".');
      const { runId } = videoFieldsSchema.parse(fields ?? {});
      if (file.size === 0) throw new HttpError(400, 'file_empty', 'This file is empty (0 bytes). Choose the video again.');
      const detected = await fileTypeFromFile(file.path);
      const type = detected ? videoTypes[detected.ext] : undefined;
      if (!type) {
        throw new HttpError(
          415,
          'unsupported_type',
          `This file is not a video we can take (${describeType(detected, 'its content is not a video')}). Upload MP4, WebM or QuickTime (.mov) video.`,
        );
      }
      let probe;
      try {
        probe = await probeVideo(file.path, type.container);
      } catch (err) {
        if (err instanceof VideoDamaged)
          throw new HttpError(422, 'video_damaged', `${err.message} Nothing was kept; upload the video again.`);
        throw err;
      }
      if ((probe.width ?? 0) > MAX_VIDEO_SIDE || (probe.height ?? 0) > MAX_VIDEO_SIDE) {
        throw new HttpError(
          413,
          'video_too_large',
          `This video says its picture is ${probe.width} × ${probe.height} pixels; videos up to ${MAX_VIDEO_SIDE} pixels a side are accepted. Nothing was kept.`,
        );
      }
      const id = newId();
      const key = `orders/${orderId}/${id}.${type.ext}`;
      await storage.putFile(key, file.path);
      const now = nowIso();
      const row: MediaRow = {
        id,
        order_id: orderId,
        kind: 'video',
        run_id: runId ?? null,
        observation_id: null,
        source_media_id: null,
        storage_key: key,
        thumbnail_key: null,
        mime: type.mime,
        size_bytes: file.size,
        width: probe.width,
        height: probe.height,
        duration_seconds: probe.durationSeconds,
        video_time: null,
        footage: null,
        origin: 'upload',
        original_name: displayName(file.originalname),
        markup: null,
        markup_version: 0,
        created_by: user.id,
        created_at: now,
        updated_at: now,
      };
      try {
        await insertMedia(db, row);
      } catch (err) {
        await storage.delete(key);
        throw err;
      }
      return toMediaView(row, undefined);
    } finally {
      // Moved into the store on success; on any failure the temporary file goes.
      if (file) await removeQuietly(file.path);
    }
  }

  async function uploadStill(user: UserRecord, orderId: string, file: UploadedFile | undefined, fields: unknown): Promise<MediaView> {
    const display = file ? `${file.path}.display.jpg` : '';
    const thumbnail = file ? `${file.path}.thumb.jpg` : '';
    const stored: string[] = [];
    try {
      await editableOrder(db, user, orderId, 'order');
      if (!file) throw badRequest('Attach the picture in the form field named "image".');
      const parsedFields = stillFieldsSchema.safeParse(fields ?? {});
      if (!parsedFields.success) {
        throw badRequest(
          'Some fields need attention.',
          parsedFields.error.issues.map((i) => ({ path: i.path.join('.'), message: i.message })),
        );
      }
      const details = parsedFields.data;
      if (file.size === 0) throw new HttpError(400, 'file_empty', 'This file is empty (0 bytes). Choose the picture again.');
      const detected = await fileTypeFromFile(file.path);
      if (!detected || !stillTypes.has(detected.mime)) {
        const looksLikeMarkup = !detected || detected.ext === 'xml' || detected.ext === 'svg' || detected.ext === 'html';
        throw new HttpError(
          415,
          'unsupported_type',
          looksLikeMarkup
            ? 'This file is not a picture we can take (it looks like text, SVG or a web page). Upload a JPEG, PNG or WebP photo.'
            : `This file is not a picture we can take (${describeType(detected, '')}). Upload a JPEG, PNG or WebP photo.`,
        );
      }
      let ingested;
      try {
        ingested = await ingestStill(file.path, { display, thumbnail }, { maxPixels: limits.maxStillPixels });
      } catch (err) {
        if (err instanceof ImageRefused) {
          throw new HttpError(err.code === 'image_too_large' ? 413 : 422, err.code, `${err.message} Nothing was kept.`);
        }
        throw err;
      }
      const id = newId();
      const key = `orders/${orderId}/${id}.jpg`;
      const thumbnailKey = `orders/${orderId}/${id}-thumb.jpg`;
      await storage.putFile(key, display);
      stored.push(key);
      await storage.putFile(thumbnailKey, thumbnail);
      stored.push(thumbnailKey);
      const now = nowIso();
      const row: MediaRow = {
        id,
        order_id: orderId,
        kind: 'still',
        run_id: details.runId ?? null,
        observation_id: details.observationId ?? null,
        source_media_id: null,
        storage_key: key,
        thumbnail_key: thumbnailKey,
        mime: 'image/jpeg',
        size_bytes: ingested.sizeBytes,
        width: ingested.width,
        height: ingested.height,
        duration_seconds: null,
        video_time: details.videoTime,
        footage: details.footage,
        origin: details.origin,
        original_name: displayName(file.originalname),
        markup: null,
        markup_version: 0,
        created_by: user.id,
        created_at: now,
        updated_at: now,
      };
      await insertMedia(db, row);
      stored.length = 0;
      return toMediaView(row, undefined);
    } finally {
      if (file) await removeQuietly(file.path, display, thumbnail);
      // A failure after the files were stored takes them back out.
      await Promise.all(stored.map((key) => storage.delete(key)));
    }
  }

  /** A file to send, if this person may see the order it belongs to (404 otherwise). */
  async function openForRead(user: UserRecord, mediaId: string, variant: 'file' | 'thumbnail') {
    const row = await findMedia(db, mediaId);
    if (!row) throw notFound('file');
    await readableOrder(db, user, row.order_id, 'file');
    const key = variant === 'thumbnail' ? row.thumbnail_key : row.storage_key;
    if (!key) throw notFound('file');
    const info = await storage.stat(key);
    if (!info) throw notFound('file');
    const ext = path.extname(key);
    return {
      key,
      size: info.size,
      mime: variant === 'thumbnail' ? 'image/jpeg' : row.mime,
      fileName: `${row.kind}-${row.id}${variant === 'thumbnail' ? '-thumb' : ''}${ext}`,
      etag: `"${row.id}-${variant}-${info.size}"`,
    };
  }

  async function getMedia(user: UserRecord, mediaId: string): Promise<MediaView> {
    const row = await findMedia(db, mediaId);
    if (!row || row.kind === 'rendered') throw notFound('file');
    await readableOrder(db, user, row.order_id, 'file');
    return toMediaView(row, await findRenderedFor(db, row.id));
  }

  /**
   * Save a still's markup (vector data) and burn it into a rendered copy. Like the
   * inspection, it carries the version it started from; a stale save gets 409.
   */
  async function saveMarkup(user: UserRecord, mediaId: string, input: { baseVersion: number; markup: Markup }): Promise<MediaView> {
    const row = await findMedia(db, mediaId);
    if (!row || row.kind !== 'still') throw notFound('still');
    await editableOrder(db, user, row.order_id, 'still');
    if (row.markup_version !== input.baseVersion) {
      throw new HttpError(409, 'version_conflict', 'Someone else changed the markup on this still. Reload it to see their version.');
    }
    const oldRendered = await findRenderedFor(db, row.id);
    const now = nowIso();
    let newRendered: MediaRow | undefined;
    if (input.markup.shapes.length > 0) {
      const renderedId = newId();
      const key = `orders/${row.order_id}/${renderedId}.jpg`;
      const temp = path.join(storage.incomingDir, `${renderedId}.render.jpg`);
      const source = path.join(storage.incomingDir, `${renderedId}.source.jpg`);
      try {
        // The display copy comes out of the store (it may be remote) to be drawn on.
        await streamToFile(await storage.get(row.storage_key), source);
        const { sizeBytes } = await renderMarkedUp(source, input.markup, temp);
        await storage.putFile(key, temp);
        newRendered = {
          ...row,
          id: renderedId,
          kind: 'rendered',
          source_media_id: row.id,
          storage_key: key,
          thumbnail_key: null,
          size_bytes: sizeBytes,
          origin: 'markup',
          markup: null,
          markup_version: 0,
          created_by: user.id,
          created_at: now,
          updated_at: now,
        };
      } finally {
        await removeQuietly(temp, source);
      }
    }
    const saved = await db.transaction(async (trx) => {
      const updated = await trx('media')
        .where({ id: row.id, markup_version: input.baseVersion })
        .update({ markup: JSON.stringify(input.markup), markup_version: input.baseVersion + 1, updated_at: now });
      if (Number(updated) !== 1) return false;
      // A rendered copy a published revision shows stays, so that revision keeps its picture.
      if (oldRendered && !(await inPublishedRevision(trx, oldRendered))) await trx('media').where({ id: oldRendered.id }).delete();
      if (newRendered) await trx('media').insert(newRendered);
      return true;
    });
    if (!saved) {
      if (newRendered) await storage.delete(newRendered.storage_key);
      throw new HttpError(409, 'version_conflict', 'Someone else changed the markup on this still. Reload it to see their version.');
    }
    if (oldRendered && !(await inPublishedRevision(db, oldRendered))) await storage.delete(oldRendered.storage_key);
    return getMedia(user, row.id);
  }

  /** Remove a video or still, its rendered copy and their files. */
  async function deleteMedia(user: UserRecord, mediaId: string): Promise<void> {
    const row = await findMedia(db, mediaId);
    if (!row || row.kind === 'rendered') throw notFound('file');
    await editableOrder(db, user, row.order_id, 'file');
    const rendered = await findRenderedFor(db, row.id);
    if ((await inPublishedRevision(db, row)) || (rendered && (await inPublishedRevision(db, rendered)))) {
      throw new HttpError(
        409,
        'in_published_revision',
        'A published revision of this report shows this file, so it stays. Take it off the finding instead; the next revision will not show it.',
      );
    }
    await db('media')
      .whereIn('id', [row.id, ...(rendered ? [rendered.id] : [])])
      .delete();
    const keys = [row.storage_key, row.thumbnail_key, rendered?.storage_key].filter((k): k is string => !!k);
    await Promise.all(keys.map((k) => storage.delete(k)));
  }

  return { uploadVideo, uploadStill, openForRead, getMedia, saveMarkup, deleteMedia, limits };
}

/** Whether a published revision of the order names this file (snapshots are JSON text holding the ids). */
async function inPublishedRevision(db: Knex, row: Pick<MediaRow, 'id' | 'order_id'>): Promise<boolean> {
  const hit = await db('report_revisions')
    .where({ order_id: row.order_id })
    .whereRaw('snapshot like ?', [`%"${row.id}"%`])
    .first('id');
  return Boolean(hit);
}

async function streamToFile(source: NodeJS.ReadableStream, file: string) {
  await pipeline(source, createWriteStream(file));
}

export type MediaService = ReturnType<typeof createMediaService>;
