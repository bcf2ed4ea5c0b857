import type { Knex } from 'knex';

/**
 * End every stored session of one person (after a password reset, or when an
 * account is disabled). Sessions are JSON blobs written by express-session; passport
 * keeps the user id under "passport":{"user":"<id>"}, and ids are UUIDs, so a LIKE
 * on that fragment is exact and portable between SQLite and PostgreSQL.
 */
export async function endSessionsOf(db: Knex, userId: string, exceptSid?: string): Promise<number> {
  const query = db('sessions').whereRaw('CAST(sess AS TEXT) LIKE ?', [`%"user":"${userId}"%`]);
  if (exceptSid) query.whereNot('sid', exceptSid);
  return query.delete();
}
