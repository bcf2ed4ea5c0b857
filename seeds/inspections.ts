import { randomUUID } from 'node:crypto';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { Readable } from 'node:stream';
import type { Knex } from 'knex';
import { feet, feetAndInches, inspectionSchema, markupSchema, type Inspection, type InspectionInput, type Markup } from '@underfoot/core';
import { createLocalDiskStorage, ingestStill, renderMarkedUp, type MediaStorage } from '@underfoot/server';
import { DEMO_VIDEO_FEET_PER_SECOND, demoStill, demoVideo, type DemoStillName } from './media/demo-media.ts';

/**
 * Recorded inspections for the demo: two orders with their line recorded in the field
 * app, each with the generated run video and generated stills, some marked up. Every
 * house, defect and picture here is invented; the pictures are procedural.
 *
 * Call after the demo orders exist:  await seedDemoInspections(db, { mediaDir: config.media.dir })
 */

interface DemoStill {
  observationId: string;
  name: DemoStillName;
  markup?: Markup['shapes'];
  /** Grabbed from the run video (true) or a photo (false). */
  fromVideo: boolean;
}

interface DemoInspection {
  orderId: string;
  updatedByEmailPrefix: string;
  document: InspectionInput;
  /** The run that gets the demo video. */
  videoRunId: string;
  stills: DemoStill[];
}

const t = (footage: number) => Math.round((footage / 3048 / DEMO_VIDEO_FEET_PER_SECOND) * 10) / 10;

// 2204 Beacon Hill Road (1926): a clay lateral with roots, an offset joint and a crack toward the main.
const beaconHill: DemoInspection = {
  orderId: 'a0000000-0000-4000-8000-000000000007',
  updatedByEmailPrefix: 'priya',
  videoRunId: 'e7000000-0000-4000-8000-000000000102',
  document: {
    id: 'a0000000-0000-4000-8000-000000000007',
    property: { yearBuilt: 1926, type: 'single_family', notes: 'Street tree (maple) about 8 ft from the cleanout.' },
    accessPoints: [
      {
        id: 'e7000000-0000-4000-8000-000000000001',
        kind: 'cleanout_two_way',
        locationNote: 'Near the sidewalk, under the hedge',
        offsetFromBuilding: feet(38),
      },
    ],
    runs: [
      {
        id: 'e7000000-0000-4000-8000-000000000101',
        accessPointId: 'e7000000-0000-4000-8000-000000000001',
        direction: 'toward_building',
        distanceReached: feet(38),
        endReason: 'reached_building',
        sections: [
          { id: 'e7000000-0000-4000-8000-000000000111', from: 0, to: feet(32), material: 'vitrified_clay', diameterIn: 4 },
          { id: 'e7000000-0000-4000-8000-000000000112', from: feet(32), to: feet(38), material: 'cast_iron', diameterIn: 4 },
        ],
        observations: [
          {
            id: 'e7000000-0000-4000-8000-000000000121',
            kind: 'roots',
            at: feetAndInches(12, 4),
            severity: 2,
            clock: 12,
            note: 'Fine roots at the joint.',
          },
          { id: 'e7000000-0000-4000-8000-000000000122', kind: 'joint_offset', at: feet(18), severity: 2, measurePercent: 8 },
          {
            id: 'e7000000-0000-4000-8000-000000000123',
            kind: 'material_change',
            at: feet(32),
            fromMaterial: 'vitrified_clay',
            toMaterial: 'cast_iron',
          },
          { id: 'e7000000-0000-4000-8000-000000000124', kind: 'run_end', at: feet(38), reason: 'reached_building' },
        ],
      },
      {
        id: 'e7000000-0000-4000-8000-000000000102',
        accessPointId: 'e7000000-0000-4000-8000-000000000001',
        direction: 'toward_main',
        distanceReached: feet(22),
        endReason: 'reached_main',
        sections: [{ id: 'e7000000-0000-4000-8000-000000000131', from: 0, to: feet(22), material: 'vitrified_clay', diameterIn: 4 }],
        observations: [
          {
            id: 'e7000000-0000-4000-8000-000000000141',
            kind: 'roots',
            at: feetAndInches(6, 8),
            severity: 3,
            clock: 12,
            measurePercent: 25,
            note: 'Root mass at the joint, about a quarter of the opening.',
            videoTime: t(feetAndInches(4, 11)),
          },
          {
            id: 'e7000000-0000-4000-8000-000000000142',
            kind: 'joint_offset',
            at: feet(9),
            severity: 4,
            measurePercent: 30,
            clock: 3,
            note: 'Step at the joint catches paper.',
            videoTime: t(feetAndInches(8, 2)),
          },
          {
            id: 'e7000000-0000-4000-8000-000000000143',
            kind: 'crack',
            at: feet(14),
            to: feet(17),
            severity: 3,
            clock: 2,
            note: 'Crack along the crown.',
            videoTime: t(feetAndInches(13, 7)),
          },
          {
            id: 'e7000000-0000-4000-8000-000000000144',
            kind: 'standing_water',
            at: feet(15),
            to: feet(18),
            severity: 2,
            measurePercent: 18,
          },
          { id: 'e7000000-0000-4000-8000-000000000145', kind: 'main_connection', at: feet(22) },
        ],
        depthReadings: [
          { at: 0, depth: feetAndInches(3, 6) },
          { at: feet(10), depth: feetAndInches(4, 2) },
          { at: feet(20), depth: feetAndInches(4, 10) },
        ],
        surfaces: [
          { from: 0, to: feet(4), surface: 'concrete' },
          { from: feet(4), to: feet(22), surface: 'soil' },
        ],
      },
    ],
    checkedNotFound: ['collapse', 'missing_piece', 'blockage', 'seepage', 'grease'],
  },
  stills: [
    {
      observationId: 'e7000000-0000-4000-8000-000000000141',
      name: 'roots',
      fromVideo: true,
      markup: [
        { id: 'mk-1', type: 'arrow', colour: 'sun', x1: 0.2, y1: 0.2, x2: 0.37, y2: 0.33 },
        { id: 'mk-2', type: 'text', colour: 'chalk', x: 0.05, y: 0.08, text: 'Roots at joint, 6′ 8″' },
      ],
    },
    {
      observationId: 'e7000000-0000-4000-8000-000000000142',
      name: 'offset',
      fromVideo: true,
      markup: [
        { id: 'mk-3', type: 'ellipse', colour: 'flare', x: 0.62, y: 0.18, w: 0.34, h: 0.62 },
        { id: 'mk-4', type: 'text', colour: 'flare', x: 0.05, y: 0.08, text: 'Offset joint' },
      ],
    },
    { observationId: 'e7000000-0000-4000-8000-000000000143', name: 'crack', fromVideo: true },
  ],
};

// 15 Fernwood Lane (1962): reached through a pulled toilet; cast iron under the slab, then clay with sludge.
const fernwood: DemoInspection = {
  orderId: 'a0000000-0000-4000-8000-000000000008',
  updatedByEmailPrefix: 'marco',
  videoRunId: 'e8000000-0000-4000-8000-000000000101',
  document: {
    id: 'a0000000-0000-4000-8000-000000000008',
    property: { yearBuilt: 1962, type: 'single_family', notes: '' },
    accessPoints: [{ id: 'e8000000-0000-4000-8000-000000000001', kind: 'toilet_removed', locationNote: 'Hall bathroom, ground floor' }],
    runs: [
      {
        id: 'e8000000-0000-4000-8000-000000000101',
        accessPointId: 'e8000000-0000-4000-8000-000000000001',
        direction: 'toward_main',
        distanceReached: feet(74),
        endReason: 'reached_main',
        sections: [
          { id: 'e8000000-0000-4000-8000-000000000111', from: 0, to: feet(9), material: 'cast_iron', diameterIn: 4 },
          { id: 'e8000000-0000-4000-8000-000000000112', from: feet(9), to: feet(74), material: 'vitrified_clay', diameterIn: 4 },
        ],
        observations: [
          {
            id: 'e8000000-0000-4000-8000-000000000121',
            kind: 'scale',
            at: feet(1),
            to: feet(9),
            severity: 2,
            measurePercent: 10,
            note: 'Light scale under the slab.',
          },
          { id: 'e8000000-0000-4000-8000-000000000122', kind: 'bend', at: feet(6), angle: 'deg_45' },
          {
            id: 'e8000000-0000-4000-8000-000000000123',
            kind: 'material_change',
            at: feet(9),
            fromMaterial: 'cast_iron',
            toMaterial: 'vitrified_clay',
          },
          { id: 'e8000000-0000-4000-8000-000000000124', kind: 'branch', at: feetAndInches(21, 6), fitting: 'wye', clock: 9 },
          {
            id: 'e8000000-0000-4000-8000-000000000125',
            kind: 'debris',
            at: feet(30),
            to: feet(36),
            severity: 3,
            measurePercent: 20,
            note: 'Sludge in the bottom of the pipe; cleaning advised.',
          },
          { id: 'e8000000-0000-4000-8000-000000000126', kind: 'roots', at: feet(47), severity: 2, clock: 1, measurePercent: 10 },
          { id: 'e8000000-0000-4000-8000-000000000127', kind: 'cleanout', at: feet(52), note: 'Buried cleanout riser, cap intact.' },
          { id: 'e8000000-0000-4000-8000-000000000128', kind: 'main_connection', at: feet(74) },
        ],
        depthReadings: [],
        surfaces: [
          { from: 0, to: feet(9), surface: 'building_slab' },
          { from: feet(9), to: feet(60), surface: 'soil' },
          { from: feet(60), to: feet(74), surface: 'asphalt' },
        ],
      },
    ],
    checkedNotFound: ['crack', 'open_crack', 'collapse', 'missing_piece', 'sag', 'blockage'],
  },
  stills: [
    {
      observationId: 'e8000000-0000-4000-8000-000000000125',
      name: 'debris',
      fromVideo: false,
      markup: [
        { id: 'mk-5', type: 'box', colour: 'sun', x: 0.18, y: 0.62, w: 0.64, h: 0.34 },
        { id: 'mk-6', type: 'text', colour: 'sun', x: 0.05, y: 0.08, text: 'Sludge, about 20%' },
      ],
    },
    { observationId: 'e8000000-0000-4000-8000-000000000126', name: 'rootsLight', fromVideo: false },
    { observationId: 'e8000000-0000-4000-8000-000000000121', name: 'scale', fromVideo: false },
  ],
};

export const demoInspections: readonly DemoInspection[] = [beaconHill, fernwood];

/** The parsed document of a demo inspection (for tests and other seeds). */
export function demoInspectionDocument(orderId: string): Inspection | null {
  const found = demoInspections.find((d) => d.orderId === orderId);
  return found ? inspectionSchema.parse(found.document) : null;
}

async function storeStill(storage: MediaStorage, orderId: string, jpeg: Buffer) {
  const work = mkdtempSync(path.join(tmpdir(), 'underfoot-seed-'));
  try {
    const source = path.join(work, 'source.jpg');
    writeFileSync(source, jpeg);
    const id = randomUUID();
    const display = path.join(work, 'display.jpg');
    const thumbnail = path.join(work, 'thumb.jpg');
    const ingested = await ingestStill(source, { display, thumbnail }, { maxPixels: 100_000_000 });
    const key = `orders/${orderId}/${id}.jpg`;
    const thumbnailKey = `orders/${orderId}/${id}-thumb.jpg`;
    return { id, key, thumbnailKey, display, thumbnail, ingested, work };
  } catch (err) {
    rmSync(work, { recursive: true, force: true });
    throw err;
  }
}

/**
 * Seed the recorded inspections (documents, the run video, stills and their marked-up
 * copies) for the demo orders that exist. Runs once: an order that already has an
 * inspection is left alone.
 */
export async function seedDemoInspections(db: Knex, options: { mediaDir: string }): Promise<{ seeded: number }> {
  const storage = createLocalDiskStorage(options.mediaDir);
  let seeded = 0;
  for (const demo of demoInspections) {
    const order = await db('orders').where({ id: demo.orderId }).first('id', 'assigned_inspector_id');
    if (!order) continue;
    if (await db('inspections').where({ order_id: demo.orderId }).first('order_id')) continue;
    const author = await db('users').where('email', 'like', `${demo.updatedByEmailPrefix}@%`).first('id');
    const userId = (author?.id as string | undefined) ?? (order.assigned_inspector_id as string | null);
    const now = new Date().toISOString();
    const document = inspectionSchema.parse(demo.document);
    const rows: Record<string, unknown>[] = [];
    const storedKeys: string[] = [];
    const base = {
      order_id: demo.orderId,
      source_media_id: null,
      width: null,
      height: null,
      duration_seconds: null,
      video_time: null,
      footage: null,
      markup: null,
      markup_version: 0,
      created_by: userId,
      created_at: now,
      updated_at: now,
    };
    try {
      // The run video.
      const video = await demoVideo();
      const videoId = randomUUID();
      const videoKey = `orders/${demo.orderId}/${videoId}.mp4`;
      await storage.putStream(videoKey, Readable.from([video]));
      storedKeys.push(videoKey);
      rows.push({
        ...base,
        id: videoId,
        kind: 'video',
        run_id: demo.videoRunId,
        observation_id: null,
        storage_key: videoKey,
        thumbnail_key: null,
        mime: 'video/mp4',
        size_bytes: video.length,
        width: 320,
        height: 240,
        duration_seconds: 8,
        origin: 'upload',
        original_name: 'run-toward-main.mp4',
      });
      const run = document.runs.find((r) => r.id === demo.videoRunId)!;
      run.videoFileId = videoId;

      for (const still of demo.stills) {
        const stored = await storeStill(storage, demo.orderId, await demoStill(still.name));
        try {
          await storage.putFile(stored.key, stored.display);
          storedKeys.push(stored.key);
          await storage.putFile(stored.thumbnailKey, stored.thumbnail);
          storedKeys.push(stored.thumbnailKey);
          const observation = document.runs
            .flatMap((r) => r.observations.map((o) => ({ o, r })))
            .find(({ o }) => o.id === still.observationId)!;
          observation.o.stillIds.push(stored.id);
          const markup = still.markup ? markupSchema.parse({ shapes: still.markup }) : null;
          rows.push({
            ...base,
            id: stored.id,
            kind: 'still',
            run_id: observation.r.id,
            observation_id: observation.o.id,
            storage_key: stored.key,
            thumbnail_key: stored.thumbnailKey,
            mime: 'image/jpeg',
            size_bytes: stored.ingested.sizeBytes,
            width: stored.ingested.width,
            height: stored.ingested.height,
            video_time: still.fromVideo ? observation.o.videoTime : null,
            footage: observation.o.at,
            origin: still.fromVideo ? 'frame_grab' : 'photo',
            original_name: `${still.name}.jpg`,
            markup: markup ? JSON.stringify(markup) : null,
            markup_version: markup ? 1 : 0,
          });
          if (markup) {
            // The burned-in copy, drawn from the stored display image (same code as the API).
            const renderedId = randomUUID();
            const renderedKey = `orders/${demo.orderId}/${renderedId}.jpg`;
            const renderedFile = path.join(stored.work, 'rendered.jpg');
            const source = path.join(options.mediaDir, ...stored.key.split('/'));
            const { sizeBytes } = await renderMarkedUp(source, markup, renderedFile);
            await storage.putFile(renderedKey, renderedFile);
            storedKeys.push(renderedKey);
            rows.push({
              ...base,
              id: renderedId,
              kind: 'rendered',
              run_id: observation.r.id,
              observation_id: observation.o.id,
              source_media_id: stored.id,
              storage_key: renderedKey,
              thumbnail_key: null,
              mime: 'image/jpeg',
              size_bytes: sizeBytes,
              width: stored.ingested.width,
              height: stored.ingested.height,
              footage: observation.o.at,
              origin: 'markup',
              original_name: '',
            });
          }
        } finally {
          rmSync(stored.work, { recursive: true, force: true });
        }
      }

      await db.transaction(async (trx) => {
        // Still rows point at their rendered copies' sources: insert the sources first.
        for (const kind of ['video', 'still', 'rendered']) {
          const ofKind = rows.filter((r) => r.kind === kind);
          if (ofKind.length > 0) await trx('media').insert(ofKind);
        }
        await trx('inspections').insert({
          order_id: demo.orderId,
          document: JSON.stringify(inspectionSchema.parse(document)),
          version: 1,
          created_at: now,
          updated_at: now,
          updated_by: userId,
        });
      });
      seeded += 1;
    } catch (err) {
      await Promise.all(storedKeys.map((key) => storage.delete(key)));
      throw err;
    }
  }
  return { seeded };
}
