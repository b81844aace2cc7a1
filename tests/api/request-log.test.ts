// The request log (issue 12, §9): pino-http writes one line per request with its id and response time,
// the id is in the X-Request-Id header and in every error body, the error handler's own line about a 500
// has the same id, and cookies, the CSRF header and invitation tokens never reach a line.
import type { Express } from 'express';
import { beforeAll, describe, expect, it } from 'vitest';
import { demoPassword } from '../../backend/src/db/seed-data';
import { createLogger } from '../../backend/src/logger';
import { createServices } from '../../backend/src/services';
import { agentFor, csrfToken, demo, makeTestApp, signIn, testPublicUrl, useTestDatabase } from './helpers';

const db = useTestDatabase();

type Line = { level: string; msg: string; reqId?: string; responseTime?: number; userId?: string; stack?: string; err?: unknown; pid?: number; time?: string;
  req?: { method: string; url: string; headers: Record<string, string> }; res?: { statusCode: number; headers: Record<string, string> } };
let lines: Line[] = [];
let raw: string[] = [];
let app: Express;
const secretFromTheDatabase = 'relation "users_private_notes" does not exist';

beforeAll(() => {
  const services = createServices(db.ds, { publicUrl: testPublicUrl });
  // A service that fails the way a bug would: a 500 whose message must stay in the log.
  services.garage = { ...services.garage, list: async () => Promise.reject(new Error(secretFromTheDatabase)) };
  const logger = createLogger('info', (line) => {
    raw.push(line);
    lines.push(JSON.parse(line) as Line);
  });
  app = makeTestApp(db.ds, { logger, services });
});

const linesOf = (reqId: string) => lines.filter((l) => l.reqId === reqId);
const finished = (reqId: string) => linesOf(reqId).find((l) => l.res && typeof l.responseTime === 'number');

describe('request logging', () => {
  it('logs each request once, with its id, status and response time; the id comes back in X-Request-Id', async () => {
    lines = [];
    const res = await agentFor(app).get('/api/meta').expect(200);
    const id = res.headers['x-request-id'] as string;
    expect(id).toMatch(/^[0-9a-f-]{36}$/);
    const line = finished(id)!;
    expect(line).toMatchObject({ level: 'info', msg: 'request completed', req: { method: 'GET', url: '/api/meta' }, res: { statusCode: 200 } });
    expect(line.responseTime).toBeGreaterThanOrEqual(0);
    expect(line.time).toMatch(/^\d{4}-\d\d-\d\dT/);
    expect(line.pid).toBe(process.pid);
    expect(lines.filter((l) => l.reqId === id)).toHaveLength(1);
    // Health probes are logged at debug only, not at info.
    const probe = await agentFor(app).get('/api/health').expect(200);
    expect(linesOf(probe.headers['x-request-id'] as string)).toEqual([]);
    // Two requests never share an id.
    const again = await agentFor(app).get('/api/meta').expect(200);
    expect(again.headers['x-request-id']).not.toBe(id);
  });

  it('puts the request id into every error body, the same as on its log line', async () => {
    lines = [];
    const agent = agentFor(app);
    const token = await csrfToken(agent);
    const answers = [
      await agent.get('/api/auth/me').expect(401),
      await agent.get('/api/no-such-thing').expect(404),
      await agent.post('/api/auth/login').set('X-CSRF-Token', token).send({ email: 'not an address' }).expect(400),
      await agent.post('/api/auth/logout').expect(403), // no CSRF token
    ];
    for (const res of answers) {
      const id = res.headers['x-request-id'] as string;
      expect(res.body.error.requestId).toBe(id);
      expect(finished(id)!.res!.statusCode).toBe(res.status);
    }
  });

  it('logs a 500 with its stack under the id the client got, and never shows the client the message', async () => {
    lines = [];
    const agent = agentFor(app);
    await signIn(agent, demo.builder);
    const res = await agent.get('/api/cars').expect(500);
    expect(res.body).toEqual({ error: { code: 'internal_error', message: 'Something went wrong on our side.', requestId: res.headers['x-request-id'] } });
    expect(JSON.stringify(res.body)).not.toContain('users_private_notes');
    const id = res.body.error.requestId as string;
    const error = linesOf(id).find((l) => l.msg === 'internal_error')!;
    expect(error).toMatchObject({ level: 'error', err: secretFromTheDatabase });
    expect(error.stack).toContain('Error: ' + secretFromTheDatabase);
    expect(finished(id)).toMatchObject({ level: 'error', res: { statusCode: 500 }, userId: expect.any(String) });
  });

  it('redacts cookies, the CSRF header and invitation tokens', async () => {
    lines = [];
    raw = [];
    const agent = agentFor(app);
    const anonymousToken = await csrfToken(agent);
    const login = await agent.post('/api/auth/login').set('X-CSRF-Token', anonymousToken).send({ email: demo.builder, password: demoPassword }).expect(200);
    const sid = /cw\.sid=([^;]+)/.exec(String(login.headers['set-cookie']))![1]!;
    const token = await csrfToken(agent);
    const res = await agent.patch('/api/account').set('X-CSRF-Token', token).send({ preferredUnits: 'metric' }).expect(200);
    const line = finished(res.headers['x-request-id'] as string)!;
    expect(line.req!.headers.cookie).toBe('[redacted]');
    expect(line.req!.headers['x-csrf-token']).toBe('[redacted]');
    // Sign-in sets the session cookie: the response's Set-Cookie is redacted too.
    expect(finished(login.headers['x-request-id'] as string)!.res!.headers['set-cookie']).toBe('[redacted]');
    const invitation = 'Zq3v-not-a-real-invitation-token_0123456789';
    await agentFor(app).get(`/api/invitations/${invitation}`).expect(404);
    const text = raw.join('\n');
    expect(text).not.toContain(token);
    expect(text).not.toContain(invitation);
    expect(text).not.toContain(decodeURIComponent(sid));
    expect(text).not.toContain(sid);
    expect(lines.some((l) => l.req?.url === '/api/invitations/[redacted]')).toBe(true);
  });

  it('keeps a request id a proxy sent when it is a plain token, and makes its own otherwise', async () => {
    lines = [];
    const kept = await agentFor(app).get('/api/meta').set('X-Request-Id', 'edge-7f3a9c21').expect(200);
    expect(kept.headers['x-request-id']).toBe('edge-7f3a9c21');
    expect(finished('edge-7f3a9c21')).toBeDefined();
    const replaced = await agentFor(app).get('/api/meta').set('X-Request-Id', 'bad id "} {"level":"info"').expect(200);
    expect(replaced.headers['x-request-id']).toMatch(/^[0-9a-f-]{36}$/);
  });
});
