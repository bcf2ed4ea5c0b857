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

export interface RevisionRow {
  id: string;
  order_id: string;
  number: number;
  kind: 'original' | 'amendment' | 'reinspection';
  note: string;
  snapshot: string;
  grade: GradeLevel;
  published_by: string | null;
  published_at: string;
}

export async function latestRevision(db: Knex, orderId: string): Promise<RevisionRow | undefined> {
  return db('report_revisions').where({ order_id: orderId }).orderBy('number', 'desc').first();
}

export async function revisionByNumber(db: Knex, orderId: string, number: number): Promise<RevisionRow | undefined> {
  return db('report_revisions').where({ order_id: orderId, number }).first();
}

export async function listRevisions(db: Knex, orderId: string) {
  const rows = await db('report_revisions')
    .leftJoin('users', 'users.id', 'report_revisions.published_by')
    .where('report_revisions.order_id', orderId)
    .orderBy('report_revisions.number')
    .select(
      'report_revisions.number',
      'report_revisions.kind',
      'report_revisions.note',
      'report_revisions.grade',
      'report_revisions.published_at',
      'users.name as published_by_name',
    );
  return rows.map((r) => ({
    number: r.number as number,
    kind: r.kind as RevisionRow['kind'],
    note: r.note as string,
    grade: r.grade as GradeLevel,
    publishedAt: r.published_at as string,
    publishedBy: (r.published_by_name as string | null) ?? null,
  }));
}

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
  await db('report_views').insert({
    order_id: view.orderId,
    revision_number: view.revisionNumber,
    viewer_user_id: view.viewerUserId,
    share_link_id: view.shareLinkId,
    what: view.what,
    ip: view.ip ?? null,
    viewed_at: new Date().toISOString(),
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
