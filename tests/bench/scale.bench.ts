/**
 * Scale (issue 8, "Prove it holds"): a company two years in, 100 000 orders and 1 000 000
 * observations (scale-data.ts), on a throw-away SQLite file outside the repo. Three reads, each
 * through HTTP with a real session, one request at a time after a warm-up:
 *  - the office queue, as the office home asks for it (requested + scheduled, nearest deadline, 200);
 *  - the agent dashboard, the portal's first page of orders for the agent on the most orders;
 *  - the report read, GET /api/reports/:id, for a published report that agent may read.
 * Target: p95 ≤ 20 ms each, timed as a server's latency is: from sending the request (as a
 * browser does, accepting compressed bodies) to its last byte. For each, the SQL it ran (knex 'query' events) goes through
 * EXPLAIN QUERY PLAN, and a scan of a big table is flagged.
 */
import http from 'node:http';
import { cpus, loadavg } from 'node:os';
import { performance } from 'node:perf_hooks';
import type { Knex } from 'knex';
import { refreshPlannerStatistics } from '@underfoot/server';
import { createTestContext, type TestContext } from '../support/test-app.ts';
import { signedIn } from './report.bench.ts';
import { seedScale, type ScaleData } from './scale-data.ts';

const TARGET_P95_MS = 20;
const WARM_UP = 20;
const REQUESTS = 200;
/** A table with fewer rows than this is small: scanning it costs little whatever the plan. */
const BIG_TABLE_ROWS = 5_000;

const percentile = (values: number[], p: number) => {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.floor((sorted.length - 1) * p))]!;
};
const mark = (met: boolean) => (met ? 'met' : 'NOT met');

interface Endpoint {
  name: string;
  /** Paths to ask for in turn (one path: the same request every time). */
  paths: string[];
  cookie: string;
  /** Judged against the target; the others are printed for scale. */
  judged: boolean;
}

interface CapturedQuery {
  sql: string;
  bindings: unknown[];
}

/** One kept-alive connection, as a browser tab holds. */
const connection = new http.Agent({ keepAlive: true, maxSockets: 1 });

/**
 * One request, timed from sending it to the last byte of the answer. The body stays compressed:
 * this client shares the server's process and event loop, so decoding here (which is the
 * browser's work) would be counted as the server's time.
 */
function get(ctx: TestContext, path: string, cookie: string): Promise<{ ms: number }> {
  return new Promise((resolve, reject) => {
    const start = performance.now();
    const req = http.get(
      `${ctx.baseUrl}${path}`,
      { agent: connection, headers: { cookie, 'accept-encoding': 'gzip, deflate, br' } },
      (res) => {
        const chunks: Buffer[] = [];
        res.on('data', (chunk: Buffer) => chunks.push(chunk));
        res.on('end', () => {
          const ms = performance.now() - start;
          if (res.statusCode !== 200)
            reject(new Error(`GET ${path} answered ${res.statusCode}: ${Buffer.concat(chunks).toString('utf8', 0, 300)}`));
          else resolve({ ms });
        });
        res.on('error', reject);
      },
    );
    req.on('error', reject);
  });
}

/** The size of the JSON an answer holds, decoded. */
async function jsonSize(ctx: TestContext, path: string, cookie: string): Promise<number> {
  const res = await fetch(`${ctx.baseUrl}${path}`, { headers: { cookie } });
  const body = await res.arrayBuffer();
  if (res.status !== 200) throw new Error(`GET ${path} answered ${res.status}: ${Buffer.from(body).toString('utf8', 0, 300)}`);
  return body.byteLength;
}

/** The SQL one request runs, in order, as knex sends it. */
async function captureQueries(ctx: TestContext, path: string, cookie: string): Promise<CapturedQuery[]> {
  const { db } = ctx.services;
  const captured: CapturedQuery[] = [];
  const onQuery = (q: { sql: string; bindings?: unknown[] }) => captured.push({ sql: q.sql, bindings: q.bindings ?? [] });
  db.on('query', onQuery);
  try {
    await get(ctx, path, cookie);
  } finally {
    db.off('query', onQuery);
  }
  return captured;
}

async function tableSizes(db: Knex): Promise<Map<string, number>> {
  const tables = (await db('sqlite_master').where({ type: 'table' }).select('name')) as { name: string }[];
  const sizes = new Map<string, number>();
  for (const { name } of tables) {
    if (name.startsWith('sqlite_')) continue;
    const row = await db(name).count({ n: '*' }).first();
    sizes.set(name, Number(row?.n ?? 0));
  }
  return sizes;
}

interface PlanRow {
  id: number;
  parent: number;
  detail: string;
}

interface PlanFindings {
  /** Scans of a big table, or reads of every order of the company before a sort. */
  warnings: string[];
  /** Counts of every order of the company (from an index alone: no table rows). */
  counts: string[];
}

/** Print each distinct statement's plan, marking what reads a big table whole. */
async function explain(db: Knex, queries: CapturedQuery[], sizes: Map<string, number>): Promise<PlanFindings> {
  const found: PlanFindings = { warnings: [], counts: [] };
  const seen = new Set<string>();
  for (const q of queries) {
    if (seen.has(q.sql)) continue;
    seen.add(q.sql);
    // The plan names aliases ("inspectors"), so map each alias back to its table.
    const aliases = new Map<string, string>();
    for (const m of q.sql.matchAll(/[`"](\w+)[`"] as [`"](\w+)[`"]/g)) aliases.set(m[2]!, m[1]!);
    const tableOf = (name: string) => aliases.get(name) ?? name;
    const rows = (await db.raw(`EXPLAIN QUERY PLAN ${q.sql}`, q.bindings as Knex.RawBinding[])) as PlanRow[];
    console.log(`    ${q.sql.length > 400 ? `${q.sql.slice(0, 400)} …` : q.sql}`);
    const depth = new Map<number, number>([[0, 0]]);
    for (const row of rows) {
      const level = (depth.get(row.parent) ?? 0) + 1;
      depth.set(row.id, level);
      let note = '';
      const scan = /^SCAN (\w+)/.exec(row.detail);
      const search = /^SEARCH (\w+) USING (?:COVERING )?INDEX \w+ \((\w+)=\?\)$/.exec(row.detail);
      if (scan) {
        const table = tableOf(scan[1]!);
        const n = sizes.get(table);
        if (n !== undefined && n >= BIG_TABLE_ROWS) {
          note = `   <-- full scan of ${table} (${n.toLocaleString('en-US')} rows)`;
          found.warnings.push(`${table}: ${row.detail}`);
        } else if (n !== undefined) {
          note = `   (scan of a small table: ${table}, ${n} rows)`;
        }
      } else if (search?.[2] === 'company_id') {
        // One company holds every order here, so a search on company_id alone covers the whole table,
        // unless the index is walked in the list's own order (no sort after it) and the LIMIT ends the walk.
        const table = tableOf(search[1]!);
        const n = sizes.get(table) ?? 0;
        const sortedAfter = rows.some((r) => r.parent === row.parent && /^USE TEMP B-TREE FOR .*ORDER BY/.test(r.detail));
        if (n < BIG_TABLE_ROWS) {
          // A small table: nothing to say.
        } else if (/^select count\(/i.test(q.sql)) {
          note = `   <-- counts all ${n.toLocaleString('en-US')} rows of ${table} from the index alone`;
          found.counts.push(`${table}: ${row.detail}`);
        } else if (!sortedAfter && /\blimit\b/i.test(q.sql)) {
          note = '   (in the list order: the walk stops at the LIMIT)';
        } else {
          note = `   <-- company-wide: reads every row of ${table} (${n.toLocaleString('en-US')})`;
          found.warnings.push(`${table}: ${row.detail}`);
        }
      }
      console.log(`      ${'  '.repeat(level - 1)}${row.detail}${note}`);
    }
  }
  return found;
}

/** Wall times, and the process's CPU time per request (server and client together): less swayed by a busy neighbour. */
async function measure(ctx: TestContext, endpoint: Endpoint): Promise<{ times: number[]; cpuMs: number }> {
  const times: number[] = [];
  const at = (i: number) => endpoint.paths[i % endpoint.paths.length]!;
  for (let i = 0; i < WARM_UP; i++) await get(ctx, at(i), endpoint.cookie);
  const cpu = process.cpuUsage();
  for (let i = 0; i < REQUESTS; i++) times.push((await get(ctx, at(WARM_UP + i), endpoint.cookie)).ms);
  const used = process.cpuUsage(cpu);
  return { times, cpuMs: (used.user + used.system) / 1000 / REQUESTS };
}

function describeData(data: ScaleData) {
  const n = (x: number) => x.toLocaleString('en-US');
  const s = data.seconds;
  console.log(
    `generated in ${s.total.toFixed(1)} s (people ${s.users.toFixed(1)} s, orders and parties ${s.orders.toFixed(1)} s,` +
      ` inspections and reports ${s.inspectionsAndReports.toFixed(1)} s of which report analysis ${s.snapshots.toFixed(1)} s)`,
  );
  console.log(
    `  rows: ${Object.entries(data.rows)
      .map(([table, count]) => `${table} ${n(count)}`)
      .join(', ')}`,
  );
  console.log(
    `  orders by status: ${Object.entries(data.byStatus)
      .map(([status, count]) => `${status} ${n(count)}`)
      .join(', ')}`,
  );
  console.log(
    `  observations ${n(data.observations)} in ${n(data.rows.inspections ?? 0)} inspections;` +
      ` report snapshots: ${n(data.fullSnapshots)} full (${(data.snapshotBytes.full / 1024).toFixed(0)} KB each),` +
      ` the rest small stand-ins (${(data.snapshotBytes.small / 1024).toFixed(0)} KB each)`,
  );
  console.log(
    `  the bench agent is on ${n(data.agentOrders)} orders (the busiest agent is on ${n(data.busiestAgentOrders)}) and may read ${n(data.agentReadable.length)} published reports;` +
      ` the median agent is on ${n(data.medianAgent.orders)}`,
  );
}

export async function benchScale(): Promise<void> {
  const ctx = await createTestContext();
  try {
    const data = await seedScale(ctx);
    // What the server's hourly upkeep does after such growth (db.ts keepPlannerStatistics).
    const analyzed = performance.now();
    await refreshPlannerStatistics(ctx.services.db);
    console.log(`planner statistics refreshed in ${(performance.now() - analyzed).toFixed(0)} ms (PRAGMA optimize)`);
    describeData(data);
    const sizes = await tableSizes(ctx.services.db);
    const { cookie: office } = await signedIn(ctx, ctx.users.office.email);
    const { cookie: agent } = await signedIn(ctx, ctx.users.agent.email);
    const { cookie: medianAgent } = await signedIn(ctx, data.medianAgent.email);
    const [readable, ...others] = data.agentReadable;
    if (!readable || others.length <= WARM_UP + REQUESTS) throw new Error('the bench agent has too few readable reports');
    const endpoints: Endpoint[] = [
      // The exact requests the web app sends (apps/web/src/features/orders/api.ts listSearch).
      {
        name: 'office queue',
        paths: ['/api/orders?status=requested&status=scheduled&sort=deadline&direction=asc&limit=200'],
        cookie: office,
        judged: true,
      },
      { name: 'agent dashboard', paths: ['/api/orders?sort=attention&direction=asc&limit=25'], cookie: agent, judged: true },
      { name: 'report read', paths: [`/api/reports/${readable}`], cookie: agent, judged: true },
      // For scale: the dashboard of the agent in the middle of the spread.
      {
        name: `agent dashboard, median agent (${data.medianAgent.orders} orders)`,
        paths: ['/api/orders?sort=attention&direction=asc&limit=25'],
        cookie: medianAgent,
        judged: false,
      },
      // For scale: the busiest agent's list sorted by the deadline column (read from their party rows).
      { name: 'agent dashboard by deadline', paths: ['/api/orders?sort=deadline&direction=asc&limit=25'], cookie: agent, judged: false },
      // For scale: every read a different report (nothing kept in the process yet), and the office's register of all orders.
      {
        name: 'report read, new report each time',
        paths: others.slice(0, WARM_UP + REQUESTS).map((id) => `/api/reports/${id}`),
        cookie: agent,
        judged: false,
      },
      { name: 'office, all orders', paths: ['/api/orders?sort=created&direction=desc&limit=25'], cookie: office, judged: false },
      // The floor: the cheapest signed-in route (session and user lookup, no list or report work).
      { name: 'GET /api/auth/me', paths: ['/api/auth/me'], cookie: agent, judged: false },
    ];

    console.log(`\nquery plans (tables under ${BIG_TABLE_ROWS.toLocaleString('en-US')} rows count as small):`);
    const warnings: string[] = [];
    const counts: string[] = [];
    for (const endpoint of endpoints) {
      console.log(`  ${endpoint.name}: GET ${endpoint.paths[0]}`);
      // A path not used by the timed runs, so what is kept in memory there stays cold.
      const probe = endpoint.paths.length > 1 ? `/api/reports/${others[others.length - 1]}` : endpoint.paths[0]!;
      const queries = await captureQueries(ctx, probe, endpoint.cookie);
      const found = await explain(ctx.services.db, queries, sizes);
      warnings.push(...found.warnings.map((w) => `${endpoint.name}: ${w}`));
      counts.push(...found.counts.map((c) => `${endpoint.name}: ${c}`));
    }

    // The machine is shared: its load says how much the figures below owe to neighbours.
    const load = loadavg()
      .map((l) => l.toFixed(1))
      .join(', ');
    console.log(
      `\nHTTP, one request at a time on one kept-alive connection, ${WARM_UP} to warm up then ${REQUESTS} timed to the last byte` +
        ` (load average ${load} on ${cpus().length} cores):`,
    );
    for (const endpoint of endpoints) {
      const { times, cpuMs } = await measure(ctx, endpoint);
      const bytes = await jsonSize(ctx, endpoint.paths[0]!, endpoint.cookie);
      const [p50, p95, p99] = [0.5, 0.95, 0.99].map((p) => percentile(times, p)) as [number, number, number];
      const verdict = endpoint.judged ? `target p95 ≤ ${TARGET_P95_MS} ms: ${mark(p95 <= TARGET_P95_MS)}` : 'for scale';
      console.log(
        `  ${endpoint.name.padEnd(44)} p50 ${p50.toFixed(1)} ms  p95 ${p95.toFixed(1)} ms = ${(p95 / TARGET_P95_MS).toFixed(2)}× of ${TARGET_P95_MS} ms  p99 ${p99.toFixed(1)} ms` +
          `  CPU ${cpuMs.toFixed(1)} ms  (${(bytes / 1024).toFixed(0)} KB JSON)  ${verdict}`,
      );
    }
    console.log(
      warnings.length === 0
        ? '\nplans: no full scan of a big table'
        : `\nplans: ${warnings.length} scan(s) of a big table:\n${warnings.map((w) => `  ${w}`).join('\n')}`,
    );
    if (counts.length > 0) console.log(`counts of the whole company (index only):\n${counts.map((c) => `  ${c}`).join('\n')}`);
  } finally {
    connection.destroy();
    await ctx.close();
  }
}
