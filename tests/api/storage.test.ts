/**
 * The media storage contract (apps/server/src/storage/media-storage.ts), run against each
 * implementation: the local disk, and the S3-compatible store through AWS's SDK against the
 * local fake object store (apps/fakes). Whatever passes here can hold the product's files.
 */
import { mkdirSync, mkdtempSync, rmSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { Readable } from 'node:stream';
import type { Response } from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startFakeS3, type FakeS3 } from '@underfoot/fakes';
import { createLocalDiskStorage, createS3Storage, parseConfig, type MediaStorage } from '@underfoot/server';
import { insertOrder } from '../support/inspection-fixtures.ts';
import { filesUnder, phoneJpeg } from '../support/media-samples.ts';
import { browserLikeAgent, createTestContext } from '../support/test-app.ts';

/** supertest: collect a binary body as a Buffer. */
const binaryParser = (res: Response, done: (err: Error | null, body: Buffer) => void) => {
  const chunks: Buffer[] = [];
  res.on('data', (c: Buffer) => chunks.push(c));
  res.on('end', () => done(null, Buffer.concat(chunks)));
};

const text = async (stream: Readable) => {
  const chunks: Buffer[] = [];
  for await (const chunk of stream) chunks.push(Buffer.from(chunk as Uint8Array));
  return Buffer.concat(chunks).toString('utf8');
};

let fake: FakeS3;
const roots: string[] = [];
const tempRoot = () => {
  const dir = mkdtempSync(path.join(tmpdir(), 'underfoot-storage-'));
  roots.push(dir);
  return dir;
};

beforeAll(async () => {
  fake = await startFakeS3();
});
afterAll(async () => {
  await fake.close();
  for (const dir of roots) rmSync(dir, { recursive: true, force: true });
});

const implementations: [string, () => MediaStorage][] = [
  ['local disk', () => createLocalDiskStorage(tempRoot())],
  [
    'S3-compatible (fake object store)',
    () => {
      const incomingDir = path.join(tempRoot(), 'incoming');
      mkdirSync(incomingDir, { recursive: true });
      return createS3Storage({
        endpoint: fake.endpoint,
        region: 'us-east-1',
        bucket: fake.bucket,
        accessKeyId: fake.accessKeyId,
        secretAccessKey: fake.secretAccessKey,
        forcePathStyle: true,
        incomingDir,
      });
    },
  ],
];

describe.each(implementations)('media storage: %s', (_name, make) => {
  const run = `t${Math.random().toString(36).slice(2, 8)}`;
  let storage: MediaStorage;
  beforeAll(() => {
    storage = make();
  });

  it('takes over a finished upload: the temporary file goes, the key reads back whole', async () => {
    const temp = path.join(storage.incomingDir, 'upload-1');
    writeFileSync(temp, 'the whole pipe, 0 to 60 feet');
    await storage.putFile(`orders/${run}/clip.mp4`, temp);
    expect(existsSync(temp)).toBe(false);
    expect(await storage.stat(`orders/${run}/clip.mp4`)).toEqual({ size: 28 });
    expect(await text(await storage.get(`orders/${run}/clip.mp4`))).toBe('the whole pipe, 0 to 60 feet');
  });

  it('writes a stream and reads byte ranges, both ends inclusive', async () => {
    await storage.putStream(`orders/${run}/still.jpg`, Readable.from([Buffer.from('0123456789')]));
    expect(await text(await storage.get(`orders/${run}/still.jpg`, { start: 2, end: 5 }))).toBe('2345');
    expect(await text(await storage.get(`orders/${run}/still.jpg`, { start: 9, end: 9 }))).toBe('9');
  });

  it('answers null for a missing key, fails reading it, and deletes idempotently', async () => {
    expect(await storage.stat(`orders/${run}/missing.jpg`)).toBeNull();
    await expect(storage.get(`orders/${run}/missing.jpg`)).rejects.toMatchObject({ code: 'ENOENT' });
    await storage.delete(`orders/${run}/still.jpg`);
    await storage.delete(`orders/${run}/still.jpg`);
    expect(await storage.stat(`orders/${run}/still.jpg`)).toBeNull();
  });

  it('lists what is stored under a prefix, with when it was written', async () => {
    await storage.putStream(`orders/${run}/a/one.jpg`, Readable.from([Buffer.from('1')]));
    await storage.putStream(`orders/${run}/b/two.jpg`, Readable.from([Buffer.from('2')]));
    const listed: { key: string; modifiedAt: Date }[] = [];
    for await (const item of storage.list(`orders/${run}/`)) listed.push(item);
    expect(listed.map((i) => i.key).sort()).toEqual([`orders/${run}/a/one.jpg`, `orders/${run}/b/two.jpg`, `orders/${run}/clip.mp4`]);
    for (const item of listed) expect(Date.now() - item.modifiedAt.getTime()).toBeLessThan(60_000);
  });

  it('refuses keys a client could turn into a path', async () => {
    for (const key of ['../etc/passwd', 'orders/../../x.jpg', '/abs.jpg', 'Orders/UPPER.jpg', 'a\\b.jpg', '']) {
      await expect(storage.stat(key)).rejects.toThrow(/unsafe storage key/);
    }
  });
});

describe('the app on an S3-compatible bucket (STORAGE=s3)', () => {
  it('keeps an uploaded still and its thumbnail in the bucket and serves them back, byte ranges included', async () => {
    const ctx = await createTestContext({
      STORAGE: 's3',
      S3_ENDPOINT: fake.endpoint,
      S3_BUCKET: fake.bucket,
      S3_ACCESS_KEY_ID: fake.accessKeyId,
      S3_SECRET_ACCESS_KEY: fake.secretAccessKey,
    });
    try {
      const orderId = await insertOrder(ctx);
      const field = await browserLikeAgent(ctx.app);
      await field.signIn(ctx.users.inspector.email);
      const before = fake.keys().length;
      const upload = await field.agent
        .post(`/api/orders/${orderId}/media/stills`)
        .set('x-csrf-token', field.token)
        .field('origin', 'photo')
        .attach('image', await phoneJpeg(), 'cleanout.jpg');
      expect(upload.status).toBe(201);
      const id = upload.body.media.id as string;
      const stored = fake.keys().filter((k) => k.includes(id));
      expect(stored.length).toBeGreaterThanOrEqual(2);
      expect(fake.keys().length).toBe(before + stored.length);
      // Nothing of it stays on the server's own disk.
      expect(filesUnder(ctx.config.media.dir).filter((f) => !f.includes('.incoming'))).toEqual([]);

      const whole = await field.agent.get(`/api/media/${id}/file`).buffer(true).parse(binaryParser);
      expect(whole.status).toBe(200);
      expect((whole.body as Buffer).subarray(0, 3)).toEqual(Buffer.from([0xff, 0xd8, 0xff]));
      const part = await field.agent.get(`/api/media/${id}/file`).set('Range', 'bytes=0-9').buffer(true).parse(binaryParser);
      expect(part.status).toBe(206);
      expect((part.body as Buffer).length).toBe(10);
      expect((await field.agent.get(`/api/media/${id}/thumbnail`)).status).toBe(200);
    } finally {
      await ctx.close();
    }
  });

  it('refuses to start with STORAGE=s3 and no bucket, saying what is missing', () => {
    expect(() => parseConfig({ NODE_ENV: 'test', DATA_DIR: tempRoot(), STORAGE: 's3' })).toThrow(/S3_BUCKET/);
  });
});

describe('the fake object store', () => {
  it('refuses requests without the configured credentials', async () => {
    const res = await fetch(`${fake.endpoint}/${fake.bucket}/orders/x.jpg`);
    expect(res.status).toBe(403);
  });
});
