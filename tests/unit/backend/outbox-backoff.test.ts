// When a failed mail is tried again: doubling from the base delay, held at the cap, given up after the
// last attempt; nonsense attempt counts are a bug and throw.
import { describe, expect, test } from 'vitest';
import { afterFailure, defaultBackoff, type BackoffPolicy } from '../../../backend/src/services/mail/backoff';

const policy: BackoffPolicy = { baseMs: 1000, capMs: 10_000, maxAttempts: 6 };

describe('afterFailure', () => {
  test.each([
    [1, 1000],
    [2, 2000],
    [3, 4000],
    [4, 8000],
    [5, 10_000], // 16 s, held at the 10 s cap
  ])('after attempt %i waits %i ms', (attempts, delayMs) => {
    expect(afterFailure(attempts, policy)).toEqual({ giveUp: false, delayMs });
  });

  test.each([6, 7, 100])('gives up after attempt %i (the limit is 6)', (attempts) => {
    expect(afterFailure(attempts, policy)).toEqual({ giveUp: true });
  });

  test('stays finite and capped for very many attempts', () => {
    expect(afterFailure(10_000, { baseMs: 1000, capMs: 60_000, maxAttempts: 1_000_000 })).toEqual({
      giveUp: false,
      delayMs: 60_000,
    });
  });

  test('the default: 30 s first, never more than an hour, and about two days of tries before giving up', () => {
    expect(afterFailure(1)).toEqual({ giveUp: false, delayMs: 30_000 });
    const waits: number[] = [];
    for (let a = 1; a < defaultBackoff.maxAttempts; a++) {
      const d = afterFailure(a);
      if (d.giveUp) throw new Error(`gave up early at ${a}`);
      waits.push(d.delayMs);
    }
    expect(Math.max(...waits)).toBe(3_600_000);
    const totalHours = waits.reduce((s, w) => s + w, 0) / 3_600_000;
    expect(totalHours).toBeGreaterThan(36);
    expect(totalHours).toBeLessThan(60);
    expect(afterFailure(defaultBackoff.maxAttempts)).toEqual({ giveUp: true });
  });

  test.each([0, -1, 1.5, Number.NaN])('refuses attempts = %s', (attempts) => {
    expect(() => afterFailure(attempts, policy)).toThrow(RangeError);
  });
});
