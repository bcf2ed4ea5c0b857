import type { Knex } from 'knex';
import { isoIn, nowIso } from '../../lib/clock.ts';
import { hashToken, newId, newSecretToken } from '../../lib/ids.ts';

/** A new address must be confirmed within two days, like a sign-up (tokens.repo.ts: email_verification). */
export const EMAIL_CHANGE_LIFETIME_MS = 48 * 60 * 60_000;

/** Start a change of address; an earlier pending change of the same person stops working. */
export async function issueEmailChange(db: Knex, userId: string, newEmail: string): Promise<string> {
  const token = newSecretToken();
  const now = nowIso();
  await db('email_changes').where({ user_id: userId }).whereNull('used_at').update({ used_at: now });
  await db('email_changes').insert({
    id: newId(),
    user_id: userId,
    new_email: newEmail.toLowerCase(),
    token_hash: hashToken(token),
    expires_at: isoIn(EMAIL_CHANGE_LIFETIME_MS),
    created_at: now,
  });
  return token;
}

export type EmailChangeLookup =
  { state: 'valid'; id: string; userId: string; newEmail: string } | { state: 'unknown' } | { state: 'expired' } | { state: 'used' };

export async function lookupEmailChange(db: Knex, token: string): Promise<EmailChangeLookup> {
  const row = await db('email_changes')
    .where({ token_hash: hashToken(token) })
    .first();
  if (!row) return { state: 'unknown' };
  if (row.used_at) return { state: 'used' };
  if (row.expires_at <= nowIso()) return { state: 'expired' };
  return { state: 'valid', id: row.id, userId: row.user_id, newEmail: row.new_email };
}

/** Single use: only the first caller changes the row. */
export async function consumeEmailChange(db: Knex, id: string): Promise<boolean> {
  const changed = await db('email_changes')
    .where({ id })
    .whereNull('used_at')
    .where('expires_at', '>', nowIso())
    .update({ used_at: nowIso() });
  return changed === 1;
}

export async function pendingEmailChange(db: Knex, userId: string): Promise<{ newEmail: string; expiresAt: string } | null> {
  const row = await db('email_changes')
    .where({ user_id: userId })
    .whereNull('used_at')
    .where('expires_at', '>', nowIso())
    .orderBy('created_at', 'desc')
    .first();
  return row ? { newEmail: row.new_email, expiresAt: row.expires_at } : null;
}

/**
 * The person's stored sessions other than this one that have not expired.
 * Sessions are JSON written by express-session with passport's user id inside (sessions.repo.ts).
 */
export async function countOtherSessions(db: Knex, userId: string, exceptSid: string): Promise<number> {
  const rows: { expired: unknown }[] = await db('sessions')
    .whereRaw('CAST(sess AS TEXT) LIKE ?', [`%"user":"${userId}"%`])
    .whereNot('sid', exceptSid)
    .select('expired');
  const now = Date.now();
  // SQLite keeps the expiry as milliseconds, PostgreSQL as a timestamp.
  return rows.filter((r) => new Date(r.expired as string | number | Date).getTime() > now).length;
}
