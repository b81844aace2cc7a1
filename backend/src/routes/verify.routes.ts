// The public verification of a code (docs/api.md, "Review and cage records"): a cage record's or a
// check run's. No sign-in, rate-limited per IP, and one plain 404 for every code that names neither.
import { Router, type ErrorRequestHandler } from 'express';
import { rateLimit } from 'express-rate-limit';
import { verifyParamsSchema } from '../contracts/review';
import { NotFoundError, RateLimitedError } from '../errors';
import type { Services } from '../services';
import { mountRoutes, route, type RouteTableRouter } from './route-table';

export const defaultVerifyLimit = { windowMs: 60_000, limit: 30 };

export function createVerifyRouter({ services, limits = defaultVerifyLimit }: { services: Services; limits?: { windowMs: number; limit: number } }): RouteTableRouter {
  const limiter = rateLimit({
    windowMs: limits.windowMs,
    limit: limits.limit,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    handler: (_req, _res, next) => next(new RateLimitedError('Too many look-ups from here. Wait a minute and try again.')),
  });
  const notFound = () => new NotFoundError('No cage record or check run has this code.');
  const router = mountRoutes(Router(), [
    route({
      method: 'get', path: '/verify/:code', access: 'public', before: [limiter], params: verifyParamsSchema, unsafeParams: notFound,
      handler: async ({ res, params }) => {
        const result = await services.verification.verify(params.code);
        // Nobody caches a status that can change (a revocation must show at once).
        res.setHeader('Cache-Control', 'no-store');
        if (!result) throw notFound();
        res.json(result.kind === 'cage_record' ? { kind: result.kind, record: result.record } : { kind: result.kind, checkRun: result.checkRun });
      },
    }),
  ]);
  // A code whose percent-encoding cannot be decoded (`%E0`, `%`) fails in the router before the route
  // runs; it names no record either, so it gets the same 404 as any other code.
  const undecodable: ErrorRequestHandler = (err, req, _res, next) => {
    next(err instanceof URIError && req.path.startsWith('/verify/') ? notFound() : err);
  };
  router.use(undecodable);
  return router;
}
