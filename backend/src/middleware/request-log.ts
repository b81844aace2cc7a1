// The request log (pino-http): one line when a response is finished, with the request id, the method,
// URL, headers (cookies, the CSRF header and authorization redacted by the logger), the status, the
// response time in milliseconds and the signed-in user's id. The id comes from a proxy's `X-Request-Id`
// when it is a plain token, else it is made here; it is sent back in `X-Request-Id`, carried by
// `req.log` (so the error handler's lines have it) and put into every error body (errors.ts).
import { randomUUID } from 'node:crypto';
import type { IncomingMessage, ServerResponse } from 'node:http';
import type { RequestHandler } from 'express';
import { pinoHttp } from 'pino-http';
import type { Logger } from '../logger';

/** What a proxy may hand us as a request id: short, and nothing that could break a log line or a header. */
const acceptableId = /^[A-Za-z0-9._:-]{8,100}$/;

/** URL parts that are secrets in themselves (an invitation's token): the log keeps only where they were. */
const secretSegments = /(\/invitations\/)[^/?#]+/g;
export const scrubUrl = (url: string | undefined) => (url ?? '').replace(secretSegments, '$1[redacted]');

const keptResponseHeaders = new Set(['content-type', 'content-length', 'location', 'set-cookie', 'retry-after']);

function requestId(req: IncomingMessage, res: ServerResponse): string {
  const offered = req.headers['x-request-id'];
  const id = typeof offered === 'string' && acceptableId.test(offered) ? offered : randomUUID();
  res.setHeader('X-Request-Id', id);
  return id;
}

/** The id pino-http gave this request (undefined outside the request log, as in a bare test app). */
export function requestIdOf(req: IncomingMessage): string | undefined {
  const id = (req as { id?: unknown }).id;
  return typeof id === 'string' ? id : undefined;
}

export function createRequestLog(logger: Logger): RequestHandler {
  return pinoHttp({
    logger: logger.pino,
    genReqId: requestId,
    // The error handler's own line carries the error; the request's line keeps to the request.
    quietReqLogger: true,
    customLogLevel: (req, res, err) => {
      if (res.statusCode === 503) return 'warn';
      if (err || res.statusCode >= 500) return 'error';
      // Health probes arrive every few seconds from a supervisor or a balancer: only at debug.
      const url = (req as { originalUrl?: string }).originalUrl ?? req.url ?? '';
      return url === '/api/health' || url.startsWith('/api/health?') ? 'debug' : 'info';
    },
    customProps: (req) => {
      const user = (req as { user?: { id?: string } }).user;
      return user?.id ? { userId: user.id } : {};
    },
    // A 5xx without a thrown error gets a made-up one from pino-http; the error handler logged the real one.
    customErrorObject: (_req, _res, err, val: Record<string, unknown>) =>
      err.message.startsWith('failed with status code') ? { ...val, err: undefined } : val,
    serializers: {
      req: (r: Record<string, unknown>) => ({ ...r, url: scrubUrl(r.url as string | undefined) }),
      // The security headers are the same on every answer; what tells one answer from another stays.
      res: (r: { statusCode: number; headers?: Record<string, unknown> }) => ({
        statusCode: r.statusCode,
        headers: Object.fromEntries(Object.entries(r.headers ?? {}).filter(([k]) => keptResponseHeaders.has(k))),
      }),
    },
  });
}
