/**
 * JSON for a response made of a small part for this reader and large parts that are shared and
 * never change (a published revision as readers get it). Each large part is serialised and
 * UTF-8 encoded once, the bytes kept beside the object itself, so they live exactly as long as
 * whatever cache holds the object; only the reader's own part is encoded per response.
 */
const encoded = new WeakMap<object, Buffer>();
const NULL = Buffer.from('null');

function bytesOf(value: object | null): Buffer {
  if (value === null) return NULL;
  let bytes = encoded.get(value);
  if (bytes === undefined) {
    bytes = Buffer.from(JSON.stringify(value));
    encoded.set(value, bytes);
  }
  return bytes;
}

/** The UTF-8 bytes of `JSON.stringify({ ...head, ...parts })`, each part's reused; the parts' objects must not change. */
export function jsonWithParts(head: object, parts: Record<string, object | null>): Buffer {
  const own = JSON.stringify(head);
  const entries = Object.entries(parts);
  if (entries.length === 0) return Buffer.from(own);
  const pieces: Buffer[] = [Buffer.from(own === '{}' ? '{' : `${own.slice(0, -1)},`)];
  entries.forEach(([key, value], i) => {
    pieces.push(Buffer.from(`${i > 0 ? ',' : ''}${JSON.stringify(key)}:`), bytesOf(value));
  });
  pieces.push(Buffer.from('}'));
  return Buffer.concat(pieces);
}
