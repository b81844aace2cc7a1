// Sign-in, sessions, sign-out, CSRF, password change and the account (docs/api.md). The limits are in
// auth-limits.test.ts, anonymous CSRF and bounded sessions in auth-sessions.test.ts, resets in
// auth-password-reset.test.ts.
import { describe, expect, it } from 'vitest';
import request from 'supertest';
import { agentFor, csrfToken, demo, demoClubId, errorBody, hasErrorBody, makeTestApp, signIn, testConfig, useTestDatabase } from './helpers';
import { demoPassword } from '../../backend/src/db/seed-data';
import { passwordMinLength } from '../../backend/src/contracts/password-rules';

const db = useTestDatabase();
const invalidCredentials = { error: { code: 'invalid_credentials', message: 'E-mail or password is wrong.' } };
const unauthenticated = { error: { code: 'unauthenticated', message: 'Please sign in.' } };
const csrfFailed = {
  error: { code: 'csrf_failed', message: 'The security token is missing or out of date. Reload the page and try again.' },
};

describe('sign-in', () => {
  it('signs in with e-mail and password and returns the user with memberships', async () => {
    const agent = agentFor(makeTestApp(db.ds));
    const token = await csrfToken(agent);
    const res = await agent
      .post('/api/auth/login')
      .set('X-CSRF-Token', token)
      .send({ email: '  Admin@Tarnwick.EXAMPLE ', password: demoPassword })
      .expect(200);
    expect(res.body).toEqual({
      user: { id: expect.any(String), email: demo.admin, displayName: 'Dara Quill', preferredUnits: 'imperial' },
      memberships: [
        { club: { id: await demoClubId(db.ds), slug: 'tarnwick-vale', name: 'Tarnwick Vale Motor Club' }, roles: ['admin', 'steward'] },
      ],
    });
    const cookie = res.headers['set-cookie']?.[0] ?? '';
    expect(cookie).toMatch(/^cw\.sid=/);
    expect(cookie).toMatch(/HttpOnly/);
    expect(cookie).toMatch(/SameSite=Lax/);
    expect(cookie).not.toMatch(/Secure/); // plain http here
    expect(res.body.user).not.toHaveProperty('passwordHash');
  });

  it('marks the cookies Secure behind a trusted TLS proxy, and only then', async () => {
    const signInOver = async (app: ReturnType<typeof makeTestApp>) => {
      const csrf = await request(app).get('/api/auth/csrf').set('X-Forwarded-Proto', 'https').expect(200);
      // By hand: a cookie jar would not send a Secure cookie back over this plain socket.
      const cookie = (csrf.headers['set-cookie']?.[0] ?? '').split(';')[0]!;
      const login = await request(app)
        .post('/api/auth/login')
        .set('X-Forwarded-Proto', 'https')
        .set('Cookie', cookie)
        .set('X-CSRF-Token', csrf.body.token)
        .send({ email: demo.builder, password: demoPassword })
        .expect(200);
      return [csrf.headers['set-cookie']?.[0] ?? '', login.headers['set-cookie']?.[0] ?? ''];
    };
    const [tlsCsrf, tlsSession] = await signInOver(makeTestApp(db.ds, { config: testConfig({ TRUST_PROXY: '1' }) }));
    expect(tlsCsrf).toMatch(/^cw\.csrf=.*; Secure/);
    expect(tlsSession).toMatch(/^cw\.sid=.*; Secure/);
    // Without trust proxy the header is ignored: a client cannot talk its way into TLS.
    const [plainCsrf, plainSession] = await signInOver(makeTestApp(db.ds));
    expect(plainCsrf).toMatch(/^cw\.csrf=/);
    expect(plainSession).toMatch(/^cw\.sid=/);
    expect(plainCsrf + plainSession).not.toMatch(/Secure/);
  });

  it('gives the same 401 for a wrong password and an unknown e-mail', async () => {
    const agent = agentFor(makeTestApp(db.ds));
    const token = await csrfToken(agent);
    const wrong = await agent.post('/api/auth/login').set('X-CSRF-Token', token).send({ email: demo.builder, password: 'not-it-at-all' });
    const unknown = await agent
      .post('/api/auth/login')
      .set('X-CSRF-Token', token)
      .send({ email: 'nobody@tarnwick.example', password: 'not-it-at-all' });
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(wrong.body).toEqual(errorBody(invalidCredentials));
    expect(unknown.body).toEqual(errorBody(invalidCredentials));
    await agent.get('/api/auth/me').expect(401).expect(hasErrorBody(unauthenticated));
  });

  it('replaces the session at sign-in (new id, old CSRF token no longer valid)', async () => {
    const agent = agentFor(makeTestApp(db.ds));
    const before = await csrfToken(agent);
    const login = await agent.post('/api/auth/login').set('X-CSRF-Token', before).send({ email: demo.builder, password: demoPassword }).expect(200);
    expect(login.headers['set-cookie']?.[0]).toMatch(/^cw\.sid=/);
    const res = await agent.patch('/api/account').set('X-CSRF-Token', before).send({ displayName: 'Robin A.' }).expect(403);
    expect(res.body).toEqual(errorBody(csrfFailed));
    const after = await csrfToken(agent);
    expect(after).not.toBe(before);
  });

  it('keeps the session across requests and across a restarted app (same secret, sessions in PostgreSQL)', async () => {
    const config = testConfig();
    const agent = agentFor(makeTestApp(db.ds, { config }));
    await signIn(agent, demo.steward);
    expect((await agent.get('/api/auth/me').expect(200)).body.user.email).toBe(demo.steward);
    const cookie = (await agent.get('/api/auth/me')).request.cookies;
    const restarted = makeTestApp(db.ds, { config });
    const res = await request(restarted).get('/api/auth/me').set('Cookie', cookie).expect(200);
    expect(res.body.user.displayName).toBe('Imogen Feld');
  });

  it('refuses an account that has not accepted its invitation yet', async () => {
    await db.ds.query(`INSERT INTO users (email, display_name, password_hash) VALUES ('pending@tarnwick.example', 'pending', NULL)`);
    const agent = agentFor(makeTestApp(db.ds));
    const token = await csrfToken(agent);
    const res = await agent.post('/api/auth/login').set('X-CSRF-Token', token).send({ email: 'pending@tarnwick.example', password: 'anything-at-all' });
    expect(res.status).toBe(401);
    expect(res.body).toEqual(errorBody(invalidCredentials));
  });

  it('lists every invalid field of a sign-in body', async () => {
    const agent = agentFor(makeTestApp(db.ds));
    const token = await csrfToken(agent);
    const res = await agent.post('/api/auth/login').set('X-CSRF-Token', token).send({ email: 'not-an-email', password: '' }).expect(400);
    expect(res.body).toEqual(errorBody({
      error: {
        code: 'validation_failed',
        message: 'Some fields are invalid.',
        details: [
          { path: 'email', message: 'Must be an e-mail address' },
          { path: 'password', message: 'Must not be empty' },
        ],
      },
    }));
  });
});

describe('sign-out', () => {
  it('destroys the session', async () => {
    const agent = agentFor(makeTestApp(db.ds));
    const token = await signIn(agent, demo.builder);
    const cookie = (await agent.get('/api/auth/me').expect(200)).request.cookies;
    const res = await agent.post('/api/auth/logout').set('X-CSRF-Token', token).expect(204);
    expect(res.headers['set-cookie']?.[0]).toMatch(/^cw\.sid=;/);
    await agent.get('/api/auth/me').expect(401).expect(hasErrorBody(unauthenticated));
    // The old cookie no longer opens anything: the row is gone from the store.
    await request(makeTestApp(db.ds)).get('/api/auth/me').set('Cookie', cookie).expect(401).expect(hasErrorBody(unauthenticated));
  });
});

describe('CSRF', () => {
  it.each([
    ['without a token', undefined],
    ['with a wrong token', 'x'.repeat(43)],
  ])('refuses a state change %s', async (_label, header) => {
    const agent = agentFor(makeTestApp(db.ds));
    await signIn(agent, demo.builder);
    const req = agent.patch('/api/account').send({ displayName: 'Sneaky' });
    if (header) req.set('X-CSRF-Token', header);
    const res = await req.expect(403);
    expect(res.body).toEqual(errorBody(csrfFailed));
    const me = await agent.get('/api/auth/me').expect(200);
    expect(me.body.user.displayName).toBe('Robin Ashcombe');
  });

  it('refuses a sign-in without a token', async () => {
    const res = await request(makeTestApp(db.ds)).post('/api/auth/login').send({ email: demo.builder, password: demoPassword }).expect(403);
    expect(res.body).toEqual(errorBody(csrfFailed));
  });
});

describe('account', () => {
  it('changes display name and preferred units, and validates them', async () => {
    const agent = agentFor(makeTestApp(db.ds));
    const token = await signIn(agent, demo.builder);
    const res = await agent.patch('/api/account').set('X-CSRF-Token', token).send({ preferredUnits: 'metric', displayName: ' Robin A. ' }).expect(200);
    expect(res.body).toEqual({ user: { id: expect.any(String), email: demo.builder, displayName: 'Robin A.', preferredUnits: 'metric' } });
    expect((await agent.get('/api/auth/me')).body.user.preferredUnits).toBe('metric');

    const bad = await agent.patch('/api/account').set('X-CSRF-Token', token).send({ preferredUnits: 'cubits', displayName: '', role: 'admin' }).expect(400);
    expect(bad.body).toEqual(errorBody({
      error: {
        code: 'validation_failed',
        message: 'Some fields are invalid.',
        details: [
          { path: 'displayName', message: 'Must not be empty' },
          { path: 'preferredUnits', message: 'Must be imperial or metric' },
          { path: '', message: 'Unrecognized key: "role"' },
        ],
      },
    }));
    await agent.patch('/api/account').set('X-CSRF-Token', token).send({ displayName: 'Robin Ashcombe', preferredUnits: 'imperial' }).expect(200);
  });

  it('needs a signed-in user', async () => {
    const agent = agentFor(makeTestApp(db.ds));
    const token = await csrfToken(agent);
    await agent.patch('/api/account').set('X-CSRF-Token', token).send({ preferredUnits: 'metric' }).expect(401).expect(hasErrorBody(unauthenticated));
  });
});

describe('change password', () => {
  it('requires the current password, then signs in only with the new one and ends other sessions', async () => {
    const app = makeTestApp(db.ds);
    const elsewhere = agentFor(app);
    await signIn(elsewhere, demo.steward);
    const agent = agentFor(app);
    const token = await signIn(agent, demo.steward);

    const wrong = await agent.post('/api/auth/password').set('X-CSRF-Token', token).send({ currentPassword: 'not-the-one', newPassword: 'a-new-long-password' }).expect(400);
    expect(wrong.body).toEqual(errorBody({
      error: { code: 'validation_failed', message: 'Some fields are invalid.', details: [{ path: 'currentPassword', message: 'The current password is wrong' }] },
    }));
    const short = await agent.post('/api/auth/password').set('X-CSRF-Token', token).send({ currentPassword: demoPassword, newPassword: 'short' }).expect(400);
    expect(short.body.error.details).toEqual([{ path: 'newPassword', message: `At least ${passwordMinLength} characters` }]);

    await agent.post('/api/auth/password').set('X-CSRF-Token', token).send({ currentPassword: demoPassword, newPassword: 'a-new-long-password' }).expect(204);
    await agent.get('/api/auth/me').expect(200);
    await elsewhere.get('/api/auth/me').expect(401).expect(hasErrorBody(unauthenticated));

    const fresh = agentFor(app);
    const t = await csrfToken(fresh);
    await fresh.post('/api/auth/login').set('X-CSRF-Token', t).send({ email: demo.steward, password: demoPassword }).expect(401).expect(hasErrorBody(invalidCredentials));
    await fresh.post('/api/auth/login').set('X-CSRF-Token', t).send({ email: demo.steward, password: 'a-new-long-password' }).expect(200);
  });
});
