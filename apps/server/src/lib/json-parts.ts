/**
 * JSON for a response made of a small part for this reader and large parts that are shared and
 * never change (a published revision as readers get it). Each large part is serialised once and
 * the text kept beside the object itself, so it lives exactly as long as whatever cache holds
 * the object; the reader's own part is serialised per response.
 */
const serialized = new WeakMap<object, string>();

function jsonOf(value: object | null): string {
  if (value === null) return 'null';
  let text = serialized.get(value);
  if (text === undefined) {
    text = JSON.stringify(value);
    serialized.set(value, text);
  }
  return text;
}

/** `JSON.stringify({ ...head, ...parts })`, with each part's text reused; the parts' objects must not change. */
export function jsonWithParts(head: object, parts: Record<string, object | null>): string {
  const own = JSON.stringify(head);
  const rest = Object.entries(parts)
    .map(([key, value]) => `${JSON.stringify(key)}:${jsonOf(value)}`)
    .join(',');
  if (rest === '') return own;
  return own === '{}' ? `{${rest}}` : `${own.slice(0, -1)},${rest}}`;
}
