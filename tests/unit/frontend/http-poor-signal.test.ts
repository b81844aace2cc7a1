// The API client at the track: every call times out, a GET that found no server is tried again after
// a pause (a POST/PUT/PATCH/DELETE never is: it may have been done once already), and what it learns
// feeds the offline banner. Only a real 401 signs out; no answer at all never does.
import { afterEach, beforeEach, describe, expect, test, vi } from 'vitest';
import { createHttpClient, DEFAULT_TIMEOUT_MS, FILE_TIMEOUT_MS, RETRY_DELAYS_MS } from '@/api/http';
import { ApiError } from '@/api/errors';
import { PROBE_INTERVAL_MS, reportReachable, reportUnreachable, serverUnreachable, setProbe } from '@/api/connection';
import { apiError, createFetchMock, csrfToken, json } from './fetch-mock';

/** A fetch that never answers, but rejects as the browser does when its signal aborts. */
function hangingFetch(calls: string[]): typeof globalThis.fetch {
  return (input, init) => {
    calls.push(`${init?.method ?? 'GET'} ${String(input)}`);
    return new Promise((_resolve, reject) => {
      init?.signal?.addEventListener('abort', () => reject(new DOMException('The operation was aborted.', 'AbortError')));
    });
  };
}

const failedToFetch = () => Promise.reject(new TypeError('Failed to fetch'));
const totalPause = RETRY_DELAYS_MS.reduce((a, b) => a + b, 0);

beforeEach(() => {
  vi.useFakeTimers();
  reportReachable();
  setProbe(null); // the app's own probe would ask a real server
});
afterEach(() => {
  vi.useRealTimers();
  reportReachable();
});

describe('time-outs', () => {
  test('a GET with no answer gives up after the default time, tried again after each pause', async () => {
    const calls: string[] = [];
    const client = createHttpClient({ fetch: hangingFetch(calls) });
    const outcome = client.get('/garage').catch((e: unknown) => e);

    await vi.advanceTimersByTimeAsync(DEFAULT_TIMEOUT_MS - 1);
    expect(calls).toHaveLength(1); // still waiting for the first answer
    await vi.advanceTimersByTimeAsync(1 + RETRY_DELAYS_MS[0]!);
    expect(calls).toHaveLength(2);
    await vi.advanceTimersByTimeAsync((DEFAULT_TIMEOUT_MS + totalPause) * 2);

    const error = (await outcome) as ApiError;
    expect(error).toBeInstanceOf(ApiError);
    expect(error.code).toBe('timeout');
    expect(error.status).toBe(0);
    expect(calls).toHaveLength(1 + RETRY_DELAYS_MS.length);
    expect(serverUnreachable.value).toBe(true);
  });

  test('a file (PDF) is given a minute, and the caller may ask for another limit', async () => {
    const calls: string[] = [];
    const client = createHttpClient({ fetch: hangingFetch(calls) });
    const mock = createFetchMock();
    mock.on('GET', '/api/auth/csrf', csrfToken('t'));
    const withToken = createHttpClient({
      fetch: (input, init) => (String(input).endsWith('/auth/csrf') ? mock.fetch(input, init) : hangingFetch(calls)(input, init)),
    });
    let settled = false;
    const pdf = withToken.postForBlob('/fabrication/cope.pdf', {}).catch((e: unknown) => e).finally(() => (settled = true));
    await vi.advanceTimersByTimeAsync(DEFAULT_TIMEOUT_MS + 1);
    expect(settled).toBe(false);
    await vi.advanceTimersByTimeAsync(FILE_TIMEOUT_MS - DEFAULT_TIMEOUT_MS);
    expect(((await pdf) as ApiError).code).toBe('timeout');

    const quick = client.get('/health', { timeoutMs: 500, retries: 0 }).catch((e: unknown) => e);
    await vi.advanceTimersByTimeAsync(500);
    expect(((await quick) as ApiError).code).toBe('timeout');
  });

  test('a caller that cancels gets its own abort, not an offline report, and no new try', async () => {
    const calls: string[] = [];
    const client = createHttpClient({ fetch: hangingFetch(calls) });
    const controller = new AbortController();
    const outcome = client.get('/garage', { signal: controller.signal }).catch((e: unknown) => e);
    controller.abort();
    await vi.advanceTimersByTimeAsync(totalPause + DEFAULT_TIMEOUT_MS);

    expect(await outcome).not.toBeInstanceOf(ApiError);
    expect(calls).toHaveLength(1);
    expect(serverUnreachable.value).toBe(false);
  });
});

describe('new tries', () => {
  test('a GET that met a network error or a 502/503/504 is tried again and can succeed', async () => {
    const mock = createFetchMock();
    mock.on('GET', '/api/garage', json(502), apiError(503, 'database_unavailable', 'Down.'), json(200, { cars: [] }));
    const client = createHttpClient({ fetch: mock.fetch });

    const outcome = client.get('/garage');
    await vi.advanceTimersByTimeAsync(RETRY_DELAYS_MS[0]! - 1);
    expect(mock.calls).toHaveLength(1); // waits before the new try
    expect(serverUnreachable.value).toBe(true);
    await vi.advanceTimersByTimeAsync(totalPause);

    await expect(outcome).resolves.toEqual({ cars: [] });
    expect(mock.calls).toHaveLength(3);
    expect(serverUnreachable.value).toBe(false); // the answer cleared the banner
  });

  test.each(['POST', 'PUT', 'PATCH', 'DELETE'] as const)('a %s is never sent twice by the client', async (method) => {
    let sent = 0;
    const client = createHttpClient({
      fetch: (input, init) => {
        if (String(input).endsWith('/auth/csrf')) return Promise.resolve(new Response(JSON.stringify({ token: 't' }), { status: 200 }));
        sent += 1;
        return init?.method === 'PUT' ? Promise.resolve(new Response(null, { status: 504 })) : failedToFetch();
      },
    });
    const call = { POST: () => client.post('/x', {}), PUT: () => client.put('/x', {}), PATCH: () => client.patch('/x', {}), DELETE: () => client.delete('/x') }[method];
    const outcome = call().catch((e: unknown) => e);
    await vi.advanceTimersByTimeAsync(totalPause * 3);

    const error = (await outcome) as ApiError;
    expect(error).toBeInstanceOf(ApiError);
    expect(error.status === 0 || error.status === 504).toBe(true);
    expect(sent).toBe(1);
    expect(serverUnreachable.value).toBe(true);
  });

  test('a refusal the server meant (404, 409, 400) is not tried again and does not mean offline', async () => {
    const mock = createFetchMock();
    mock.on('GET', '/api/build-sheets/x', apiError(404, 'not_found', 'No such sheet.'));
    const client = createHttpClient({ fetch: mock.fetch });
    await expect(client.get('/build-sheets/x')).rejects.toMatchObject({ status: 404 });
    expect(mock.calls).toHaveLength(1);
    expect(serverUnreachable.value).toBe(false);
  });
});

describe('unreachable is not signed out', () => {
  test('a network error, a timeout or a 503 never calls the sign-out hook; a real 401 does', async () => {
    const mock = createFetchMock();
    mock.on('GET', '/api/a', () => {
      throw new TypeError('Failed to fetch');
    });
    mock.on('GET', '/api/b', apiError(503, 'database_unavailable', 'Down.'));
    mock.on('GET', '/api/c', apiError(401, 'unauthenticated', 'Please sign in.'));
    const client = createHttpClient({ fetch: mock.fetch });
    const signedOut = vi.fn();
    client.onUnauthenticated(signedOut);

    const a = client.get('/a').catch((e: unknown) => e);
    const b = client.get('/b').catch((e: unknown) => e);
    await vi.advanceTimersByTimeAsync(totalPause);
    expect(((await a) as ApiError).code).toBe('network_error');
    expect(((await b) as ApiError).status).toBe(503);
    expect(signedOut).not.toHaveBeenCalled();
    expect(serverUnreachable.value).toBe(true);

    await expect(client.get('/c')).rejects.toMatchObject({ status: 401 });
    expect(signedOut).toHaveBeenCalledTimes(1);
    expect(serverUnreachable.value).toBe(false); // a 401 is an answer: the server is there
  });
});

describe('the banner clears itself', () => {
  test('while unreachable the server is asked again now and then, until it answers', async () => {
    let up = false;
    const probe = vi.fn(async () => {
      if (up) reportReachable();
      return up;
    });
    setProbe(probe);
    reportUnreachable();
    await vi.advanceTimersByTimeAsync(PROBE_INTERVAL_MS);
    expect(probe).toHaveBeenCalledTimes(1);
    expect(serverUnreachable.value).toBe(true);
    up = true;
    await vi.advanceTimersByTimeAsync(PROBE_INTERVAL_MS);
    expect(probe).toHaveBeenCalledTimes(2);
    expect(serverUnreachable.value).toBe(false);
    await vi.advanceTimersByTimeAsync(PROBE_INTERVAL_MS * 3);
    expect(probe).toHaveBeenCalledTimes(2); // no more asking once it answered
  });
});
