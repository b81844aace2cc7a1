// Sign-in limits (docs/decisions/0010-limits-in-postgresql.md). Failed sign-ins are counted three ways:
// - per e-mail and IP together, and per IP: past their limits that caller is refused (429);
// - per e-mail from anywhere: that never refuses, it only slows every attempt for the e-mail down,
//   doubling per failure up to a ceiling. So nobody can lock another person out of their account,
//   while guessing one account's password from many addresses still gets slower.
// Each attempt is counted before its password is checked (one atomic upsert per counter, so parallel
// guesses cannot slip past a limit) and taken back when the password was right.
import { emailKey, refusal, type CounterLike } from './counter';

export interface SignInLimits {
  windowMs: number;
  /** Failed sign-ins for one e-mail from one IP before that pair is refused. */
  perEmailAndIp: number;
  /** Failed sign-ins from one IP, for any e-mails, before the IP is refused. */
  perIp: number;
  /** Every attempt for an e-mail that failed this often (from anywhere) waits: none for the first
   *  `freeFailures`, then `firstDelayMs`, doubling with each failure, never more than `maxDelayMs`. */
  delay: { freeFailures: number; firstDelayMs: number; maxDelayMs: number };
}

/** The wait before checking a password, after `failures` failed sign-ins for its e-mail. */
export function delayAfter(failures: number, delay: SignInLimits['delay']): number {
  if (failures < delay.freeFailures) return 0;
  return Math.min(delay.maxDelayMs, delay.firstDelayMs * 2 ** (failures - delay.freeFailures));
}

export interface SignInAttempt {
  /** How long this attempt waited before its password was checked. */
  delayMs: number;
  /** The password was right: the attempt is no failure, and the e-mail and IP pair starts afresh. */
  succeeded(): Promise<void>;
}

export interface SignInCounters {
  emailAndIp: CounterLike;
  ip: CounterLike;
  email: CounterLike;
}

export type SignInThrottle = ReturnType<typeof createSignInThrottle>;

export function createSignInThrottle(
  counters: SignInCounters,
  limits: SignInLimits,
  sleep: (ms: number) => Promise<void> = (ms) => new Promise((resolve) => setTimeout(resolve, ms)),
) {
  return {
    /** Counts the attempt, refuses it (RateLimitedError) or waits its delay out; then check the password. */
    async begin(email: string, ip: string): Promise<SignInAttempt> {
      const address = emailKey(email);
      const pair = `${address}:${ip}`;
      const [byIp, byPair, byEmail] = await Promise.all([counters.ip.hit(ip), counters.emailAndIp.hit(pair), counters.email.hit(address)]);
      if (byIp.over || byPair.over) {
        // A refused attempt checks no password: it is no failure of the e-mail's and adds no delay for it.
        await counters.email.refund(address);
        throw refusal(byIp.over ? byIp : byPair);
      }
      const delayMs = delayAfter(byEmail.count - 1, limits.delay);
      if (delayMs > 0) await sleep(delayMs);
      return {
        delayMs,
        async succeeded() {
          await Promise.all([counters.ip.refund(ip), counters.emailAndIp.clear(pair), counters.email.refund(address)]);
        },
      };
    },
  };
}
