// Typed application errors. Services throw these; the single error handler turns each into the wire
// shape `{ error: { code, message, details, requestId } }` (docs/api.md). Anything else becomes a 500 without
// its message or stack reaching the client.

export interface FieldIssue {
  path: string;
  message: string;
}

export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
    this.name = new.target.name;
  }
}

export class ValidationError extends AppError {
  constructor(details: FieldIssue[], message = 'Some fields are invalid.') {
    super(400, 'validation_failed', message, details);
  }
}
export class MalformedJsonError extends AppError {
  constructor() {
    super(400, 'malformed_json', 'The request body is not valid JSON.');
  }
}
export class UnauthenticatedError extends AppError {
  constructor(message = 'Please sign in.') {
    super(401, 'unauthenticated', message);
  }
}
export class InvalidCredentialsError extends AppError {
  constructor() {
    super(401, 'invalid_credentials', 'E-mail or password is wrong.');
  }
}
export class ForbiddenError extends AppError {
  constructor(message = 'Your role does not allow this.') {
    super(403, 'forbidden', message);
  }
}
export class CsrfError extends AppError {
  constructor() {
    super(403, 'csrf_failed', 'The security token is missing or out of date. Reload the page and try again.');
  }
}
export class NotFoundError extends AppError {
  constructor(message = 'Not found.') {
    super(404, 'not_found', message);
  }
}
export class ConflictError extends AppError {
  constructor(message: string, details?: unknown) {
    super(409, 'conflict', message, details);
  }
}
export class PayloadTooLargeError extends AppError {
  constructor(limit: string) {
    super(413, 'payload_too_large', `The request body is larger than ${limit}.`);
  }
}
export class RateLimitedError extends AppError {
  /** Sent as `Retry-After` (seconds) when known. */
  constructor(message = 'Too many attempts. Wait a few minutes and try again.', readonly retryAfterSeconds?: number) {
    super(429, 'rate_limited', message);
  }
}
export class DatabaseUnavailableError extends AppError {
  constructor() {
    super(503, 'database_unavailable', 'The database is unavailable right now. Try again in a moment.');
  }
}
export class InternalError extends AppError {
  constructor() {
    super(500, 'internal_error', 'Something went wrong on our side.');
  }
}

export interface ErrorBody {
  error: { code: string; message: string; details?: unknown; requestId?: string };
}

/** The wire shape; `requestId` (the request log's id) lets a person quote what the server logged. */
export function errorBody(err: AppError, requestId?: string): ErrorBody {
  return {
    error: {
      code: err.code,
      message: err.message,
      ...(err.details !== undefined ? { details: err.details } : {}),
      ...(requestId !== undefined ? { requestId } : {}),
    },
  };
}

// Error codes node-postgres and PostgreSQL give when the server cannot be reached or went away:
// socket errors, SQLSTATE class 08 (connection exception), 57P01-03 (shutdown / starting up),
// 53300 (too many connections).
const unavailableCodes = new Set([
  'ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'EHOSTUNREACH', 'ENETUNREACH', 'ENOTFOUND', 'EPIPE', 'EAI_AGAIN',
  '08000', '08001', '08003', '08004', '08006', '57P01', '57P02', '57P03', '53300',
]);
const unavailableMessages = [
  'connection terminated',
  'timeout exceeded when trying to connect',
  'not queryable',
  'connection refused',
  'server closed the connection',
];

/** True when `err` (or anything it wraps) says PostgreSQL is unreachable rather than the query is wrong. */
export function isDatabaseUnavailable(err: unknown, depth = 0): boolean {
  if (depth > 5 || err === null || typeof err !== 'object') return false;
  const e = err as { code?: unknown; message?: unknown; driverError?: unknown; cause?: unknown; errors?: unknown };
  if (typeof e.code === 'string' && unavailableCodes.has(e.code)) return true;
  if (typeof e.message === 'string') {
    const m = e.message.toLowerCase();
    if (unavailableMessages.some((s) => m.includes(s))) return true;
  }
  if (isDatabaseUnavailable(e.driverError, depth + 1) || isDatabaseUnavailable(e.cause, depth + 1)) return true;
  return Array.isArray(e.errors) && e.errors.some((x) => isDatabaseUnavailable(x, depth + 1));
}

/** Maps anything thrown to an AppError the client may see. */
export function toAppError(err: unknown): AppError {
  if (err instanceof AppError) return err;
  if (isDatabaseUnavailable(err)) return new DatabaseUnavailableError();
  // body-parser's errors carry a `type`; keep their meaning, not their text.
  const type = typeof err === 'object' && err !== null ? (err as { type?: unknown }).type : undefined;
  if (type === 'entity.parse.failed') return new MalformedJsonError();
  if (type === 'entity.too.large') return new PayloadTooLargeError('100 kB');
  // Other body-parser refusals (unsupported charset, aborted upload) are the client's, not ours.
  const status = typeof err === 'object' && err !== null ? (err as { status?: unknown }).status : undefined;
  if (typeof status === 'number' && status >= 400 && status < 500) {
    return new AppError(status, 'bad_request', 'The request could not be read.');
  }
  return new InternalError();
}
