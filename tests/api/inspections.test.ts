import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { feet } from '@underfoot/core';
import { insertOrder, sampleDocument } from '../support/inspection-fixtures.ts';
import { browserLikeAgent, createTestContext, type TestContext } from '../support/test-app.ts';

let ctx: TestContext;
beforeAll(async () => {
  ctx = await createTestContext();
});
afterAll(() => ctx.close());

async function signedIn(email: string) {
  const client = await browserLikeAgent(ctx.app);
  expect((await client.signIn(email)).status).toBe(200);
  return client;
}

const put = (client: Awaited<ReturnType<typeof signedIn>>, orderId: string, body: object) =>
  client.agent.put(`/api/orders/${orderId}/inspection`).set('x-csrf-token', client.token).send(body);

const storedRow = (orderId: string) => ctx.services.db('inspections').where({ order_id: orderId }).first();

describe('reading an inspection', () => {
  it('gives the assigned inspector an empty document at version 0, with the property as ordered', async () => {
    const orderId = await insertOrder(ctx);
    const inspector = await signedIn(ctx.users.inspector.email);
    const res = await inspector.agent.get(`/api/orders/${orderId}/inspection`).expect(200);
    expect(res.body.inspection).toMatchObject({ orderId, version: 0, updatedAt: null });
    expect(res.body.inspection.document).toMatchObject({
      id: orderId,
      property: { yearBuilt: 1956, type: 'single_family' },
      accessPoints: [],
      runs: [],
      checkedNotFound: [],
    });
    expect(res.body.order).toMatchObject({ id: orderId, status: 'scheduled', address: expect.stringContaining('12 Sluice Row') });
    expect(res.body.allowed).toEqual({ edit: true });
    expect(res.body.media).toEqual([]);
    // Reading creates nothing.
    expect(await storedRow(orderId)).toBeUndefined();
  });

  it('answers 404 to an inspector not assigned, another company and the parties before release', async () => {
    const otherInspector = await ctx.addUser('inspector', `other-${crypto.randomUUID()}@mudlark.test`);
    const orderId = await insertOrder(ctx);
    const otherCompany = await ctx.addCompany('Elsewhere Sewer Co');
    const outsider = await ctx.addUser('office', `office-${crypto.randomUUID()}@elsewhere.test`, otherCompany);
    for (const email of [otherInspector.email, outsider.email, ctx.users.agent.email, ctx.users.client.email]) {
      const client = await signedIn(email);
      const res = await client.agent.get(`/api/orders/${orderId}/inspection`);
      expect(res.status, email).toBe(404);
      expect(res.body.code).toBe('not_found');
      const save = await put(client, orderId, { baseVersion: 0, document: sampleDocument(orderId) });
      expect(save.status, email).toBe(404);
    }
    expect(await storedRow(orderId)).toBeUndefined();
  });

  it('answers 401 when signed out and 404 for an order that does not exist', async () => {
    const orderId = await insertOrder(ctx);
    expect((await request(ctx.app).get(`/api/orders/${orderId}/inspection`)).status).toBe(401);
    const office = await signedIn(ctx.users.office.email);
    expect((await office.agent.get(`/api/orders/${crypto.randomUUID()}/inspection`)).status).toBe(404);
  });
});

describe('saving with optimistic concurrency', () => {
  it('stores the first save as version 1 and each later save one higher', async () => {
    const orderId = await insertOrder(ctx);
    const inspector = await signedIn(ctx.users.inspector.email);
    const document = sampleDocument(orderId);

    const first = await put(inspector, orderId, { baseVersion: 0, document });
    expect(first.status).toBe(200);
    expect(first.body).toEqual({ version: 1, updatedAt: expect.any(String) });
    const row = await storedRow(orderId);
    expect(row.version).toBe(1);
    expect(row.updated_by).toBe(ctx.users.inspector.id);
    expect(JSON.parse(row.document).runs[0].observations).toHaveLength(3);

    document.checkedNotFound = ['standing_water', 'blockage'];
    const second = await put(inspector, orderId, { baseVersion: 1, document });
    expect(second.status).toBe(200);
    expect(second.body.version).toBe(2);

    const read = await inspector.agent.get(`/api/orders/${orderId}/inspection`).expect(200);
    expect(read.body.inspection.version).toBe(2);
    expect(read.body.inspection.document.checkedNotFound).toEqual(['standing_water', 'blockage']);
    expect(read.body.inspection.updatedBy).toEqual({ id: ctx.users.inspector.id, name: 'inspector person' });
    // Defaults are filled in by the core schema on the way in.
    expect(read.body.inspection.document.runs[0].observations[1]).toMatchObject({ kind: 'roots', to: null, stillIds: [] });
  });

  it('refuses a stale save with 409 and the stored document, and changes nothing', async () => {
    const orderId = await insertOrder(ctx);
    const phone = await signedIn(ctx.users.inspector.email);
    const office = await signedIn(ctx.users.office.email);
    const document = sampleDocument(orderId);
    expect((await put(phone, orderId, { baseVersion: 0, document })).status).toBe(200);

    // The office and the phone both start from version 1; the office saves first.
    const officeCopy = structuredClone(document);
    officeCopy.checkedNotFound = ['roots'];
    expect((await put(office, orderId, { baseVersion: 1, document: officeCopy })).status).toBe(200);

    const phoneCopy = structuredClone(document);
    phoneCopy.checkedNotFound = ['blockage'];
    const stale = await put(phone, orderId, { baseVersion: 1, document: phoneCopy });
    expect(stale.status).toBe(409);
    expect(stale.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(stale.body).toMatchObject({ code: 'version_conflict', status: 409 });
    expect(stale.body.detail).toMatch(/office person saved a newer version/);
    expect(stale.body.current).toMatchObject({ orderId, version: 2, updatedBy: { id: ctx.users.office.id } });
    expect(stale.body.current.document.checkedNotFound).toEqual(['roots']);

    const row = await storedRow(orderId);
    expect(row.version).toBe(2);
    expect(JSON.parse(row.document).checkedNotFound).toEqual(['roots']);
  });

  it('lets only one of two first saves win', async () => {
    const orderId = await insertOrder(ctx);
    const a = await signedIn(ctx.users.inspector.email);
    const b = await signedIn(ctx.users.office.email);
    const [first, second] = await Promise.all([
      put(a, orderId, { baseVersion: 0, document: sampleDocument(orderId) }),
      put(b, orderId, { baseVersion: 0, document: { ...sampleDocument(orderId), checkedNotFound: [] } }),
    ]);
    expect([first.status, second.status].sort()).toEqual([200, 409]);
    expect((await storedRow(orderId)).version).toBe(1);
  });

  it('refuses a version from the future as stale', async () => {
    const orderId = await insertOrder(ctx);
    const inspector = await signedIn(ctx.users.inspector.email);
    const res = await put(inspector, orderId, { baseVersion: 7, document: sampleDocument(orderId) });
    expect(res.status).toBe(409);
    expect(res.body.current.version).toBe(0);
    expect(await storedRow(orderId)).toBeUndefined();
  });

  it('needs the CSRF token', async () => {
    const orderId = await insertOrder(ctx);
    const inspector = await signedIn(ctx.users.inspector.email);
    const res = await inspector.agent.put(`/api/orders/${orderId}/inspection`).send({ baseVersion: 0, document: sampleDocument(orderId) });
    expect(res.status).toBe(403);
    expect(await storedRow(orderId)).toBeUndefined();
  });

  it('takes a large inspection (hundreds of findings) in one save', async () => {
    const orderId = await insertOrder(ctx);
    const inspector = await signedIn(ctx.users.inspector.email);
    const document = sampleDocument(orderId);
    const run = document.runs![0]!;
    run.distanceReached = feet(700);
    run.observations = Array.from({ length: 1200 }, (_, i) => ({
      id: `obs-${i}`,
      kind: 'debris' as const,
      at: feet(i * 0.5),
      severity: 2,
      note: 'Light sludge along the invert, noted for the record.',
    }));
    const body = JSON.stringify({ baseVersion: 0, document });
    expect(body.length).toBeGreaterThan(100 * 1024);
    const res = await put(inspector, orderId, { baseVersion: 0, document });
    expect(res.status).toBe(200);
  });
});

describe('bad input is refused field by field', () => {
  async function expectFieldErrors(mutate: (doc: ReturnType<typeof sampleDocument>) => void, paths: string[]) {
    const orderId = await insertOrder(ctx);
    const inspector = await signedIn(ctx.users.inspector.email);
    expect((await put(inspector, orderId, { baseVersion: 0, document: sampleDocument(orderId) })).status).toBe(200);
    const document = sampleDocument(orderId);
    mutate(document);
    const res = await put(inspector, orderId, { baseVersion: 1, document });
    expect(res.status).toBe(400);
    expect(res.body.code).toBe('invalid_input');
    expect(res.body.errors.map((e: { path: string }) => e.path)).toEqual(expect.arrayContaining(paths));
    // Nothing changed.
    expect((await storedRow(orderId)).version).toBe(1);
    return res.body.errors as { path: string; message: string }[];
  }

  it('a finding beyond the distance the camera reached', async () => {
    const errors = await expectFieldErrors(
      (doc) => {
        doc.runs![0]!.observations![2]!.at = feet(70);
      },
      ['document.runs.0.observations.2.at'],
    );
    expect(errors[0]!.message).toMatch(/past the distance reached \(62' 0"\)/);
  });

  it('a pipe section overlapping another', async () => {
    await expectFieldErrors(
      (doc) => {
        doc.runs![0]!.sections![1]!.from = feet(25);
      },
      ['document.runs.0.sections.1.from'],
    );
  });

  it('a severity on a feature', async () => {
    const errors = await expectFieldErrors(
      (doc) => {
        Object.assign(doc.runs![0]!.observations![0]!, { severity: 3 });
      },
      ['document.runs.0.observations.0.severity'],
    );
    expect(errors[0]!.message).toMatch(/Bend is a feature of the line, not a defect/);
  });

  it('a defect without a severity, and an unknown kind', async () => {
    await expectFieldErrors(
      (doc) => {
        delete (doc.runs![0]!.observations![1] as { severity?: number }).severity;
        Object.assign(doc.runs![0]!.observations![2]!, { kind: 'gremlins' });
      },
      ['document.runs.0.observations.1.severity', 'document.runs.0.observations.2.kind'],
    );
  });

  it('a run from an access point that is not there, and a document of another inspection', async () => {
    await expectFieldErrors(
      (doc) => {
        doc.runs![0]!.accessPointId = 'ap-404';
        doc.id = crypto.randomUUID();
      },
      ['document.runs.0.accessPointId'],
    );
    const orderId = await insertOrder(ctx);
    const inspector = await signedIn(ctx.users.inspector.email);
    const res = await put(inspector, orderId, { baseVersion: 0, document: { ...sampleDocument(orderId), id: crypto.randomUUID() } });
    expect(res.status).toBe(400);
    expect(res.body.errors).toEqual([{ path: 'document.id', message: 'This document belongs to another inspection.' }]);
  });

  it('a video or still that is not a file of this job', async () => {
    await expectFieldErrors(
      (doc) => {
        doc.runs![0]!.videoFileId = crypto.randomUUID();
        doc.runs![0]!.observations![1]!.stillIds = [crypto.randomUUID()];
      },
      ['document.runs.0.videoFileId', 'document.runs.0.observations.1.stillIds.0'],
    );
  });

  it('a missing version', async () => {
    const orderId = await insertOrder(ctx);
    const inspector = await signedIn(ctx.users.inspector.email);
    const res = await put(inspector, orderId, { document: sampleDocument(orderId) });
    expect(res.status).toBe(400);
    expect(res.body.errors[0].path).toBe('baseVersion');
  });
});

describe('who may change it', () => {
  it('lets the office of the company edit an order it owns', async () => {
    const orderId = await insertOrder(ctx, { inspectorId: null });
    const office = await signedIn(ctx.users.office.email);
    const read = await office.agent.get(`/api/orders/${orderId}/inspection`).expect(200);
    expect(read.body.allowed.edit).toBe(true);
    expect((await put(office, orderId, { baseVersion: 0, document: sampleDocument(orderId) })).status).toBe(200);
  });

  it('freezes the inspection once the report is published: readable, not changeable', async () => {
    const orderId = await insertOrder(ctx);
    const inspector = await signedIn(ctx.users.inspector.email);
    expect((await put(inspector, orderId, { baseVersion: 0, document: sampleDocument(orderId) })).status).toBe(200);
    await ctx.services.db('orders').where({ id: orderId }).update({ status: 'published' });

    for (const email of [ctx.users.inspector.email, ctx.users.office.email]) {
      const client = await signedIn(email);
      const read = await client.agent.get(`/api/orders/${orderId}/inspection`).expect(200);
      expect(read.body.allowed.edit).toBe(false);
      const res = await put(client, orderId, { baseVersion: 1, document: { ...sampleDocument(orderId), checkedNotFound: [] } });
      expect(res.status).toBe(403);
      expect(res.body.code).toBe('inspection_published');
    }
    expect((await storedRow(orderId)).version).toBe(1);
  });

  it('closes the inspection of a cancelled order', async () => {
    const orderId = await insertOrder(ctx, { status: 'cancelled' });
    const inspector = await signedIn(ctx.users.inspector.email);
    const read = await inspector.agent.get(`/api/orders/${orderId}/inspection`).expect(200);
    expect(read.body.allowed.edit).toBe(false);
    const res = await put(inspector, orderId, { baseVersion: 0, document: sampleDocument(orderId) });
    expect(res.status).toBe(409);
    expect(res.body.code).toBe('order_cancelled');
  });
});
