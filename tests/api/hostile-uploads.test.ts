import { randomUUID } from 'node:crypto';
import { createServer, request as httpRequest, type Server, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  buildRequest,
  fieldOf,
  hostileCorpus,
  uploadRoutes,
  type Category,
  type HostileCase,
  type UploadRequest,
  type UploadRoute,
} from '../support/hostile-corpus.ts';
import { insertOrder } from '../support/inspection-fixtures.ts';
import { filesUnder, phoneJpeg, plainPng, sampleIsoVideo } from '../support/media-samples.ts';
import { browserLikeAgent, createTestContext, type TestContext } from '../support/test-app.ts';

/*
 * Issue #8, "Prove it holds": a generated corpus of hostile files (tests/support/hostile-corpus.ts)
 * thrown at every upload route. Each must get its 4xx problem (application/problem+json, no stack,
 * no SQL), the server must keep answering, and nothing may stay behind: no row in any table and
 * no file anywhere under DATA_DIR (the upload folder included), counted before and after.
 */

type Client = Awaited<ReturnType<typeof browserLikeAgent>>;

let ctx: TestContext;
let inspector: Client;
let office: Client;
let orderId: string;

const routes: Record<
  UploadRoute,
  { url: () => string; client: () => Client; validFile: () => Promise<{ content: Buffer; name: string }> }
> = {
  video: {
    url: () => `/api/orders/${orderId}/media/videos`,
    client: () => inspector,
    validFile: async () => ({ content: sampleIsoVideo(), name: 'lateral run.mp4' }),
  },
  still: {
    url: () => `/api/orders/${orderId}/media/stills`,
    client: () => inspector,
    validFile: async () => ({ content: await phoneJpeg(), name: 'IMG_2231.JPG' }),
  },
  logo: { url: () => '/api/company/logo', client: () => office, validFile: async () => ({ content: await plainPng(), name: 'mark.png' }) },
};

/** Categories in the order they run (every one of them is in each route's corpus). */
const categories: Category[] = [
  'wrong type behind a good name',
  'polyglot',
  'truncated',
  'zero-byte or near-empty',
  'pixel bomb',
  'huge declared dimensions',
  'SVG or HTML with script',
  'nested archive',
  'hostile file name',
  'cut off mid-stream',
  'broken form',
  'over the size limit',
];

// A server around the same app that lets the test see what the app answered to a request whose
// connection the client has already destroyed (the answer can no longer reach the client).
interface Observed {
  res: ServerResponse;
  ended: boolean;
  chunks: Buffer[];
}
const observed = new Map<string, Observed>();
let observer: Server;
let observerPort: number;

beforeAll(async () => {
  // The media routes' size limits brought down to the logo's 2 MB, so one padded file is over all three.
  ctx = await createTestContext({ MEDIA_MAX_VIDEO_MB: '2', MEDIA_MAX_STILL_MB: '2' });
  inspector = await browserLikeAgent(ctx.app);
  expect((await inspector.signIn(ctx.users.inspector.email)).status).toBe(200);
  office = await browserLikeAgent(ctx.app);
  expect((await office.signIn(ctx.users.office.email)).status).toBe(200);
  orderId = await insertOrder(ctx);

  observer = createServer((req, res) => {
    const id = req.headers['x-hostile-case'];
    if (typeof id === 'string') {
      const seen: Observed = { res, ended: false, chunks: [] };
      observed.set(id, seen);
      const end = res.end as (...args: unknown[]) => ServerResponse;
      res.end = function (this: ServerResponse, ...args: unknown[]) {
        const [chunk] = args;
        if (typeof chunk === 'string' || chunk instanceof Uint8Array) seen.chunks.push(Buffer.from(chunk));
        seen.ended = true;
        return end.apply(this, args);
      } as typeof res.end;
    }
    void ctx.app(req, res);
  });
  await new Promise<void>((resolve) => observer.listen(0, '127.0.0.1', resolve));
  observerPort = (observer.address() as AddressInfo).port;

  // Controls: each route takes its ordinary file, so every refusal below is the hostile part's doing.
  // They also leave a row, a stored file and a current logo that a refused upload must not disturb.
  for (const route of uploadRoutes) {
    const { content, name } = await routes[route].validFile();
    const client = routes[route].client();
    const res = await client.agent.post(routes[route].url()).set('x-csrf-token', client.token).attach(fieldOf[route], content, name);
    expect(res.status, `${route} control upload: ${JSON.stringify(res.body)}`).toBe(201);
  }
}, 60_000);

afterAll(async () => {
  if (observer) {
    observer.closeAllConnections();
    await new Promise((resolve) => observer.close(resolve));
  }
  if (measured.length > 0) console.info(`hostile uploads, counted before → after each route's corpus:\n${measured.join('\n')}`);
  await ctx?.close();
});

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
async function waitFor(check: () => boolean, ms: number): Promise<boolean> {
  const deadline = Date.now() + ms;
  while (!check()) {
    if (Date.now() > deadline) return false;
    await sleep(5);
  }
  return true;
}

// ---------------------------------------------------------------- what is kept

const dataFiles = () => filesUnder(ctx.config.dataDir);
const incomingFiles = () => filesUnder(path.join(ctx.config.media.dir, '.incoming'));

/** What a refused upload must leave as it was. */
async function snapshot() {
  const { db } = ctx.services;
  const count = async (table: string) => Number((await db(table).count({ n: '*' }).first())?.n ?? -1);
  const company = await db('companies').where({ id: ctx.companyId }).first('logo_id', 'updated_at');
  return {
    files: dataFiles(),
    media: await count('media'),
    companyLogos: await count('company_logos'),
    auditLog: await count('audit_log'),
    logo: `${company?.logo_id}@${company?.updated_at}`,
  };
}
type Snapshot = Awaited<ReturnType<typeof snapshot>>;

/** Rows in every table (SQLite, or PostgreSQL under `npm run test:pg`). */
async function allTableCounts(): Promise<Record<string, number>> {
  const { db } = ctx.services;
  const tables: { name: string }[] = ctx.config.databaseUrl
    ? await db('pg_tables').where({ schemaname: 'public' }).select({ name: 'tablename' })
    : await db('sqlite_master').where({ type: 'table' }).andWhereNot('name', 'like', 'sqlite_%').select('name');
  const counts: Record<string, number> = {};
  for (const { name } of tables) counts[name] = Number((await db(name).count({ n: '*' }).first())?.n ?? -1);
  return counts;
}

function differences(before: Snapshot, after: Snapshot): string[] {
  const found: string[] = [];
  const added = after.files.filter((f) => !before.files.includes(f));
  const removed = before.files.filter((f) => !after.files.includes(f));
  if (added.length) found.push(`left files behind: ${added.join(', ')}`);
  if (removed.length) found.push(`removed files: ${removed.join(', ')}`);
  for (const key of ['media', 'companyLogos', 'auditLog', 'logo'] as const) {
    if (before[key] !== after[key]) found.push(`${key} changed: ${before[key]} → ${after[key]}`);
  }
  return found;
}

// ---------------------------------------------------------------- sending

interface Answer {
  status: number;
  contentType: string;
  body: unknown;
}

function send(route: UploadRoute, c: HostileCase, req: UploadRequest): Promise<Answer> {
  const client = routes[route].client();
  const body = c.delivery.kind === 'ends-early' ? req.body.subarray(0, c.delivery.at(req)) : req.body;
  return client.agent
    .post(routes[route].url())
    .set('x-csrf-token', client.token)
    .set('content-type', req.contentType)
    .send(body)
    .then((res) => ({ status: res.status, contentType: String(res.headers['content-type'] ?? ''), body: res.body as unknown }));
}

async function cookieOf(client: Client) {
  const cookies = await client.agent.jar.getCookies({ domain: '127.0.0.1', path: '/', secure: false, script: false });
  return cookies.map((c) => `${c.name}=${c.value}`).join('; ');
}

/**
 * Declare the whole body, send part of it, and destroy the connection. The client gets no
 * answer, so the answer the app gave is read on the server side (see `observer`).
 */
async function sendAndDrop(route: UploadRoute, c: HostileCase, req: UploadRequest, at: number): Promise<Answer | string> {
  const client = routes[route].client();
  const id = randomUUID();
  const incomingBefore = incomingFiles().length;
  const outgoing = httpRequest({
    host: '127.0.0.1',
    port: observerPort,
    method: 'POST',
    path: routes[route].url(),
    headers: {
      cookie: await cookieOf(client),
      'x-csrf-token': client.token,
      'content-type': req.contentType,
      'content-length': String(req.body.length),
      'x-hostile-case': id,
    },
  });
  outgoing.on('error', () => undefined);
  outgoing.write(req.body.subarray(0, at));
  if (!(await waitFor(() => observed.has(id), 2_000))) return 'the request never reached the app';
  // Once file bytes are on the way, wait until the server is writing them to disk (the logo is kept in memory),
  // so the drop finds a temporary file to clean up. (With none yet, busboy may still hold the header's last
  // line, which could begin the next boundary.)
  if (at > req.fileStart + 64 && route !== 'logo') {
    if (!(await waitFor(() => incomingFiles().length > incomingBefore, 2_000))) {
      outgoing.destroy();
      return 'the server had not begun writing the file when the connection was to be dropped';
    }
    tempFilesSeen[route] += 1;
  } else await sleep(30);
  outgoing.destroy();
  const seen = observed.get(id)!;
  if (!(await waitFor(() => seen.ended, 3_000))) return 'the app never answered the cut-off request (it is still holding it)';
  observed.delete(id);
  return { status: seen.res.statusCode, contentType: String(seen.res.getHeader('content-type') ?? ''), body: parsed(seen.chunks) };
}

function parsed(chunks: Buffer[]): unknown {
  const text = Buffer.concat(chunks).toString('utf8');
  try {
    return JSON.parse(text);
  } catch {
    return text;
  }
}

/** Whatever is wrong with an answer, in words; empty when it is the expected problem. */
function answerFaults(c: HostileCase, answer: Answer): string[] {
  const faults: string[] = [];
  const body = (answer.body ?? {}) as Record<string, unknown>;
  const got = `${answer.status} ${String(body.code ?? '')}`;
  if (answer.status !== c.expected.status || body.code !== c.expected.code) {
    faults.push(
      `expected ${c.expected.status} ${c.expected.code}, got ${got}: ${String(body.detail ?? JSON.stringify(answer.body)).slice(0, 160)}`,
    );
  }
  if (answer.status < 400 || answer.status > 499) faults.push(`not a 4xx (${answer.status})`);
  if (!/^application\/problem\+json/.test(answer.contentType)) faults.push(`content type ${answer.contentType || '(none)'}`);
  if (body.status !== answer.status) faults.push('problem body has no matching status');
  if (typeof body.detail !== 'string' || body.detail.length < 15) faults.push('problem body has no readable detail');
  const serialised = JSON.stringify(answer.body);
  if ('stack' in body || /\n\s+at |node_modules|\.ts:\d+|SQLITE_[A-Z]|sqlite_master|knex|select .+ from|insert into/i.test(serialised)) {
    faults.push(`problem body leaks internals: ${serialised.slice(0, 160)}`);
  }
  if (c.expected.code === 'unsafe_file_name' && !/file name/i.test(String(body.detail)))
    faults.push('the problem does not say it is the file name');
  return faults;
}

async function runCase(route: UploadRoute, c: HostileCase): Promise<string[]> {
  const before = await snapshot();
  const req = buildRequest(c, route);
  const answer = c.delivery.kind === 'dropped' ? await sendAndDrop(route, c, req, c.delivery.at(req)) : await send(route, c, req);
  const faults = typeof answer === 'string' ? [answer] : answerFaults(c, answer);
  // Temporary files go before the answer is sent; allow the file system a brief moment all the same.
  let after = await snapshot();
  for (let i = 0; i < 10 && differences(before, after).length > 0; i++) {
    await sleep(20);
    after = await snapshot();
  }
  return [...faults, ...differences(before, after)];
}

const measured: string[] = [];
/** Cut-off uploads whose temporary file was on disk when the connection dropped. */
const tempFilesSeen: Record<UploadRoute, number> = { video: 0, still: 0, logo: 0 };

describe.each(uploadRoutes)('hostile uploads to the %s route', (route) => {
  let cases: HostileCase[];
  let start: { tables: Record<string, number>; files: string[] };
  beforeAll(async () => {
    cases = await hostileCorpus(route);
    start = { tables: await allTableCounts(), files: dataFiles() };
  });
  afterAll(async () => {
    const tables = await allTableCounts();
    const files = dataFiles();
    const rows = (t: Record<string, number>) => Object.values(t).reduce((a, b) => a + b, 0);
    measured.push(
      `  ${route} (${cases.length} files): files under DATA_DIR ${start.files.length} → ${files.length}, ` +
        `rows in all ${Object.keys(tables).length} tables ${rows(start.tables)} → ${rows(tables)} ` +
        `(media ${start.tables.media} → ${tables.media}, company_logos ${start.tables.company_logos} → ${tables.company_logos}, ` +
        `audit_log ${start.tables.audit_log} → ${tables.audit_log}); dropped connections with a temporary file on disk: ${tempFilesSeen[route]}`,
    );
  });

  it('has a corpus of at least 200 files covering every category', () => {
    expect(cases.length).toBeGreaterThanOrEqual(200);
    for (const category of categories) expect(cases.filter((c) => c.category === category).length, category).toBeGreaterThan(0);
    expect(new Set(cases.map((c) => c.category)).size).toBe(categories.length);
  });

  it.each(categories)(
    '%s: each refused with its problem, nothing kept, the server still answering',
    async (category) => {
      const batch = cases.filter((c) => c.category === category);
      const tablesBefore = await allTableCounts();
      const filesBefore = dataFiles();
      const failures: string[] = [];
      for (const c of batch) {
        const faults = await runCase(route, c);
        if (faults.length > 0) failures.push(`${c.name}: ${faults.join('; ')}`);
      }
      const health = await fetch(`${ctx.baseUrl}/api/health`);
      expect(health.status, 'GET /api/health after the batch').toBe(200);
      const tablesAfter = await allTableCounts();
      const filesAfter = dataFiles();
      expect(failures, `${failures.length} of ${batch.length} ${category} cases on the ${route} route`).toEqual([]);
      expect(tablesAfter).toEqual(tablesBefore);
      expect(filesAfter).toEqual(filesBefore);
      // A batch that fails slowly must not run on into the next one.
    },
    60_000,
  );
});

describe('after the corpus', () => {
  it('every route still takes an ordinary file', async () => {
    for (const route of uploadRoutes) {
      const { content, name } = await routes[route].validFile();
      const client = routes[route].client();
      const res = await client.agent.post(routes[route].url()).set('x-csrf-token', client.token).attach(fieldOf[route], content, name);
      expect(res.status, `${route}: ${JSON.stringify(res.body)}`).toBe(201);
    }
    expect(incomingFiles()).toEqual([]);
  });

  it('takes an ordinary file sent as the corpus sends it, under a plain non-ASCII name in each encoding, and keeps the name', async () => {
    // The same request builder, with nothing hostile: so each refusal above is the hostile part's doing.
    const fileName = 'Lateral – run 1 (front steps).jpg';
    for (const route of uploadRoutes) {
      for (const nameEncoding of ['browser', 'raw', 'extended'] as const) {
        const { content } = await routes[route].validFile();
        const plain: HostileCase = {
          name: `a plain name, ${nameEncoding}`,
          category: 'hostile file name',
          fileName,
          nameEncoding,
          content,
          partType: 'application/octet-stream',
          form: 'one file',
          delivery: { kind: 'whole' },
          expected: { status: 201, code: '' },
        };
        const answer = await send(route, plain, buildRequest(plain, route));
        expect(answer.status, `${route}, ${nameEncoding}: ${JSON.stringify(answer.body)}`).toBe(201);
        if (route !== 'logo') expect((answer.body as { media: { originalName: string } }).media.originalName).toBe(fileName);
      }
    }
  });
});
