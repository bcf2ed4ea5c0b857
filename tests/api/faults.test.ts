import { spawn, type ChildProcess } from 'node:child_process';
import { randomBytes, randomUUID } from 'node:crypto';
import { once } from 'node:events';
import { existsSync, mkdirSync, mkdtempSync, readdirSync, rmSync, statSync, utimesSync, writeFileSync } from 'node:fs';
import { request as httpRequest } from 'node:http';
import { tmpdir } from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startFakeSmtp, type FakeSmtp } from '@underfoot/fakes';
import { insertOrder, sampleDocument } from '../support/inspection-fixtures.ts';
import { filesUnder, sampleIsoVideo } from '../support/media-samples.ts';
import { publishReport } from '../support/report-fixtures.ts';
import { browserLikeAgent, createTestContext, TEST_PASSWORD, type TestContext } from '../support/test-app.ts';
import { freePort } from '../support/free-port.ts';

/*
 * Faults the product must come through whole: the mail server away for a while, payment
 * webhooks replayed at once, and the server killed (SIGKILL, no clean-up) in the middle of an
 * upload and of a publish. Replays one after another and a refund overtaking its payment are
 * in orders.test.ts ("payment").
 */

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

async function until(check: () => boolean | Promise<boolean>, timeoutMs: number, what: string) {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (await check()) return;
    await sleep(20);
  }
  throw new Error(`not within ${timeoutMs} ms: ${what}`);
}

describe('in one process', () => {
  const RETRY_BASE_MS = 100;
  let ctx: TestContext;
  beforeAll(async () => {
    ctx = await createTestContext({ MAIL_RETRY_BASE_MS: String(RETRY_BASE_MS) });
  });
  afterAll(() => ctx.close());

  it('the mail server down for a while: every message written meanwhile arrives once it is back, none twice', async () => {
    const { db } = ctx.services;
    const smtpPort = ctx.mail.smtpPort;
    await ctx.mail.pause();
    const outageBegan = Date.now();

    // Reset links, an invitation and a released report, all asked for while nothing can be sent.
    const visitor = await browserLikeAgent(ctx.app);
    for (const email of [ctx.users.office.email, ctx.users.inspector.email]) {
      expect((await visitor.post('/api/auth/password-reset', { email })).status).toBe(202);
    }
    const office = await browserLikeAgent(ctx.app);
    expect((await office.signIn(ctx.users.office.email)).status).toBe(200);
    const invited = await office.post('/api/users/invitations', { email: 'sam.sump@mudlark.test', name: 'Sam Sump', role: 'inspector' });
    expect(invited.status).toBe(201);
    const field = await browserLikeAgent(ctx.app);
    expect((await field.signIn(ctx.users.inspector.email)).status).toBe(200);
    const report = await publishReport(ctx, { field, office, parties: [[ctx.users.agent.id, 'buyers_agent']], releasedTo: ['buyer'] });

    const queued = await db('mail_outbox').select('template', 'to_address', 'text_body');
    expect(queued.map((r) => `${r.template} → ${r.to_address}`)).toEqual(
      expect.arrayContaining([
        `password_reset → ${ctx.users.office.email}`,
        `password_reset → ${ctx.users.inspector.email}`,
        'invitation → sam.sump@mudlark.test',
        `report_released → ${ctx.users.agent.email}`,
      ]),
    );
    expect(queued.find((r) => r.template === 'report_released')?.text_body).toContain(`/portal/reports/${report.id}`);

    // The worker keeps trying, backing off, and keeps every message.
    await until(async () => (await db('mail_outbox').where('attempts', '<', 2)).length === 0, 10_000, 'every message tried twice');
    const outageMs = 1_500;
    if (Date.now() - outageBegan < outageMs) await sleep(outageMs - (Date.now() - outageBegan));
    const during = await db('mail_outbox').select();
    const now = Date.now();
    for (const row of during) {
      expect(row, row.template).toMatchObject({ status: 'pending', sent_at: null });
      expect(row.last_error).toMatch(/ECONNREFUSED/);
      // Tries k start no sooner than base × (2^(k−1) − 1) after the first; without back-off (a pass every 50 ms) it would be elapsed / 50.
      const elapsed = now - Date.parse(row.created_at);
      expect(row.attempts, `${row.template} tried ${row.attempts} times in ${elapsed} ms`).toBeLessThanOrEqual(
        2 + Math.floor(Math.log2(elapsed / RETRY_BASE_MS + 1)),
      );
    }
    expect(ctx.mail.messages()).toEqual([]);

    // Back on the same port: everything goes out, once.
    await ctx.mail.resume();
    expect(ctx.mail.smtpPort).toBe(smtpPort);
    await until(async () => (await db('mail_outbox').whereNot('status', 'sent')).length === 0, 15_000, 'every message sent');
    // A few more worker passes, for any second copy to show.
    await sleep(400);
    const rows = await db('mail_outbox').select();
    const arrived = ctx.mail.messages();
    expect(arrived).toHaveLength(rows.length);
    for (const row of rows) {
      const copies = arrived.filter((m) => m.messageId === row.message_id);
      expect(copies, `${row.template} to ${row.to_address}`).toHaveLength(1);
      expect(copies[0]).toMatchObject({ to: [row.to_address], subject: row.subject });
    }
    expect(new Set(arrived.map((m) => `${m.to.join(',')} ${m.subject}`)).size).toBe(rows.length);
  });

  it('one payment event delivered five times at once, then again: one payment, one receipt', async () => {
    const { db } = ctx.services;
    const orderId = await insertOrder(ctx);
    await db('order_fee_lines').insert({ order_id: orderId, fee_item_id: null, name: 'Camera inspection', price_cents: 32500 });
    const agent = await browserLikeAgent(ctx.app);
    expect((await agent.signIn(ctx.users.agent.email)).status).toBe(200);
    const checkout = await agent.post(`/api/orders/${orderId}/checkout`);
    expect(checkout.status, JSON.stringify(checkout.body)).toBe(200);
    const session = ctx.payments.sessions().find((s) => s.url === checkout.body.url)!;

    ctx.payments.pauseWebhooks();
    try {
      await ctx.payments.paySession(session.id);
      const completed = ctx.payments
        .events()
        .find((e) => e.type === 'checkout.session.completed' && (e.data.object as { id: string }).id === session.id)!;
      const burst = await Promise.allSettled(Array.from({ length: 5 }, () => ctx.payments.resendEvent(completed.id)));
      expect(burst.map((b) => b.status)).toEqual(Array(5).fill('fulfilled'));
      await ctx.payments.resendEvent(completed.id);
    } finally {
      await ctx.payments.resumeWebhooks();
    }

    expect(await db('payments').where({ order_id: orderId }).select('status')).toEqual([{ status: 'paid' }]);
    expect((await db('orders').where({ id: orderId }).first()).payment_state).toBe('paid');
    expect(await db('order_events').where({ order_id: orderId, type: 'paid' })).toHaveLength(1);
    expect(await db('audit_log').where({ subject_id: orderId, action: 'payment.received' })).toHaveLength(1);
    const receipts = await db('mail_outbox').where({ template: 'payment_receipt' }).whereLike('text_body', `%/portal/orders/${orderId}%`);
    expect(receipts).toHaveLength(1);
    await until(async () => (await db('mail_outbox').where({ id: receipts[0].id }).first()).status === 'sent', 5_000, 'the receipt sent');
    await sleep(200);
    expect(ctx.mail.messages().filter((m) => m.messageId === receipts[0].message_id)).toHaveLength(1);
  });
});

/*
 * The real server (apps/server/src/main.ts) as a child process on a data folder prepared
 * here, killed with SIGKILL and started again on the same folder.
 * SQLite only: it prepares and checks the SQLite file in that folder (PRAGMA integrity_check); on
 * PostgreSQL crash safety is the server's own write-ahead log, not a file of ours.
 */
describe.skipIf(Boolean(process.env.DATABASE_URL))('the server killed (SIGKILL) and started again', () => {
  const root = path.resolve(import.meta.dirname, '../..');
  const running = new Set<ChildProcess>();
  const sessionSecret = randomBytes(32).toString('hex');
  let dataDir: string;
  let mail: FakeSmtp;
  let emails: { office: string; inspector: string };
  let uploadOrderId: string;
  let keptVideoKey: string;
  const publishOrders: string[] = [];
  /** Each test leaves its last server running for the next, which saves a start (several seconds). */
  let current: RunningServer | undefined;

  const dbFile = () => path.join(dataDir, 'underfoot.sqlite');
  const mediaDir = () => path.join(dataDir, 'media');

  interface RunningServer {
    child: ChildProcess;
    baseUrl: string;
    output(): string;
  }

  async function startServer(): Promise<RunningServer> {
    const port = await freePort();
    const baseUrl = `http://127.0.0.1:${port}`;
    let output = '';
    const child = spawn(process.execPath, ['--import', 'tsx', 'apps/server/src/main.ts'], {
      cwd: root,
      env: {
        ...process.env,
        NODE_ENV: 'test',
        HOST: '127.0.0.1',
        PORT: String(port),
        PUBLIC_URL: 'http://underfoot.test',
        DATA_DIR: dataDir,
        // The same secret every start, so a session survives the restart as it does in production.
        SESSION_SECRET: sessionSecret,
        PASSWORD_HASH_COST: '10',
        LOG_LEVEL: 'info',
        MAIL_POLL_MS: '200',
        FAKE_SMTP_PORT: String(mail.smtpPort),
        FAKE_SMTP_HTTP_PORT: String(mail.httpPort),
        // Whatever the shell has set, this server uses the SQLite file and the local fakes.
        DATABASE_URL: undefined,
        SMTP_URL: undefined,
        STRIPE_SECRET_KEY: undefined,
        STRIPE_WEBHOOK_SECRET: undefined,
      },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    running.add(child);
    child.once('exit', () => running.delete(child));
    child.stdout?.on('data', (chunk) => (output += chunk));
    child.stderr?.on('data', (chunk) => (output += chunk));
    const deadline = Date.now() + 30_000;
    for (;;) {
      if (child.exitCode !== null) throw new Error(`the server exited with ${child.exitCode}:\n${output}`);
      if (Date.now() > deadline) throw new Error(`the server did not answer within 30 s:\n${output}`);
      try {
        if ((await fetch(`${baseUrl}/api/health`)).ok) break;
      } catch {
        // not listening yet
      }
      await sleep(50);
    }
    return { child, baseUrl, output: () => output };
  }

  async function kill(server: Pick<RunningServer, 'child'>) {
    if (server.child.exitCode !== null || server.child.signalCode !== null) return;
    const exited = once(server.child, 'exit');
    server.child.kill('SIGKILL');
    await exited;
  }

  interface Session {
    cookie: string;
    token: string;
  }

  const cookiesOf = (res: Response) =>
    res.headers
      .getSetCookie()
      .map((c) => c.split(';')[0])
      .join('; ');

  async function signIn(baseUrl: string, email: string): Promise<Session> {
    const csrf = await fetch(`${baseUrl}/api/auth/csrf`);
    const first = { cookie: cookiesOf(csrf), token: ((await csrf.json()) as { token: string }).token };
    const res = await fetch(`${baseUrl}/api/auth/sign-in`, {
      method: 'POST',
      headers: { cookie: first.cookie, 'x-csrf-token': first.token, 'content-type': 'application/json' },
      body: JSON.stringify({ email, password: TEST_PASSWORD }),
    });
    expect(res.status).toBe(200);
    return { cookie: cookiesOf(res), token: ((await res.json()) as { csrfToken: string }).csrfToken };
  }

  /** Open the database beside the running server (WAL lets both in), check it, and close it again. */
  function inspectDb<T>(look: (db: Database.Database) => T): T {
    const db = new Database(dbFile());
    try {
      expect(db.pragma('integrity_check', { simple: true })).toBe('ok');
      return look(db);
    } finally {
      db.close();
    }
  }

  const countOf = (db: Database.Database, sql: string, ...params: unknown[]) => (db.prepare(sql).get(...params) as { n: number }).n;

  /** No row without its file, no file without its row, nothing else in the data folder. */
  function expectNoOrphans() {
    const named = inspectDb(
      (db) =>
        new Set(
          (
            db
              .prepare(
                `select storage_key as k from media
                 union select thumbnail_key from media where thumbnail_key is not null
                 union select storage_key from company_logos`,
              )
              .all() as { k: string }[]
          ).map((r) => r.k),
        ),
    );
    const stored = filesUnder(mediaDir()).map((f) => f.split(path.sep).join('/'));
    expect(stored.filter((f) => !named.has(f))).toEqual([]);
    expect([...named].filter((k) => !stored.includes(k))).toEqual([]);
    expect(readdirSync(dataDir).filter((f) => !/^underfoot\.sqlite(-wal|-shm)?$/.test(f) && f !== 'media')).toEqual([]);
  }

  beforeAll(async () => {
    dataDir = mkdtempSync(path.join(tmpdir(), 'underfoot-faults-'));
    mail = await startFakeSmtp();
    // The same helpers as every API test make the database, people and orders; then this process lets go of it.
    const ctx = await createTestContext({ DATA_DIR: dataDir, SESSION_SECRET: sessionSecret });
    try {
      emails = { office: ctx.users.office.email, inspector: ctx.users.inspector.email };
      const field = await browserLikeAgent(ctx.app);
      expect((await field.signIn(ctx.users.inspector.email)).status).toBe(200);

      uploadOrderId = await insertOrder(ctx);
      // A finished video on the order: whatever any sweep does, its file stays.
      const finished = await field.agent
        .post(`/api/orders/${uploadOrderId}/media/videos`)
        .set('x-csrf-token', field.token)
        .attach('video', sampleIsoVideo(), 'run-0.mp4');
      expect(finished.status).toBe(201);
      keptVideoKey = (await ctx.services.db('media').where({ id: finished.body.media.id }).first()).storage_key;

      // Recorded inspections, paid for, ready to publish (released to the buyer's agent at once).
      for (let i = 0; i < 8; i++) {
        const orderId = await insertOrder(ctx);
        await ctx.services.db('orders').where({ id: orderId }).update({ payment_state: 'paid' });
        const saved = await field.agent
          .put(`/api/orders/${orderId}/inspection`)
          .set('x-csrf-token', field.token)
          .send({ baseVersion: 0, document: sampleDocument(orderId) });
        expect(saved.status).toBe(200);
        expect((await field.post(`/api/orders/${orderId}/recorded`)).status).toBe(200);
        publishOrders.push(orderId);
      }
    } finally {
      await ctx.close();
    }
  });

  afterAll(async () => {
    await Promise.all([...running].map((child) => kill({ child })));
    await mail?.close();
    if (dataDir) rmSync(dataDir, { recursive: true, force: true });
  });

  /**
   * A video upload over a plain socket, sent in pieces: it sends `pauseAt` of the bytes, then
   * waits, as a phone on a weak signal does, with the server holding a partial file.
   */
  function slowUpload(baseUrl: string, urlPath: string, session: Session, video: Buffer, pauseAt: number) {
    const boundary = `----underfoot-${randomUUID()}`;
    const head = Buffer.from(
      `--${boundary}\r\nContent-Disposition: form-data; name="video"; filename="run-1.mp4"\r\nContent-Type: video/mp4\r\n\r\n`,
    );
    const tail = Buffer.from(`\r\n--${boundary}--\r\n`);
    const req = httpRequest(new URL(urlPath, baseUrl), {
      method: 'POST',
      headers: {
        cookie: session.cookie,
        'x-csrf-token': session.token,
        'content-type': `multipart/form-data; boundary=${boundary}`,
        'content-length': String(head.length + video.length + tail.length),
      },
    });
    const outcome = new Promise<string>((resolve) => {
      req.once('response', (res) => {
        res.resume();
        resolve(`answered ${res.statusCode}`);
      });
      req.once('error', (err: NodeJS.ErrnoException) => resolve(`cut off (${err.code ?? err.message})`));
    });
    void (async () => {
      req.write(head);
      const chunk = 256 * 1024;
      for (let at = 0; at < pauseAt; at += chunk) {
        if (req.destroyed) return;
        if (!req.write(video.subarray(at, Math.min(at + chunk, pauseAt)))) await once(req, 'drain');
        await sleep(5);
      }
    })().catch(() => undefined);
    return outcome;
  }

  it('in the middle of an upload: afterwards the database is sound, no half record shows and no file is left over', async () => {
    const videoBytes = 16 * 1024 * 1024;
    const video = sampleIsoVideo({ payloadBytes: videoBytes });
    const incoming = path.join(mediaDir(), '.incoming');
    const partialOnDisk = () =>
      filesUnder(incoming)
        .filter((f) => f.endsWith('.upload'))
        .map((f) => ({ file: path.join(incoming, f), size: statSync(path.join(incoming, f)).size }))[0];

    let server = current ?? (await startServer());
    const field = await signIn(server.baseUrl, emails.inspector);
    const answer = slowUpload(server.baseUrl, `/api/orders/${uploadOrderId}/media/videos`, field, video, Math.floor(video.length * 0.7));
    await until(() => (partialOnDisk()?.size ?? 0) >= video.length / 2, 20_000, 'half the video on the server’s disk');
    const partial = partialOnDisk()!;
    await kill(server);
    expect(await answer).toMatch(/^cut off/);
    // What the crash left: the partial upload, in the dead process's own folder.
    expect(existsSync(partial.file)).toBe(true);

    // The other window a crash can hit: the file stored, its row never written (an hour ago, so the sweep may judge it).
    const orphan = path.join(mediaDir(), 'orders', uploadOrderId, `${randomUUID()}.mp4`);
    mkdirSync(path.dirname(orphan), { recursive: true });
    writeFileSync(orphan, video.subarray(0, 4096));
    const anHourAndMoreAgo = new Date(Date.now() - 2 * 60 * 60_000);
    utimesSync(orphan, anHourAndMoreAgo, anHourAndMoreAgo);
    // The finished video is as old, but a row names it.
    const keptFile = path.join(mediaDir(), ...keptVideoKey.split('/'));
    utimesSync(keptFile, anHourAndMoreAgo, anHourAndMoreAgo);

    server = current = await startServer();
    await until(() => server.output().includes('media sweep done'), 10_000, 'the start-up sweep of stored files');
    expect(existsSync(partial.file)).toBe(false);
    expect(existsSync(orphan)).toBe(false);
    expect(existsSync(keptFile)).toBe(true);
    // Only the new process's own (empty) incoming folder is left.
    expect(readdirSync(incoming)).toEqual([expect.stringMatching(new RegExp(`^${server.child.pid}-`))]);
    expect(filesUnder(incoming)).toEqual([]);
    const rows = inspectDb((db) => db.prepare('select storage_key from media where order_id = ?').all(uploadOrderId));
    expect(rows).toEqual([{ storage_key: keptVideoKey }]);
    expectNoOrphans();

    // The same session uploads the video again and it is taken whole.
    const again = new FormData();
    again.append('video', new Blob([sampleIsoVideo()], { type: 'video/mp4' }), 'run-1.mp4');
    const retried = await fetch(`${server.baseUrl}/api/orders/${uploadOrderId}/media/videos`, {
      method: 'POST',
      headers: { cookie: field.cookie, 'x-csrf-token': field.token },
      body: again,
    });
    expect(retried.status).toBe(201);
    expectNoOrphans();
  }, 60_000);

  it('in the middle of publishing, again and again: each report is published whole or not at all', async () => {
    /** The order as the database holds it: all of a publish, or none of it. */
    const publishedState = (orderId: string) =>
      inspectDb((db) => {
        const status = (db.prepare('select status from orders where id = ?').get(orderId) as { status: string }).status;
        const parts = {
          revisions: countOf(db, 'select count(*) as n from report_revisions where order_id = ?', orderId),
          history: countOf(db, "select count(*) as n from order_events where order_id = ? and type = 'published'", orderId),
          audit: countOf(db, "select count(*) as n from audit_log where subject_id = ? and action = 'report.published'", orderId),
          mail: countOf(
            db,
            "select count(*) as n from mail_outbox where template = 'report_released' and text_body like ?",
            `%/portal/reports/${orderId}%`,
          ),
        };
        if (status === 'published') {
          expect(parts, `order ${orderId} published`).toEqual({ revisions: 1, history: 1, audit: 1, mail: 1 });
          return 'published' as const;
        }
        expect(status).toBe('recorded');
        expect(parts, `order ${orderId} not published`).toEqual({ revisions: 0, history: 0, audit: 0, mail: 0 });
        return 'not published' as const;
      });

    let server = current ?? (await startServer());
    const office = await signIn(server.baseUrl, emails.office);
    const publish = (baseUrl: string, orderId: string) =>
      fetch(`${baseUrl}/api/orders/${orderId}/publish`, {
        method: 'POST',
        headers: { cookie: office.cookie, 'x-csrf-token': office.token, 'content-type': 'application/json' },
        body: JSON.stringify({ note: '' }),
      }).then(
        (res) => res.status,
        () => 'cut off' as const,
      );

    // How long one publish takes here, to aim the kills into it.
    const timed = performance.now();
    expect(await publish(server.baseUrl, publishOrders[0]!)).toBe(201);
    const publishMs = performance.now() - timed;
    expect(publishedState(publishOrders[0]!)).toBe('published');

    const rounds: string[] = [];
    for (let round = 0; round < 4; round++) {
      const aimed = publishOrders.filter((id) => publishedState(id) === 'not published').slice(0, 3);
      if (aimed.length === 0) break;
      const answers = aimed.map((id) => publish(server.baseUrl, id));
      const delay = Math.random() * Math.max(50, publishMs * 2);
      await sleep(delay);
      await kill(server);
      const statuses = await Promise.all(answers);
      server = current = await startServer();
      const states = aimed.map((id) => publishedState(id));
      // An answered publish is a kept one.
      statuses.forEach((status, i) => {
        if (status === 201) expect(states[i]).toBe('published');
      });
      rounds.push(`${Math.round(delay)} ms: ${states.join(', ')}`);
    }
    console.info(`publish took ${Math.round(publishMs)} ms; killed after ${rounds.join('; ')}`);

    // What was cut off publishes cleanly now: nothing half-made stands in its way.
    for (const orderId of publishOrders) {
      if (publishedState(orderId) === 'published') continue;
      expect(await publish(server.baseUrl, orderId)).toBe(201);
      expect(publishedState(orderId)).toBe('published');
    }
  }, 90_000);
});
