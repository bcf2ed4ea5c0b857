import type { Knex } from 'knex';
import type { CurrentUser, Role } from '@underfoot/core';
import { nowIso } from '../../lib/clock.ts';
import { newId } from '../../lib/ids.ts';

interface UserRow {
  id: string;
  company_id: string;
  email: string;
  name: string;
  role: Role;
  password_hash: string | null;
  disabled_at: string | null;
  email_verified_at: string | null;
  company_name: string;
}

export interface UserRecord extends CurrentUser {
  passwordHash: string | null;
  disabledAt: string | null;
  emailVerifiedAt: string | null;
}

const toUser = (row: UserRow): UserRecord => ({
  id: row.id,
  companyId: row.company_id,
  companyName: row.company_name,
  email: row.email,
  name: row.name,
  role: row.role,
  passwordHash: row.password_hash,
  disabledAt: row.disabled_at,
  emailVerifiedAt: row.email_verified_at,
});

export const publicUser = (user: UserRecord): CurrentUser => ({
  id: user.id,
  email: user.email,
  name: user.name,
  role: user.role,
  companyId: user.companyId,
  companyName: user.companyName,
});

function selectUsers(db: Knex) {
  return db<UserRow>('users').join('companies', 'companies.id', 'users.company_id').select('users.*', 'companies.name as company_name');
}

export async function findUserByEmail(db: Knex, email: string): Promise<UserRecord | undefined> {
  const row = await selectUsers(db).whereRaw('lower(users.email) = ?', [email.toLowerCase()]).first();
  return row ? toUser(row) : undefined;
}

export async function findUserById(db: Knex, id: string): Promise<UserRecord | undefined> {
  const row = await selectUsers(db).where('users.id', id).first();
  return row ? toUser(row) : undefined;
}

export interface NewUser {
  companyId: string;
  email: string;
  name: string;
  role: Role;
  passwordHash: string | null;
  emailVerified: boolean;
}

export async function insertUser(db: Knex, user: NewUser): Promise<string> {
  const id = newId();
  const now = nowIso();
  await db('users').insert({
    id,
    company_id: user.companyId,
    email: user.email.toLowerCase(),
    name: user.name,
    role: user.role,
    password_hash: user.passwordHash,
    email_verified_at: user.emailVerified ? now : null,
    created_at: now,
    updated_at: now,
  });
  return id;
}

export async function setPassword(db: Knex, userId: string, passwordHash: string, name?: string): Promise<void> {
  const now = nowIso();
  await db('users')
    .where({ id: userId })
    .update({
      password_hash: passwordHash,
      // Following an e-mailed link proves the address.
      email_verified_at: db.raw('coalesce(email_verified_at, ?)', [now]),
      ...(name ? { name } : {}),
      updated_at: now,
    });
}
