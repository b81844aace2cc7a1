// ApiError: the API's one error shape `{ error: { code, message, details, requestId } }` as a typed
// exception, with field errors indexed by path so forms can show each message beside its input.

export interface FieldErrorDetail {
  path: string;
  message: string;
}

/** Codes the API documents, plus two of our own for failures that never reached it. */
export type ApiErrorCode =
  | 'validation_failed'
  | 'malformed_json'
  | 'unauthenticated'
  | 'invalid_credentials'
  | 'forbidden'
  | 'csrf_failed'
  | 'not_found'
  | 'conflict'
  | 'payload_too_large'
  | 'rate_limited'
  | 'database_unavailable'
  | 'network_error'
  | 'unexpected_response'
  | (string & {});

export class ApiError extends Error {
  readonly status: number;
  readonly code: ApiErrorCode;
  readonly details: unknown;
  /** The server's id of the request (on its log lines), when it sent one. */
  readonly requestId: string | undefined;
  /** First message per field path, e.g. `{ email: 'Must be an e-mail address' }`. */
  readonly fieldErrors: Readonly<Record<string, string>>;

  constructor(status: number, code: ApiErrorCode, message: string, details?: unknown, requestId?: string) {
    super(message);
    this.name = 'ApiError';
    this.status = status;
    this.code = code;
    this.details = details;
    this.requestId = requestId;
    this.fieldErrors = indexFieldErrors(details);
  }

  fieldError(path: string): string | undefined {
    return this.fieldErrors[path];
  }
}

function isFieldErrorDetail(value: unknown): value is FieldErrorDetail {
  if (typeof value !== 'object' || value === null) return false;
  const record = value as Record<string, unknown>;
  return typeof record.path === 'string' && typeof record.message === 'string';
}

function indexFieldErrors(details: unknown): Record<string, string> {
  const byPath: Record<string, string> = {};
  if (!Array.isArray(details)) return byPath;
  for (const detail of details) {
    if (isFieldErrorDetail(detail) && !(detail.path in byPath)) byPath[detail.path] = detail.message;
  }
  return byPath;
}

const fallbackMessages: Record<number, string> = {
  400: 'The request was not accepted.',
  401: 'Please sign in.',
  403: 'You are not allowed to do that.',
  404: 'Not found.',
  409: 'That changed meanwhile. Reload and try again.',
  413: 'That is too large to send.',
  429: 'Too many attempts. Wait a little and try again.',
  503: 'The service is unavailable for a moment. Try again shortly.',
};

/** Turns any non-2xx response body into an ApiError, tolerating bodies that are not our shape. */
export function apiErrorFromBody(status: number, body: unknown): ApiError {
  const envelope =
    typeof body === 'object' && body !== null ? (body as { error?: unknown }).error : undefined;
  if (typeof envelope === 'object' && envelope !== null) {
    const { code, message, details, requestId } = envelope as Record<string, unknown>;
    if (typeof code === 'string') {
      const text = typeof message === 'string' && message ? message : fallbackFor(status);
      return new ApiError(status, code, text, details, typeof requestId === 'string' ? requestId : undefined);
    }
  }
  return new ApiError(status, 'unexpected_response', fallbackFor(status));
}

function fallbackFor(status: number): string {
  return fallbackMessages[status] ?? `The server answered with an error (${status}).`;
}

export function isApiError(error: unknown, code?: ApiErrorCode): error is ApiError {
  return error instanceof ApiError && (code === undefined || error.code === code);
}

/** A message fit for a toast or banner, whatever was thrown. */
export function errorMessage(error: unknown): string {
  if (error instanceof ApiError) return error.message;
  return 'Something went wrong. Try again.';
}
