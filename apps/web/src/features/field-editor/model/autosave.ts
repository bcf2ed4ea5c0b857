import type { Inspection } from '@underfoot/core';
import type { InspectionView, SaveOutcome } from '../api';
import { documentProblems } from './document';
import { mergeDocuments } from './merge';

/**
 * The editor's saving: every change is kept on the phone at once (localStorage) and sent
 * a moment later; each save names the version it started from. A save that fails on the
 * network is retried with growing pauses and when the phone comes back online; a save
 * that meets a newer version stops and asks the person to reload or merge. Nothing is
 * overwritten silently and nothing entered is dropped.
 */

export type SaveState =
  /** Everything on screen is on the server. */
  | 'saved'
  /** Changed moments ago; the save is about to go. */
  | 'pending'
  | 'saving'
  /** The last save did not reach the server; kept on this phone and retried. */
  | 'retrying'
  /** A field needs fixing before the document can be saved. */
  | 'invalid'
  /** Someone saved a newer version: reload or merge. */
  | 'conflict'
  /** The inspection can no longer be changed (published, or access removed). */
  | 'locked';

export interface EditorSnapshot {
  document: Inspection;
  /** The latest document without field problems: what the live preview works from. */
  previewDocument: Inspection;
  version: number;
  state: SaveState;
  lastSavedAt: string | null;
  /** Field problems, by path inside the document. */
  problems: Map<string, string>;
  /** A sentence for the state line when saving is stuck. */
  detail: string | null;
  /** When the next automatic retry goes, for the status line. */
  retryAt: number | null;
  conflict: InspectionView | null;
  /** Restored from this phone on load: changes made earlier that had not reached the server. */
  restoredDraft: boolean;
}

export interface DraftRecord {
  orderId: string;
  baseVersion: number;
  baseDocument: Inspection;
  document: Inspection;
  changedAt: string;
}

export interface DraftStore {
  read(orderId: string): DraftRecord | null;
  write(draft: DraftRecord): void;
  clear(orderId: string): void;
}

/** Drafts in localStorage, one per order; a full or blocked storage costs the backup, never the edit. */
export const localDraftStore: DraftStore = {
  read(orderId) {
    try {
      const text = localStorage.getItem(draftKey(orderId));
      if (!text) return null;
      const draft = JSON.parse(text) as DraftRecord;
      return draft.orderId === orderId && draft.document && draft.baseDocument ? draft : null;
    } catch {
      return null;
    }
  },
  write(draft) {
    try {
      localStorage.setItem(draftKey(draft.orderId), JSON.stringify(draft));
    } catch {
      // Storage full or disabled: the in-memory copy and the retries still hold the change.
    }
  },
  clear(orderId) {
    try {
      localStorage.removeItem(draftKey(orderId));
    } catch {
      // Nothing to clear.
    }
  },
};

export const draftKey = (orderId: string) => `underfoot:inspection-draft:${orderId}`;

export interface EngineOptions {
  orderId: string;
  initial: InspectionView;
  canEdit: boolean;
  save: (orderId: string, baseVersion: number, document: Inspection) => Promise<SaveOutcome>;
  drafts?: DraftStore;
  /** Pause after the last change before saving. */
  debounceMs?: number;
  now?: () => number;
}

const RETRY_STEPS_MS = [2_000, 5_000, 10_000, 20_000, 30_000];

export class AutosaveEngine {
  private snapshot: EditorSnapshot;
  private readonly listeners = new Set<() => void>();
  private readonly drafts: DraftStore;
  private readonly debounceMs: number;
  private readonly now: () => number;
  /** The server's document at `version`: the base of a merge. */
  private baseDocument: Inspection;
  private timer: ReturnType<typeof setTimeout> | null = null;
  private inFlight = false;
  private dirty = false;
  private failures = 0;
  /** Timers run only between start() and stop(), so a copy React throws away never saves. */
  private running = false;

  constructor(private readonly options: EngineOptions) {
    this.drafts = options.drafts ?? localDraftStore;
    this.debounceMs = options.debounceMs ?? 800;
    this.now = options.now ?? Date.now;
    const { initial } = options;
    this.baseDocument = initial.document;
    this.snapshot = {
      document: initial.document,
      previewDocument: initial.document,
      version: initial.version,
      state: options.canEdit ? 'saved' : 'locked',
      lastSavedAt: initial.updatedAt,
      problems: new Map(),
      detail: options.canEdit ? null : 'This inspection can be read here but not changed.',
      retryAt: null,
      conflict: null,
      restoredDraft: false,
    };
    if (options.canEdit) this.restoreDraft();
    else this.drafts.clear(options.orderId);
  }

  // ---------- store protocol (useSyncExternalStore) ----------

  subscribe = (listener: () => void) => {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  };

  getSnapshot = () => this.snapshot;

  private set(patch: Partial<EditorSnapshot>) {
    this.snapshot = { ...this.snapshot, ...patch };
    for (const listener of this.listeners) listener();
  }

  // ---------- editing ----------

  /** Apply a change; it is kept on the phone at once and saved after a short pause. */
  edit(change: (document: Inspection) => Inspection): boolean {
    const { state } = this.snapshot;
    if (state === 'locked') return false;
    const document = change(this.snapshot.document);
    if (document === this.snapshot.document) return true;
    this.dirty = true;
    this.keepDraft(document);
    const problems = documentProblems(document);
    const previewDocument = problems.size === 0 ? document : this.snapshot.previewDocument;
    if (state === 'conflict') {
      // Keep editing while the question is open; the answer decides what is saved.
      this.set({ document, problems, previewDocument });
      return true;
    }
    this.set({ document, previewDocument, problems, state: problems.size > 0 ? 'invalid' : 'pending', detail: problemsDetail(problems) });
    if (problems.size === 0) this.schedule(this.debounceMs);
    return true;
  }

  /** Save now (leaving the page, the phone going to sleep, or "Retry now"). */
  flush = () => {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    void this.saveNow();
  };

  /** The phone is back online: try at once instead of waiting out the pause. */
  online = () => {
    if (this.snapshot.state === 'retrying') this.flush();
  };

  /** Answer a conflict: take the stored version as it is, or merge this phone's changes into it. */
  resolveConflict(choice: 'theirs' | 'merge') {
    const current = this.snapshot.conflict;
    if (!current) return;
    const mine = this.snapshot.document;
    const base = this.baseDocument;
    this.baseDocument = current.document;
    if (choice === 'theirs') {
      this.dirty = false;
      this.drafts.clear(this.options.orderId);
      this.set({
        document: current.document,
        previewDocument: current.document,
        version: current.version,
        conflict: null,
        state: 'saved',
        detail: null,
        problems: new Map(),
        lastSavedAt: current.updatedAt,
        restoredDraft: false,
      });
      return;
    }
    const merged = mergeDocuments(base, mine, current.document);
    this.dirty = true;
    this.keepDraft(merged, current.version);
    const problems = documentProblems(merged);
    this.set({
      document: merged,
      previewDocument: problems.size === 0 ? merged : current.document,
      version: current.version,
      conflict: null,
      problems,
      state: problems.size > 0 ? 'invalid' : 'pending',
      detail: problemsDetail(problems),
      restoredDraft: false,
    });
    if (problems.size === 0) this.flush();
  }

  /** Begin saving: a change restored from this phone goes at once. */
  start() {
    this.running = true;
    if (this.dirty && this.snapshot.state === 'pending') this.schedule(0);
    else if (this.dirty && this.snapshot.state === 'retrying') this.schedule(RETRY_STEPS_MS[0]!);
  }

  /** Stop the timers (the page is closing); a save already on its way still lands. */
  stop() {
    this.running = false;
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
  }

  // ---------- internals ----------

  private keepDraft(document: Inspection, baseVersion = this.snapshot.version) {
    this.drafts.write({
      orderId: this.options.orderId,
      baseVersion,
      baseDocument: this.baseDocument,
      document,
      changedAt: new Date(this.now()).toISOString(),
    });
  }

  private restoreDraft() {
    const draft = this.drafts.read(this.options.orderId);
    if (!draft) return;
    const { initial } = this.options;
    if (draft.baseVersion === initial.version) {
      this.baseDocument = draft.baseDocument;
      this.dirty = true;
      const problems = documentProblems(draft.document);
      this.snapshot = {
        ...this.snapshot,
        document: draft.document,
        previewDocument: problems.size === 0 ? draft.document : this.snapshot.previewDocument,
        problems,
        state: problems.size > 0 ? 'invalid' : 'pending',
        detail: problemsDetail(problems),
        restoredDraft: true,
      };
      return;
    }
    // Changes made here on an older version: the person decides how they meet the newer one.
    this.baseDocument = draft.baseDocument;
    this.dirty = true;
    this.snapshot = {
      ...this.snapshot,
      document: draft.document,
      problems: documentProblems(draft.document),
      state: 'conflict',
      conflict: initial,
      detail: null,
      restoredDraft: true,
    };
  }

  private schedule(ms: number) {
    if (!this.running) return;
    if (this.timer) clearTimeout(this.timer);
    this.timer = setTimeout(() => {
      this.timer = null;
      void this.saveNow();
    }, ms);
  }

  private async saveNow() {
    if (this.inFlight || !this.dirty) return;
    const { state } = this.snapshot;
    if (state === 'conflict' || state === 'locked' || state === 'invalid') return;
    const document = this.snapshot.document;
    const baseVersion = this.snapshot.version;
    this.inFlight = true;
    this.set({ state: 'saving', retryAt: null });
    let outcome: SaveOutcome;
    try {
      outcome = await this.options.save(this.options.orderId, baseVersion, document);
    } catch {
      this.inFlight = false;
      const delay = RETRY_STEPS_MS[Math.min(this.failures, RETRY_STEPS_MS.length - 1)]!;
      this.failures += 1;
      this.set({
        state: 'retrying',
        retryAt: this.now() + delay,
        detail: 'Could not reach Underfoot. Your changes are kept on this phone and will be sent when the connection is back.',
      });
      this.schedule(delay);
      return;
    }
    this.inFlight = false;
    this.failures = 0;
    if (outcome.kind === 'saved') {
      this.baseDocument = document;
      const changedSince = this.snapshot.document !== document;
      this.dirty = changedSince;
      if (changedSince) {
        this.set({ version: outcome.version, lastSavedAt: outcome.updatedAt, state: 'pending', detail: null });
        this.keepDraft(this.snapshot.document, outcome.version);
        this.schedule(this.debounceMs);
      } else {
        this.drafts.clear(this.options.orderId);
        this.set({ version: outcome.version, lastSavedAt: outcome.updatedAt, state: 'saved', detail: null, restoredDraft: false });
      }
    } else if (outcome.kind === 'conflict') {
      this.set({ state: 'conflict', conflict: outcome.current, detail: null });
    } else if (outcome.kind === 'invalid') {
      const problems = new Map(outcome.errors.map((e) => [e.path, e.message]));
      this.set({ state: 'invalid', problems, detail: problemsDetail(problems) ?? outcome.detail });
    } else {
      this.set({ state: 'locked', detail: outcome.detail });
    }
  }
}

function problemsDetail(problems: Map<string, string>): string | null {
  if (problems.size === 0) return null;
  return problems.size === 1
    ? 'One field needs fixing before this can be saved.'
    : `${problems.size} fields need fixing before this can be saved.`;
}
