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
    const freshReset = new Date(now + this.windowMs).toISOString();
    return this.db.transaction(async (trx) => {
      const row = await trx('rate_limits').where({ key: k }).first();
      if (!row || new Date(row.reset_at).getTime() <= now) {
        await trx('rate_limits').insert({ key: k, hits: 1, reset_at: freshReset }).onConflict('key').merge();
        return { totalHits: 1, resetTime: new Date(freshReset) };
      }
      await trx('rate_limits').where({ key: k }).increment('hits', 1);
      return { totalHits: row.hits + 1, resetTime: new Date(row.reset_at) };
    });
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
