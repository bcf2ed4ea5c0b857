import type { Knex } from 'knex';
import type { Analysis, GradeLevel, Inspection, OrderKind, Side } from '@underfoot/core';

/** Everything a reader sees, frozen at publish time. */
export interface ReportSnapshot {
  orderId: string;
  kind: OrderKind;
  orderingSide: Side;
  property: { address: string; yearBuilt: number; propertyType: string };
  company: { name: string; licenceNumber: string | null; phone: string | null; email: string | null; footer: string | null };
  inspector: { name: string } | null;
  inspectedOn: string | null;
  inspection: Inspection;
  analysis: Analysis;
  /** Files the report shows, as they were at publish time (rendered = the still with its markup burned in). */
  media: {
    id: string;
    kind: 'video' | 'still';
    observationId: string | null;
    runId: string | null;
    renderedId: string | null;
    hasThumbnail: boolean;
    videoTime: number | null;
    footage: number | null;
  }[];
}

/** A revision without its snapshot (the large part, read once through `revisionSnapshot`). */
export interface RevisionRow {
  id: string;
  order_id: string;
  number: number;
  kind: 'original' | 'amendment' | 'reinspection';
  note: string;
  grade: GradeLevel;
  published_by: string | null;
  published_at: string;
}

const revisionColumns = ['id', 'order_id', 'number', 'kind', 'note', 'grade', 'published_by', 'published_at'] as const;

export async function latestRevision(db: Knex, orderId: string): Promise<RevisionRow | undefined> {
  return db('report_revisions')
    .where({ order_id: orderId })
    .orderBy('number', 'desc')
    .first(...revisionColumns);
}

export async function revisionByNumber(db: Knex, orderId: string, number: number): Promise<RevisionRow | undefined> {
  return db('report_revisions')
    .where({ order_id: orderId, number })
    .first(...revisionColumns);
}

export async function revisionSnapshot(db: Knex, revisionId: string): Promise<ReportSnapshot> {
  const row = await db('report_revisions').where({ id: revisionId }).first('snapshot');
  if (!row) throw new Error(`revision ${revisionId} has no row`);
  return JSON.parse(row.snapshot as string) as ReportSnapshot;
}

/** Every revision of a report, oldest first, without snapshots, with who published each. */
export async function listRevisionRows(db: Knex, orderId: string): Promise<(RevisionRow & { published_by_name: string | null })[]> {
  return db('report_revisions')
    .leftJoin('users', 'users.id', 'report_revisions.published_by')
    .where('report_revisions.order_id', orderId)
    .orderBy('report_revisions.number')
    .select(...revisionColumns.map((c) => `report_revisions.${c}`), 'users.name as published_by_name');
}

/** The revision list as readers get it. */
export const revisionListItem = (r: RevisionRow & { published_by_name: string | null }) => ({
  number: r.number,
  kind: r.kind,
  note: r.note,
  grade: r.grade,
  publishedAt: r.published_at,
  publishedBy: r.published_by_name ?? null,
});

export async function listRevisions(db: Knex, orderId: string) {
  return (await listRevisionRows(db, orderId)).map(revisionListItem);
}

/** A reader who comes back to the same revision within this window is one view, not many. */
export const VIEW_REPEAT_WINDOW_MS = 10 * 60_000;

/**
 * Log that someone opened a revision (or its PDF), unless the same person or link already did
 * within the last few minutes: the log answers "who opened what, when", and a reload or a
 * tab left open is not a new opening.
 */
export async function recordView(
  db: Knex,
  view: {
    orderId: string;
    revisionNumber: number;
    viewerUserId: string | null;
    shareLinkId: string | null;
    what: 'report' | 'pdf';
    ip: string | undefined;
  },
): Promise<void> {
  const now = new Date();
  const recent = await db('report_views')
    .where({ order_id: view.orderId, revision_number: view.revisionNumber, what: view.what })
    .where((q) =>
      view.viewerUserId
        ? q.where('viewer_user_id', view.viewerUserId)
        : q.where('share_link_id', view.shareLinkId ?? '').whereNull('viewer_user_id'),
    )
    .where('viewed_at', '>', new Date(now.getTime() - VIEW_REPEAT_WINDOW_MS).toISOString())
    .first('id');
  if (recent) return;
  await db('report_views').insert({
    order_id: view.orderId,
    revision_number: view.revisionNumber,
    viewer_user_id: view.viewerUserId,
    share_link_id: view.shareLinkId,
    what: view.what,
    ip: view.ip ?? null,
    viewed_at: now.toISOString(),
  });
}

export interface ShareLinkRow {
  id: string;
  order_id: string;
  purpose: 'guest' | 'disclosure';
  token_hash: string;
  label: string;
  show_costs: number | boolean;
  expires_at: string | null;
  revoked_at: string | null;
  created_by: string | null;
  created_at: string;
}

export async function findShareLinkByTokenHash(db: Knex, tokenHash: string): Promise<ShareLinkRow | undefined> {
  return db<ShareLinkRow>('share_links').where({ token_hash: tokenHash }).first();
}

/** Media ids a revision shows: each file and its burned-in copy. A guest may fetch these and nothing else. */
export function snapshotMediaIds(snapshot: ReportSnapshot): Set<string> {
  const ids = new Set<string>();
  for (const m of snapshot.media) {
    ids.add(m.id);
    if (m.renderedId) ids.add(m.renderedId);
  }
  return ids;
}
