import type { Knex } from 'knex';
import { nowIso } from '../../lib/clock.ts';

export interface AuditEntry {
  companyId: string | null;
  actorUserId: string | null;
  action: string;
  subjectType?: string;
  subjectId?: string;
  detail?: Record<string, unknown>;
  ip?: string | undefined;
}

export async function recordAudit(db: Knex, entry: AuditEntry): Promise<void> {
  await db('audit_log').insert({
    company_id: entry.companyId,
    actor_user_id: entry.actorUserId,
    action: entry.action,
    subject_type: entry.subjectType ?? null,
    subject_id: entry.subjectId ?? null,
    detail: entry.detail ? JSON.stringify(entry.detail) : null,
    ip: entry.ip ?? null,
    created_at: nowIso(),
  });
}
