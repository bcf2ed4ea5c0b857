import { describe, expect, it } from 'vitest';
import { revisionFromQuery } from './reader.ts';

describe('revisionFromQuery', () => {
  it('reads a positive whole revision number and nothing else', () => {
    expect(revisionFromQuery('2')).toBe(2);
    expect(revisionFromQuery('12')).toBe(12);
    for (const value of [null, undefined, '', '0', '-1', '1.5', 'two', '2abc', 'Infinity']) {
      expect(revisionFromQuery(value), String(value)).toBeNull();
    }
  });
});
