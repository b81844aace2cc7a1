// Every limit of the API, kept in PostgreSQL (counter.ts): sign-in (sign-in-throttle.ts), password
// change per user, password reset requests per e-mail and per IP, and public look-ups per IP. The
// numbers are here in one place; tests pass smaller ones (createApp's `limits`).
import type { Pool } from 'pg';
import type { DataSource } from 'typeorm';
import { Counter, emailKey, refusal, type Window } from './counter';
import { createSignInThrottle, type SignInLimits } from './sign-in-throttle';

export { createSignInThrottle, delayAfter, type SignInAttempt, type SignInLimits, type SignInThrottle } from './sign-in-throttle';
export { emailKey, rateLimitTable, type CounterLike, type Hit, type Window } from './counter';

export interface LimitSettings {
  signIn: SignInLimits;
  /** Wrong current passwords per user when changing it. */
  passwordChange: Window;
  /** Reset mails: past `perIp` a caller is refused; past `perEmail` the same answer comes but no mail goes. */
  passwordReset: { windowMs: number; perEmail: number; perIp: number };
  /** Public verification look-ups per IP. */
  verify: Window;
}

const minute = 60_000;

export const defaultLimitSettings: LimitSettings = {
  signIn: { windowMs: 15 * minute, perEmailAndIp: 8, perIp: 30, delay: { freeFailures: 3, firstDelayMs: 500, maxDelayMs: 5000 } },
  passwordChange: { windowMs: 15 * minute, limit: 5 },
  passwordReset: { windowMs: 60 * minute, perEmail: 3, perIp: 10 },
  verify: { windowMs: minute, limit: 30 },
};

export type LimitOverrides = { [K in keyof LimitSettings]?: Partial<LimitSettings[K]> };

export function limitSettings(overrides: LimitOverrides = {}): LimitSettings {
  const d = defaultLimitSettings;
  return {
    signIn: { ...d.signIn, ...overrides.signIn, delay: { ...d.signIn.delay, ...overrides.signIn?.delay } },
    passwordChange: { ...d.passwordChange, ...overrides.passwordChange },
    passwordReset: { ...d.passwordReset, ...overrides.passwordReset },
    verify: { ...d.verify, ...overrides.verify },
  };
}

/** A limit on failures of one kind per key: counted first, taken back on success. */
export interface FailureLimit {
  /** Counts the attempt or refuses it (RateLimitedError); call `succeeded` when it went right. */
  begin(key: string): Promise<{ succeeded(): Promise<void> }>;
}

function failureLimit(counter: Counter, message?: string): FailureLimit {
  return {
    async begin(key) {
      const hit = await counter.hit(key);
      if (hit.over) throw refusal(hit, message);
      return { succeeded: () => counter.refund(key) };
    },
  };
}

export type Limits = ReturnType<typeof createLimits>;

export function createLimits(ds: DataSource, settings: LimitSettings, options: { clearExpired: boolean }) {
  // TypeORM keeps its node-postgres pool as `driver.master`; its type there is `any`.
  const pool = (ds.driver as unknown as { master: Pool }).master;
  let first = true;
  // One of the counters deletes long-expired rows every few minutes (they share one table).
  const counter = (name: string, window: Window) => {
    const c = new Counter(pool, name, window, options.clearExpired && first);
    first = false;
    return c;
  };
  const s = settings;
  const resetByIp = counter('reset-ip', { windowMs: s.passwordReset.windowMs, limit: s.passwordReset.perIp });
  const resetByEmail = counter('reset-email', { windowMs: s.passwordReset.windowMs, limit: s.passwordReset.perEmail });
  return {
    settings,
    signIn: createSignInThrottle(
      {
        emailAndIp: counter('signin-email-ip', { windowMs: s.signIn.windowMs, limit: s.signIn.perEmailAndIp }),
        ip: counter('signin-ip', { windowMs: s.signIn.windowMs, limit: s.signIn.perIp }),
        // Never refuses: its count only sets the delay.
        email: counter('signin-email', { windowMs: s.signIn.windowMs, limit: Number.MAX_SAFE_INTEGER }),
      },
      s.signIn,
    ),
    /** Keyed by user id. */
    passwordChange: failureLimit(counter('password-change', s.passwordChange)),
    passwordReset: {
      /** Refuses a caller over its limit; says whether this e-mail may get another mail now. */
      async begin(email: string, ip: string): Promise<{ mayMail: boolean }> {
        const [byIp, byEmail] = await Promise.all([resetByIp.hit(ip), resetByEmail.hit(emailKey(email))]);
        if (byIp.over) throw refusal(byIp, 'Too many reset requests from here. Wait a while and try again.');
        return { mayMail: !byEmail.over };
      },
    },
    /** Keyed by the caller's IP. */
    verify: failureLimit(counter('verify-ip', s.verify), 'Too many look-ups from here. Wait a minute and try again.'),
  };
}
