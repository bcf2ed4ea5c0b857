import type { Knex } from 'knex';
import type { PersonStatus, Role } from '@underfoot/core';
import { isSqlite } from '../../db.ts';
import { nowIso } from '../../lib/clock.ts';

export interface PersonRecord {
  id: string;
  name: string;
  email: string;
  role: Role;
  status: PersonStatus;
  emailVerified: boolean;
  createdAt: string;
  disabledAt: string | null;
  lastSignInAt: string | null;
}

interface PersonRow {
  id: string;
  name: string;
  email: string;
  role: Role;
  password_hash: string | null;
  disabled_at: string | null;
  email_verified_at: string | null;
  created_at: string;
  last_sign_in_at: string | null;
}

export const statusOf = (row: { disabled_at: string | null; password_hash: string | null }): PersonStatus =>
  row.disabled_at ? 'disabled' : row.password_hash ? 'active' : 'invited';

const toPerson = (row: PersonRow): PersonRecord => ({
  id: row.id,
  name: row.name,
  email: row.email,
  role: row.role,
  status: statusOf(row),
  emailVerified: row.email_verified_at !== null,
  createdAt: row.created_at,
  disabledAt: row.disabled_at,
  lastSignInAt: row.last_sign_in_at,
});

export interface PeopleFilter {
  role?: Role | 'staff' | undefined;
  status?: PersonStatus | undefined;
  q?: string | undefined;
}

function peopleQuery(db: Knex, companyId: string) {
  const signIns = db('audit_log')
    .where({ company_id: companyId, action: 'auth.sign_in' })
    .groupBy('actor_user_id')
    .select('actor_user_id')
    .max({ last_sign_in_at: 'created_at' })
    .as('signins');
  return db('users')
    .leftJoin(signIns, 'signins.actor_user_id', 'users.id')
    .where('users.company_id', companyId)
    .select(
      'users.id',
      'users.name',
      'users.email',
      'users.role',
      'users.password_hash',
      'users.disabled_at',
      'users.email_verified_at',
      'users.created_at',
      'signins.last_sign_in_at',
    );
}

export async function listPeople(db: Knex, companyId: string, filter: PeopleFilter): Promise<PersonRecord[]> {
  const query = peopleQuery(db, companyId);
  if (filter.role === 'staff') query.whereIn('users.role', ['office', 'inspector']);
  else if (filter.role) query.where('users.role', filter.role);
  if (filter.status === 'disabled') query.whereNotNull('users.disabled_at');
  if (filter.status === 'active') query.whereNull('users.disabled_at').whereNotNull('users.password_hash');
  if (filter.status === 'invited') query.whereNull('users.disabled_at').whereNull('users.password_hash');
  if (filter.q) {
    const pattern = `%${filter.q.toLowerCase().replace(/[\\%_]/g, (ch) => `\\${ch}`)}%`;
    query.where((w) =>
      w.whereRaw("lower(users.name) like ? escape '\\'", [pattern]).orWhereRaw("lower(users.email) like ? escape '\\'", [pattern]),
    );
  }
  // Staff first (office, inspectors), then agents and clients; by name within each.
  const rows: PersonRow[] = await query.orderByRaw(
    "case users.role when 'office' then 0 when 'inspector' then 1 when 'agent' then 2 else 3 end, lower(users.name)",
  );
  return rows.map(toPerson);
}

export async function findPerson(db: Knex, companyId: string, id: string): Promise<PersonRecord | undefined> {
  const row: PersonRow | undefined = await peopleQuery(db, companyId).where('users.id', id).first();
  return row ? toPerson(row) : undefined;
}

/**
 * Office users who can run the company right now: signed up (not just invited) and not disabled.
 * On PostgreSQL the rows are locked, so two office users demoting each other at once cannot both
 * pass the last-office check; SQLite runs one write transaction at a time anyway.
 */
export async function activeOfficeIds(db: Knex, companyId: string): Promise<string[]> {
  const query = db('users')
    .where({ company_id: companyId, role: 'office' })
    .whereNull('disabled_at')
    .whereNotNull('password_hash')
    .select('id');
  if (!isSqlite(db)) query.forUpdate();
  const rows: { id: string }[] = await query;
  return rows.map((r) => r.id);
}

export async function setRole(db: Knex, id: string, role: Role): Promise<void> {
  await db('users').where({ id }).update({ role, updated_at: nowIso() });
}

export async function setDisabled(db: Knex, id: string, disabled: boolean): Promise<void> {
  const now = nowIso();
  await db('users')
    .where({ id })
    .update({ disabled_at: disabled ? now : null, updated_at: now });
}
