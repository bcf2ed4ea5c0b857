/**
 * Load (issue 8): 200 portal readers at once for 60 s against the built app on loopback,
 * each with a session of its own, each opening their report page (the first HTML with the
 * grade) and reading the report as the app does (GET /api/reports/:id). Target: zero errors;
 * p50 and p99 printed. The load generator (autocannon) runs in a child process.
 *
 * Each reader makes one request a second (a page and its data every two seconds: far busier
 * than a person reading). For scale, a second, shorter run drops the pause: every connection
 * fires its next request the moment the last one is answered, which is past what the server
 * can answer, so it shows the ceiling and how the slowest requests fare when overloaded.
 */
import { spawn } from 'node:child_process';
import { existsSync } from 'node:fs';
import path from 'node:path';
import type { InspectionInput } from '@underfoot/core';
import { webDistDir } from '@underfoot/server';
import { addParties, insertOrder, sampleDocument } from '../support/inspection-fixtures.ts';
import { createTestContext, type TestContext } from '../support/test-app.ts';
import { signedIn } from './report.bench.ts';

const READERS = Number(process.env.LOAD_READERS ?? 200);
const REPORTS = 20;
const SECONDS = Number(process.env.LOAD_SECONDS ?? 60);

/** Published reports, each read by READERS / REPORTS buyers of its own (parties on the order). */
async function arrange(ctx: TestContext): Promise<{ cookie: string; orderId: string }[]> {
  const { db } = ctx.services;
  const { client: field } = await signedIn(ctx, ctx.users.inspector.email);
  const { client: office } = await signedIn(ctx, ctx.users.office.email);
  const orders: string[] = [];
  for (let i = 0; i < REPORTS; i++) {
    const orderId = await insertOrder(ctx);
    await db('orders').where({ id: orderId }).update({ payment_state: 'paid' });
    const current = await field.agent.get(`/api/orders/${orderId}/inspection`).expect(200);
    const doc: InspectionInput = structuredClone(sampleDocument(orderId));
    await field.agent
      .put(`/api/orders/${orderId}/inspection`)
      .set('x-csrf-token', field.token)
      .send({ baseVersion: current.body.inspection.version, document: doc })
      .expect(200);
    const published = await office.post(`/api/orders/${orderId}/publish`, { note: '' });
    if (published.status !== 201) throw new Error(`publishing answered ${published.status}: ${JSON.stringify(published.body)}`);
    orders.push(orderId);
  }
  const readers: { cookie: string; orderId: string }[] = [];
  for (let i = 0; i < READERS; i++) {
    const orderId = orders[i % REPORTS]!;
    const user = await ctx.addUser('client', `reader-${i}@example.com`);
    await addParties(ctx, orderId, [[user.id, 'buyer']]);
    readers.push({ cookie: (await signedIn(ctx, user.email)).cookie, orderId });
  }
  return readers;
}

/** Each connection takes the next reader and keeps them: their page, then their report data, over and over. */
const loadScript = `
const autocannon = require('autocannon');
const [baseUrl, readersJson, seconds, perSecond] = process.argv.slice(1);
const readers = JSON.parse(readersJson);
let next = 0;
const take = (context) => (context.reader ??= readers[next++ % readers.length]);
autocannon({
  url: baseUrl,
  connections: readers.length,
  duration: Number(seconds),
  ...(Number(perSecond) > 0 ? { connectionRate: Number(perSecond) } : {}),
  requests: [
    { setupRequest: (req, context) => { const r = take(context); return { ...req, method: 'GET', path: '/portal/reports/' + r.orderId, headers: { cookie: r.cookie, 'accept-encoding': 'gzip' } }; } },
    { setupRequest: (req, context) => { const r = take(context); return { ...req, method: 'GET', path: '/api/reports/' + r.orderId, headers: { cookie: r.cookie, 'accept-encoding': 'gzip' } }; } },
  ],
}, (err, r) => {
  if (err) { console.error(err); process.exit(1); }
  process.stdout.write(JSON.stringify({ requests: r.requests.total, rps: r.requests.average, non2xx: r.non2xx, errors: r.errors,
    timeouts: r.timeouts, p50: r.latency.p50, p99: r.latency.p99, max: r.latency.max, duration: r.duration }));
});
`;

export async function benchLoad(): Promise<void> {
  if (!existsSync(path.join(webDistDir, 'index.html'))) {
    console.log('load: SKIPPED — the web app is not built (run `npm run build` first, then the bench again).');
    return;
  }
  const ctx = await createTestContext();
  try {
    const readers = await arrange(ctx);
    const run = (seconds: number, perSecond: number) =>
      new Promise<Record<string, number>>((resolve, reject) => {
        const child = spawn(
          process.execPath,
          ['-e', loadScript, ctx.baseUrl, JSON.stringify(readers), String(seconds), String(perSecond)],
          {
            stdio: ['ignore', 'pipe', 'inherit'],
            cwd: path.resolve(import.meta.dirname, '../..'),
          },
        );
        let out = '';
        child.stdout.on('data', (d: Buffer) => (out += d));
        child.on('exit', (code) => (code === 0 ? resolve(JSON.parse(out)) : reject(new Error(`autocannon exited with ${code}`))));
      });
    const describe = (r: Record<string, number>) =>
      `${r.requests} requests, ${r.rps!.toFixed(0)} req/s; latency p50 ${r.p50} ms, p99 ${r.p99} ms, worst ${r.max} ms`;
    const failuresOf = (r: Record<string, number>) => r.non2xx! + r.errors! + r.timeouts!;

    const result = await run(SECONDS, 1);
    const failures = failuresOf(result);
    console.log(
      `${READERS} portal readers, one request a second each, ${result.duration!.toFixed(0)} s (report page + report data, gzip):`,
    );
    console.log(`  ${describe(result)}`);
    console.log(
      `  errors                         ${failures} (${result.non2xx} non-2xx, ${result.errors} failed, ${result.timeouts} timed out)  (target 0: ${failures === 0 ? 'met' : 'NOT met'})`,
    );
    const flat = await run(Math.min(SECONDS, 15), 0);
    console.log(
      `  for scale, no pause (overloaded), ${flat.duration!.toFixed(0)} s: ${describe(flat)}, ${failuresOf(flat)} failed or timed out (10 s)`,
    );
  } finally {
    await ctx.close();
  }
}
