import type { Knex } from 'knex';
import { isoIn, nowIso } from '../../lib/clock.ts';
import { hashToken, newId, newSecretToken } from '../../lib/ids.ts';

export type TokenPurpose = 'password_reset' | 'invitation' | 'email_verification';

/** How long each kind of link works. Reset links are short-lived (OWASP Forgot Password Cheat Sheet). */
export const tokenLifetimeMs: Record<TokenPurpose, number> = {
  password_reset: 60 * 60_000,
  invitation: 7 * 24 * 60 * 60_000,
  email_verification: 48 * 60 * 60_000,
};

/** Issue a new link token; earlier unused ones for the same purpose stop working. */
export async function issueToken(db: Knex, userId: string, purpose: TokenPurpose): Promise<string> {
  const token = newSecretToken();
  const now = nowIso();
  await db('one_time_tokens').where({ user_id: userId, purpose }).whereNull('used_at').update({ used_at: now });
  await db('one_time_tokens').insert({
    id: newId(),
    user_id: userId,
    purpose,
    token_hash: hashToken(token),
    expires_at: isoIn(tokenLifetimeMs[purpose]),
    created_at: now,
  });
  return token;
}

export type TokenLookup =
  { state: 'valid'; userId: string; tokenId: string } | { state: 'unknown' } | { state: 'expired' } | { state: 'used' };

export async function lookupToken(db: Knex, token: string, purpose: TokenPurpose): Promise<TokenLookup> {
  const row = await db('one_time_tokens')
    .where({ token_hash: hashToken(token), purpose })
    .first();
  if (!row) return { state: 'unknown' };
  if (row.used_at) return { state: 'used' };
  if (row.expires_at <= nowIso()) return { state: 'expired' };
  return { state: 'valid', userId: row.user_id, tokenId: row.id };
}

/** Mark a token used; false if someone else used it first (the update is the single-use guarantee). */
export async function consumeToken(db: Knex, tokenId: string): Promise<boolean> {
  const changed = await db('one_time_tokens')
    .where({ id: tokenId })
    .whereNull('used_at')
    .where('expires_at', '>', nowIso())
    .update({ used_at: nowIso() });
  return changed === 1;
}
