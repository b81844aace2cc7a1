// When a failed mail is tried again: exponential backoff from a base delay, capped, with a limit on
// attempts after which the message is given up (failed_permanently, its last error kept).

export interface BackoffPolicy {
  /** Delay after the first failure. */
  baseMs: number;
  /** No wait is ever longer than this. */
  capMs: number;
  /** Attempts in all, the first included; after the last failure the message is given up. */
  maxAttempts: number;
}

/** 30 s, 1 min, 2 min, … up to 1 h between tries; about two days of tries in all. */
export const defaultBackoff: BackoffPolicy = { baseMs: 30_000, capMs: 3_600_000, maxAttempts: 50 };

export type RetryDecision = { giveUp: true } | { giveUp: false; delayMs: number };

/** `attempts` counts tries made so far, the one that just failed included (so at least 1). */
export function afterFailure(attempts: number, policy: BackoffPolicy = defaultBackoff): RetryDecision {
  if (!Number.isInteger(attempts) || attempts < 1)
    throw new RangeError(`attempts must be a whole number ≥ 1, got ${attempts}`);
  if (attempts >= policy.maxAttempts) return { giveUp: true };
  // 2 ** 30 already exceeds any sensible cap; stop growing there so the number stays finite.
  const delayMs = Math.min(policy.capMs, policy.baseMs * 2 ** Math.min(attempts - 1, 30));
  return { giveUp: false, delayMs };
}
