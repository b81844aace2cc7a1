// Sign-in throttling: failed attempts are counted per client IP and, separately, per e-mail (so a
// spread-out attack on one account is slowed too). Successful sign-ins do not count.
import type { RequestHandler } from 'express';
import { rateLimit } from 'express-rate-limit';
import { RateLimitedError } from '../errors';

export interface LoginLimits {
  windowMs: number;
  perIp: number;
  perEmail: number;
}

export const defaultLoginLimits: LoginLimits = { windowMs: 15 * 60 * 1000, perIp: 30, perEmail: 8 };

export function createLoginLimiters(limits: LoginLimits): { perIp: RequestHandler; perEmail: RequestHandler } {
  const common = {
    windowMs: limits.windowMs,
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8' as const,
    legacyHeaders: false,
    handler: (_req: unknown, _res: unknown, next: (err: unknown) => void) => next(new RateLimitedError()),
  };
  const perIp = rateLimit({ ...common, limit: limits.perIp });
  const perEmail = rateLimit({
    ...common,
    limit: limits.perEmail,
    keyGenerator: (req) => {
      const email: unknown = (req.body as { email?: unknown } | undefined)?.email;
      return typeof email === 'string' ? `email:${email.trim().toLowerCase()}` : 'email:(none)';
    },
  });
  return { perIp, perEmail };
}

/** Failed attempts per IP for another sensitive route (password change). */
export function createFailureLimiter(windowMs: number, limit: number): RequestHandler {
  return rateLimit({
    windowMs,
    limit,
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    handler: (_req, _res, next) => next(new RateLimitedError()),
  });
}
