import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemo } from '../../seeds/demo.ts';
import { seedDemoReports } from '../../seeds/reports.ts';
import { createTestContext, type TestContext } from '../support/test-app.ts';

let ctx: TestContext;
beforeAll(async () => {
  ctx = await createTestContext();
  seededByDemo = await seedDemo(ctx.services.db, { passwordHashCost: 10, mediaDir: ctx.config.media.dir });
}, 120_000);
let seededByDemo: Awaited<ReturnType<typeof seedDemo>>;
afterAll(() => ctx.close());

describe('the demo reports', () => {
  it(
    'publish reports in all five grades, a disclosed pre-listing report, an amendment and a re-inspection, once',
    { timeout: 120_000 },
    async () => {
      const { db } = ctx.services;
      // seedDemo published them and handed back the disclosure link; a second run adds nothing.
      expect(seededByDemo.disclosureLinkPath).toMatch(/^\/shared\//);
      expect((await seedDemoReports(db, { mediaDir: ctx.config.media.dir })).seeded).toBe(0);

      const revisions = await db('report_revisions').select('order_id', 'number', 'kind', 'grade');
      const latest = new Map<string, { number: number; kind: string; grade: string }>();
      for (const r of revisions) if ((latest.get(r.order_id)?.number ?? 0) < r.number) latest.set(r.order_id, r);
      expect(new Set([...latest.values()].map((r) => r.grade))).toEqual(
        new Set(['clear', 'maintain', 'plan_repair', 'repair_now', 'failing']),
      );
      expect(revisions.filter((r) => r.kind === 'amendment')).toHaveLength(1);
      expect(revisions.filter((r) => r.kind === 'reinspection')).toHaveLength(1);

      const preListing = await db('orders').where({ kind: 'pre_listing', status: 'published' });
      expect(preListing).toHaveLength(1);
      expect(JSON.parse(preListing[0].released_to)).toEqual(['buyer', 'seller']);
      // The disclosure link opens the report for anyone, with the marked-up stills.
      expect(seededByDemo.disclosureLinkPath).toMatch(/^\/shared\//);
      const shared = await request(ctx.app).get(`/api${seededByDemo.disclosureLinkPath}`).expect(200);
      expect(shared.body.purpose).toBe('disclosure');
      const still = shared.body.revision.snapshot.media.find((m: { renderedId: string | null }) => m.renderedId);
      await request(ctx.app).get(`/api${seededByDemo.disclosureLinkPath}/media/${still.renderedId}/file`).expect(200);
      // Its PDF carries the slope and pipe notes too (the line has depth readings and early-failure pipe).
      const pdf = await request(ctx.app)
        .get(`/api${seededByDemo.disclosureLinkPath}/pdf`)
        .buffer(true)
        .parse((res, callback) => {
          const chunks: Buffer[] = [];
          res.on('data', (c: Buffer) => chunks.push(c));
          res.on('end', () => callback(null, Buffer.concat(chunks)));
        })
        .expect(200);
      expect((pdf.body as Buffer).subarray(0, 5).toString()).toBe('%PDF-');
      expect(pdf.headers['content-disposition']).toBe('attachment; filename="sewer-line-report-1740-orchard-hill-road.pdf"');
    },
  );
});
