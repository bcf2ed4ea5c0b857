import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { accessPointOffsets, collectFindings, findingFromBuilding, formatCents, formatFootage, type Inspection } from '@underfoot/core';
import { pdfPages } from '../support/pdf-text.ts';
import { publishReport, type ReportFixture } from '../support/report-fixtures.ts';
import { browserLikeAgent, createTestContext, type TestContext } from '../support/test-app.ts';

/*
 * The PDF says what the report page says (PRODUCT.md §3 journey 5): its text, pulled out with a
 * PDF reader rather than searched for in the raw bytes, holds the grade and the cost ranges of the
 * report JSON, numbers its pages, and leaves the costs out of a guest copy that hides them.
 */

let ctx: TestContext;
type Client = Awaited<ReturnType<typeof browserLikeAgent>>;
let buyer: Client;
let buyersAgent: Client;
let report: ReportFixture;

beforeAll(async () => {
  ctx = await createTestContext();
  const signIn = async (email: string) => {
    const client = await browserLikeAgent(ctx.app);
    expect((await client.signIn(email)).status).toBe(200);
    return client;
  };
  buyer = await signIn(ctx.users.client.email);
  buyersAgent = await signIn(ctx.users.agent.email);
  report = await publishReport(ctx, {
    field: await signIn(ctx.users.inspector.email),
    office: await signIn(ctx.users.office.email),
    parties: [
      [ctx.users.agent.id, 'buyers_agent'],
      [ctx.users.client.id, 'buyer'],
    ],
    releasedTo: ['buyer'],
  });
}, 60_000);
afterAll(() => ctx.close());

const collect = (res: request.Response, callback: (err: Error | null, body: Buffer) => void) => {
  const chunks: Buffer[] = [];
  res.on('data', (c: Buffer) => chunks.push(c));
  res.on('end', () => callback(null, Buffer.concat(chunks)));
};

interface CostOption {
  name: string;
  lowCents: number;
  highCents: number;
}

describe('the PDF text', () => {
  it('holds the grade and every cost range the report shows, with numbered pages', async () => {
    const json = await buyer.agent.get(`/api/reports/${report.id}`).expect(200);
    const grade: string = json.body.revision.snapshot.analysis.grade.name;
    const options = json.body.revision.snapshot.analysis.costs.options as CostOption[];
    expect(grade).toBe('Repair now');
    expect(options.length).toBeGreaterThan(0);

    const res = await buyer.agent.get(`/api/reports/${report.id}/pdf`).buffer(true).parse(collect).expect(200);
    const pages = await pdfPages(res.body as Buffer);
    expect(pages.length).toBeGreaterThanOrEqual(2);
    const all = pages.join(' ');
    expect(pages[0]).toContain(grade);
    for (const option of options) {
      expect(all).toContain(option.name);
      expect(all).toContain(`${formatCents(option.lowCents)} – ${formatCents(option.highCents)}`);
    }
    // Each finding also reads on the diagram's scale, from the house.
    const inspection = json.body.revision.snapshot.inspection as Inspection;
    const offsets = accessPointOffsets(inspection);
    for (const finding of collectFindings(inspection)) {
      expect(all).toContain(`${formatFootage(findingFromBuilding(inspection, finding, offsets))} from the house`);
    }
    pages.forEach((text, i) => expect(text).toContain(`Page ${i + 1} of ${pages.length}`));
  });

  it('leaves every cost range out of a guest copy with costs hidden, and keeps the grade', async () => {
    const json = await buyer.agent.get(`/api/reports/${report.id}`).expect(200);
    const options = json.body.revision.snapshot.analysis.costs.options as CostOption[];
    const link = await buyersAgent.post(`/api/reports/${report.id}/share-links`, { label: 'Lender', showCosts: false });
    expect(link.status).toBe(201);
    const token = (link.body.url as string).split('/shared/')[1]!;

    const res = await request(ctx.app).get(`/api/shared/${token}/pdf`).buffer(true).parse(collect).expect(200);
    const pages = await pdfPages(res.body as Buffer);
    const all = pages.join(' ');
    expect(pages[0]).toContain('Repair now');
    expect(all).toContain('Cost ranges are not included in this copy of the report.');
    expect(all).not.toContain('Repair options and cost ranges');
    for (const option of options) {
      expect(all).not.toContain(formatCents(option.lowCents));
      expect(all).not.toContain(formatCents(option.highCents));
    }
    // No dollar figure at all: the summary's cost sentence goes too.
    expect(all).not.toMatch(/\$\d/);
    pages.forEach((text, i) => expect(text).toContain(`Page ${i + 1} of ${pages.length}`));
  });
});
