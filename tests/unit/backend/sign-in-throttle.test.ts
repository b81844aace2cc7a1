// The sign-in throttle's rules, on counters held in memory: which counter refuses, when an attempt
// waits and for how long, and what a success takes back. (The PostgreSQL side: tests/api/auth-limits.test.ts.)
import { describe, expect, it } from 'vitest';
import { createSignInThrottle, delayAfter, type CounterLike, type Hit, type SignInLimits } from '../../../backend/src/services/limits';
import { RateLimitedError } from '../../../backend/src/errors';

function memoryCounter(limit: number): CounterLike & { counts: Map<string, number> } {
  const counts = new Map<string, number>();
  return {
    counts,
    async hit(key): Promise<Hit> {
      const count = (counts.get(key) ?? 0) + 1;
      counts.set(key, count);
      return { count, over: count > limit, retryAfterMs: 60_000 };
    },
    async refund(key) {
      counts.set(key, (counts.get(key) ?? 0) - 1);
    },
    async clear(key) {
      counts.delete(key);
    },
  };
}

const limits: SignInLimits = { windowMs: 60_000, perEmailAndIp: 3, perIp: 5, delay: { freeFailures: 2, firstDelayMs: 100, maxDelayMs: 1000 } };

function setup() {
  const counters = { emailAndIp: memoryCounter(limits.perEmailAndIp), ip: memoryCounter(limits.perIp), email: memoryCounter(Number.MAX_SAFE_INTEGER) };
  const waits: number[] = [];
  const throttle = createSignInThrottle(counters, limits, async (ms) => {
    waits.push(ms);
  });
  return { counters, waits, throttle };
}

describe('delayAfter', () => {
  it.each([
    [0, 0],
    [1, 0],
    [2, 100],
    [3, 200],
    [4, 400],
    [5, 800],
    [6, 1000],
    [60, 1000],
    [5000, 1000], // 2 ** 4998 is Infinity: still the ceiling
  ])('after %i failures waits %i ms', (failures, ms) => {
    expect(delayAfter(failures, limits.delay)).toBe(ms);
  });
});

describe('the sign-in throttle', () => {
  it('slows an e-mail failing from many IPs down but never refuses it', async () => {
    const { throttle, waits } = setup();
    for (let i = 0; i < 20; i++) await throttle.begin('admin@x.example', `10.0.0.${i}`);
    expect(waits).toEqual([100, 200, 400, 800, ...Array(14).fill(1000)]);
  });

  it('refuses the e-mail and IP pair past its limit, without adding to the e-mail delay', async () => {
    const { throttle, counters } = setup();
    for (let i = 0; i < 3; i++) await throttle.begin('a@x.example', '10.0.0.1');
    await expect(throttle.begin('a@x.example', '10.0.0.1')).rejects.toThrow(RateLimitedError);
    expect([...counters.email.counts.values()]).toEqual([3]);
    // From elsewhere the e-mail still gets a go.
    await throttle.begin('a@x.example', '10.0.0.2');
  });

  it('refuses an IP past its limit across e-mails, with the time to wait', async () => {
    const { throttle } = setup();
    for (let i = 0; i < 5; i++) await throttle.begin(`u${i}@x.example`, '10.0.0.9');
    const err = await throttle.begin('admin@x.example', '10.0.0.9').catch((e: unknown) => e);
    expect(err).toBeInstanceOf(RateLimitedError);
    expect((err as RateLimitedError).retryAfterSeconds).toBe(60);
  });

  it('takes a success back: the pair starts afresh, the IP and the e-mail lose one', async () => {
    const { throttle, counters } = setup();
    await throttle.begin('a@x.example', '10.0.0.1');
    const attempt = await throttle.begin('a@x.example', '10.0.0.1');
    await attempt.succeeded();
    expect(counters.emailAndIp.counts.size).toBe(0);
    expect([...counters.ip.counts.values()]).toEqual([1]);
    expect([...counters.email.counts.values()]).toEqual([1]);
  });

  it('keys e-mails case- and space-insensitively', async () => {
    const { throttle, counters } = setup();
    await throttle.begin(' Admin@X.example ', '10.0.0.1');
    await throttle.begin('admin@x.example', '10.0.0.1');
    expect([...counters.email.counts.values()]).toEqual([2]);
  });
});
