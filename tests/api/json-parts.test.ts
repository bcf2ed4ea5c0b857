import { describe, expect, it } from 'vitest';
import { jsonWithParts } from '@underfoot/server';

describe('jsonWithParts', () => {
  it('gives the JSON of the head and parts together', () => {
    const revision = { number: 2, snapshot: { grade: 'watch', notes: ['a "quoted" word', 'ünïcode'] } };
    const head = { orderId: 'o-1', allowed: { ask: true }, releasedTo: [] };
    for (const [h, parts] of [
      [head, { revision, changes: null }],
      [{}, { revision }],
      [head, {}],
      [{}, {}],
    ] as const) {
      const bytes = jsonWithParts(h, parts);
      expect(bytes.toString('utf8')).toBe(JSON.stringify({ ...h, ...parts }));
    }
  });

  it('serialises a shared part once and reuses the text', () => {
    const revision = { number: 1, grade: 'sound' };
    const first = jsonWithParts({ reader: 'a' }, { revision }).toString();
    // The part is frozen by contract; a change after the first use is not seen.
    (revision as { grade: string }).grade = 'changed';
    const second = jsonWithParts({ reader: 'b' }, { revision }).toString();
    expect(JSON.parse(first).revision).toEqual({ number: 1, grade: 'sound' });
    expect(JSON.parse(second)).toEqual({ reader: 'b', revision: { number: 1, grade: 'sound' } });
  });
});
