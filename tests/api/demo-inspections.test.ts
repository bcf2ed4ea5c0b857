import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { analyseInspection, demoPriceBook, inspectionSchema } from '@underfoot/core';
import { seedDemo, DEMO_PASSWORD } from '../../seeds/demo.ts';
import { demoInspections, seedDemoInspections } from '../../seeds/inspections.ts';
import { browserLikeAgent, createTestContext, type TestContext } from '../support/test-app.ts';

let ctx: TestContext;
beforeAll(async () => {
  ctx = await createTestContext();
  await seedDemo(ctx.services.db, { passwordHashCost: 10, mediaDir: ctx.config.media.dir });
}, 120_000);
afterAll(() => ctx.close());

describe('the demo inspections', () => {
  it('seed recorded lines with the generated video and stills, once', { timeout: 120_000 }, async () => {
    // seedDemo recorded them already; a second run adds nothing.
    expect((await seedDemoInspections(ctx.services.db, { mediaDir: ctx.config.media.dir })).seeded).toBe(0);

    // The published demo reports have inspections of their own; these are the two recorded, not yet published.
    const rows = await ctx.services
      .db('inspections')
      .whereIn(
        'order_id',
        demoInspections.map((d) => d.orderId),
      )
      .select('order_id', 'document', 'version');
    expect(rows).toHaveLength(2);
    const grades = rows.map((row) => {
      const document = inspectionSchema.parse(JSON.parse(row.document));
      return analyseInspection(document, demoPriceBook).grade.level;
    });
    // Beacon Hill: a serious joint offset (severity 4) → Repair now. Fernwood: moderate sludge only → Maintain.
    expect(grades.sort()).toEqual(['maintain', 'repair_now']);
  });

  it('serves them through the API like any upload: the video with ranges, stills with their burned-in markup', async () => {
    const client = await browserLikeAgent(ctx.app);
    expect((await client.signIn('priya@bramblewood.example.com', DEMO_PASSWORD)).status).toBe(200);
    const page = await client.agent.get('/api/orders/a0000000-0000-4000-8000-000000000007/inspection').expect(200);
    const video = page.body.media.find((m: { kind: string }) => m.kind === 'video');
    expect(page.body.inspection.document.runs[1].videoFileId).toBe(video.id);
    const head = await client.agent.get(video.url).set('Range', 'bytes=0-11').expect(206);
    expect(head.headers['content-type']).toBe('video/mp4');
    const marked = page.body.media.filter((m: { renderedUrl: string | null }) => m.renderedUrl);
    expect(marked).toHaveLength(2);
    const rendered = await client.agent
      .get(marked[0].renderedUrl)
      .buffer(true)
      .parse((res, cb) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => cb(null, Buffer.concat(chunks)));
      })
      .expect(200);
    const meta = await sharp(rendered.body as Buffer).metadata();
    expect(meta.width).toBe(1280);
  });
});
