// The one configured API client: JSON over fetch with the session cookie, the CSRF token fetched once and
// cached (sent on every state-changing request, refetched once after a `csrf_failed` 403), every error
// turned into an ApiError, and a single hook for "not signed in" so pages never handle 401 themselves.
import { ApiError, apiErrorFromBody } from './errors';

type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';

export interface RequestOptions {
  /** Leave a 401 to the caller instead of signing out (session probe at start-up, sign-in itself). */
  allowUnauthenticated?: boolean;
  signal?: AbortSignal;
}

export interface HttpClientOptions {
  baseUrl?: string;
  fetch?: typeof globalThis.fetch;
}

const CSRF_HEADER = 'X-CSRF-Token';
const STATE_CHANGING = new Set<Method>(['POST', 'PUT', 'PATCH', 'DELETE']);

export function createHttpClient(options: HttpClientOptions = {}) {
  const baseUrl = options.baseUrl ?? '/api';
  // Looked up per call so tests (and happy-dom) can replace globalThis.fetch after the client exists.
  const doFetch: typeof globalThis.fetch = (...args) => (options.fetch ?? globalThis.fetch)(...args);
  let csrfToken: Promise<string> | null = null;
  const unauthenticatedHandlers = new Set<() => void>();

  async function send(method: Method, path: string, body: unknown, signal?: AbortSignal): Promise<Response> {
    const headers: Record<string, string> = { Accept: 'application/json' };
    if (body !== undefined) headers['Content-Type'] = 'application/json';
    if (STATE_CHANGING.has(method)) headers[CSRF_HEADER] = await getCsrfToken();
    try {
      return await doFetch(baseUrl + path, {
        method,
        headers,
        body: body === undefined ? undefined : JSON.stringify(body),
        credentials: 'same-origin',
        signal,
      });
    } catch (cause) {
      if (signal?.aborted) throw cause;
      throw new ApiError(0, 'network_error', 'Cannot reach the server. Check the connection and try again.');
    }
  }

  async function readBody(response: Response): Promise<unknown> {
    if (response.status === 204) return undefined;
    const text = await response.text();
    if (!text) return undefined;
    try {
      return JSON.parse(text) as unknown;
    } catch {
      if (response.ok)
        throw new ApiError(response.status, 'unexpected_response', 'The server sent an unreadable answer.');
      return undefined;
    }
  }

  async function request<T>(
    method: Method,
    path: string,
    body?: unknown,
    opts: RequestOptions = {},
  ): Promise<T> {
    let response = await send(method, path, body, opts.signal);
    let parsed = await readBody(response);
    if (response.status === 403 && errorCode(parsed) === 'csrf_failed') {
      // The token is bound to the session, which may have changed under us: fetch a new one, retry once.
      csrfToken = null;
      response = await send(method, path, body, opts.signal);
      parsed = await readBody(response);
    }
    if (response.ok) return parsed as T;
    const error = apiErrorFromBody(response.status, parsed);
    if (response.status === 401 && error.code === 'unauthenticated') {
      csrfToken = null;
      if (!opts.allowUnauthenticated) unauthenticatedHandlers.forEach((handler) => handler());
    }
    throw error;
  }

  /** A POST whose answer is a file (a PDF); a refusal still arrives as the API's JSON error. */
  async function postForBlob(path: string, body: unknown, opts: RequestOptions = {}): Promise<Blob> {
    let response = await send('POST', path, body, opts.signal);
    if (response.ok) return response.blob();
    let parsed = await readBody(response);
    if (response.status === 403 && errorCode(parsed) === 'csrf_failed') {
      csrfToken = null;
      response = await send('POST', path, body, opts.signal);
      if (response.ok) return response.blob();
      parsed = await readBody(response);
    }
    const error = apiErrorFromBody(response.status, parsed);
    if (response.status === 401 && error.code === 'unauthenticated') {
      csrfToken = null;
      if (!opts.allowUnauthenticated) unauthenticatedHandlers.forEach((handler) => handler());
    }
    throw error;
  }

  function getCsrfToken(): Promise<string> {
    csrfToken ??= fetchCsrfToken();
    return csrfToken;
  }

  async function fetchCsrfToken(): Promise<string> {
    try {
      const response = await send('GET', '/auth/csrf', undefined);
      const parsed = await readBody(response);
      if (!response.ok) throw apiErrorFromBody(response.status, parsed);
      const token = (parsed as { token?: unknown } | undefined)?.token;
      if (typeof token !== 'string')
        throw new ApiError(response.status, 'unexpected_response', 'The server sent no CSRF token.');
      return token;
    } catch (error) {
      csrfToken = null; // never cache a failure
      throw error;
    }
  }

  return {
    get: <T>(path: string, opts?: RequestOptions) => request<T>('GET', path, undefined, opts),
    post: <T>(path: string, body?: unknown, opts?: RequestOptions) => request<T>('POST', path, body, opts),
    put: <T>(path: string, body?: unknown, opts?: RequestOptions) => request<T>('PUT', path, body, opts),
    patch: <T>(path: string, body?: unknown, opts?: RequestOptions) => request<T>('PATCH', path, body, opts),
    delete: <T = void>(path: string, opts?: RequestOptions) => request<T>('DELETE', path, undefined, opts),
    postForBlob,
    /** Forget the cached token; the API changes it at sign-in and sign-out. */
    resetCsrfToken(): void {
      csrfToken = null;
    },
    /** Register what happens when the API says the session is gone; returns an unsubscribe function. */
    onUnauthenticated(handler: () => void): () => void {
      unauthenticatedHandlers.add(handler);
      return () => unauthenticatedHandlers.delete(handler);
    },
  };
}

function errorCode(body: unknown): string | undefined {
  const envelope =
    typeof body === 'object' && body !== null ? (body as { error?: { code?: unknown } }).error : undefined;
  return typeof envelope?.code === 'string' ? envelope.code : undefined;
}

export type HttpClient = ReturnType<typeof createHttpClient>;

/** The app's client for `/api`. */
export const http = createHttpClient();
