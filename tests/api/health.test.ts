// GET /api/health, and what happens to the app while PostgreSQL is away: 503s with the documented
// body, no crash, and service back by itself once the database returns.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import type { DataSource } from 'typeorm';
import { agentFor, type DbProxy, demo, errorBody, makeTestApp, openDataSource, signIn, startDbProxy, useTestDatabase } from './helpers';

const db = useTestDatabase();
const unavailable = {
  error: { code: 'database_unavailable', message: 'The database is unavailable right now. Try again in a moment.' },
};

describe('health', () => {
  it('reports the database up', async () => {
    const res = await request(makeTestApp(db.ds)).get('/api/health').expect(200);
    expect(res.body).toEqual({ status: 'ok', db: 'up' });
    expect(res.headers['cache-control']).toBe('no-store');
  });
});

describe('when PostgreSQL goes away and comes back', () => {
  let proxy: DbProxy;
  let proxied: DataSource;

  beforeAll(async () => {
    proxy = await startDbProxy();
    proxied = await openDataSource(proxy.url);
  });
  afterAll(async () => {
    await proxy.restore().catch(() => undefined);
    await proxied.destroy();
    await proxy.close();
  });

  it('answers 503 while it is down and recovers by itself', async () => {
    const app = makeTestApp(proxied);
    const agent = agentFor(app);
    const token = await signIn(agent, demo.builder);
    await agent.get('/api/auth/me').expect(200);

    await proxy.cut();

    const health = await request(app).get('/api/health').expect(503);
    expect(health.body).toEqual({ status: 'degraded', db: 'down' });
    // The session store cannot load the session: the request fails cleanly.
    const me = await agent.get('/api/auth/me').expect(503);
    expect(me.body).toEqual(errorBody(unavailable));
    const patch = await agent.patch('/api/account').set('X-CSRF-Token', token).send({ displayName: 'Offline' }).expect(503);
    expect(patch.body).toEqual(errorBody(unavailable));
    // Without a session cookie, a route that queries the database directly also reports 503. An
    // anonymous CSRF token needs no database (a signed cookie), so the sign-in is what fails.
    const fresh = agentFor(app);
    const anonymousToken = (await fresh.get('/api/auth/csrf').expect(200)).body.token as string;
    const login = await fresh.post('/api/auth/login').set('X-CSRF-Token', anonymousToken).send({ email: demo.builder, password: 'whatever-it-is' }).expect(503);
    expect(login.body).toEqual(errorBody(unavailable));
    const invitation = await request(app).get('/api/invitations/' + 'a'.repeat(43)).expect(503);
    expect(invitation.body).toEqual(errorBody(unavailable));

    await proxy.restore();

    await request(app).get('/api/health').expect(200, { status: 'ok', db: 'up' });
    const back = await agent.get('/api/auth/me').expect(200);
    expect(back.body.user.email).toBe(demo.builder);
  });
});

describe('when every database connection is terminated', () => {
  it('serves the next request on fresh connections', async () => {
    const app = makeTestApp(db.ds);
    const agent = agentFor(app);
    await signIn(agent, demo.steward);
    // Fill the pool with idle clients, then kill them all from a separate connection.
    await Promise.all([1, 2, 3].map(() => agent.get('/api/auth/me').expect(200)));
    const killer = await openDataSource();
    try {
      const killed: { n: number }[] = await killer.query(
        `SELECT count(pg_terminate_backend(pid))::int AS n FROM pg_stat_activity
         WHERE datname = current_database() AND pid <> pg_backend_pid() AND backend_type = 'client backend'
           AND application_name = ''`,
      );
      expect(killed[0]!.n).toBeGreaterThan(0);
    } finally {
      await killer.destroy();
    }
    // Give the pool a moment to notice its clients died (they emit 'error' and are dropped).
    await new Promise((r) => setTimeout(r, 200));
    await request(app).get('/api/health').expect(200, { status: 'ok', db: 'up' });
    const me = await agent.get('/api/auth/me').expect(200);
    expect(me.body.user.email).toBe(demo.steward);
  });
});
