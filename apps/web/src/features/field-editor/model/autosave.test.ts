import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { feet, inspectionSchema, type Inspection } from '@underfoot/core';
import type { InspectionView, SaveOutcome } from '../api';
import { AutosaveEngine, type DraftRecord, type DraftStore } from './autosave';

const start: Inspection = inspectionSchema.parse({
  id: 'order-1',
  property: { yearBuilt: 1950 },
  accessPoints: [{ id: 'ap', kind: 'cleanout_two_way' }],
  runs: [{ id: 'r1', accessPointId: 'ap', direction: 'toward_main', distanceReached: feet(60), endReason: 'reached_main' }],
});
const view = (document: Inspection, version: number): InspectionView => ({
  orderId: 'order-1',
  document,
  version,
  updatedAt: '2027-01-01T00:00:00.000Z',
  updatedBy: { id: 'u', name: 'Dana' },
});

function memoryDrafts(initial: DraftRecord | null = null): DraftStore & { current: DraftRecord | null } {
  const store = {
    current: initial,
    read: () => store.current,
    write: (d: DraftRecord) => {
      store.current = d;
    },
    clear: () => {
      store.current = null;
    },
  };
  return store;
}

const addNote = (note: string) => (doc: Inspection) => ({ ...doc, property: { ...doc.property, notes: note } });

beforeEach(() => vi.useFakeTimers());
afterEach(() => vi.useRealTimers());

describe('autosave', () => {
  it('keeps every change on the phone at once and saves it after a pause, with the version it started from', async () => {
    const save = vi.fn(async (_o: string, baseVersion: number): Promise<SaveOutcome> => ({
      kind: 'saved',
      version: baseVersion + 1,
      updatedAt: 'now',
    }));
    const drafts = memoryDrafts();
    const engine = new AutosaveEngine({ orderId: 'order-1', initial: view(start, 3), canEdit: true, save, drafts, debounceMs: 500 });
    engine.start();
    engine.edit(addNote('gate code 4411'));
    expect(engine.getSnapshot().state).toBe('pending');
    expect(drafts.current?.document.property.notes).toBe('gate code 4411');
    engine.edit(addNote('gate code 4412'));
    await vi.advanceTimersByTimeAsync(499);
    expect(save).not.toHaveBeenCalled();
    await vi.advanceTimersByTimeAsync(1);
    expect(save).toHaveBeenCalledTimes(1);
    expect(save.mock.calls[0]![1]).toBe(3);
    expect(engine.getSnapshot()).toMatchObject({ state: 'saved', version: 4 });
    expect(drafts.current).toBeNull();
  });

  it('keeps a failed save on the phone and retries it, sooner when the phone is back online', async () => {
    let online = false;
    const save = vi.fn(async (_o: string, baseVersion: number): Promise<SaveOutcome> => {
      if (!online) throw new TypeError('Failed to fetch');
      return { kind: 'saved', version: baseVersion + 1, updatedAt: 'now' };
    });
    const drafts = memoryDrafts();
    const engine = new AutosaveEngine({ orderId: 'order-1', initial: view(start, 1), canEdit: true, save, drafts, debounceMs: 100 });
    engine.start();
    engine.edit(addNote('roots at the wye'));
    await vi.advanceTimersByTimeAsync(100);
    expect(engine.getSnapshot().state).toBe('retrying');
    expect(drafts.current?.document.property.notes).toBe('roots at the wye');
    await vi.advanceTimersByTimeAsync(2_000);
    expect(save).toHaveBeenCalledTimes(2);
    online = true;
    engine.online();
    await vi.advanceTimersByTimeAsync(0);
    expect(engine.getSnapshot()).toMatchObject({ state: 'saved', version: 2 });
    expect(drafts.current).toBeNull();
  });

  it('stops at a stale save, and merges this phone’s changes into the newer version when asked', async () => {
    const theirs = { ...start, checkedNotFound: ['roots' as const] };
    const outcomes: SaveOutcome[] = [
      { kind: 'conflict', current: view(theirs, 5) },
      { kind: 'saved', version: 6, updatedAt: 'now' },
    ];
    const save = vi.fn(async () => outcomes.shift()!);
    const engine = new AutosaveEngine({
      orderId: 'order-1',
      initial: view(start, 4),
      canEdit: true,
      save,
      drafts: memoryDrafts(),
      debounceMs: 10,
    });
    engine.start();
    engine.edit(addNote('mine'));
    await vi.advanceTimersByTimeAsync(10);
    expect(engine.getSnapshot().state).toBe('conflict');
    expect(engine.getSnapshot().conflict?.version).toBe(5);
    // No silent retry while the question is open.
    await vi.advanceTimersByTimeAsync(60_000);
    expect(save).toHaveBeenCalledTimes(1);

    engine.resolveConflict('merge');
    await vi.advanceTimersByTimeAsync(0);
    expect(save).toHaveBeenCalledTimes(2);
    const [, baseVersion, merged] = save.mock.calls[1]! as unknown as [string, number, Inspection];
    expect(baseVersion).toBe(5);
    expect(merged.property.notes).toBe('mine');
    expect(merged.checkedNotFound).toEqual(['roots']);
    expect(engine.getSnapshot()).toMatchObject({ state: 'saved', version: 6 });
  });

  it('reloads the newer version when asked, dropping this phone’s changes', async () => {
    const theirs = { ...start, checkedNotFound: ['sag' as const] };
    const save = vi.fn(async (): Promise<SaveOutcome> => ({ kind: 'conflict', current: view(theirs, 2) }));
    const drafts = memoryDrafts();
    const engine = new AutosaveEngine({ orderId: 'order-1', initial: view(start, 1), canEdit: true, save, drafts, debounceMs: 10 });
    engine.start();
    engine.edit(addNote('mine'));
    await vi.advanceTimersByTimeAsync(10);
    engine.resolveConflict('theirs');
    expect(engine.getSnapshot()).toMatchObject({ state: 'saved', version: 2 });
    expect(engine.getSnapshot().document).toEqual(theirs);
    expect(drafts.current).toBeNull();
  });

  it('does not send a document with field problems, and says so', async () => {
    const save = vi.fn();
    const engine = new AutosaveEngine({
      orderId: 'order-1',
      initial: view(start, 1),
      canEdit: true,
      save,
      drafts: memoryDrafts(),
      debounceMs: 10,
    });
    engine.start();
    engine.edit((doc) => ({
      ...doc,
      runs: doc.runs.map((r) => ({ ...r, sections: [{ id: 's', from: 0, to: feet(80), material: 'pvc' as const, diameterIn: 4 }] })),
    }));
    await vi.advanceTimersByTimeAsync(100);
    expect(save).not.toHaveBeenCalled();
    expect(engine.getSnapshot().state).toBe('invalid');
    expect(engine.getSnapshot().problems.get('runs.0.sections.0.to')).toMatch(/past the distance reached/);
  });

  it('restores unsaved changes from an earlier visit, and asks when the server moved on meanwhile', async () => {
    const save = vi.fn(async (_o: string, v: number): Promise<SaveOutcome> => ({ kind: 'saved', version: v + 1, updatedAt: 'now' }));
    const draft: DraftRecord = {
      orderId: 'order-1',
      baseVersion: 2,
      baseDocument: start,
      document: addNote('from earlier')(start),
      changedAt: '',
    };
    const same = new AutosaveEngine({ orderId: 'order-1', initial: view(start, 2), canEdit: true, save, drafts: memoryDrafts(draft) });
    same.start();
    expect(same.getSnapshot()).toMatchObject({ restoredDraft: true, state: 'pending' });
    await vi.advanceTimersByTimeAsync(0);
    expect(save).toHaveBeenCalledTimes(1);
    expect(same.getSnapshot().state).toBe('saved');

    const moved = new AutosaveEngine({ orderId: 'order-1', initial: view(start, 3), canEdit: true, save, drafts: memoryDrafts(draft) });
    moved.start();
    expect(moved.getSnapshot()).toMatchObject({ state: 'conflict', restoredDraft: true });
    expect(moved.getSnapshot().document.property.notes).toBe('from earlier');
  });

  it('refuses edits when the inspection is locked', () => {
    const engine = new AutosaveEngine({
      orderId: 'order-1',
      initial: view(start, 2),
      canEdit: false,
      save: vi.fn(),
      drafts: memoryDrafts(),
    });
    engine.start();
    expect(engine.edit(addNote('x'))).toBe(false);
    expect(engine.getSnapshot().state).toBe('locked');
  });
});
