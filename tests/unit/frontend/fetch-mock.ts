// A scripted fetch for front-end tests: each call is recorded (method, path, headers, parsed body) and
// answered by the first matching route, so tests can assert exactly what the client sent.
import { vi } from 'vitest';

export interface RecordedCall {
  method: string;
  path: string;
  headers: Record<string, string>;
  body: unknown;
}

type Answer =
  { status: number; body?: unknown } | ((call: RecordedCall) => { status: number; body?: unknown });

interface Route {
  method: string;
  path: string | RegExp;
  answers: Answer[];
}

export function json(status: number, body?: unknown) {
  return { status, body };
}

export function createFetchMock() {
  const calls: RecordedCall[] = [];
  const routes: Route[] = [];

  /** Answers in order; the last answer repeats. A later `on` for the same request takes over. */
  function on(method: string, path: string | RegExp, ...answers: Answer[]) {
    routes.push({ method, path, answers });
  }

  const fetchMock = vi.fn(async (input: RequestInfo | URL, init: RequestInit = {}) => {
    const url = new URL(String(input), 'http://localhost');
    // Header names are case-insensitive; happy-dom keeps the spelling, so normalise to lower case.
    const headers = Object.fromEntries(
      [...new Headers(init.headers).entries()].map(([k, v]) => [k.toLowerCase(), v]),
    );
    const body = typeof init.body === 'string' ? (JSON.parse(init.body) as unknown) : undefined;
    const call: RecordedCall = { method: init.method ?? 'GET', path: url.pathname, headers, body };
    calls.push(call);
    // The latest matching route wins, so a test can override what beforeEach set up.
    const route = routes.findLast(
      (r) =>
        r.method === call.method &&
        (typeof r.path === 'string' ? r.path === call.path : r.path.test(call.path)),
    );
    if (!route) throw new Error(`unexpected request ${call.method} ${call.path}`);
    const answer = route.answers.length > 1 ? route.answers.shift()! : route.answers[0];
    const { status, body: responseBody } = typeof answer === 'function' ? answer(call) : answer;
    return new Response(status === 204 || responseBody === undefined ? null : JSON.stringify(responseBody), {
      status,
      headers: { 'Content-Type': 'application/json' },
    });
  });

  return { fetch: fetchMock as unknown as typeof globalThis.fetch, calls, on };
}

export const csrfToken = (token: string) => json(200, { token });

export function apiError(status: number, code: string, message: string, details?: unknown) {
  return json(status, { error: { code, message, details } });
}
