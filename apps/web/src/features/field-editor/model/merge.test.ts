import { describe, expect, it } from 'vitest';
import { inspectionSchema, feet, type Inspection } from '@underfoot/core';
import { mergeDocuments } from './merge';

const base: Inspection = inspectionSchema.parse({
  id: 'order-1',
  property: { yearBuilt: 1950 },
  accessPoints: [{ id: 'ap', kind: 'cleanout_two_way' }],
  runs: [
    {
      id: 'r1',
      accessPointId: 'ap',
      direction: 'toward_main',
      distanceReached: feet(60),
      endReason: 'reached_main',
      sections: [{ id: 's1', from: 0, to: feet(60), material: 'pvc', diameterIn: 4 }],
      observations: [
        { id: 'o1', kind: 'roots', at: feet(10), severity: 2 },
        { id: 'o2', kind: 'bend', at: feet(20), angle: 'deg_45' },
      ],
    },
  ],
  checkedNotFound: ['sag', 'blockage'],
});

const clone = () => structuredClone(base);

describe('merging two edits of one inspection', () => {
  it('keeps findings added on both sides', () => {
    const mine = clone();
    mine.runs[0]!.observations.push({ ...base.runs[0]!.observations[0]!, id: 'mine', at: feet(30) } as never);
    const theirs = clone();
    theirs.runs[0]!.observations.push({ ...base.runs[0]!.observations[0]!, id: 'theirs', at: feet(40) } as never);
    const merged = mergeDocuments(base, mine, theirs);
    expect(merged.runs[0]!.observations.map((o) => o.id)).toEqual(['o1', 'o2', 'theirs', 'mine']);
  });

  it('takes each side’s change to different fields of one finding', () => {
    const mine = clone();
    (mine.runs[0]!.observations[0] as { severity: number }).severity = 3;
    const theirs = clone();
    theirs.runs[0]!.observations[0]!.note = 'Fine roots at the joint';
    const merged = mergeDocuments(base, mine, theirs);
    expect(merged.runs[0]!.observations[0]).toMatchObject({ severity: 3, note: 'Fine roots at the joint' });
  });

  it('removes what one side removed, unless the other side changed it', () => {
    const mine = clone();
    mine.runs[0]!.observations = mine.runs[0]!.observations.filter((o) => o.id !== 'o2');
    const theirs = clone();
    const merged = mergeDocuments(base, mine, theirs);
    expect(merged.runs[0]!.observations.map((o) => o.id)).toEqual(['o1']);

    const theirsChanged = clone();
    theirsChanged.runs[0]!.observations[1]!.note = 'Long sweep, checked twice';
    const kept = mergeDocuments(base, mine, theirsChanged);
    expect(kept.runs[0]!.observations.map((o) => o.id)).toEqual(['o1', 'o2']);
  });

  it('merges the checked-and-not-found list as a set', () => {
    const mine = clone();
    mine.checkedNotFound = ['sag', 'blockage', 'roots'];
    const theirs = clone();
    theirs.checkedNotFound = ['blockage', 'grease'];
    expect(mergeDocuments(base, mine, theirs).checkedNotFound).toEqual(['blockage', 'grease', 'roots']);
  });

  it('lets this device win where both changed the same value', () => {
    const mine = clone();
    mine.runs[0]!.distanceReached = feet(61);
    const theirs = clone();
    theirs.runs[0]!.distanceReached = feet(64);
    expect(mergeDocuments(base, mine, theirs).runs[0]!.distanceReached).toBe(feet(61));
  });

  it('keeps a run added elsewhere and a run added here', () => {
    const mine = clone();
    mine.runs.push({ ...base.runs[0]!, id: 'r-mine', direction: 'toward_building', observations: [], sections: [] });
    const theirs = clone();
    theirs.runs.push({ ...base.runs[0]!, id: 'r-theirs', observations: [], sections: [] });
    expect(mergeDocuments(base, mine, theirs).runs.map((r) => r.id)).toEqual(['r1', 'r-theirs', 'r-mine']);
  });
});
