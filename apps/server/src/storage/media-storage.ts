import type { Readable } from 'node:stream';

/** A byte range, both ends inclusive (as in an HTTP Range header). */
export interface ByteRange {
  start: number;
  end: number;
}

/**
 * Where uploaded files live. Keys are server-made (`orders/<orderId>/<mediaId>.mp4`),
 * never a client's file name. The local-disk implementation is the default; an
 * S3-compatible one can implement the same four calls for a fleet of servers.
 */
export interface MediaStorage {
  /** Take over a finished temporary file (moved on local disk, streamed up to an object store). */
  putFile(key: string, tempPath: string): Promise<void>;
  /** Write a stream under a key. */
  putStream(key: string, source: Readable): Promise<void>;
  /** Read a key, or a part of it. */
  get(key: string, range?: ByteRange): Promise<Readable>;
  /** Size of a stored key, or null when it is not there. */
  stat(key: string): Promise<{ size: number } | null>;
  /** Remove a key; removing a missing key is not an error. */
  delete(key: string): Promise<void>;
  /** Every stored key under a prefix with when it was last written (the start-up sweep for files no row names). */
  list(prefix: string): AsyncIterable<{ key: string; modifiedAt: Date }>;
  /**
   * A folder for uploads in progress, on the same disk as the store where possible
   * (so `putFile` is a rename). Each process has its own; what a crash leaves is swept at start.
   */
  readonly incomingDir: string;
}

/** Keys are lower-case ids, slashes and one extension: nothing a client can turn into a path. */
export const KEY_PATTERN = /^[a-z0-9-]+(\/[a-z0-9-]+)*(\.[a-z0-9]{2,5})?$/;

export function assertSafeKey(key: string): void {
  if (!KEY_PATTERN.test(key) || key.length > 300) throw new Error(`unsafe storage key: ${key}`);
}
