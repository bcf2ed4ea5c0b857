import { request as httpRequest } from 'node:http';
import type { AddressInfo } from 'node:net';
import sharp from 'sharp';
import request from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { feet, markupColourInfo } from '@underfoot/core';
import { insertOrder, sampleDocument } from '../support/inspection-fixtures.ts';
import {
  enormousPngHeader,
  filesUnder,
  htmlPage,
  phoneJpeg,
  plainPng,
  sampleIsoVideo,
  sampleWebm,
  svgPicture,
} from '../support/media-samples.ts';
import { browserLikeAgent, createTestContext, type TestContext } from '../support/test-app.ts';

let ctx: TestContext;
// Small limits, so "over the limit" is quick to send.
const MAX_VIDEO_BYTES = 256 * 1024;
beforeAll(async () => {
  ctx = await createTestContext({ MEDIA_MAX_VIDEO_MB: String(MAX_VIDEO_BYTES / 1024 / 1024), MEDIA_MAX_STILL_MB: '2' });
});
afterAll(() => ctx.close());

type Client = Awaited<ReturnType<typeof browserLikeAgent>>;
const clients = new Map<string, Client>();
async function signedIn(email: string): Promise<Client> {
  const existing = clients.get(email);
  if (existing) return existing;
  const client = await browserLikeAgent(ctx.app);
  expect((await client.signIn(email)).status).toBe(200);
  clients.set(email, client);
  return client;
}

const mediaDir = () => ctx.config.media.dir;
const mediaRows = (orderId: string) => ctx.services.db('media').where({ order_id: orderId });
const storedFiles = () => filesUnder(mediaDir());

// form-data keeps only the base name of `filename`; `filepath` sends the name as given, folders and all.
// (form-data's own option; superagent's types only list filename and contentType.)
const attachName = (name: string) => (name.includes('/') ? ({ filepath: name } as unknown as { filename: string }) : name);

function uploadVideo(client: Client, orderId: string, content: Buffer, filename: string, fields: Record<string, string> = {}) {
  const req = client.agent.post(`/api/orders/${orderId}/media/videos`).set('x-csrf-token', client.token);
  for (const [k, v] of Object.entries(fields)) req.field(k, v);
  return req.attach('video', content, attachName(filename));
}

function uploadStill(client: Client, orderId: string, content: Buffer, filename: string, fields: Record<string, string> = {}) {
  const req = client.agent.post(`/api/orders/${orderId}/media/stills`).set('x-csrf-token', client.token);
  for (const [k, v] of Object.entries(fields)) req.field(k, v);
  return req.attach('image', content, attachName(filename));
}

const binary = (res: request.Response) => res.body as Buffer;
const getBinary = (client: Client, url: string) =>
  client.agent
    .get(url)
    .buffer(true)
    .parse((res, callback) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => callback(null, Buffer.concat(chunks)));
    });

let inspector: Client;
beforeEach(async () => {
  inspector = await signedIn(ctx.users.inspector.email);
});

/** Nothing left behind: no row for the order and nothing new on disk (the upload folder included). */
async function expectNothingKept(orderId: string, filesBefore: string[]) {
  expect(await mediaRows(orderId)).toEqual([]);
  // multer removes partial files as the request ends; give the file system a moment.
  for (let i = 0; i < 20 && storedFiles().length !== filesBefore.length; i++) await new Promise((r) => setTimeout(r, 25));
  expect(storedFiles()).toEqual(filesBefore);
}

describe('video upload', () => {
  it('streams an MP4 to storage, checks it and reads its length and size', async () => {
    const orderId = await insertOrder(ctx);
    const content = sampleIsoVideo({ seconds: 12.5, width: 320, height: 240 });
    const res = await uploadVideo(inspector, orderId, content, 'lateral run 1.MP4', { runId: 'run-1' });
    expect(res.status).toBe(201);
    expect(res.body.media).toMatchObject({
      kind: 'video',
      orderId,
      runId: 'run-1',
      mime: 'video/mp4',
      sizeBytes: content.length,
      durationSeconds: 12.5,
      width: 320,
      height: 240,
      originalName: 'lateral run 1.MP4',
      url: `/api/media/${res.body.media.id}/file`,
    });
    const [row] = await mediaRows(orderId);
    expect(row.storage_key).toBe(`orders/${orderId}/${res.body.media.id}.mp4`);
    expect(row.created_by).toBe(ctx.users.inspector.id);
    const stored = await getBinary(inspector, res.body.media.url).expect(200);
    expect(Buffer.compare(binary(stored), content)).toBe(0);
    expect(stored.headers['content-type']).toBe('video/mp4');
    expect(stored.headers['accept-ranges']).toBe('bytes');

    const list = await inspector.agent.get(`/api/orders/${orderId}/media`).expect(200);
    expect(list.body.media.map((m: { id: string }) => m.id)).toEqual([res.body.media.id]);
    // The upload folder is empty again: the file was moved, not copied.
    expect(filesUnder(`${mediaDir()}/.incoming`)).toEqual([]);
  });

  it('takes WebM and QuickTime by their content', async () => {
    const orderId = await insertOrder(ctx);
    const webm = await uploadVideo(inspector, orderId, sampleWebm({ seconds: 8, width: 640, height: 360 }), 'clip.webm');
    expect(webm.status).toBe(201);
    expect(webm.body.media).toMatchObject({ mime: 'video/webm', durationSeconds: 8, width: 640, height: 360 });
    const mov = await uploadVideo(inspector, orderId, sampleIsoVideo({ brand: 'qt' }), 'IMG_0042.MOV');
    expect(mov.status).toBe(201);
    expect(mov.body.media.mime).toBe('video/quicktime');
  });

  it('serves byte ranges so a player can seek', async () => {
    const orderId = await insertOrder(ctx);
    const content = sampleIsoVideo({ payloadBytes: 10_000 });
    const { body } = await uploadVideo(inspector, orderId, content, 'run.mp4').expect(201);
    const url = body.media.url as string;

    const first = await getBinary(inspector, url).set('Range', 'bytes=0-99').expect(206);
    expect(first.headers['content-range']).toBe(`bytes 0-99/${content.length}`);
    expect(first.headers['content-length']).toBe('100');
    expect(Buffer.compare(binary(first), content.subarray(0, 100))).toBe(0);

    const middle = await getBinary(inspector, url).set('Range', 'bytes=5000-').expect(206);
    expect(Buffer.compare(binary(middle), content.subarray(5000))).toBe(0);
    expect(middle.headers['content-range']).toBe(`bytes 5000-${content.length - 1}/${content.length}`);

    const tail = await getBinary(inspector, url).set('Range', 'bytes=-10').expect(206);
    expect(Buffer.compare(binary(tail), content.subarray(content.length - 10))).toBe(0);

    const beyond = await inspector.agent.get(url).set('Range', `bytes=${content.length + 5}-`);
    expect(beyond.status).toBe(416);
    expect(beyond.headers['content-range']).toBe(`bytes */${content.length}`);

    // Several ranges at once: the whole file, which the RFC allows.
    const several = await getBinary(inspector, url).set('Range', 'bytes=0-1,5-6').expect(200);
    expect(binary(several).length).toBe(content.length);

    const head = await inspector.agent.head(url).expect(200);
    expect(head.headers['content-length']).toBe(String(content.length));
  });

  it('lets only people who may read the order fetch it: 404 for everyone else', async () => {
    const orderId = await insertOrder(ctx);
    const { body } = await uploadVideo(inspector, orderId, sampleIsoVideo(), 'run.mp4').expect(201);
    const url = body.media.url as string;
    const office = await signedIn(ctx.users.office.email);
    expect((await office.agent.get(url)).status).toBe(200);

    const stranger = await ctx.addUser('inspector', `stranger-${crypto.randomUUID()}@mudlark.test`);
    const otherCompany = await ctx.addCompany('Far Away Drains');
    const outsider = await ctx.addUser('office', `o-${crypto.randomUUID()}@faraway.test`, otherCompany);
    for (const email of [stranger.email, outsider.email, ctx.users.agent.email]) {
      const client = await signedIn(email);
      const res = await client.agent.get(url).set('Range', 'bytes=0-9');
      expect(res.status, email).toBe(404);
      expect((await client.agent.get(`/api/orders/${orderId}/media`)).status, email).toBe(404);
    }
    expect((await request(ctx.app).get(url)).status).toBe(401);
  });

  it('refuses uploads from people who may not change the inspection, before storing anything', async () => {
    const orderId = await insertOrder(ctx);
    const before = storedFiles();
    const agent = await signedIn(ctx.users.agent.email);
    const res = await uploadVideo(agent, orderId, sampleIsoVideo(), 'run.mp4');
    expect(res.status).toBe(404);
    const published = await insertOrder(ctx, { status: 'published' });
    const frozen = await uploadVideo(inspector, published, sampleIsoVideo(), 'run.mp4');
    expect(frozen.status).toBe(403);
    expect(frozen.body.code).toBe('inspection_published');
    await expectNothingKept(orderId, before);
    await expectNothingKept(published, before);
  });
});

describe('bad video input: a clear 4xx problem, and no row and no file left behind', () => {
  const cases: { name: string; content: () => Buffer; filename: string; status: number; code: string }[] = [
    { name: 'a zero-byte file', content: () => Buffer.alloc(0), filename: 'x.mp4', status: 400, code: 'file_empty' },
    {
      name: 'a PNG named .mp4',
      content: () => Buffer.from(enormousPngHeader()),
      filename: 'holiday.mp4',
      status: 415,
      code: 'unsupported_type',
    },
    { name: 'a web page named .webm', content: () => htmlPage, filename: 'clip.webm', status: 415, code: 'unsupported_type' },
    {
      name: 'a truncated MP4',
      content: () => {
        const whole = sampleIsoVideo({ payloadBytes: 20_000 });
        return whole.subarray(0, whole.length - 5_000);
      },
      filename: 'run.mp4',
      status: 422,
      code: 'video_damaged',
    },
    {
      name: 'an MP4 with no index',
      content: () => Buffer.concat([sampleIsoVideo().subarray(0, 32)]),
      filename: 'run.mp4',
      status: 422,
      code: 'video_damaged',
    },
    {
      name: 'a truncated WebM',
      content: () => {
        const whole = sampleWebm({ payloadBytes: 20_000 });
        return whole.subarray(0, 12_000);
      },
      filename: 'run.webm',
      status: 422,
      code: 'video_damaged',
    },
    {
      name: 'a path in the file name',
      content: () => sampleIsoVideo(),
      filename: '../../etc/run.mp4',
      status: 400,
      code: 'unsafe_file_name',
    },
    {
      name: 'a Windows path in the file name',
      content: () => sampleIsoVideo(),
      filename: 'C:\\Users\\field\\run.mp4',
      status: 400,
      code: 'unsafe_file_name',
    },
    {
      name: 'a file over the limit',
      content: () => sampleIsoVideo({ payloadBytes: MAX_VIDEO_BYTES + 10 }),
      filename: 'long.mp4',
      status: 413,
      code: 'file_too_large',
    },
  ];
  for (const c of cases) {
    it(c.name, async () => {
      const orderId = await insertOrder(ctx);
      const before = storedFiles();
      const res = await uploadVideo(inspector, orderId, c.content(), c.filename);
      expect(res.status).toBe(c.status);
      expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
      expect(res.body.code).toBe(c.code);
      expect(res.body.detail.length).toBeGreaterThan(20);
      await expectNothingKept(orderId, before);
    });
  }

  it('no file in the form', async () => {
    const orderId = await insertOrder(ctx);
    const res = await inspector.agent
      .post(`/api/orders/${orderId}/media/videos`)
      .set('x-csrf-token', inspector.token)
      .field('runId', 'run-1');
    expect(res.status).toBe(400);
    expect(res.body.detail).toMatch(/Attach the video/);
  });

  it('the wrong field name, or two files', async () => {
    const orderId = await insertOrder(ctx);
    const before = storedFiles();
    const wrong = await inspector.agent
      .post(`/api/orders/${orderId}/media/videos`)
      .set('x-csrf-token', inspector.token)
      .attach('movie', sampleIsoVideo(), 'run.mp4');
    expect(wrong.status).toBe(400);
    const two = await inspector.agent
      .post(`/api/orders/${orderId}/media/videos`)
      .set('x-csrf-token', inspector.token)
      .attach('video', sampleIsoVideo(), 'a.mp4')
      .attach('video', sampleIsoVideo(), 'b.mp4');
    expect(two.status).toBe(400);
    await expectNothingKept(orderId, before);
  });

  it('an upload cut off half way', async () => {
    const orderId = await insertOrder(ctx);
    const before = storedFiles();
    const server = ctx.app.listen(0, '127.0.0.1');
    await new Promise((r) => server.once('listening', r));
    try {
      const { port } = server.address() as AddressInfo;
      const cookie = (await inspector.agent.jar.getCookies({ domain: '127.0.0.1', path: '/', secure: false, script: false }))
        .map((c) => `${c.name}=${c.value}`)
        .join('; ');
      const boundary = '----underfoot-test';
      const head = Buffer.from(
        `--${boundary}\r\nContent-Disposition: form-data; name="video"; filename="run.mp4"\r\nContent-Type: video/mp4\r\n\r\n`,
      );
      const content = sampleIsoVideo({ payloadBytes: 100_000 });
      const req = httpRequest({
        host: '127.0.0.1',
        port,
        method: 'POST',
        path: `/api/orders/${orderId}/media/videos`,
        headers: {
          cookie,
          'x-csrf-token': inspector.token,
          'content-type': `multipart/form-data; boundary=${boundary}`,
          'content-length': String(head.length + content.length + 100),
        },
      });
      req.on('error', () => undefined);
      req.write(head);
      req.write(content.subarray(0, 50_000));
      // Let the server start writing the part to disk, then drop the connection.
      await new Promise((r) => setTimeout(r, 150));
      req.destroy();
      await new Promise((r) => setTimeout(r, 300));
    } finally {
      await new Promise((r) => server.close(r));
    }
    await expectNothingKept(orderId, before);
  });
});

describe('stills', () => {
  it('fixes the orientation, strips the metadata (GPS included) and makes display and thumbnail sizes', async () => {
    const orderId = await insertOrder(ctx);
    const original = await phoneJpeg(600, 400);
    const originalMeta = await sharp(original).metadata();
    expect(originalMeta.orientation).toBe(6);
    expect(originalMeta.exif?.includes(Buffer.from('Pocket Camera Co'))).toBe(true);

    const res = await uploadStill(inspector, orderId, original, 'IMG_2231.JPG', {
      origin: 'photo',
      runId: 'run-1',
      observationId: 'obs-3',
      footage: String(feet(41)),
    });
    expect(res.status).toBe(201);
    // Orientation 6 means "turn 90° clockwise to view": a 600 × 400 sensor image stands up as 400 × 600.
    expect(res.body.media).toMatchObject({
      kind: 'still',
      mime: 'image/jpeg',
      width: 400,
      height: 600,
      runId: 'run-1',
      observationId: 'obs-3',
      footage: feet(41),
      videoTime: null,
      origin: 'photo',
      markup: null,
      renderedUrl: null,
    });
    const display = binary(await getBinary(inspector, res.body.media.url).expect(200));
    const meta = await sharp(display).metadata();
    expect(meta).toMatchObject({ format: 'jpeg', width: 400, height: 600 });
    expect(meta.exif).toBeUndefined();
    expect(meta.xmp).toBeUndefined();
    expect(meta.orientation).toBeUndefined();
    expect(display.includes(Buffer.from('Pocket Camera Co'))).toBe(false);
    // The red corner was top-left of the sensor image; upright it is top-right.
    const { data, info } = await sharp(display).raw().toBuffer({ resolveWithObject: true });
    const pixel = (x: number, y: number) =>
      Array.from(data.subarray((y * info.width + x) * info.channels, (y * info.width + x) * info.channels + 3));
    expect(pixel(info.width - 10, 10)[0]).toBeGreaterThan(200);
    expect(pixel(10, 10)[0]).toBeLessThan(150);

    const thumb = binary(await getBinary(inspector, res.body.media.thumbnailUrl).expect(200));
    const thumbMeta = await sharp(thumb).metadata();
    expect(Math.max(thumbMeta.width!, thumbMeta.height!)).toBe(320);
    expect(thumbMeta.exif).toBeUndefined();
  });

  it('shrinks a large photo to the display size, and takes PNG and WebP', async () => {
    const orderId = await insertOrder(ctx);
    const big = await sharp({ create: { width: 3000, height: 2000, channels: 3, background: '#335577' } })
      .jpeg()
      .toBuffer();
    const res = await uploadStill(inspector, orderId, big, 'big.jpg').expect(201);
    expect(res.body.media).toMatchObject({ width: 1600, height: 1067 });
    expect((await uploadStill(inspector, orderId, await plainPng(), 'frame.png')).status).toBe(201);
    const webp = await sharp({ create: { width: 200, height: 150, channels: 3, background: '#222222' } })
      .webp()
      .toBuffer();
    expect((await uploadStill(inspector, orderId, webp, 'frame.webp')).status).toBe(201);
  });

  it('records a frame grabbed from the video with its time and footage, and the inspection can point at it', async () => {
    const orderId = await insertOrder(ctx);
    const frame = await sharp({ create: { width: 320, height: 240, channels: 3, background: '#3a342c' } })
      .jpeg()
      .toBuffer();
    const res = await uploadStill(inspector, orderId, frame, 'frame.jpg', {
      origin: 'frame_grab',
      runId: 'run-1',
      observationId: 'obs-2',
      videoTime: '41.25',
      footage: String(feet(24.5)),
    }).expect(201);
    expect(res.body.media).toMatchObject({ origin: 'frame_grab', videoTime: 41.25, footage: feet(24.5), observationId: 'obs-2' });

    const document = sampleDocument(orderId);
    document.runs![0]!.observations![1]!.stillIds = [res.body.media.id];
    const saved = await inspector.agent
      .put(`/api/orders/${orderId}/inspection`)
      .set('x-csrf-token', inspector.token)
      .send({ baseVersion: 0, document });
    expect(saved.status).toBe(200);

    // A still of another order cannot be attached.
    const otherOrder = await insertOrder(ctx);
    const elsewhere = sampleDocument(otherOrder);
    elsewhere.runs![0]!.observations![1]!.stillIds = [res.body.media.id];
    const refused = await inspector.agent
      .put(`/api/orders/${otherOrder}/inspection`)
      .set('x-csrf-token', inspector.token)
      .send({ baseVersion: 0, document: elsewhere });
    expect(refused.status).toBe(400);
    expect(refused.body.errors[0].path).toBe('document.runs.0.observations.1.stillIds.0');
  });

  it('deletes a still with its files', async () => {
    const orderId = await insertOrder(ctx);
    const before = storedFiles();
    const { body } = await uploadStill(inspector, orderId, await plainPng(), 'frame.png').expect(201);
    expect(storedFiles().length).toBe(before.length + 2);
    const res = await inspector.agent.delete(`/api/media/${body.media.id}`).set('x-csrf-token', inspector.token);
    expect(res.status).toBe(204);
    await expectNothingKept(orderId, before);
    expect((await inspector.agent.get(body.media.url)).status).toBe(404);
  });
});

describe('bad picture input: a clear 4xx problem, and no row and no file left behind', () => {
  const cases: {
    name: string;
    content: () => Buffer | Promise<Buffer>;
    filename: string;
    status: number;
    code: string;
    fields?: Record<string, string>;
  }[] = [
    { name: 'an SVG', content: () => svgPicture, filename: 'pipe.svg', status: 415, code: 'unsupported_type' },
    { name: 'an SVG disguised as a JPEG', content: () => svgPicture, filename: 'pipe.jpg', status: 415, code: 'unsupported_type' },
    { name: 'an HTML page', content: () => htmlPage, filename: 'pipe.html', status: 415, code: 'unsupported_type' },
    { name: 'a video disguised as a photo', content: () => sampleIsoVideo(), filename: 'pipe.jpg', status: 415, code: 'unsupported_type' },
    { name: 'a zero-byte file', content: () => Buffer.alloc(0), filename: 'pipe.jpg', status: 400, code: 'file_empty' },
    {
      name: 'a truncated JPEG',
      content: async () => {
        const whole = await sharp({ create: { width: 800, height: 600, channels: 3, background: '#775533' } })
          .jpeg()
          .toBuffer();
        return whole.subarray(0, Math.floor(whole.length / 2));
      },
      filename: 'pipe.jpg',
      status: 422,
      code: 'image_damaged',
    },
    {
      name: 'an image of enormous dimensions',
      content: () => enormousPngHeader(),
      filename: 'bomb.png',
      status: 413,
      code: 'image_too_large',
    },
    { name: 'a path in the file name', content: () => plainPng(), filename: '/var/www/pipe.png', status: 400, code: 'unsafe_file_name' },
    {
      name: 'a file over the limit',
      content: () => Buffer.concat([Buffer.from([0xff, 0xd8, 0xff, 0xe0]), Buffer.alloc(2 * 1024 * 1024 + 10)]),
      filename: 'huge.jpg',
      status: 413,
      code: 'file_too_large',
    },
    {
      name: 'a negative video time',
      content: () => plainPng(),
      filename: 'frame.png',
      status: 400,
      code: 'invalid_input',
      fields: { videoTime: '-3' },
    },
    {
      name: 'an unknown origin',
      content: () => plainPng(),
      filename: 'frame.png',
      status: 400,
      code: 'invalid_input',
      fields: { origin: 'scanner' },
    },
  ];
  for (const c of cases) {
    it(c.name, async () => {
      const orderId = await insertOrder(ctx);
      const before = storedFiles();
      const res = await uploadStill(inspector, orderId, await c.content(), c.filename, c.fields);
      expect(res.status).toBe(c.status);
      expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
      expect(res.body.code).toBe(c.code);
      await expectNothingKept(orderId, before);
    });
  }
});

describe('markup', () => {
  async function stillOn(orderId: string) {
    const base = await sharp({ create: { width: 800, height: 600, channels: 3, background: '#202020' } })
      .jpeg()
      .toBuffer();
    const { body } = await uploadStill(inspector, orderId, base, 'frame.jpg').expect(201);
    return body.media as { id: string; url: string };
  }
  const putMarkup = (client: Client, id: string, body: object) =>
    client.agent.put(`/api/media/${id}/markup`).set('x-csrf-token', client.token).send(body);

  it('stores the vector data and burns it into a rendered copy', async () => {
    const orderId = await insertOrder(ctx);
    const still = await stillOn(orderId);
    const markup = {
      shapes: [
        { id: 'm1', type: 'box', colour: 'flare', x: 0.1, y: 0.1, w: 0.3, h: 0.3 },
        { id: 'm2', type: 'arrow', colour: 'sun', x1: 0.9, y1: 0.9, x2: 0.6, y2: 0.6 },
        { id: 'm3', type: 'ellipse', colour: 'sky', x: 0.5, y: 0.1, w: 0.2, h: 0.2 },
        { id: 'm4', type: 'text', colour: 'chalk', x: 0.1, y: 0.75, text: 'Offset joint <41 ft>' },
      ],
    };
    const res = await putMarkup(inspector, still.id, { baseVersion: 0, markup });
    expect(res.status).toBe(200);
    expect(res.body.media).toMatchObject({ id: still.id, markupVersion: 1, markup });
    expect(res.body.media.renderedUrl).toMatch(/^\/api\/media\/[\w-]+\/file$/);

    const rendered = binary(await getBinary(inspector, res.body.media.renderedUrl).expect(200));
    const { data, info } = await sharp(rendered).raw().toBuffer({ resolveWithObject: true });
    expect([info.width, info.height]).toEqual([800, 600]);
    const at = (x: number, y: number) => Array.from(data.subarray((y * info.width + x) * 3, (y * info.width + x) * 3 + 3));
    const near = (actual: number[], hex: string) => {
      const expected = [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16));
      return actual.every((v, i) => Math.abs(v - expected[i]!) < 40);
    };
    // The box's left edge at x = 0.1 × 800, halfway down its side, is flare orange.
    expect(near(at(80, 180), markupColourInfo.flare.hex)).toBe(true);
    // Inside the box the picture is untouched.
    expect(near(at(200, 180), '#202020')).toBe(true);
    // Along the arrow's shaft, sun yellow.
    expect(near(at(640, 480), markupColourInfo.sun.hex)).toBe(true);
    // The display copy itself is unchanged.
    const display = binary(await getBinary(inspector, still.url).expect(200));
    const plain = await sharp(display).raw().toBuffer({ resolveWithObject: true });
    expect(Math.abs(plain.data[(180 * 800 + 80) * 3]! - 0x20)).toBeLessThan(10);
  });

  it('replaces the rendered copy when the markup changes, and removes it when cleared', async () => {
    const orderId = await insertOrder(ctx);
    const still = await stillOn(orderId);
    const one = await putMarkup(inspector, still.id, {
      baseVersion: 0,
      markup: { shapes: [{ id: 'a', type: 'box', colour: 'sky', x: 0.2, y: 0.2, w: 0.2, h: 0.2 }] },
    }).expect(200);
    const filesAfterOne = storedFiles();
    const two = await putMarkup(inspector, still.id, {
      baseVersion: 1,
      markup: { shapes: [{ id: 'b', type: 'ellipse', colour: 'flare', x: 0.4, y: 0.4, w: 0.2, h: 0.2 }] },
    }).expect(200);
    expect(two.body.media.renderedUrl).not.toBe(one.body.media.renderedUrl);
    expect((await inspector.agent.get(one.body.media.renderedUrl)).status).toBe(404);
    expect(storedFiles().length).toBe(filesAfterOne.length);
    const cleared = await putMarkup(inspector, still.id, { baseVersion: 2, markup: { shapes: [] } }).expect(200);
    expect(cleared.body.media.renderedUrl).toBeNull();
    expect(storedFiles().length).toBe(filesAfterOne.length - 1);
    expect(await ctx.services.db('media').where({ source_media_id: still.id })).toEqual([]);
  });

  it('refuses a stale markup save (409) and bad shapes (400), changing nothing', async () => {
    const orderId = await insertOrder(ctx);
    const still = await stillOn(orderId);
    await putMarkup(inspector, still.id, { baseVersion: 0, markup: { shapes: [] } }).expect(200);
    const stale = await putMarkup(inspector, still.id, { baseVersion: 0, markup: { shapes: [] } });
    expect(stale.status).toBe(409);
    expect(stale.body.code).toBe('version_conflict');
    const bad = await putMarkup(inspector, still.id, {
      baseVersion: 1,
      markup: {
        shapes: [
          { id: 'a', type: 'text', colour: 'chalk', x: 0.1, y: 0.1, text: 'x'.repeat(41) },
          { id: 'b', type: 'box', colour: 'mauve', x: 0.1, y: 0.1, w: 0.2, h: 0.2 },
          { id: 'c', type: 'box', colour: 'sky', x: 0.9, y: 0.1, w: 0.5, h: 0.2 },
          { id: 'd', type: 'arrow', colour: 'sky', x1: -0.1, y1: 0.1, x2: 0.5, y2: 0.2 },
        ],
      },
    });
    expect(bad.status).toBe(400);
    expect(bad.body.errors.map((e: { path: string }) => e.path)).toEqual(
      expect.arrayContaining(['markup.shapes.0.text', 'markup.shapes.1.colour', 'markup.shapes.2.w', 'markup.shapes.3.x1']),
    );
    const row = await ctx.services.db('media').where({ id: still.id }).first();
    expect(row.markup_version).toBe(1);
  });

  it('is not open to the parties, and stops once published', async () => {
    const orderId = await insertOrder(ctx);
    const still = await stillOn(orderId);
    const agent = await signedIn(ctx.users.agent.email);
    expect((await putMarkup(agent, still.id, { baseVersion: 0, markup: { shapes: [] } })).status).toBe(404);
    await ctx.services.db('orders').where({ id: orderId }).update({ status: 'published' });
    const frozen = await putMarkup(inspector, still.id, { baseVersion: 0, markup: { shapes: [] } });
    expect(frozen.status).toBe(403);
    expect((await inspector.agent.delete(`/api/media/${still.id}`).set('x-csrf-token', inspector.token)).status).toBe(403);
  });
});
