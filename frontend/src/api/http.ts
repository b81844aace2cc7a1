// The one configured API client: JSON over fetch with the session cookie, the CSRF token fetched once and
// cached (sent on every state-changing request, refetched once after a `csrf_failed` 403), every error
// turned into an ApiError, and a single hook for "not signed in" so pages never handle 401 themselves.
// At the track the signal comes and goes: every call times out (15 s, a minute for files), a GET that
// found no server is tried again after a pause (never a POST/PUT/PATCH/DELETE, which might have been
// done once already), and what the client learns about the server feeds the offline banner
// (connection.ts). Only a real 401 means "signed out"; an unreachable server never does.
import { ApiError, apiErrorFromBody } from './errors';
import { isGatewayStatus, reportReachable, reportUnreachable, setProbe } from './connection';

type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';

export interface RequestOptions {
  /** Leave a 401 to the caller instead of signing out (session probe at start-up, sign-in itself). */
  allowUnauthenticated?: boolean;
  signal?: AbortSignal;
  /** Give up after this long without a whole answer (default DEFAULT_TIMEOUT_MS). */
  timeoutMs?: number;
  /** How often a GET is tried again when the server cannot be reached (default RETRY_DELAYS_MS.length). */
  retries?: number;
}

export interface HttpClientOptions {
  baseUrl?: string;
  fetch?: typeof globalThis.fetch;
}

/** Long enough for a slow phone connection, short enough that a dead one is noticed. */
export const DEFAULT_TIMEOUT_MS = 15_000;
/** Files (PDFs) are made on the server and can be large. */
export const FILE_TIMEOUT_MS = 60_000;
/** An upload (photos through XMLHttpRequest) may take minutes on a weak signal, but not for ever. */
export const UPLOAD_TIMEOUT_MS = 180_000;
/** Pauses before each new try of a GET: a short one for a blip, a longer one for a tunnel. */
export const RETRY_DELAYS_MS: readonly number[] = [600, 2000];

const CSRF_HEADER = 'X-CSRF-Token';
const STATE_CHANGING = new Set<Method>(['POST', 'PUT', 'PATCH', 'DELETE']);
const UNREACHABLE_MESSAGE = 'Cannot reach the server. Check the connection and try again.';
const TIMEOUT_MESSAGE = 'The server did not answer in time. Check the connection and try again.';

/** An answer that arrived whole: the response and its body, read before the timeout. */
interface Exchange {
  response: Response;
  parsed: unknown;
  blob?: Blob;
}

/** True for failures where no server answered: worth a new try for a GET, and the offline banner. */
export function isUnreachable(error: unknown): boolean {
  return error instanceof ApiError && (error.status === 0 ? error.code !== 'aborted' : isGatewayStatus(error.status));
}

function sleep(ms: number, signal?: AbortSignal): Promise<void> {
  return new Promise((resolve, reject) => {
    const timer = setTimeout(resolve, ms);
    signal?.addEventListener('abort', () => (clearTimeout(timer), reject(signal.reason as Error)), { once: true });
  });
}

export function createHttpClient(options: HttpClientOptions = {}) {
  const baseUrl = options.baseUrl ?? '/api';
  // Looked up per call so tests (and happy-dom) can replace globalThis.fetch after the client exists.
  const doFetch: typeof globalThis.fetch = (...args) => (options.fetch ?? globalThis.fetch)(...args);
  let csrfToken: Promise<string> | null = null;
  const unauthenticatedHandlers = new Set<() => void>();

  /** One try: the request and its whole body within the time allowed, or an ApiError (status 0). */
  async function once(method: Method, path: string, body: unknown, opts: RequestOptions, asBlob: boolean): Promise<Exchange> {
    const headers: Record<string, string> = { Accept: 'application/json' };
    if (body !== undefined) headers['Content-Type'] = 'application/json';
    if (STATE_CHANGING.has(method)) headers[CSRF_HEADER] = await getCsrfToken();
    const controller = new AbortController();
    let timedOut = false;
    const timer = setTimeout(() => ((timedOut = true), controller.abort()), opts.timeoutMs ?? (asBlob ? FILE_TIMEOUT_MS : DEFAULT_TIMEOUT_MS));
    const onCallerAbort = () => controller.abort();
    if (opts.signal?.aborted) controller.abort();
    opts.signal?.addEventListener('abort', onCallerAbort, { once: true });
    try {
      const response = await doFetch(baseUrl + path, {
        method,
        headers,
        body: body === undefined ? undefined : JSON.stringify(body),
        credentials: 'same-origin',
        signal: controller.signal,
      });
      if (asBlob && response.ok) return { response, parsed: undefined, blob: await response.blob() };
      return { response, parsed: await readBody(response) };
    } catch (cause) {
      if (cause instanceof ApiError) throw cause;
      if (opts.signal?.aborted) throw cause;
      reportUnreachable();
      throw new ApiError(0, timedOut ? 'timeout' : 'network_error', timedOut ? TIMEOUT_MESSAGE : UNREACHABLE_MESSAGE);
    } finally {
      clearTimeout(timer);
      opts.signal?.removeEventListener('abort', onCallerAbort);
    }
  }

  /** One try, again after a pause for a GET that found no server; the answer reports reachability. */
  async function send(method: Method, path: string, body: unknown, opts: RequestOptions, asBlob = false): Promise<Exchange> {
    const retries = method === 'GET' ? (opts.retries ?? RETRY_DELAYS_MS.length) : 0;
    for (let attempt = 0; ; attempt += 1) {
      let exchange: Exchange | null = null;
      let failure: unknown = null;
      try {
        exchange = await once(method, path, body, opts, asBlob);
      } catch (error) {
        if (!isUnreachable(error)) throw error;
        failure = error;
      }
      if (exchange) {
        if (!isGatewayStatus(exchange.response.status)) {
          reportReachable();
          return exchange;
        }
        reportUnreachable();
        if (attempt >= retries) return exchange;
      } else if (attempt >= retries) throw failure;
      await sleep(RETRY_DELAYS_MS[Math.min(attempt, RETRY_DELAYS_MS.length - 1)]!, opts.signal);
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

  /** Sends, fetching a new CSRF token and trying once more after a `csrf_failed` 403; errors thrown. */
  async function exchange(method: Method, path: string, body: unknown, opts: RequestOptions, asBlob: boolean): Promise<Exchange> {
    let answer = await send(method, path, body, opts, asBlob);
    if (answer.response.status === 403 && errorCode(answer.parsed) === 'csrf_failed') {
      // The token is bound to the session, which may have changed under us: fetch a new one, retry once.
      csrfToken = null;
      answer = await send(method, path, body, opts, asBlob);
    }
    if (answer.response.ok) return answer;
    const error = apiErrorFromBody(answer.response.status, answer.parsed);
    if (answer.response.status === 401 && error.code === 'unauthenticated') {
      csrfToken = null;
      if (!opts.allowUnauthenticated) unauthenticatedHandlers.forEach((handler) => handler());
    }
    throw error;
  }

  async function request<T>(method: Method, path: string, body?: unknown, opts: RequestOptions = {}): Promise<T> {
    return (await exchange(method, path, body, opts, false)).parsed as T;
  }

  /** A POST whose answer is a file (a PDF); a refusal still arrives as the API's JSON error. */
  async function postForBlob(path: string, body: unknown, opts: RequestOptions = {}): Promise<Blob> {
    return (await exchange('POST', path, body, opts, true)).blob!;
  }

  function getCsrfToken(): Promise<string> {
    csrfToken ??= fetchCsrfToken();
    return csrfToken;
  }

  async function fetchCsrfToken(): Promise<string> {
    try {
      const { response, parsed } = await send('GET', '/auth/csrf', undefined, {});
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

// While the server is unreachable, the banner asks the health probe now and then whether it is back.
setProbe(() => http.get('/health', { retries: 0, timeoutMs: 5000 }).then(() => true, () => false));
