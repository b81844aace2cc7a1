// The one error handler: every error becomes `{ error: { code, message, details, requestId } }`. 5xx
// errors are logged with their stack, on the request's own logger so the line has the same request id
// as the body; the client never sees a stack.
import type { ErrorRequestHandler, Request, RequestHandler } from 'express';
import { errorBody, NotFoundError, RateLimitedError, toAppError } from '../errors';
import { errorFields, wrapPino, type Logger } from '../logger';
import { requestIdOf } from './request-log';

/** The request's logger (pino-http's child, carrying `reqId`), else the app's. */
function loggerFor(req: Request, fallback: Logger): Logger {
  const log = (req as { log?: Logger['pino'] }).log;
  return log ? wrapPino(log) : fallback;
}

export function createErrorHandler(logger: Logger): ErrorRequestHandler {
  return (err, req, res, next) => {
    const appError = toAppError(err);
    if (appError.status >= 500) {
      // An outage is expected and logged briefly; a 500 is a bug and keeps its stack.
      const fields = { method: req.method, path: req.path, ...errorFields(err) };
      const log = loggerFor(req, logger);
      if (appError.status === 503) log.warn(appError.code, { ...fields, stack: undefined });
      else log.error(appError.code, fields);
    }
    if (res.headersSent) return next(err);
    if (appError instanceof RateLimitedError && appError.retryAfterSeconds) res.setHeader('Retry-After', String(appError.retryAfterSeconds));
    res.status(appError.status).json(errorBody(appError, requestIdOf(req)));
  };
}

export const apiNotFound: RequestHandler = (_req, _res, next) => next(new NotFoundError('No such API route.'));
