/**
 * A company two years into using Underfoot, generated straight into the tables for the scale bench:
 * 100 000 orders and 1 000 000 observations (inside the inspection documents, runs[].observations).
 *
 * Rows go in through the knex pool's own better-sqlite3 connection with prepared statements inside
 * a few large transactions (no query building per row). Everything is invented (example.com
 * addresses, made-up towns around Alder Falls); a seeded generator makes every run the same data,
 * ids included (only the dates move with the day it runs).
 */
import { performance } from 'node:perf_hooks';
import { isDeepStrictEqual } from 'node:util';
import {
  accessPointKinds,
  analyseInspection,
  bendAngles,
  branchFittings,
  defectKinds,
  demoPriceBook,
  feet,
  formatAddress,
  inspectionSchema,
  kindInfo,
  propertyTypeNames,
  sideOf,
  type DefectKind,
  type GradeLevel,
  type Inspection,
  type Material,
  type Observation,
  type OrderStatus,
  type PartyRole,
  type PropertyType,
  type Run,
  type Side,
} from '@underfoot/core';
import type { TestContext } from '../support/test-app.ts';

export interface ScaleOptions {
  orders: number;
  observations: number;
  agents: number;
  clients: number;
  /** Office staff and inspectors besides the test context's own. */
  extraOffice: number;
  extraInspectors: number;
  /** Published reports with a full snapshot besides every one the bench agent may read (the rest get a small valid one). */
  fullSnapshotSample: number;
}

export const defaultScale: ScaleOptions = {
  orders: 100_000,
  observations: 1_000_000,
  agents: 200,
  clients: 60_000,
  extraOffice: 3,
  extraInspectors: 7,
  fullSnapshotSample: 2_000,
};

export interface ScaleData {
  rows: Record<string, number>;
  byStatus: Record<OrderStatus, number>;
  observations: number;
  /** Published reports with the full snapshot (a real analysis of their own inspection). */
  fullSnapshots: number;
  /** Bytes of snapshot JSON: mean of the full ones and of the small ones. */
  snapshotBytes: { full: number; small: number };
  /** Orders the bench agent (the test context's agent) is a party on. */
  agentOrders: number;
  /** The agent in the middle of the spread, given the test password so the bench can sign in as them. */
  medianAgent: { email: string; orders: number };
  /** The most orders any one agent is on. */
  busiestAgentOrders: number;
  /** Published reports the bench agent may read (released to their side), all with full snapshots. */
  agentReadable: string[];
  seconds: { users: number; orders: number; inspectionsAndReports: number; snapshots: number; total: number };
}

/** A small deterministic generator (mulberry32), so every run builds the same company. */
function rng(seed: number) {
  let a = seed >>> 0;
  const next = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const int = (min: number, max: number) => min + Math.floor(next() * (max - min + 1));
  const pick = <T>(list: readonly T[]): T => list[Math.floor(next() * list.length)]!;
  const chance = (p: number) => next() < p;
  const hex = (digits: number) =>
    Math.floor(next() * 16 ** digits)
      .toString(16)
      .padStart(digits, '0');
  /** A version-4-shaped UUID from the seeded sequence: same ids every run, and far cheaper than crypto's. */
  const uuid = () => `${hex(8)}-${hex(4)}-4${hex(3)}-${(8 + int(0, 3)).toString(16)}${hex(3)}-${hex(6)}${hex(6)}`;
  return { next, int, pick, chance, uuid };
}
type Rng = ReturnType<typeof rng>;

const DAY_MS = 86_400_000;
const isoDate = (ms: number) => new Date(ms).toISOString().slice(0, 10);

const firstNames = [
  'Ada',
  'Bram',
  'Cleo',
  'Dev',
  'Esme',
  'Farid',
  'Greta',
  'Hal',
  'Ines',
  'Jonah',
  'Kira',
  'Lio',
  'Mara',
  'Nils',
  'Oona',
  'Pax',
];
const lastNames = ['Ashgrove', 'Brookline', 'Culvert', 'Dunmore', 'Eastwick', 'Fernhill', 'Gully', 'Hollins', 'Ivers', 'Juniper', 'Kettle'];
const streets = ['Sluice Row', 'Beacon Hill Road', 'Larkspur Lane', 'Millrace Street', 'Tannery Way', 'Heron Court', 'Quarry Lane'];
const streetsMore = ['Weir Avenue', 'Orchard Terrace', 'Fennel Street', 'Copper Beech Drive', 'Mossbank Road', 'Ferry Lane'];
const towns = [
  { city: 'Alder Falls', postal: ['97411', '97412', '97413'] },
  { city: 'North Alder', postal: ['97415'] },
  { city: 'Cedar Ferry', postal: ['97418', '97419'] },
  { city: 'Willow Bend', postal: ['97421'] },
];
const propertyTypesSeen: PropertyType[] = ['single_family', 'single_family', 'single_family', 'townhouse', 'condominium', 'multi_family'];
const accessNotes = [
  'Cleanout by the front steps.',
  'Side gate code 4410.',
  'Dog in the yard; call first.',
  '',
  'Lockbox on the back door.',
];

/** Pipe materials by the decade the house was built (older lines are clay and cast iron, newer ones plastic). */
function materialFor(yearBuilt: number, r: Rng): Material {
  if (yearBuilt < 1950) return r.pick<Material>(['vitrified_clay', 'vitrified_clay', 'cast_iron', 'concrete']);
  if (yearBuilt < 1975) return r.pick<Material>(['cast_iron', 'vitrified_clay', 'asbestos_cement', 'bituminous_fiber']);
  return r.pick<Material>(['abs', 'pvc', 'pvc', 'cast_iron']);
}

const notesFor: Partial<Record<DefectKind, string[]>> = {
  roots: ['Fine roots at the joint.', 'Root mass, about a quarter of the opening.'],
  joint_offset: ['Step at the joint catches paper.'],
  crack: ['Crack along the crown.'],
  debris: ['Grit settled along the invert.'],
  standing_water: ['Water holds after the belly.'],
};

/**
 * One recorded line in the stored form (core's inspectionSchema output, every default filled in),
 * with exactly `count` observations spread over one or two runs.
 */
export function makeInspection(orderId: string, count: number, house: { yearBuilt: number; type: PropertyType }, r: Rng): Inspection {
  const accessPoints = [
    {
      id: r.uuid(),
      kind: r.chance(0.7) ? ('cleanout_two_way' as const) : r.pick(accessPointKinds),
      locationNote: r.pick(['By the front steps', 'Under the kitchen sink', 'Beside the driveway', 'Basement wall']),
      offsetFromBuilding: null,
    },
  ];
  const runCount = count >= 8 && r.chance(0.5) ? 2 : 1;
  const runs: Run[] = [];
  let left = count;
  for (let ri = 0; ri < runCount; ri++) {
    const n = ri === runCount - 1 ? left : Math.ceil(left / 2);
    left -= n;
    const distanceFt = r.int(30, 120);
    const distance = feet(distanceFt);
    const split = r.chance(0.4) ? feet(r.int(8, distanceFt - 8)) : null;
    const firstMaterial = materialFor(house.yearBuilt, r);
    const secondMaterial = materialFor(house.yearBuilt + 30, r);
    const sections = split
      ? [
          { id: r.uuid(), from: 0, to: split, material: firstMaterial, diameterIn: 4 },
          { id: r.uuid(), from: split, to: distance, material: secondMaterial, diameterIn: 4 },
        ]
      : [{ id: r.uuid(), from: 0, to: distance, material: firstMaterial, diameterIn: 4 }];
    const observations: Observation[] = [];
    const base = { note: '', videoTime: null, stillIds: [] as string[] };
    for (let k = 0; k < n; k++) {
      const at = k === n - 1 ? distance : Math.round((distance * (k + r.next())) / n);
      if (k === n - 1) {
        observations.push({ ...base, id: r.uuid(), at, kind: 'run_end', reason: 'reached_main' });
      } else if (split !== null && k === 0) {
        observations.push({
          ...base,
          id: r.uuid(),
          at: split,
          kind: 'material_change',
          fromMaterial: firstMaterial,
          toMaterial: secondMaterial,
        });
      } else if (r.chance(0.25)) {
        observations.push(
          r.chance(0.6)
            ? { ...base, id: r.uuid(), at, kind: 'bend', angle: r.pick(bendAngles) }
            : { ...base, id: r.uuid(), at, kind: 'branch', fitting: r.pick(branchFittings), clock: r.int(1, 12) },
        );
      } else {
        const kind = r.pick(defectKinds);
        const to = kindInfo[kind].continuous && r.chance(0.5) ? Math.min(distance, at + feet(r.int(1, 4))) : null;
        observations.push({
          ...base,
          note: r.pick(notesFor[kind] ?? ['']),
          // Seconds into the run's video: roughly a foot a second as the camera is pushed, plus stops.
          videoTime: Math.round(at / 3048) + r.int(0, 20),
          id: r.uuid(),
          at,
          kind,
          severity: r.int(1, 5),
          to,
          clock: r.chance(0.7) ? r.int(1, 12) : null,
          measurePercent: null,
          severityReason: '',
        });
      }
    }
    runs.push({
      id: r.uuid(),
      accessPointId: accessPoints[0]!.id,
      direction: ri === 0 ? 'toward_main' : 'toward_building',
      distanceReached: distance,
      endReason: 'reached_main',
      endNote: '',
      videoFileId: null,
      videoOffset: 0,
      sections,
      observations,
      depthReadings: [],
      surfaces: [],
    });
  }
  const seen = new Set(runs.flatMap((run) => run.observations.map((o) => o.kind)));
  return {
    id: orderId,
    property: { yearBuilt: house.yearBuilt, type: house.type, notes: '' },
    accessPoints,
    runs,
    checkedNotFound: defectKinds.filter((k) => !seen.has(k)).slice(0, 4),
    gradeOverride: null,
  };
}

/** The few better-sqlite3 calls used here; knex's pool hands out this object for SQLite. */
interface SqliteConnection {
  prepare(sql: string): { run(...params: unknown[]): unknown };
  transaction<T>(fn: () => T): () => T;
  pragma(sql: string, options?: { simple: boolean }): unknown;
}

/** Insert many rows of one table with a prepared statement inside one transaction. */
function bulkInsert(conn: SqliteConnection, table: string, columns: string[], rows: Iterable<unknown[]>): number {
  const statement = conn.prepare(
    `insert into "${table}" (${columns.map((c) => `"${c}"`).join(', ')}) values (${columns.map(() => '?').join(', ')})`,
  );
  let n = 0;
  conn.transaction(() => {
    for (const row of rows) {
      statement.run(...row);
      n++;
    }
  })();
  return n;
}

/** Zipf-like weights: a few agents order most inspections (exponent 0.5 puts the top agent on ~5 % of orders). */
function weightedPicker(count: number, exponent: number, r: Rng) {
  const cumulative: number[] = [];
  let sum = 0;
  for (let k = 0; k < count; k++) cumulative.push((sum += 1 / (k + 1) ** exponent));
  return () => {
    const x = r.next() * sum;
    let lo = 0;
    let hi = count - 1;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (cumulative[mid]! < x) lo = mid + 1;
      else hi = mid;
    }
    return lo;
  };
}

/** Status by the order's age: recent orders are still open, older ones mostly published, a few left open and stale. */
function statusFor(ageDays: number, r: Rng): OrderStatus {
  const x = r.next();
  if (ageDays < 3) return x < 0.6 ? 'requested' : x < 0.95 ? 'scheduled' : 'cancelled';
  if (ageDays < 10) return x < 0.3 ? 'scheduled' : x < 0.5 ? 'recorded' : x < 0.65 ? 'in_review' : x < 0.95 ? 'published' : 'cancelled';
  return x < 0.905 ? 'published' : x < 0.975 ? 'cancelled' : x < 0.99 ? 'requested' : 'scheduled';
}

export async function seedScale(ctx: TestContext, options: ScaleOptions = defaultScale): Promise<ScaleData> {
  const started = performance.now();
  const r = rng(8);
  const { db } = ctx.services;
  const now = Date.now();
  const nowIso = new Date(now).toISOString();
  const companyId = ctx.companyId;
  const company = await db('companies').where({ id: companyId }).first();
  const rows: Record<string, number> = {};

  const conn = (await db.client.acquireConnection()) as SqliteConnection;
  // Random UUID keys land all over each index, so a page cache smaller than the indexes rereads
  // pages on every insert. A big cache while generating only, then the app's own setting again for the reads.
  const cacheSize = conn.pragma('cache_size', { simple: true });
  conn.pragma('cache_size = -524288');
  try {
    // ---- people: the test context's four, plus more office staff, inspectors, ~200 agents and many clients
    const t0 = performance.now();
    const inspectors = [ctx.users.inspector.id];
    const office = [ctx.users.office.id];
    const agents = [ctx.users.agent.id];
    const agentEmails = new Map<string, string>([[ctx.users.agent.id, ctx.users.agent.email]]);
    const clients = [ctx.users.client.id];
    const inspectorNames = new Map<string, string>([[ctx.users.inspector.id, 'inspector person']]);
    const name = (i: number) => `${firstNames[i % firstNames.length]} ${lastNames[Math.floor(i / firstNames.length) % lastNames.length]}`;
    function* people(): Generator<unknown[]> {
      const make = (role: string, email: string, i: number, active: boolean) => {
        const id = r.uuid();
        return [id, companyId, email, name(i), role, active ? 'x' : null, active ? nowIso : null, nowIso, nowIso];
      };
      for (let i = 0; i < options.extraOffice; i++) {
        const row = make('office', `office${i + 2}@mudlark.example.com`, i, true);
        office.push(row[0] as string);
        yield row;
      }
      for (let i = 0; i < options.extraInspectors; i++) {
        const row = make('inspector', `inspector${i + 2}@mudlark.example.com`, i + 3, true);
        inspectors.push(row[0] as string);
        inspectorNames.set(row[0] as string, row[3] as string);
        yield row;
      }
      for (let i = 1; i < options.agents; i++) {
        const row = make('agent', `agent${i}@realty${i % 17}.example.com`, i + 11, true);
        agents.push(row[0] as string);
        agentEmails.set(row[0] as string, row[2] as string);
        yield row;
      }
      for (let i = 1; i < options.clients; i++) {
        // Most clients never set a password: they read the report from the invitation or not at all.
        const row = make('client', `client${i}@example.com`, i + 29, r.chance(0.35));
        clients.push(row[0] as string);
        yield row;
      }
    }
    // The extra people's password hash is a placeholder: only the context's own four sign in, and the
    // median agent, who is given the test password below.
    rows.users =
      4 +
      bulkInsert(
        conn,
        'users',
        ['id', 'company_id', 'email', 'name', 'role', 'password_hash', 'email_verified_at', 'created_at', 'updated_at'],
        people(),
      );
    const t1 = performance.now();

    // ---- properties, orders and their parties
    const pickAgent = weightedPicker(agents.length, 0.5, r);
    const byStatus = { requested: 0, scheduled: 0, recorded: 0, in_review: 0, published: 0, cancelled: 0 } as Record<OrderStatus, number>;
    interface OrderFacts {
      id: string;
      status: OrderStatus;
      side: 'buyer' | 'seller';
      yearBuilt: number;
      type: PropertyType;
      address: string;
      inspector: string | null;
      windowDate: string | null;
      createdMs: number;
      /** The bench agent is on the order and the report is released to their side (core's report.read). */
      agentMayRead: boolean;
    }
    const facts: OrderFacts[] = [];
    const propertyRows: unknown[][] = [];
    const orderRows: unknown[][] = [];
    const partyRows: unknown[][] = [];
    let agentOrders = 0;
    for (let i = 0; i < options.orders; i++) {
      const ageDays = r.next() * 730;
      const createdMs = now - ageDays * DAY_MS;
      const createdAt = new Date(createdMs).toISOString();
      const status = statusFor(ageDays, r);
      byStatus[status]++;
      const kind = r.chance(0.8) ? 'pre_purchase' : 'pre_listing';
      const side = kind === 'pre_purchase' ? 'buyer' : 'seller';
      const town = r.pick(towns);
      const street = `${r.int(2, 9800)} ${r.pick(r.chance(0.5) ? streets : streetsMore)}`;
      const unit = r.chance(0.1) ? `Unit ${r.int(1, 40)}` : '';
      const postal = r.pick(town.postal);
      const yearBuilt = r.int(1905, 2018);
      const type = r.pick(propertyTypesSeen);
      const propertyId = r.uuid();
      propertyRows.push([
        propertyId,
        companyId,
        street,
        unit,
        town.city,
        'OR',
        postal,
        [street, unit, postal].map((s) => s.toLowerCase()).join('|'),
        yearBuilt,
        type,
        r.chance(0.8) ? 'occupied' : 'vacant',
        r.pick(accessNotes),
        createdAt,
      ]);
      const id = r.uuid();
      const scheduledOnward = status !== 'requested' && !(status === 'cancelled' && r.chance(0.6));
      const windowMs = createdMs + r.int(1, 6) * DAY_MS;
      const windowStart = r.pick(['08:00', '10:00', '13:00', '15:00']);
      const inspector = scheduledOnward ? r.pick(inspectors) : null;
      const payer = r.chance(0.6) ? 'agent_now' : 'client_before_release';
      const paid = status === 'published' ? r.chance(0.97) : status !== 'requested' && payer === 'agent_now';
      const held = status === 'published' && !paid;
      const ordering = agents[pickAgent()]!;
      const client = clients[Math.floor(r.next() * clients.length)]!;
      const releasedTo: Side[] = status === 'published' && !held ? (r.chance(0.3) ? ['buyer', 'seller'] : [side]) : [];
      facts.push({
        id,
        status,
        side,
        yearBuilt,
        type,
        address: formatAddress({ street, unit, city: town.city, region: 'OR', postalCode: postal }),
        inspector,
        windowDate: scheduledOnward ? isoDate(windowMs) : null,
        createdMs,
        agentMayRead: false,
      });
      const deadline = isoDate(createdMs + r.int(7, 17) * DAY_MS);
      orderRows.push([
        id,
        companyId,
        propertyId,
        kind,
        side,
        status,
        deadline,
        JSON.stringify([isoDate(createdMs + 2 * DAY_MS), isoDate(createdMs + 3 * DAY_MS)]),
        payer,
        r.pick([29500, 32500, 36500, 41000, 45000]),
        status === 'cancelled' && paid ? 'refunded' : paid ? 'paid' : 'unpaid',
        inspector,
        scheduledOnward ? isoDate(windowMs) : null,
        scheduledOnward ? windowStart : null,
        scheduledOnward ? `${String(Number(windowStart.slice(0, 2)) + 2).padStart(2, '0')}:00` : null,
        r.chance(0.2) ? 'Seller asks for a call the day before.' : '',
        status === 'cancelled' ? 'The sale fell through.' : null,
        JSON.stringify(releasedTo),
        held ? 1 : 0,
        r.chance(0.85) ? ordering : r.pick(office),
        createdAt,
        new Date(Math.min(now, createdMs + r.int(1, 14) * DAY_MS)).toISOString(),
      ]);
      const parties: [string, PartyRole][] = [
        [ordering, side === 'buyer' ? 'buyers_agent' : 'listing_agent'],
        [client, side === 'buyer' ? 'buyer' : 'seller'],
      ];
      // Some buyer-side orders carry the listing agent too, and an occasional agent is on both sides.
      if (side === 'buyer' && r.chance(0.3)) parties.push([agents[pickAgent()]!, 'listing_agent']);
      for (const [userId, role] of parties) partyRows.push([id, userId, role, createdAt, companyId, deadline]);
      const agentRoles = parties.filter(([u]) => u === ctx.users.agent.id).map(([, role]) => role);
      if (agentRoles.length > 0) {
        agentOrders++;
        facts[facts.length - 1]!.agentMayRead = agentRoles.some((role) => releasedTo.includes(sideOf(role)));
      }
    }
    rows.properties = bulkInsert(
      conn,
      'properties',
      [
        'id',
        'company_id',
        'street',
        'unit',
        'city',
        'region',
        'postal_code',
        'address_key',
        'year_built',
        'property_type',
        'occupancy',
        'access_notes',
        'created_at',
      ],
      propertyRows,
    );
    rows.orders = bulkInsert(
      conn,
      'orders',
      [
        'id',
        'company_id',
        'property_id',
        'kind',
        'ordering_side',
        'status',
        'contingency_deadline',
        'preferred_dates',
        'payer',
        'fee_total_cents',
        'payment_state',
        'assigned_inspector_id',
        'window_date',
        'window_start',
        'window_end',
        'note',
        'cancel_reason',
        'released_to',
        'release_held',
        'created_by',
        'created_at',
        'updated_at',
      ],
      orderRows,
    );
    // Parties on the same order twice with the same role would break the unique key; keep the first.
    const seenParty = new Set<string>();
    rows.order_parties = bulkInsert(
      conn,
      'order_parties',
      ['order_id', 'user_id', 'party_role', 'created_at', 'company_id', 'contingency_deadline'],
      partyRows.filter((p) => {
        const key = `${p[0]}|${p[1]}|${p[2]}`;
        if (seenParty.has(key)) return false;
        seenParty.add(key);
        return true;
      }),
    );
    // The median agent by orders they are on (each order once, whatever their roles on it).
    const agentSet = new Set(agents);
    const ordersOf = new Map<string, Set<string>>();
    for (const [orderId, userId] of partyRows as [string, string][]) {
      if (!agentSet.has(userId)) continue;
      let mine = ordersOf.get(userId);
      if (!mine) ordersOf.set(userId, (mine = new Set()));
      mine.add(orderId);
    }
    const bySize = agents.map((id) => ({ id, orders: ordersOf.get(id)?.size ?? 0 })).sort((a, b) => a.orders - b.orders);
    const median = bySize[Math.floor(bySize.length / 2)]!;
    const medianAgent = { email: agentEmails.get(median.id)!, orders: median.orders };
    const busiestAgentOrders = bySize[bySize.length - 1]!.orders;
    conn
      .prepare('update "users" set "password_hash" = (select "password_hash" from "users" where "id" = ?) where "id" = ?')
      .run(ctx.users.agent.id, median.id);
    const t2 = performance.now();

    // ---- inspections (every recorded, in-review and published order; 1M observations in all),
    // with the published report revision and a few views of each, generated order by order so no
    // document is held in memory longer than its own insert
    const recorded = facts.filter((f) => f.status === 'recorded' || f.status === 'in_review' || f.status === 'published');
    const mean = options.observations / recorded.length;
    const counts = recorded.map(() => Math.max(3, Math.round(mean + (r.next() - 0.5) * 2 * Math.min(8, mean - 3))));
    // Nudge single counts until the total is exactly the target.
    let total = counts.reduce((a, b) => a + b, 0);
    while (total !== options.observations) {
      const k = Math.floor(r.next() * counts.length);
      if (total > options.observations && counts[k]! > 3) {
        counts[k]!--;
        total--;
      } else if (total < options.observations) {
        counts[k]!++;
        total++;
      }
    }
    const companySnapshot = {
      name: company.name as string,
      licenceNumber: (company.licence_number as string | null) ?? null,
      phone: (company.phone as string | null) ?? null,
      email: (company.email as string | null) ?? null,
      footer: (company.report_footer as string | null) ?? null,
    };
    const published = recorded.filter((f) => f.status === 'published');
    const readable = new Set(published.filter((f) => f.agentMayRead).map((f) => f.id));
    const sampleEvery = Math.max(1, Math.floor(published.length / options.fullSnapshotSample));
    let fullSnapshots = 0;
    let fullBytes = 0;
    let smallBytes = 0;
    let smallCount = 0;
    /**
     * The full snapshot is what publishing stores: the order's own inspection and core's analysis of
     * it. The small one has the same shape and is valid for every reader, but freezes a short stand-in
     * line (one run to the main with nothing found, one of 40 analysed up front) instead of the order's own document, so
     * 90 000 reports do not take minutes of analysis and gigabytes of JSON to generate.
     */
    const baseSnapshot = (f: OrderFacts) => ({
      orderId: f.id,
      kind: f.side === 'buyer' ? ('pre_purchase' as const) : ('pre_listing' as const),
      orderingSide: f.side,
      property: { address: f.address, yearBuilt: f.yearBuilt, propertyType: propertyTypeNames[f.type] },
      company: companySnapshot,
      inspector: f.inspector ? { name: inspectorNames.get(f.inspector) ?? 'inspector person' } : null,
      inspectedOn: f.windowDate,
      media: [],
    });
    const standIns = Array.from({ length: 40 }, (_, k) => {
      const inspection = makeInspection(r.uuid(), 1, { yearBuilt: 1910 + k * 2, type: 'single_family' }, r);
      return { inspection, analysis: analyseInspection(inspection, demoPriceBook, { demoPrices: true }) };
    });
    const snapshotFor = (f: OrderFacts, doc: Inspection, full: boolean): { json: string; grade: GradeLevel } => {
      const standIn = standIns[Math.floor(r.next() * standIns.length)]!;
      const { inspection, analysis } = full
        ? { inspection: doc, analysis: analyseInspection(doc, demoPriceBook, { demoPrices: true }) }
        : { inspection: { ...standIn.inspection, id: f.id }, analysis: standIn.analysis };
      // The shape publishing stores (ReportSnapshot in apps/server/src/modules/reports/reports.repo.ts).
      const snapshot = { ...baseSnapshot(f), inspection, analysis };
      return { json: JSON.stringify(snapshot), grade: analysis.grade.level };
    };
    const insertInspection = conn.prepare(
      'insert into "inspections" ("order_id", "document", "version", "created_at", "updated_at", "updated_by") values (?, ?, ?, ?, ?, ?)',
    );
    const insertRevision = conn.prepare(
      'insert into "report_revisions" ("id", "order_id", "number", "kind", "note", "snapshot", "grade", "published_by", "published_at") values (?, ?, ?, ?, ?, ?, ?, ?, ?)',
    );
    const insertView = conn.prepare(
      'insert into "report_views" ("order_id", "revision_number", "viewer_user_id", "what", "ip", "viewed_at") values (?, ?, ?, ?, ?, ?)',
    );
    rows.inspections = 0;
    rows.report_revisions = 0;
    rows.report_views = 0;
    let publishedIndex = 0;
    let snapshotMs = 0;
    conn.transaction(() => {
      for (const [k, f] of recorded.entries()) {
        const doc = makeInspection(f.id, counts[k]!, f, r);
        // The generated documents must be what the server itself would store.
        if (k < 300 && !isDeepStrictEqual(inspectionSchema.parse(doc), doc)) {
          throw new Error(`generated inspection ${f.id} is not in the stored form`);
        }
        const at = new Date(Math.min(now, f.createdMs + 4 * DAY_MS)).toISOString();
        insertInspection.run(f.id, JSON.stringify(doc), r.int(1, 12), at, at, f.inspector);
        rows.inspections!++;
        if (f.status !== 'published') continue;
        const full = readable.has(f.id) || publishedIndex++ % sampleEvery === 0;
        const s0 = performance.now();
        const { json, grade } = snapshotFor(f, doc, full);
        snapshotMs += performance.now() - s0;
        if (full) {
          fullSnapshots++;
          fullBytes += json.length;
        } else {
          smallCount++;
          smallBytes += json.length;
        }
        const publishedMs = Math.min(now - DAY_MS, f.createdMs + 6 * DAY_MS);
        insertRevision.run(r.uuid(), f.id, 1, 'original', '', json, grade, r.pick(office), new Date(publishedMs).toISOString());
        rows.report_revisions!++;
        // The buyer or seller and their agent open a report a few times in its first days.
        for (let v = r.int(0, 4); v > 0; v--) {
          insertView.run(f.id, 1, null, r.chance(0.8) ? 'report' : 'pdf', '127.0.0.1', new Date(publishedMs + v * 3_600_000).toISOString());
          rows.report_views!++;
        }
      }
    })();
    const t4 = performance.now();

    return {
      rows,
      byStatus,
      observations: total,
      fullSnapshots,
      snapshotBytes: { full: fullBytes / Math.max(1, fullSnapshots), small: smallBytes / Math.max(1, smallCount) },
      agentOrders,
      medianAgent,
      busiestAgentOrders,
      agentReadable: [...readable],
      seconds: {
        users: (t1 - t0) / 1000,
        orders: (t2 - t1) / 1000,
        inspectionsAndReports: (t4 - t2) / 1000,
        snapshots: snapshotMs / 1000,
        total: (t4 - started) / 1000,
      },
    };
  } finally {
    conn.pragma(`cache_size = ${Number(cacheSize)}`);
    db.client.releaseConnection(conn);
  }
}
