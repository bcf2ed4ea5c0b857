import type { Store, IncrementResponse, Options } from 'express-rate-limit';
import type { Knex } from 'knex';

/** An express-rate-limit store in the `rate_limits` table, shared by every server instance. */
export class KnexRateLimitStore implements Store {
  localKeys = false;
  private windowMs = 60_000;

  constructor(
    private readonly db: Knex,
    public readonly prefix: string,
  ) {}

  init(options: Options): void {
    this.windowMs = options.windowMs;
  }

  private key(key: string) {
    return `${this.prefix}:${key}`;
  }

  async get(key: string): Promise<IncrementResponse | undefined> {
    const row = await this.db('rate_limits')
      .where({ key: this.key(key) })
      .first();
    if (!row || new Date(row.reset_at).getTime() <= Date.now()) return undefined;
    return { totalHits: row.hits, resetTime: new Date(row.reset_at) };
  }

  async increment(key: string): Promise<IncrementResponse> {
    const k = this.key(key);
    const now = Date.now();
    const nowText = new Date(now).toISOString();
    const freshReset = new Date(now + this.windowMs).toISOString();
    // One statement counts the hit and reads the count back. Read-then-write would let hits arriving at
    // the same moment on PostgreSQL (several connections) read the same count and all pass; SQLite and
    // PostgreSQL both take INSERT … ON CONFLICT DO UPDATE … RETURNING. ISO times compare as text.
    const rows: { hits: number | string; reset_at: string }[] = await this.db('rate_limits')
      .insert({ key: k, hits: 1, reset_at: freshReset })
      .onConflict('key')
      .merge({
        hits: this.db.raw('case when rate_limits.reset_at <= ? then 1 else rate_limits.hits + 1 end', [nowText]),
        reset_at: this.db.raw('case when rate_limits.reset_at <= ? then excluded.reset_at else rate_limits.reset_at end', [nowText]),
      })
      .returning(['hits', 'reset_at']);
    const row = rows[0]!;
    return { totalHits: Number(row.hits), resetTime: new Date(row.reset_at) };
  }

  async decrement(key: string): Promise<void> {
    await this.db('rate_limits')
      .where({ key: this.key(key) })
      .where('hits', '>', 0)
      .decrement('hits', 1);
  }

  async resetKey(key: string): Promise<void> {
    await this.db('rate_limits')
      .where({ key: this.key(key) })
      .delete();
  }

  async resetAll(): Promise<void> {
    await this.db('rate_limits').where('key', 'like', `${this.prefix}:%`).delete();
  }
}
