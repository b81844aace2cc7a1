// One kind of counter in PostgreSQL: hits per key in a fixed window, on rate-limiter-flexible's
// PostgreSQL store (the `rate_limits` table, created by a migration). Every server process that shares
// the database shares the counts, and a restart keeps them. Nothing is kept in this process's memory.
import { createHash } from 'node:crypto';
import { RateLimiterPostgres, RateLimiterRes } from 'rate-limiter-flexible';
import type { Pool } from 'pg';
import { RateLimitedError } from '../../errors';

export interface Window {
  windowMs: number;
  /** Hits allowed in one window; the next one is over. */
  limit: number;
}

export interface Hit {
  /** Hits in this window so far, this one included. */
  count: number;
  over: boolean;
  /** Until the window ends. */
  retryAfterMs: number;
}

export const rateLimitTable = 'rate_limits';

/**
 * Keys carry no personal data: an e-mail address becomes the start of its SHA-256. (The key column
 * holds 255 characters; an address alone may have 320.)
 */
export function emailKey(email: string): string {
  return createHash('sha256').update(email.trim().toLowerCase()).digest('hex').slice(0, 32);
}

/** What the limits need of a counter (a fake one in unit tests). */
export interface CounterLike {
  hit(key: string): Promise<Hit>;
  refund(key: string): Promise<void>;
  clear(key: string): Promise<void>;
}

export class Counter implements CounterLike {
  private readonly store: RateLimiterPostgres;

  constructor(pool: Pool, name: string, readonly window: Window, clearExpired: boolean) {
    this.store = new RateLimiterPostgres({
      storeClient: pool,
      storeType: 'pool',
      tableName: rateLimitTable,
      tableCreated: true,
      keyPrefix: name,
      points: window.limit,
      duration: window.windowMs / 1000,
      // Off: a block held in one process's memory would not be shared, nor cleared by another.
      inMemoryBlockOnConsumed: 0,
      clearExpiredByTimeout: clearExpired,
    });
  }

  /** Counts one hit (atomically: an upsert) and says whether it went over the limit. */
  async hit(key: string): Promise<Hit> {
    try {
      const res = await this.store.consume(key, 1);
      return { count: res.consumedPoints, over: false, retryAfterMs: res.msBeforeNext };
    } catch (err) {
      // The store rejects with a RateLimiterRes when over the limit, and with the database's error otherwise.
      if (err instanceof RateLimiterRes) return { count: err.consumedPoints, over: true, retryAfterMs: err.msBeforeNext };
      throw err;
    }
  }

  /** Takes one hit back (a sign-in that turned out right is not a failure). */
  async refund(key: string): Promise<void> {
    await this.store.reward(key, 1);
  }

  /** Forgets the key's window. */
  async clear(key: string): Promise<void> {
    await this.store.delete(key);
  }
}

export function refusal(hit: Hit, message?: string): RateLimitedError {
  return new RateLimitedError(message, Math.max(1, Math.ceil(hit.retryAfterMs / 1000)));
}
