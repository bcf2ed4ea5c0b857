import { randomUUID } from 'node:crypto';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { Readable } from 'node:stream';
import type { Knex } from 'knex';
import {
  feet,
  feetAndInches,
  inspectionSchema,
  markupSchema,
  orderingSideOf,
  type Inspection,
  type InspectionInput,
  type Markup,
  type OrderKind,
  type PartyRole,
} from '@underfoot/core';
import {
  createLocalDiskStorage,
  createReportsService,
  findUserById,
  ingestStill,
  renderMarkedUp,
  type MediaStorage,
} from '@underfoot/server';
import { demoAccounts, demoCompany } from './demo.ts';
import { DEMO_VIDEO_FEET_PER_SECOND, demoStill, demoVideo, type DemoStillName } from './media/demo-media.ts';
import { demoFeeItems } from './orders.ts';

/**
 * Published reports for the demo, one per grade, published through the reports service
 * exactly as the office would: Clear, Maintain (later amended), Plan repair (a pre-listing
 * report the seller discloses, with a listing disclosure link), Repair now (with the run
 * video), Failing, and a line re-inspected after its repair. Every house, finding and
 * picture is invented; the pictures and the video are generated.
 *
 * Call after the demo company and its people exist:
 *   await seedDemoReports(db, { mediaDir: config.media.dir, publicUrl: config.publicUrl })
 */

interface DemoStillSpec {
  observationId: string;
  name: DemoStillName;
  markup?: Markup['shapes'];
  fromVideo?: boolean;
}

interface Revision {
  /** What changes in the inspection for this revision. */
  change: (doc: InspectionInput) => void;
  kind: 'amendment' | 'reinspection';
  note: string;
  daysAfter: number;
}

interface DemoReport {
  id: string;
  street: string;
  postalCode: string;
  yearBuilt: number;
  kind: OrderKind;
  inspector: 'marco' | 'priya';
  /** Days before today the line was filmed. */
  daysAgo: number;
  parties: [string, PartyRole][];
  document: Omit<InspectionInput, 'id'>;
  stills: DemoStillSpec[];
  /** The run that gets the generated video. */
  videoRunId?: string;
  revisions?: Revision[];
  disclose?: boolean;
  disclosureLink?: boolean;
}

const t = (footage: number) => Math.round((footage / 3048 / DEMO_VIDEO_FEET_PER_SECOND) * 10) / 10;
const id = (order: number, n: number) => `f${String(order).padStart(7, '0')}-0000-4000-8000-${String(n).padStart(12, '0')}`;

const reports: DemoReport[] = [
  {
    // Clear: a 1994 PVC line with one fine root, noted only.
    id: 'a0000000-0000-4000-8000-000000000010',
    street: '88 Willow Bend',
    postalCode: '97411',
    yearBuilt: 1994,
    kind: 'pre_purchase',
    inspector: 'marco',
    daysAgo: 9,
    parties: [
      ['theo', 'buyers_agent'],
      ['riley', 'buyer'],
    ],
    document: {
      property: { yearBuilt: 1994, type: 'single_family', notes: '' },
      accessPoints: [{ id: id(10, 1), kind: 'cleanout_two_way', locationNote: 'Front walk, by the hose bib', offsetFromBuilding: feet(6) }],
      runs: [
        {
          id: id(10, 2),
          accessPointId: id(10, 1),
          direction: 'toward_main',
          distanceReached: feet(58),
          endReason: 'reached_main',
          sections: [{ id: id(10, 3), from: 0, to: feet(58), material: 'pvc', diameterIn: 4 }],
          observations: [
            { id: id(10, 4), kind: 'bend', at: feet(14), angle: 'deg_45' },
            { id: id(10, 5), kind: 'roots', at: feetAndInches(33, 6), severity: 1, note: 'A few hair roots at a coupling.' },
            { id: id(10, 6), kind: 'main_connection', at: feet(58) },
          ],
        },
        {
          id: id(10, 7),
          accessPointId: id(10, 1),
          direction: 'toward_building',
          distanceReached: feet(6),
          endReason: 'reached_building',
          sections: [{ id: id(10, 8), from: 0, to: feet(6), material: 'pvc', diameterIn: 4 }],
          observations: [],
        },
      ],
      checkedNotFound: ['crack', 'joint_offset', 'sag', 'standing_water', 'grease'],
    },
    stills: [{ observationId: id(10, 5), name: 'rootsLight' }],
  },
  {
    // Maintain: roots and sludge in a 1958 clay line; amended to add the inspector's note on cleaning access.
    id: 'a0000000-0000-4000-8000-000000000011',
    street: '31 Ferry Street',
    postalCode: '97412',
    yearBuilt: 1958,
    kind: 'pre_purchase',
    inspector: 'priya',
    daysAgo: 12,
    parties: [
      ['sam', 'buyers_agent'],
      ['noor', 'buyer'],
    ],
    document: {
      property: { yearBuilt: 1958, type: 'single_family', notes: 'Silver maple in the front yard.' },
      accessPoints: [{ id: id(11, 1), kind: 'cleanout_one_way', locationNote: 'Side yard, under the kitchen window' }],
      runs: [
        {
          id: id(11, 2),
          accessPointId: id(11, 1),
          direction: 'toward_main',
          distanceReached: feet(71),
          endReason: 'reached_main',
          sections: [{ id: id(11, 3), from: 0, to: feet(71), material: 'vitrified_clay', diameterIn: 4 }],
          observations: [
            { id: id(11, 4), kind: 'roots', at: feet(22), severity: 3, clock: 12, measurePercent: 25, note: 'Root mass at the joint.' },
            { id: id(11, 5), kind: 'debris', at: feet(30), to: feet(36), severity: 3, measurePercent: 20 },
            { id: id(11, 6), kind: 'branch', at: feetAndInches(41, 6), fitting: 'wye', clock: 9 },
            { id: id(11, 7), kind: 'roots', at: feet(47), severity: 2, measurePercent: 10 },
            { id: id(11, 8), kind: 'main_connection', at: feet(71) },
          ],
        },
      ],
      checkedNotFound: ['crack', 'collapse', 'sag', 'joint_gap'],
    },
    stills: [
      {
        observationId: id(11, 4),
        name: 'roots',
        markup: [
          { id: 'mk-1', type: 'arrow', colour: 'sun', x1: 0.2, y1: 0.2, x2: 0.37, y2: 0.33 },
          { id: 'mk-2', type: 'text', colour: 'chalk', x: 0.05, y: 0.08, text: 'Roots at joint, 22′' },
        ],
      },
      {
        observationId: id(11, 5),
        name: 'debris',
        markup: [{ id: 'mk-3', type: 'box', colour: 'sun', x: 0.18, y: 0.62, w: 0.64, h: 0.34 }],
      },
    ],
    revisions: [
      {
        kind: 'amendment',
        note: 'Added the joint at 47 ft to the notes and corrected the sludge extent after reviewing the video.',
        daysAfter: 2,
        change: (doc) => {
          const run = doc.runs?.[0];
          const debris = run?.observations?.find((o) => o.id === id(11, 5));
          if (debris && debris.kind === 'debris') debris.to = feet(38);
          const roots = run?.observations?.find((o) => o.id === id(11, 7));
          if (roots) roots.note = 'Fine roots starting at this joint; cut them with the others.';
        },
      },
    ],
  },
  {
    // Plan repair: a pre-listing report on a 1961 line with bituminous fiber; the seller discloses it.
    id: 'a0000000-0000-4000-8000-000000000012',
    street: '1740 Orchard Hill Road',
    postalCode: '97413',
    yearBuilt: 1961,
    kind: 'pre_listing',
    inspector: 'marco',
    daysAgo: 15,
    parties: [
      ['june', 'listing_agent'],
      ['walt', 'seller'],
    ],
    document: {
      property: { yearBuilt: 1961, type: 'single_family', notes: '' },
      accessPoints: [{ id: id(12, 1), kind: 'cleanout_two_way', locationNote: 'By the driveway', offsetFromBuilding: feet(9) }],
      runs: [
        {
          id: id(12, 2),
          accessPointId: id(12, 1),
          direction: 'toward_main',
          distanceReached: feet(64),
          endReason: 'reached_main',
          sections: [
            { id: id(12, 3), from: 0, to: feet(20), material: 'cast_iron', diameterIn: 4 },
            { id: id(12, 4), from: feet(20), to: feet(64), material: 'bituminous_fiber', diameterIn: 4 },
          ],
          observations: [
            { id: id(12, 5), kind: 'scale', at: feet(2), to: feet(18), severity: 2, measurePercent: 10 },
            { id: id(12, 6), kind: 'material_change', at: feet(20), fromMaterial: 'cast_iron', toMaterial: 'bituminous_fiber' },
            { id: id(12, 7), kind: 'crack', at: feet(38), severity: 3, clock: 12, note: 'Blistered wall with a crack along the crown.' },
            { id: id(12, 8), kind: 'main_connection', at: feet(64) },
          ],
          depthReadings: [
            { at: 0, depth: feetAndInches(2, 6) },
            { at: feet(30), depth: feetAndInches(3, 4) },
            { at: feet(60), depth: feetAndInches(4, 2) },
          ],
        },
        {
          id: id(12, 9),
          accessPointId: id(12, 1),
          direction: 'toward_building',
          distanceReached: feet(9),
          endReason: 'reached_building',
          sections: [{ id: id(12, 10), from: 0, to: feet(9), material: 'cast_iron', diameterIn: 4 }],
          observations: [],
        },
      ],
      checkedNotFound: ['roots', 'sag', 'collapse', 'joint_offset'],
    },
    stills: [
      {
        observationId: id(12, 7),
        name: 'crack',
        markup: [
          { id: 'mk-4', type: 'ellipse', colour: 'flare', x: 0.35, y: 0.05, w: 0.4, h: 0.3 },
          { id: 'mk-5', type: 'text', colour: 'flare', x: 0.05, y: 0.08, text: 'Crack, 38′' },
        ],
      },
      { observationId: id(12, 5), name: 'scale' },
    ],
    disclose: true,
    disclosureLink: true,
  },
  {
    // Repair now: a serious offset in an old clay line, with the run video.
    id: 'a0000000-0000-4000-8000-000000000013',
    street: '502 Millpond Way',
    postalCode: '97411',
    yearBuilt: 1929,
    kind: 'pre_purchase',
    inspector: 'priya',
    daysAgo: 6,
    parties: [
      ['theo', 'buyers_agent'],
      ['riley', 'buyer'],
    ],
    videoRunId: id(13, 2),
    document: {
      property: { yearBuilt: 1929, type: 'single_family', notes: '' },
      accessPoints: [{ id: id(13, 1), kind: 'cleanout_two_way', locationNote: 'Near the sidewalk', offsetFromBuilding: feet(34) }],
      runs: [
        {
          id: id(13, 2),
          accessPointId: id(13, 1),
          direction: 'toward_main',
          distanceReached: feet(24),
          endReason: 'reached_main',
          sections: [{ id: id(13, 3), from: 0, to: feet(24), material: 'vitrified_clay', diameterIn: 4 }],
          observations: [
            {
              id: id(13, 4),
              kind: 'roots',
              at: feetAndInches(6, 8),
              severity: 3,
              clock: 12,
              measurePercent: 25,
              videoTime: t(feetAndInches(4, 11)),
            },
            {
              id: id(13, 5),
              kind: 'joint_offset',
              at: feet(9),
              severity: 4,
              measurePercent: 30,
              clock: 3,
              note: 'Step at the joint catches paper.',
              videoTime: t(feetAndInches(8, 2)),
            },
            { id: id(13, 6), kind: 'crack', at: feet(14), to: feet(17), severity: 3, clock: 2, videoTime: t(feetAndInches(13, 7)) },
            { id: id(13, 7), kind: 'debris', at: feetAndInches(18, 6), to: feet(21), severity: 2, measurePercent: 12 },
            { id: id(13, 8), kind: 'main_connection', at: feet(24) },
          ],
        },
        {
          id: id(13, 9),
          accessPointId: id(13, 1),
          direction: 'toward_building',
          distanceReached: feet(34),
          endReason: 'reached_building',
          sections: [{ id: id(13, 10), from: 0, to: feet(34), material: 'vitrified_clay', diameterIn: 4 }],
          observations: [{ id: id(13, 11), kind: 'roots', at: feet(12), severity: 2 }],
        },
      ],
      checkedNotFound: ['collapse', 'missing_piece', 'grease'],
    },
    stills: [
      { observationId: id(13, 4), name: 'roots', fromVideo: true },
      {
        observationId: id(13, 5),
        name: 'offset',
        fromVideo: true,
        markup: [
          { id: 'mk-6', type: 'ellipse', colour: 'flare', x: 0.62, y: 0.18, w: 0.34, h: 0.62 },
          { id: 'mk-7', type: 'text', colour: 'flare', x: 0.05, y: 0.08, text: 'Offset joint, 9′' },
        ],
      },
      { observationId: id(13, 6), name: 'crack', fromVideo: true },
    ],
  },
  {
    // Failing: a collapsed section under the driveway of a 1948 house; the camera could not pass.
    id: 'a0000000-0000-4000-8000-000000000014',
    street: '9 Stonecutter Lane',
    postalCode: '97412',
    yearBuilt: 1948,
    kind: 'pre_purchase',
    inspector: 'marco',
    daysAgo: 4,
    parties: [
      ['sam', 'buyers_agent'],
      ['noor', 'buyer'],
    ],
    document: {
      property: { yearBuilt: 1948, type: 'single_family', notes: 'Slow drains reported by the seller.' },
      accessPoints: [{ id: id(14, 1), kind: 'interior_cleanout', locationNote: 'Basement, behind the furnace' }],
      runs: [
        {
          id: id(14, 2),
          accessPointId: id(14, 1),
          direction: 'toward_main',
          distanceReached: feet(37),
          endReason: 'camera_blocked',
          endNote: 'Collapsed pipe; the camera could not pass.',
          sections: [
            { id: id(14, 3), from: 0, to: feet(12), material: 'cast_iron', diameterIn: 4 },
            { id: id(14, 4), from: feet(12), to: feet(37), material: 'vitrified_clay', diameterIn: 4 },
          ],
          observations: [
            { id: id(14, 5), kind: 'worn_wall', at: feet(2), to: feet(11), severity: 3, note: 'Heavy scale and pitting.' },
            { id: id(14, 6), kind: 'joint_offset', at: feet(27), severity: 3, measurePercent: 20 },
            { id: id(14, 7), kind: 'collapse', at: feet(37), severity: 5, note: 'Pipe broken and soil in the line.' },
          ],
          surfaces: [
            { from: 0, to: feet(14), surface: 'building_slab' },
            { from: feet(14), to: feet(37), surface: 'concrete' },
          ],
        },
      ],
      checkedNotFound: ['grease'],
    },
    stills: [
      { observationId: id(14, 5), name: 'scale' },
      {
        observationId: id(14, 6),
        name: 'offset',
        markup: [{ id: 'mk-8', type: 'arrow', colour: 'sun', x1: 0.3, y1: 0.7, x2: 0.62, y2: 0.45 }],
      },
    ],
  },
  {
    // Re-inspection: heavy roots and a broken joint, repaired, then filmed again.
    id: 'a0000000-0000-4000-8000-000000000015',
    street: '47 Kestrel Court',
    postalCode: '97413',
    yearBuilt: 1952,
    kind: 'pre_purchase',
    inspector: 'priya',
    daysAgo: 20,
    parties: [
      ['theo', 'buyers_agent'],
      ['noor', 'buyer'],
      ['june', 'listing_agent'],
      ['bea', 'seller'],
    ],
    document: {
      property: { yearBuilt: 1952, type: 'single_family', notes: '' },
      accessPoints: [{ id: id(15, 1), kind: 'cleanout_two_way', locationNote: 'Back yard, by the patio', offsetFromBuilding: feet(5) }],
      runs: [
        {
          id: id(15, 2),
          accessPointId: id(15, 1),
          direction: 'toward_main',
          distanceReached: feet(82),
          endReason: 'reached_main',
          sections: [{ id: id(15, 3), from: 0, to: feet(82), material: 'vitrified_clay', diameterIn: 4 }],
          observations: [
            { id: id(15, 4), kind: 'roots', at: feet(31), severity: 4, measurePercent: 50, note: 'Roots fill half the pipe.' },
            { id: id(15, 5), kind: 'open_crack', at: feet(33), severity: 4, clock: 1 },
            { id: id(15, 6), kind: 'roots', at: feet(58), severity: 2 },
            { id: id(15, 7), kind: 'main_connection', at: feet(82) },
          ],
        },
      ],
      checkedNotFound: ['sag', 'collapse', 'grease'],
    },
    stills: [
      {
        observationId: id(15, 4),
        name: 'roots',
        markup: [{ id: 'mk-9', type: 'arrow', colour: 'sun', x1: 0.2, y1: 0.2, x2: 0.37, y2: 0.33 }],
      },
    ],
    disclose: true,
    revisions: [
      {
        kind: 'reinspection',
        note: 'Re-inspected after a spot repair at 31–35 ft: the broken clay joint was replaced with PVC and the roots were cut.',
        daysAfter: 12,
        change: (doc) => {
          const run = doc.runs?.[0];
          if (!run) return;
          run.sections = [
            { id: id(15, 3), from: 0, to: feet(30), material: 'vitrified_clay', diameterIn: 4 },
            { id: id(15, 8), from: feet(30), to: feet(36), material: 'pvc', diameterIn: 4 },
            { id: id(15, 9), from: feet(36), to: feet(82), material: 'vitrified_clay', diameterIn: 4 },
          ];
          run.observations = [
            { id: id(15, 10), kind: 'material_change', at: feet(30), fromMaterial: 'vitrified_clay', toMaterial: 'pvc' },
            { id: id(15, 11), kind: 'material_change', at: feet(36), fromMaterial: 'pvc', toMaterial: 'vitrified_clay' },
            { id: id(15, 6), kind: 'roots', at: feet(58), severity: 2 },
            { id: id(15, 7), kind: 'main_connection', at: feet(82) },
          ];
          doc.checkedNotFound = ['open_crack', 'sag', 'collapse', 'grease'];
        },
      },
    ],
  },
];

const accountId = (prefix: string) => {
  const found = demoAccounts.find((a) => a.email.startsWith(`${prefix}@`) || a.email.startsWith(`${prefix}.`));
  if (!found) throw new Error(`no demo account ${prefix}`);
  return found.id;
};

const dayFromToday = (days: number) => {
  const now = new Date();
  return new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth(), now.getUTCDate() + days)).toISOString().slice(0, 10);
};

/** A generated still stored as an upload would be (display copy and thumbnail), with its burned-in copy when marked up. */
async function storeStill(
  storage: MediaStorage,
  mediaDir: string,
  orderId: string,
  spec: DemoStillSpec,
  runId: string,
  observation: { at: number; videoTime?: number | null | undefined },
  createdBy: string,
  now: string,
) {
  const work = mkdtempSync(path.join(tmpdir(), 'underfoot-report-seed-'));
  try {
    const source = path.join(work, 'source.jpg');
    writeFileSync(source, await demoStill(spec.name));
    const display = path.join(work, 'display.jpg');
    const thumbnail = path.join(work, 'thumb.jpg');
    const ingested = await ingestStill(source, { display, thumbnail }, { maxPixels: 100_000_000 });
    const stillId = randomUUID();
    const key = `orders/${orderId}/${stillId}.jpg`;
    const thumbnailKey = `orders/${orderId}/${stillId}-thumb.jpg`;
    await storage.putFile(key, display);
    await storage.putFile(thumbnailKey, thumbnail);
    const markup = spec.markup ? markupSchema.parse({ shapes: spec.markup }) : null;
    const base = {
      order_id: orderId,
      run_id: runId,
      observation_id: spec.observationId,
      mime: 'image/jpeg',
      width: ingested.width,
      height: ingested.height,
      duration_seconds: null,
      footage: observation.at,
      created_by: createdBy,
      created_at: now,
      updated_at: now,
    };
    const rows: Record<string, unknown>[] = [
      {
        ...base,
        id: stillId,
        kind: 'still',
        source_media_id: null,
        storage_key: key,
        thumbnail_key: thumbnailKey,
        size_bytes: ingested.sizeBytes,
        video_time: spec.fromVideo ? (observation.videoTime ?? null) : null,
        origin: spec.fromVideo ? 'frame_grab' : 'photo',
        original_name: `${spec.name}.jpg`,
        markup: markup ? JSON.stringify(markup) : null,
        markup_version: markup ? 1 : 0,
      },
    ];
    if (markup) {
      const renderedId = randomUUID();
      const renderedKey = `orders/${orderId}/${renderedId}.jpg`;
      const renderedFile = path.join(work, 'rendered.jpg');
      const { sizeBytes } = await renderMarkedUp(path.join(mediaDir, ...key.split('/')), markup, renderedFile);
      await storage.putFile(renderedKey, renderedFile);
      rows.push({
        ...base,
        id: renderedId,
        kind: 'rendered',
        source_media_id: stillId,
        storage_key: renderedKey,
        thumbnail_key: null,
        size_bytes: sizeBytes,
        video_time: null,
        origin: 'markup',
        original_name: '',
        markup: null,
        markup_version: 0,
      });
    }
    return { stillId, rows };
  } finally {
    rmSync(work, { recursive: true, force: true });
  }
}

async function insertOrder(trx: Knex, report: DemoReport, nowIso: string) {
  const propertyId = report.id.replace(/^a/, 'b');
  const total = demoFeeItems[0].priceCents;
  await trx('properties').insert({
    id: propertyId,
    company_id: demoCompany.id,
    street: report.street,
    unit: '',
    city: 'Alder Falls',
    region: 'OR',
    postal_code: report.postalCode,
    address_key: [report.street, '', report.postalCode].map((s) => s.toLowerCase()).join('|'),
    year_built: report.yearBuilt,
    property_type: 'single_family',
    occupancy: 'occupied',
    access_notes: '',
    created_at: nowIso,
  });
  const orderingAgent = accountId(report.parties[0]![0]);
  const visit = dayFromToday(-report.daysAgo);
  const deadline = dayFromToday(Math.max(3, 14 - report.daysAgo));
  await trx('orders').insert({
    id: report.id,
    company_id: demoCompany.id,
    property_id: propertyId,
    kind: report.kind,
    ordering_side: orderingSideOf(report.kind),
    status: 'scheduled',
    contingency_deadline: deadline,
    preferred_dates: JSON.stringify([visit]),
    payer: 'agent_now',
    fee_total_cents: total,
    payment_state: 'paid',
    assigned_inspector_id: accountId(report.inspector),
    window_date: visit,
    window_start: '09:00',
    window_end: '11:00',
    note: '',
    created_by: orderingAgent,
    created_at: nowIso,
    updated_at: nowIso,
  });
  await trx('order_fee_lines').insert({
    order_id: report.id,
    fee_item_id: demoFeeItems[0].id,
    name: demoFeeItems[0].name,
    price_cents: total,
  });
  await trx('order_parties').insert(
    report.parties.map(([who, role]) => ({
      order_id: report.id,
      company_id: demoCompany.id,
      contingency_deadline: deadline,
      user_id: accountId(who),
      party_role: role,
      created_at: nowIso,
    })),
  );
  await trx('order_events').insert([
    {
      order_id: report.id,
      actor_user_id: orderingAgent,
      type: 'created',
      detail: JSON.stringify({ feeTotalCents: total }),
      created_at: nowIso,
    },
    { order_id: report.id, actor_user_id: orderingAgent, type: 'paid', detail: JSON.stringify({ amountCents: total }), created_at: nowIso },
  ]);
  await trx('payments').insert({
    id: report.id.replace(/^a/, 'c'),
    order_id: report.id,
    checkout_session_id: `cs_demo_${report.id.slice(-4)}`,
    checkout_url: 'about:blank',
    payment_intent_id: `pi_demo_${report.id.slice(-4)}`,
    amount_cents: total,
    currency: 'usd',
    status: 'paid',
    created_by: orderingAgent,
    created_at: nowIso,
    updated_at: nowIso,
  });
}

/**
 * Seed the demo's published reports. Runs once: an order that already exists is left alone.
 * Returns the path of the pre-listing report's disclosure link (its token exists only here).
 */
export async function seedDemoReports(
  db: Knex,
  options: { mediaDir: string; publicUrl?: string },
): Promise<{ seeded: number; disclosureLinkPath: string | null }> {
  const storage = createLocalDiskStorage(options.mediaDir);
  const service = createReportsService({ db, publicUrl: options.publicUrl ?? '', mailQueued: () => undefined, storage });
  const officeUser = await findUserById(db, accountId('dana'));
  if (!officeUser || !(await db('companies').where({ id: demoCompany.id }).first('id'))) return { seeded: 0, disclosureLinkPath: null };
  let seeded = 0;
  let disclosureLinkPath: string | null = null;

  for (const report of reports) {
    if (await db('orders').where({ id: report.id }).first('id')) continue;
    const nowIso = new Date().toISOString();
    const inspectorId = accountId(report.inspector);
    await db.transaction((trx) => insertOrder(trx, report, nowIso));

    const document: InspectionInput = structuredClone({ ...report.document, id: report.id });
    const mediaRows: Record<string, unknown>[] = [];
    if (report.videoRunId) {
      const video = await demoVideo();
      const videoId = randomUUID();
      const key = `orders/${report.id}/${videoId}.mp4`;
      await storage.putStream(key, Readable.from([video]));
      mediaRows.push({
        id: videoId,
        order_id: report.id,
        kind: 'video',
        run_id: report.videoRunId,
        observation_id: null,
        source_media_id: null,
        storage_key: key,
        thumbnail_key: null,
        mime: 'video/mp4',
        size_bytes: video.length,
        width: 320,
        height: 240,
        duration_seconds: 8,
        video_time: null,
        footage: null,
        origin: 'upload',
        original_name: 'run-toward-main.mp4',
        markup: null,
        markup_version: 0,
        created_by: inspectorId,
        created_at: nowIso,
        updated_at: nowIso,
      });
      const run = document.runs?.find((r) => r.id === report.videoRunId);
      if (run) run.videoFileId = videoId;
    }
    for (const spec of report.stills) {
      const run = document.runs?.find((r) => r.observations?.some((o) => o.id === spec.observationId));
      const observation = run?.observations?.find((o) => o.id === spec.observationId);
      if (!run || !observation) throw new Error(`demo report ${report.street}: no observation ${spec.observationId}`);
      const stored = await storeStill(storage, options.mediaDir, report.id, spec, run.id, observation, inspectorId, nowIso);
      observation.stillIds = [...(observation.stillIds ?? []), stored.stillId];
      mediaRows.push(...stored.rows);
    }
    const parsed: Inspection = inspectionSchema.parse(document);
    await db.transaction(async (trx) => {
      for (const kind of ['video', 'still', 'rendered']) {
        const ofKind = mediaRows.filter((r) => r.kind === kind);
        if (ofKind.length > 0) await trx('media').insert(ofKind);
      }
      await trx('inspections').insert({
        order_id: report.id,
        document: JSON.stringify(parsed),
        version: 1,
        created_at: nowIso,
        updated_at: nowIso,
        updated_by: inspectorId,
      });
    });

    // Published the day after the visit, through the same service the office uses.
    await service.publish(officeUser, report.id, { note: '' });
    const publishedOn = (days: number) => new Date(`${dayFromToday(days)}T16:30:00.000Z`).toISOString();
    await db('report_revisions')
      .where({ order_id: report.id, number: 1 })
      .update({ published_at: publishedOn(-report.daysAgo + 1) });

    let number = 1;
    for (const revision of report.revisions ?? []) {
      await service.reopen(officeUser, report.id);
      const stored = await db('inspections').where({ order_id: report.id }).first();
      const next: InspectionInput = JSON.parse(stored.document);
      revision.change(next);
      await db('inspections')
        .where({ order_id: report.id })
        .update({
          document: JSON.stringify(inspectionSchema.parse(next)),
          version: Number(stored.version) + 1,
          updated_at: nowIso,
          updated_by: inspectorId,
        });
      await service.publish(officeUser, report.id, { note: revision.note, kind: revision.kind });
      number += 1;
      await db('report_revisions')
        .where({ order_id: report.id, number })
        .update({ published_at: publishedOn(Math.min(0, -report.daysAgo + 1 + revision.daysAfter)) });
    }

    if (report.disclose) {
      const orderingAgent = await findUserById(db, accountId(report.parties[0]![0]));
      if (orderingAgent) await service.setDisclosure(orderingAgent, report.id, true);
    }
    if (report.disclosureLink) {
      const agent = await findUserById(db, accountId(report.parties[0]![0]));
      if (agent) {
        const link = await service.createShareLink(agent, report.id, {
          purpose: 'disclosure',
          label: 'Listing disclosure',
          expiresInDays: null,
          showCosts: true,
        });
        disclosureLinkPath = new URL(link.url, 'http://localhost').pathname;
      }
    }
    seeded += 1;
  }
  return { seeded, disclosureLinkPath };
}
