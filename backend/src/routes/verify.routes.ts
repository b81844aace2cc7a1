// The public verification of a code (docs/api.md, "Review and cage records"): a cage record's or a
// check run's. No sign-in, rate-limited per IP, and one plain 404 for every code that names neither.
import { Router, type ErrorRequestHandler, type RequestHandler } from 'express';
import { verifyParamsSchema } from '../contracts/review';
import { NotFoundError } from '../errors';
import { clientKey } from '../middleware/client-key';
import type { Services } from '../services';
import type { Limits } from '../services/limits';
import { mountRoutes, route, type RouteTableRouter } from './route-table';

export function createVerifyRouter({ services, limits }: { services: Services; limits: Limits }): RouteTableRouter {
  // Every look-up counts (in PostgreSQL, shared by every server process), found or not.
  const limiter: RequestHandler = (req, _res, next) => {
    limits.verify.begin(clientKey(req)).then(() => next(), next);
  };
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
