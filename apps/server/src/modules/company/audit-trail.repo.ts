import type { Knex } from 'knex';
import { auditActionLabel, auditActions, type AuditQuery } from '@underfoot/core';

export interface AuditEntryView {
  id: number;
  at: string;
  action: string;
  actionLabel: string;
  actor: { id: string; name: string; email: string } | null;
  subject: { type: string; id: string; label: string } | null;
  detail: Record<string, unknown> | null;
  /** The detail as one readable line ("role: inspector → office"). */
  detailText: string;
  ip: string | null;
}

export type AuditFilter = Omit<AuditQuery, 'page' | 'pageSize'>;

/** `LIKE` with the user's text taken literally: %, _ and the escape character itself are escaped. */
function likePattern(text: string): string {
  return `%${text.toLowerCase().replace(/[\\%_]/g, (ch) => `\\${ch}`)}%`;
}

function baseQuery(db: Knex, companyId: string, filter: AuditFilter) {
  const query = db('audit_log as a')
    .leftJoin('users as actor', 'actor.id', 'a.actor_user_id')
    .leftJoin('users as su', function joinSubjectUser() {
      this.on('su.id', '=', 'a.subject_id').andOn('a.subject_type', '=', db.raw('?', ['user']));
    })
    .leftJoin('orders as so', function joinSubjectOrder() {
      this.on('so.id', '=', 'a.subject_id').andOn('a.subject_type', '=', db.raw('?', ['order']));
    })
    .leftJoin('properties as sp', 'sp.id', 'so.property_id')
    .where('a.company_id', companyId);
  if (filter.action) query.where('a.action', filter.action);
  if (filter.actorId) query.where('a.actor_user_id', filter.actorId);
  // Stored times are ISO strings in UTC; normalising the bounds the same way keeps the string comparison exact.
  if (filter.from) query.where('a.created_at', '>=', new Date(filter.from).toISOString());
  if (filter.to) query.where('a.created_at', '<=', new Date(filter.to).toISOString());
  if (filter.q) {
    const pattern = likePattern(filter.q);
    const needle = filter.q.toLowerCase();
    // People search by what they read ("role"), so action names count as well as codes.
    const labelled = Object.entries(auditActions)
      .filter(([, info]) => info.label.toLowerCase().includes(needle))
      .map(([code]) => code);
    query.where((w) => {
      for (const column of ['a.action', 'a.detail', 'a.ip', 'actor.name', 'actor.email', 'su.name', 'su.email', 'sp.street']) {
        w.orWhereRaw(`lower(coalesce(${column}, '')) like ? escape '\\'`, [pattern]);
      }
      if (labelled.length > 0) w.orWhereIn('a.action', labelled);
    });
  }
  return query;
}

interface AuditRow {
  id: number;
  created_at: string;
  action: string;
  subject_type: string | null;
  subject_id: string | null;
  detail: string | null;
  ip: string | null;
  actor_user_id: string | null;
  actor_name: string | null;
  actor_email: string | null;
  subject_user_name: string | null;
  subject_street: string | null;
}

function describeValue(value: unknown): string {
  if (value === null || value === undefined) return '—';
  if (Array.isArray(value)) return value.map(describeValue).join(', ');
  if (typeof value === 'object') return JSON.stringify(value);
  return String(value);
}

function detailTextOf(detail: Record<string, unknown> | null): string {
  if (!detail) return '';
  if ('from' in detail && 'to' in detail && Object.keys(detail).length <= 3) {
    const field = typeof detail.field === 'string' ? `${detail.field}: ` : '';
    return `${field}${describeValue(detail.from)} → ${describeValue(detail.to)}`;
  }
  return Object.entries(detail)
    .map(([key, value]) => `${key}: ${describeValue(value)}`)
    .join('; ');
}

function parseDetail(text: string | null): Record<string, unknown> | null {
  if (!text) return null;
  try {
    const parsed: unknown = JSON.parse(text);
    return parsed && typeof parsed === 'object' && !Array.isArray(parsed) ? (parsed as Record<string, unknown>) : { value: parsed };
  } catch {
    return { text };
  }
}

function toView(row: AuditRow): AuditEntryView {
  const detail = parseDetail(row.detail);
  let subject: AuditEntryView['subject'] = null;
  if (row.subject_type && row.subject_id) {
    const named = typeof detail?.name === 'string' ? detail.name : null;
    const label =
      row.subject_type === 'user'
        ? (row.subject_user_name ?? 'A removed person')
        : row.subject_type === 'order'
          ? (row.subject_street ?? 'A removed order')
          : row.subject_type === 'company'
            ? 'Company'
            : row.subject_type === 'fee_item'
              ? `Fee: ${named ?? 'removed'}`
              : row.subject_type.replace(/_/g, ' ');
    subject = { type: row.subject_type, id: row.subject_id, label };
  }
  return {
    id: row.id,
    at: row.created_at,
    action: row.action,
    actionLabel: auditActionLabel(row.action),
    actor: row.actor_user_id ? { id: row.actor_user_id, name: row.actor_name ?? 'A removed person', email: row.actor_email ?? '' } : null,
    subject,
    detail,
    detailText: detailTextOf(detail),
    ip: row.ip,
  };
}

const columns = [
  'a.id',
  'a.created_at',
  'a.action',
  'a.subject_type',
  'a.subject_id',
  'a.detail',
  'a.ip',
  'a.actor_user_id',
  'actor.name as actor_name',
  'actor.email as actor_email',
  'su.name as subject_user_name',
  'sp.street as subject_street',
];

export async function listAuditEntries(
  db: Knex,
  companyId: string,
  filter: AuditFilter,
  page: { limit: number; offset: number },
): Promise<{ entries: AuditEntryView[]; total: number }> {
  const counted = await baseQuery(db, companyId, filter).count({ n: '*' }).first();
  const rows: AuditRow[] = await baseQuery(db, companyId, filter)
    .select(columns)
    .orderBy([
      { column: 'a.created_at', order: 'desc' },
      { column: 'a.id', order: 'desc' },
    ])
    .limit(page.limit)
    .offset(page.offset);
  return { entries: rows.map(toView), total: Number(counted?.n ?? 0) };
}

/** The choices the filters offer: the actions and the people that appear in this company's trail. */
export async function auditFilterOptions(db: Knex, companyId: string) {
  const actions: { action: string }[] = await db('audit_log').where({ company_id: companyId }).distinct('action').orderBy('action');
  const actors: { id: string; name: string; email: string }[] = await db('audit_log')
    .join('users', 'users.id', 'audit_log.actor_user_id')
    .where('audit_log.company_id', companyId)
    .distinct('users.id', 'users.name', 'users.email')
    .orderBy('users.name');
  return {
    actions: actions.map((a) => ({ code: a.action, label: auditActionLabel(a.action) })).sort((x, y) => x.label.localeCompare(y.label)),
    actors,
  };
}
