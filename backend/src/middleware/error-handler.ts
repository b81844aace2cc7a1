// The one error handler: every error becomes `{ error: { code, message, details } }`. 5xx errors
// are logged with their stack; the client never sees one.
import type { ErrorRequestHandler, RequestHandler } from 'express';
import { errorBody, NotFoundError, toAppError } from '../errors';
import { errorFields, type Logger } from '../logger';

export function createErrorHandler(logger: Logger): ErrorRequestHandler {
  return (err, req, res, next) => {
    const appError = toAppError(err);
    if (appError.status >= 500) {
      logger[appError.status === 503 ? 'warn' : 'error'](appError.code, { method: req.method, path: req.path, ...errorFields(err) });
    }
    if (res.headersSent) return next(err);
    res.status(appError.status).json(errorBody(appError));
  };
}

export const apiNotFound: RequestHandler = (_req, _res, next) => next(new NotFoundError('No such API route.'));
