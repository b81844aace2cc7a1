// The one error handler: every error becomes `{ error: { code, message, details } }`. 5xx errors
// are logged with their stack; the client never sees one.
import type { ErrorRequestHandler, RequestHandler } from 'express';
import { errorBody, NotFoundError, RateLimitedError, toAppError } from '../errors';
import { errorFields, type Logger } from '../logger';

export function createErrorHandler(logger: Logger): ErrorRequestHandler {
  return (err, req, res, next) => {
    const appError = toAppError(err);
    if (appError.status >= 500) {
      // An outage is expected and logged briefly; a 500 is a bug and keeps its stack.
      const fields = { method: req.method, path: req.path, ...errorFields(err) };
      if (appError.status === 503) logger.warn(appError.code, { ...fields, stack: undefined });
      else logger.error(appError.code, fields);
    }
    if (res.headersSent) return next(err);
    if (appError instanceof RateLimitedError && appError.retryAfterSeconds) res.setHeader('Retry-After', String(appError.retryAfterSeconds));
    res.status(appError.status).json(errorBody(appError));
  };
}

export const apiNotFound: RequestHandler = (_req, _res, next) => next(new NotFoundError('No such API route.'));
