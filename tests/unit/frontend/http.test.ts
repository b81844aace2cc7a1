// The API client: CSRF token handling, the error shape, and the one place a lost session is handled.
import { beforeEach, describe, expect, test, vi } from 'vitest';
import { createHttpClient } from '@/api/http';
import { ApiError } from '@/api/errors';
import { apiError, createFetchMock, csrfToken, json } from './fetch-mock';

let mock: ReturnType<typeof createFetchMock>;
let client: ReturnType<typeof createHttpClient>;

beforeEach(() => {
  mock = createFetchMock();
  client = createHttpClient({ fetch: mock.fetch });
});

describe('CSRF token', () => {
  test('is fetched once, cached, and sent on every state-changing request but not on GET', async () => {
    mock.on('GET', '/api/auth/csrf', csrfToken('tok-1'));
    mock.on('PATCH', '/api/account', json(200, { user: {} }));
    mock.on('GET', '/api/auth/me', json(200, {}));

    await client.patch('/account', { displayName: 'A' });
    await client.patch('/account', { displayName: 'B' });
    await client.get('/auth/me');

    expect(mock.calls.map((c) => `${c.method} ${c.path}`)).toEqual([
      'GET /api/auth/csrf',
      'PATCH /api/account',
      'PATCH /api/account',
      'GET /api/auth/me',
    ]);
    expect(mock.calls[1].headers['x-csrf-token']).toBe('tok-1');
    expect(mock.calls[2].headers['x-csrf-token']).toBe('tok-1');
    expect(mock.calls[3].headers['x-csrf-token']).toBeUndefined();
    expect(mock.calls[1].headers['content-type']).toBe('application/json');
    expect(mock.calls[2].body).toEqual({ displayName: 'B' });
  });

  test('is refetched and the request retried once after a 403 csrf_failed', async () => {
    mock.on('GET', '/api/auth/csrf', csrfToken('stale'), csrfToken('fresh'));
    mock.on(
      'POST',
      '/api/auth/logout',
      apiError(403, 'csrf_failed', 'Missing or wrong CSRF token.'),
      json(204),
    );

    await expect(client.post('/auth/logout')).resolves.toBeUndefined();

    const logouts = mock.calls.filter((c) => c.path === '/api/auth/logout');
    expect(logouts.map((c) => c.headers['x-csrf-token'])).toEqual(['stale', 'fresh']);
    expect(mock.calls.filter((c) => c.path === '/api/auth/csrf')).toHaveLength(2);
  });

  test('a second csrf_failed is not retried again but surfaces as an ApiError', async () => {
    mock.on('GET', '/api/auth/csrf', csrfToken('a'), csrfToken('b'));
    mock.on('DELETE', /\/api\/clubs\/.+/, apiError(403, 'csrf_failed', 'Missing or wrong CSRF token.'));

    const error = await client.delete('/clubs/c1/members/u1').catch((e: unknown) => e);

    expect(error).toBeInstanceOf(ApiError);
    expect((error as ApiError).code).toBe('csrf_failed');
    expect(mock.calls.filter((c) => c.method === 'DELETE')).toHaveLength(2);
  });

  test('resetCsrfToken makes the next change fetch a new token (sign-in and sign-out swap it)', async () => {
    mock.on('GET', '/api/auth/csrf', csrfToken('before'), csrfToken('after'));
    mock.on('POST', '/api/auth/login', json(200, {}));

    await client.post('/auth/login', { email: 'a@b.example', password: 'x' });
    client.resetCsrfToken();
    await client.post('/auth/login', { email: 'a@b.example', password: 'x' });

    expect(mock.calls.filter((c) => c.method === 'POST').map((c) => c.headers['x-csrf-token'])).toEqual([
      'before',
      'after',
    ]);
  });
});

describe('errors', () => {
  test('the error shape becomes an ApiError with status, code, message and field errors by path', async () => {
    mock.on('GET', '/api/auth/csrf', csrfToken('t'));
    mock.on(
      'POST',
      '/api/auth/password',
      apiError(400, 'validation_failed', 'Some fields are invalid.', [
        { path: 'newPassword', message: 'At least 10 characters' },
        { path: 'members.0.wallMm', message: 'Must be less than half the OD' },
        { path: 'newPassword', message: 'a second message for the same field is not shown' },
      ]),
    );

    const error = (await client
      .post('/auth/password', { currentPassword: 'a', newPassword: 'b' })
      .catch((e: unknown) => e)) as ApiError;

    expect(error).toBeInstanceOf(ApiError);
    expect(error.status).toBe(400);
    expect(error.code).toBe('validation_failed');
    expect(error.message).toBe('Some fields are invalid.');
    expect(error.fieldErrors).toEqual({
      newPassword: 'At least 10 characters',
      'members.0.wallMm': 'Must be less than half the OD',
    });
    expect(error.fieldError('members.0.wallMm')).toBe('Must be less than half the OD');
  });

  test('a 409 keeps its object details (e.g. the current revision) and has no field errors', async () => {
    mock.on('GET', '/api/things/1', apiError(409, 'conflict', 'Changed meanwhile.', { currentRevision: 4 }));

    const error = (await client.get('/things/1').catch((e: unknown) => e)) as ApiError;

    expect(error.details).toEqual({ currentRevision: 4 });
    expect(error.fieldErrors).toEqual({});
  });

  test('keeps the request id the server put into the error body (it is on the server’s log lines)', async () => {
    mock.on('GET', '/api/cars', json(500, { error: { code: 'internal_error', message: 'Something went wrong on our side.', requestId: 'b7f0c3d2-5a14-4e1b-9c2a-0f6e8d1a2b3c' } }));

    const error = (await client.get('/cars').catch((e: unknown) => e)) as ApiError;

    expect(error.requestId).toBe('b7f0c3d2-5a14-4e1b-9c2a-0f6e8d1a2b3c');
    expect(error.message).toBe('Something went wrong on our side.');
  });

  test('a body that is not the error shape still gives a readable ApiError', async () => {
    mock.on('GET', '/api/health', () => ({ status: 502, body: undefined }));

    const error = (await client.get('/health', { retries: 0 }).catch((e: unknown) => e)) as ApiError;

    expect(error.status).toBe(502);
    expect(error.code).toBe('unexpected_response');
    expect(error.message).toContain('502');
  });

  test('a failed connection becomes a network_error', async () => {
    const offline = createHttpClient({ fetch: () => Promise.reject(new TypeError('Failed to fetch')) });

    const error = (await offline.get('/auth/me', { retries: 0 }).catch((e: unknown) => e)) as ApiError;

    expect(error.code).toBe('network_error');
    expect(error.status).toBe(0);
  });

  test('a 204 answer resolves to undefined', async () => {
    mock.on('GET', '/api/auth/csrf', csrfToken('t'));
    mock.on('DELETE', '/api/clubs/c1/members/u1', json(204));

    await expect(client.delete('/clubs/c1/members/u1')).resolves.toBeUndefined();
  });
});

describe('401 handling', () => {
  test('an unauthenticated answer calls the handler once and still rejects', async () => {
    const handler = vi.fn();
    client.onUnauthenticated(handler);
    mock.on('GET', '/api/clubs/c1/members', apiError(401, 'unauthenticated', 'Please sign in.'));

    await expect(client.get('/clubs/c1/members')).rejects.toMatchObject({
      status: 401,
      code: 'unauthenticated',
    });

    expect(handler).toHaveBeenCalledTimes(1);
  });

  test('a lost session also drops the CSRF token', async () => {
    client.onUnauthenticated(() => {});
    mock.on('GET', '/api/auth/csrf', csrfToken('old'), csrfToken('new'));
    mock.on('PATCH', '/api/account', apiError(401, 'unauthenticated', 'Please sign in.'), json(200, {}));

    await client.patch('/account', {}).catch(() => undefined);
    await client.patch('/account', {});

    expect(mock.calls.filter((c) => c.method === 'PATCH').map((c) => c.headers['x-csrf-token'])).toEqual([
      'old',
      'new',
    ]);
  });

  test('wrong credentials at sign-in and the start-up probe do not trigger the handler', async () => {
    const handler = vi.fn();
    client.onUnauthenticated(handler);
    mock.on('GET', '/api/auth/csrf', csrfToken('t'));
    mock.on('POST', '/api/auth/login', apiError(401, 'invalid_credentials', 'E-mail or password is wrong.'));
    mock.on('GET', '/api/auth/me', apiError(401, 'unauthenticated', 'Please sign in.'));

    await expect(client.post('/auth/login', {})).rejects.toMatchObject({ code: 'invalid_credentials' });
    await expect(client.get('/auth/me', { allowUnauthenticated: true })).rejects.toMatchObject({
      status: 401,
    });

    expect(handler).not.toHaveBeenCalled();
  });

  test('an unsubscribed handler is not called', async () => {
    const handler = vi.fn();
    const unsubscribe = client.onUnauthenticated(handler);
    unsubscribe();
    mock.on('GET', '/api/x', apiError(401, 'unauthenticated', 'Please sign in.'));

    await client.get('/x').catch(() => undefined);

    expect(handler).not.toHaveBeenCalled();
  });
});
