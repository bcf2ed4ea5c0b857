import { describe, expect, it } from 'vitest';
import { homePathOf, safeNextPath } from './auth';

describe('safeNextPath', () => {
  it('follows a path inside the person’s own area, keeping its query and hash', () => {
    expect(safeNextPath('/office?tab=queue#top', 'office')).toBe('/office?tab=queue#top');
    expect(safeNextPath('/account', 'client')).toBe('/account');
  });

  it.each([['//evil.example/office'], ['https://evil.example/'], ['/\\evil.example'], ['javascript:alert(1)'], [''], [null]])(
    'refuses %s and goes home instead',
    (next) => {
      expect(safeNextPath(next, 'agent')).toBe('/portal');
    },
  );

  it('does not send a person into another role’s area', () => {
    expect(safeNextPath('/office', 'inspector')).toBe('/field');
    expect(safeNextPath('/portal/reports/1', 'office')).toBe('/office');
  });

  it('knows each role’s home', () => {
    expect([homePathOf('office'), homePathOf('inspector'), homePathOf('agent'), homePathOf('client')]).toEqual([
      '/office',
      '/field',
      '/portal',
      '/portal',
    ]);
  });
});
