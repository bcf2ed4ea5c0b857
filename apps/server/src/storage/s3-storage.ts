import { createReadStream, createWriteStream } from 'node:fs';
import { rm, stat, unlink } from 'node:fs/promises';
import path from 'node:path';
import { randomBytes } from 'node:crypto';
import { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import {
  DeleteObjectCommand,
  GetObjectCommand,
  HeadObjectCommand,
  ListObjectsV2Command,
  PutObjectCommand,
  S3Client,
  S3ServiceException,
} from '@aws-sdk/client-s3';
import { assertSafeKey, type MediaStorage } from './media-storage.ts';

export interface S3StorageSettings {
  /** An S3-compatible endpoint (MinIO, Ceph, R2…); omitted for AWS itself. */
  endpoint?: string | undefined;
  region: string;
  bucket: string;
  accessKeyId: string;
  secretAccessKey: string;
  /** bucket in the path (most S3-compatible stores) rather than in the host name. */
  forcePathStyle: boolean;
  /** A local folder for uploads in progress (each process its own; swept at start like the local store's). */
  incomingDir: string;
}

const isMissing = (err: unknown) =>
  err instanceof S3ServiceException && (err.name === 'NotFound' || err.name === 'NoSuchKey' || err.$metadata.httpStatusCode === 404);

/** A missing object reads like a missing file on disk, so callers handle both alike. */
const notFoundError = (key: string) => Object.assign(new Error(`no stored object ${key}`), { code: 'ENOENT' });

/**
 * Media in an S3-compatible bucket, through AWS's own SDK, for a fleet of servers sharing one
 * store. Uploads still arrive in a local incoming folder (multer writes there), then go up
 * with their known length; reads stream straight from the bucket, byte ranges included.
 */
export function createS3Storage(settings: S3StorageSettings): MediaStorage {
  const client = new S3Client({
    region: settings.region,
    endpoint: settings.endpoint,
    forcePathStyle: settings.forcePathStyle,
    credentials: { accessKeyId: settings.accessKeyId, secretAccessKey: settings.secretAccessKey },
    // Checksums only where the API demands them: S3-compatible stores differ in the newer checksum headers.
    requestChecksumCalculation: 'WHEN_REQUIRED',
    responseChecksumValidation: 'WHEN_REQUIRED',
  });
  const Bucket = settings.bucket;

  const putFile = async (key: string, tempPath: string) => {
    assertSafeKey(key);
    const { size } = await stat(tempPath);
    await client.send(new PutObjectCommand({ Bucket, Key: key, Body: createReadStream(tempPath), ContentLength: size }));
    await unlink(tempPath);
  };

  return {
    incomingDir: settings.incomingDir,
    putFile,

    async putStream(key, source) {
      assertSafeKey(key);
      // A PUT needs its length up front: spool to the incoming folder, then send the file.
      const spool = path.join(settings.incomingDir, `stream-${randomBytes(8).toString('hex')}`);
      try {
        await pipeline(source, createWriteStream(spool));
        await putFile(key, spool);
      } finally {
        await rm(spool, { force: true });
      }
    },

    async get(key, range) {
      assertSafeKey(key);
      try {
        const res = await client.send(
          new GetObjectCommand({ Bucket, Key: key, ...(range ? { Range: `bytes=${range.start}-${range.end}` } : {}) }),
        );
        if (!(res.Body instanceof Readable)) throw new Error(`the store answered ${key} without a body stream`);
        return res.Body;
      } catch (err) {
        if (isMissing(err)) throw notFoundError(key);
        throw err;
      }
    },

    async stat(key) {
      assertSafeKey(key);
      try {
        const res = await client.send(new HeadObjectCommand({ Bucket, Key: key }));
        return { size: res.ContentLength ?? 0 };
      } catch (err) {
        if (isMissing(err)) return null;
        throw err;
      }
    },

    async delete(key) {
      assertSafeKey(key);
      // Deleting a missing object succeeds in S3, as removing a missing key must here.
      await client.send(new DeleteObjectCommand({ Bucket, Key: key }));
    },

    async *list(prefix) {
      let ContinuationToken: string | undefined;
      do {
        const page = await client.send(new ListObjectsV2Command({ Bucket, Prefix: prefix, ContinuationToken }));
        for (const item of page.Contents ?? []) {
          if (item.Key) yield { key: item.Key, modifiedAt: item.LastModified ?? new Date(0) };
        }
        ContinuationToken = page.IsTruncated ? page.NextContinuationToken : undefined;
      } while (ContinuationToken);
    },
  };
}
