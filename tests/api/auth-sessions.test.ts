// Sessions stay bounded (docs/decisions/0011-csrf-without-anonymous-sessions.md): an anonymous visitor's
// CSRF token is a signed double-submit cookie, so fetching tokens, failing sign-ins or asking for
// nothing at all stores no session row; a signed-in user holds at most maxSessionsPerUser of them.
import { describe, expect, it } from 'vitest';
import request from 'supertest';
import { demoPassword } from '../../backend/src/db/seed-data';
import { maxSessionsPerUser } from '../../backend/src/services/accounts.service';
import { agentFor, csrfToken, demo, errorBody, hasErrorBody, makeTestApp, signIn, useTestDatabase } from './helpers';

const db = useTestDatabase();
const csrfFailed = {
  error: { code: 'csrf_failed', message: 'The security token is missing or out of date. Reload the page and try again.' },
};

async function sessionRows(): Promise<number> {
  return ((await db.ds.query(`SELECT count(*)::int AS n FROM "session"`)) as { n: number }[])[0]!.n;
}

async function sessionsOf(email: string): Promise<number> {
  const rows: { n: number }[] = await db.ds.query(
    `SELECT count(*)::int AS n FROM "session" s JOIN users u ON u.id::text = s.sess->'passport'->>'user' WHERE u.email = $1`,
    [email],
  );
  return rows[0]!.n;
}

describe('anonymous CSRF tokens', () => {
  it('store no session row, however many are fetched', async () => {
    const app = makeTestApp(db.ds);
    const before = await sessionRows();
    const sameVisitor = agentFor(app);
    for (let i = 0; i < 25; i++) await csrfToken(sameVisitor);
    for (let i = 0; i < 25; i++) await csrfToken(agentFor(app));
    expect(await sessionRows()).toBe(before);
  });

  it('come with an httpOnly, SameSite=Strict cookie for /api, and no session cookie', async () => {
    const res = await request(makeTestApp(db.ds)).get('/api/auth/csrf').expect(200);
    const cookies = res.headers['set-cookie'] as unknown as string[];
    expect(cookies).toHaveLength(1);
    expect(cookies[0]).toMatch(/^cw\.csrf=[0-9a-f]{64}\.[0-9a-f]{64}; Path=\/api; HttpOnly; SameSite=Strict$/);
    expect(res.body.token).toBe(decodeURIComponent(cookies[0]!.split(';')[0]!.slice('cw.csrf='.length)));
  });

  it('sign a visitor in, and a failed sign-in stores no session either', async () => {
    const app = makeTestApp(db.ds);
    const before = await sessionRows();
    const agent = agentFor(app);
    const token = await csrfToken(agent);
    await agent.post('/api/auth/login').set('X-CSRF-Token', token).send({ email: demo.builder, password: 'not-the-password' }).expect(401);
    expect(await sessionRows()).toBe(before);
    await agent.post('/api/auth/login').set('X-CSRF-Token', token).send({ email: demo.builder, password: demoPassword }).expect(200);
    expect(await sessionRows()).toBe(before + 1);
    // Signed in, the session's own token takes over: the anonymous one no longer changes anything.
    await agent.patch('/api/account').set('X-CSRF-Token', token).send({ displayName: 'Robin A.' }).expect(403).expect(hasErrorBody(csrfFailed));
    const sessionToken = await csrfToken(agent);
    expect(sessionToken).toMatch(/^[A-Za-z0-9_-]{43}$/);
    await agent.patch('/api/account').set('X-CSRF-Token', sessionToken).send({ displayName: 'Robin Ashcombe' }).expect(200);
  });

  it.each([
    ['the token without its cookie', { cookie: false, token: 'own' }],
    ['the cookie without a token', { cookie: true, token: 'none' }],
    ['another visitor’s token', { cookie: true, token: 'other' }],
    ['a forged token', { cookie: true, token: 'forged' }],
  ] as const)('refuse a sign-in with %s', async (_label, how) => {
    const app = makeTestApp(db.ds);
    const mine = await request(app).get('/api/auth/csrf').expect(200);
    const theirs = await request(app).get('/api/auth/csrf').expect(200);
    const ownToken = mine.body.token as string;
    const token = { own: ownToken, none: undefined, other: theirs.body.token as string, forged: '0'.repeat(64) + ownToken.slice(64) }[how.token];
    const req = request(app).post('/api/auth/login');
    if (how.cookie) req.set('Cookie', (mine.headers['set-cookie'] as unknown as string[])[0]!.split(';')[0]!);
    if (token) req.set('X-CSRF-Token', token);
    const res = await req.send({ email: demo.builder, password: demoPassword }).expect(403);
    expect(res.body).toEqual(errorBody(csrfFailed));
  });

  it('are refused for a signed-in session', async () => {
    const app = makeTestApp(db.ds);
    const anonymous = await request(app).get('/api/auth/csrf').expect(200);
    const agent = agentFor(app);
    await signIn(agent, demo.steward);
    // The anonymous pair, cookie and token, sent along with the signed-in session.
    const cookie = (anonymous.headers['set-cookie'] as unknown as string[])[0]!.split(';')[0]!;
    await agent
      .patch('/api/account')
      .set('Cookie', cookie)
      .set('X-CSRF-Token', anonymous.body.token as string)
      .send({ displayName: 'Sneaky' })
      .expect(403).expect(hasErrorBody(csrfFailed));
  });
});

describe('signed-in sessions', () => {
  it(`are at most ${maxSessionsPerUser} per user: signing in again ends the least recently used`, async () => {
    const app = makeTestApp(db.ds);
    const agents = [];
    for (let i = 0; i < maxSessionsPerUser + 2; i++) {
      const agent = agentFor(app);
      await signIn(agent, demo.builder);
      agents.push(agent);
    }
    expect(await sessionsOf(demo.builder)).toBe(maxSessionsPerUser);
    // The first two were used least recently; the others, and the newest, still work.
    await agents[0]!.get('/api/auth/me').expect(401);
    await agents[1]!.get('/api/auth/me').expect(401);
    for (const agent of agents.slice(2)) await agent.get('/api/auth/me').expect(200);
    // Another user's sessions are their own.
    await signIn(agentFor(app), demo.steward);
    expect(await sessionsOf(demo.builder)).toBe(maxSessionsPerUser);
  });
});
