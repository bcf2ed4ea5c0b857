import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';

/**
 * A local stand-in for an S3-compatible object store, enough for Underfoot's media storage:
 * path-style PUT, GET (with Range), HEAD, DELETE of objects and ListObjectsV2, in memory, on
 * loopback. Requests must carry a SigV4 Authorization header naming the configured access key
 * (the signature itself is not recomputed: this fake checks the client's wiring, not AWS's crypto).
 */
export interface FakeS3 {
  endpoint: string;
  bucket: string;
  accessKeyId: string;
  secretAccessKey: string;
  /** Keys stored now, for tests. */
  keys(): string[];
  close(): Promise<void>;
}

export interface FakeS3Options {
  host?: string;
  port?: number;
  bucket?: string;
}

interface StoredObject {
  body: Buffer;
  modifiedAt: Date;
}

const xmlEscape = (text: string) =>
  text.replace(/[<>&'"]/g, (c) => ({ '<': '&lt;', '>': '&gt;', '&': '&amp;', "'": '&apos;', '"': '&quot;' })[c]!);

function sendError(res: ServerResponse, status: number, code: string, message: string, head = false) {
  res.writeHead(status, { 'content-type': 'application/xml' });
  res.end(
    head ? undefined : `<?xml version="1.0" encoding="UTF-8"?><Error><Code>${code}</Code><Message>${xmlEscape(message)}</Message></Error>`,
  );
}

async function readBody(req: IncomingMessage): Promise<Buffer> {
  const chunks: Buffer[] = [];
  for await (const chunk of req) chunks.push(chunk as Buffer);
  return Buffer.concat(chunks);
}

/** `bytes=a-b`, `bytes=a-` or `bytes=-n` against a size; null when unsatisfiable. */
function parseRange(header: string, size: number): { start: number; end: number } | null {
  const m = /^bytes=(\d*)-(\d*)$/.exec(header.trim());
  if (!m || (m[1] === '' && m[2] === '')) return null;
  let start: number;
  let end: number;
  if (m[1] === '') {
    start = Math.max(0, size - Number(m[2]));
    end = size - 1;
  } else {
    start = Number(m[1]);
    end = m[2] === '' ? size - 1 : Math.min(Number(m[2]), size - 1);
  }
  return start <= end && start < size ? { start, end } : null;
}

export async function startFakeS3(options: FakeS3Options = {}): Promise<FakeS3> {
  const host = options.host ?? '127.0.0.1';
  const bucket = options.bucket ?? 'underfoot-media';
  const accessKeyId = 'FAKEACCESSKEY';
  const secretAccessKey = 'fake-secret-access-key';
  const objects = new Map<string, StoredObject>();

  const handle = async (req: IncomingMessage, res: ServerResponse) => {
    const url = new URL(req.url ?? '/', `http://${host}`);
    const head = req.method === 'HEAD';
    const auth = req.headers.authorization ?? '';
    if (!auth.startsWith(`AWS4-HMAC-SHA256 Credential=${accessKeyId}/`)) {
      return sendError(res, 403, 'AccessDenied', 'Missing or unknown credentials.', head);
    }
    const [, bucketName, ...rest] = url.pathname.split('/');
    if (bucketName !== bucket) return sendError(res, 404, 'NoSuchBucket', 'The bucket does not exist.', head);
    const key = decodeURIComponent(rest.join('/'));

    if (!key && req.method === 'GET' && url.searchParams.get('list-type') === '2') {
      const prefix = url.searchParams.get('prefix') ?? '';
      const max = Math.min(1000, Number(url.searchParams.get('max-keys') ?? 1000) || 1000);
      const after = url.searchParams.get('continuation-token') ?? url.searchParams.get('start-after') ?? '';
      const all = [...objects.keys()].filter((k) => k.startsWith(prefix) && k > after).sort();
      const page = all.slice(0, max);
      const truncated = all.length > page.length;
      const contents = page
        .map((k) => {
          const o = objects.get(k)!;
          return `<Contents><Key>${xmlEscape(k)}</Key><LastModified>${o.modifiedAt.toISOString()}</LastModified><Size>${o.body.length}</Size><StorageClass>STANDARD</StorageClass></Contents>`;
        })
        .join('');
      res.writeHead(200, { 'content-type': 'application/xml' });
      return res.end(
        `<?xml version="1.0" encoding="UTF-8"?><ListBucketResult><Name>${bucket}</Name><Prefix>${xmlEscape(prefix)}</Prefix>` +
          `<KeyCount>${page.length}</KeyCount><MaxKeys>${max}</MaxKeys><IsTruncated>${truncated}</IsTruncated>` +
          (truncated ? `<NextContinuationToken>${xmlEscape(page[page.length - 1]!)}</NextContinuationToken>` : '') +
          `${contents}</ListBucketResult>`,
      );
    }
    if (!key) return sendError(res, 400, 'InvalidRequest', 'Name an object.', head);

    switch (req.method) {
      case 'PUT': {
        const body = await readBody(req);
        const declared = req.headers['content-length'];
        if (declared !== undefined && Number(declared) !== body.length) {
          return sendError(res, 400, 'IncompleteBody', 'The body is shorter or longer than its Content-Length.');
        }
        objects.set(key, { body, modifiedAt: new Date() });
        res.writeHead(200, { etag: `"${body.length}-${Date.now()}"` });
        return res.end();
      }
      case 'GET':
      case 'HEAD': {
        const found = objects.get(key);
        if (!found) return sendError(res, 404, 'NoSuchKey', 'The specified key does not exist.', head);
        const common = {
          'last-modified': found.modifiedAt.toUTCString(),
          'accept-ranges': 'bytes',
          'content-type': 'application/octet-stream',
        };
        const rangeHeader = req.headers.range;
        if (rangeHeader && !head) {
          const range = parseRange(rangeHeader, found.body.length);
          if (!range) return sendError(res, 416, 'InvalidRange', 'The requested range is not satisfiable.');
          res.writeHead(206, {
            ...common,
            'content-length': String(range.end - range.start + 1),
            'content-range': `bytes ${range.start}-${range.end}/${found.body.length}`,
          });
          return res.end(found.body.subarray(range.start, range.end + 1));
        }
        res.writeHead(200, { ...common, 'content-length': String(found.body.length) });
        return res.end(head ? undefined : found.body);
      }
      case 'DELETE':
        objects.delete(key);
        res.writeHead(204);
        return res.end();
      default:
        return sendError(res, 405, 'MethodNotAllowed', 'Not supported by this fake.');
    }
  };

  const server: Server = createServer((req, res) => {
    handle(req, res).catch((err: unknown) => sendError(res, 500, 'InternalError', String(err)));
  });
  await new Promise<void>((resolve) => server.listen(options.port ?? 0, host, resolve));
  const { port } = server.address() as AddressInfo;

  return {
    endpoint: `http://${host}:${port}`,
    bucket,
    accessKeyId,
    secretAccessKey,
    keys: () => [...objects.keys()].sort(),
    close: () =>
      new Promise<void>((resolve) => {
        server.closeAllConnections();
        server.close(() => resolve());
      }),
  };
}
