// Sign-in and password-change limits (docs/decisions/0009-limits-in-postgresql.md): failures counted per
// e-mail and IP together and per IP refuse that caller; failures for an e-mail from other IPs only slow
// it down and never refuse its right password; password changes are limited per user; and every count
// lives in PostgreSQL, so a new app instance on the same database (a restart, a second server) keeps it.
import { beforeEach, describe, expect, it } from 'vitest';
import request from 'supertest';
import { demoPassword } from '../../backend/src/db/seed-data';
import { emailKey, type LimitOverrides } from '../../backend/src/services/limits';
import { agentFor, clearLimits, csrfToken, demo, errorBody, makeTestApp, signIn, testConfig, useTestDatabase } from './helpers';

const db = useTestDatabase();
const rateLimited = { error: { code: 'rate_limited', message: 'Too many attempts. Wait a few minutes and try again.' } };
const noDelay = { freeFailures: 1000, firstDelayMs: 0, maxDelayMs: 0 };

beforeEach(() => clearLimits(db.ds));

/** An app behind one trusted proxy, so each call can say which IP it comes from (X-Forwarded-For). */
function appWith(limits: LimitOverrides) {
  return makeTestApp(db.ds, { config: testConfig({ TRUST_PROXY: '1' }), limits });
}

/** One sign-in attempt from `ip`, with a fresh anonymous CSRF token and cookie. */
async function attempt(app: ReturnType<typeof makeTestApp>, ip: string, email: string, password = 'wrong-password') {
  const agent = agentFor(app);
  const token = (await agent.get('/api/auth/csrf').set('X-Forwarded-For', ip).expect(200)).body.token as string;
  const started = Date.now();
  const res = await agent.post('/api/auth/login').set('X-Forwarded-For', ip).set('X-CSRF-Token', token).send({ email, password });
  return { status: res.status, body: res.body as unknown, headers: res.headers, ms: Date.now() - started };
}

describe('sign-in limits', () => {
  it('refuses one e-mail from one IP after too many failures, even with the right password, and no one else', async () => {
    const app = appWith({ signIn: { perEmailAndIp: 3, perIp: 100, delay: noDelay } });
    for (let i = 0; i < 3; i++) expect((await attempt(app, '198.51.100.7', demo.builder)).status).toBe(401);
    const refused = await attempt(app, '198.51.100.7', demo.builder, demoPassword);
    expect(refused.status).toBe(429);
    expect(refused.body).toEqual(errorBody(rateLimited));
    expect(Number(refused.headers['retry-after'])).toBeGreaterThan(0);
    // The same person from their own address gets in; another account from the same IP is not affected.
    expect((await attempt(app, '203.0.113.20', demo.builder, demoPassword)).status).toBe(200);
    expect((await attempt(app, '198.51.100.7', demo.steward, demoPassword)).status).toBe(200);
  });

  it('refuses one IP after too many failures across different e-mails', async () => {
    const app = appWith({ signIn: { perEmailAndIp: 100, perIp: 3, delay: noDelay } });
    for (const email of ['a@x.example', 'b@x.example', 'c@x.example']) expect((await attempt(app, '198.51.100.8', email)).status).toBe(401);
    const refused = await attempt(app, '198.51.100.8', demo.admin, demoPassword);
    expect(refused.status).toBe(429);
    expect(refused.body).toEqual(errorBody(rateLimited));
    expect((await attempt(app, '198.51.100.9', demo.admin, demoPassword)).status).toBe(200);
  });

  it('takes an IPv6 caller by its /56 network: hopping addresses inside it does not help', async () => {
    const app = appWith({ signIn: { perEmailAndIp: 100, perIp: 2, delay: noDelay } });
    expect((await attempt(app, '2001:db8:1:100::1', 'a@x.example')).status).toBe(401);
    expect((await attempt(app, '2001:db8:1:1ff::2', 'b@x.example')).status).toBe(401);
    expect((await attempt(app, '2001:db8:1:1ab::3', demo.admin, demoPassword)).status).toBe(429);
    expect((await attempt(app, '2001:db8:2::1', demo.admin, demoPassword)).status).toBe(200);
  });

  it('accepts the right password after many wrong ones from other IPs, only later (progressive delay)', async () => {
    const delay = { freeFailures: 2, firstDelayMs: 250, maxDelayMs: 500 };
    const app = appWith({ signIn: { perEmailAndIp: 3, perIp: 100, delay } });
    // An attacker spread over six addresses, two guesses each: no pair reaches its limit.
    const timings: number[] = [];
    for (let i = 1; i <= 6; i++) {
      for (let j = 0; j < 2; j++) {
        const res = await attempt(app, `192.0.2.${i}`, demo.admin);
        expect(res.status).toBe(401);
        timings.push(res.ms);
      }
    }
    // From the third failure on, each attempt waited (250 ms, then the 500 ms ceiling); the unit test of
    // the throttle shows the first ones did not.
    expect(timings[2]!).toBeGreaterThanOrEqual(250);
    expect(timings.slice(3).every((ms) => ms >= 500)).toBe(true);
    // The admin, from the club's own address: let in, after the longest delay, never refused.
    const admin = await attempt(app, '203.0.113.50', demo.admin, demoPassword);
    expect(admin.status).toBe(200);
    expect(admin.ms).toBeGreaterThanOrEqual(500);
    // A success is no failure: the e-mail's count stays at the attacker's twelve.
    const rows: { points: number }[] = await db.ds.query(`SELECT points FROM rate_limits WHERE key = $1`, [`signin-email:${emailKey(demo.admin)}`]);
    expect(rows).toEqual([{ points: 12 }]);
  });

  it('does not count successful sign-ins', async () => {
    const strict = appWith({ signIn: { perEmailAndIp: 2, perIp: 2, delay: noDelay } });
    for (let i = 0; i < 5; i++) expect((await attempt(strict, '198.51.100.10', demo.builder, demoPassword)).status).toBe(200);
    // And a success starts the e-mail and IP pair afresh: one failure before it is forgotten.
    const app = appWith({ signIn: { perEmailAndIp: 2, perIp: 100, delay: noDelay } });
    expect((await attempt(app, '198.51.100.10', demo.builder)).status).toBe(401);
    expect((await attempt(app, '198.51.100.10', demo.builder, demoPassword)).status).toBe(200);
    expect((await attempt(app, '198.51.100.10', demo.builder)).status).toBe(401);
    expect((await attempt(app, '198.51.100.10', demo.builder)).status).toBe(401);
    expect((await attempt(app, '198.51.100.10', demo.builder, demoPassword)).status).toBe(429);
  });

  it('keeps a limit reached on one app instance for a new instance on the same database', async () => {
    const limits: LimitOverrides = { signIn: { perEmailAndIp: 2, perIp: 100, delay: noDelay } };
    const first = appWith(limits);
    for (let i = 0; i < 2; i++) expect((await attempt(first, '198.51.100.11', demo.steward)).status).toBe(401);
    // A restarted server, or a second one beside it: a new app, new stores, the same PostgreSQL.
    const second = appWith(limits);
    expect((await attempt(second, '198.51.100.11', demo.steward, demoPassword)).status).toBe(429);
    // The counters name no address: an e-mail is kept as the start of its SHA-256.
    const keys: { key: string }[] = await db.ds.query(`SELECT key FROM rate_limits ORDER BY key`);
    expect(keys.map((k) => k.key)).toEqual([
      `signin-email-ip:${emailKey(demo.steward)}:198.51.100.11`,
      `signin-email:${emailKey(demo.steward)}`,
      'signin-ip:198.51.100.11',
    ]);
    expect(JSON.stringify(keys)).not.toContain('steward');
  });

  it('starts counting afresh when the window has passed', async () => {
    const app = appWith({ signIn: { windowMs: 700, perEmailAndIp: 1, perIp: 100, delay: noDelay } });
    expect((await attempt(app, '198.51.100.12', demo.builder)).status).toBe(401);
    expect((await attempt(app, '198.51.100.12', demo.builder, demoPassword)).status).toBe(429);
    await new Promise((r) => setTimeout(r, 800));
    expect((await attempt(app, '198.51.100.12', demo.builder, demoPassword)).status).toBe(200);
  });
});

describe('password-change limits', () => {
  const change = (agent: ReturnType<typeof agentFor>, token: string, currentPassword: string) =>
    agent.post('/api/auth/password').set('X-CSRF-Token', token).send({ currentPassword, newPassword: 'another-long-password' });

  it('are per user: wrong current passwords in one session hold in every session of that user, and for no one else', async () => {
    const app = makeTestApp(db.ds, { limits: { passwordChange: { limit: 2 } } });
    const one = agentFor(app);
    const oneToken = await signIn(one, demo.builder);
    for (let i = 0; i < 2; i++) expect((await change(one, oneToken, 'not-the-password')).status).toBe(400);
    const refused = await change(one, oneToken, demoPassword);
    expect(refused.status).toBe(429);
    expect(refused.body).toEqual(errorBody(rateLimited));
    // A second session of the same user, from anywhere, is held too.
    const other = agentFor(makeTestApp(db.ds, { limits: { passwordChange: { limit: 2 } } }));
    const otherToken = await signIn(other, demo.builder);
    expect((await change(other, otherToken, demoPassword)).status).toBe(429);
    // Another user is not.
    const steward = agentFor(app);
    const stewardToken = await signIn(steward, demo.steward);
    expect((await change(steward, stewardToken, 'not-the-password')).status).toBe(400);
    // The builder's password did not change.
    const fresh = agentFor(app);
    const t = await csrfToken(fresh);
    await fresh.post('/api/auth/login').set('X-CSRF-Token', t).send({ email: demo.builder, password: demoPassword }).expect(200);
  });

  it('do not count an invalid new password or a successful change', async () => {
    const app = makeTestApp(db.ds, { limits: { passwordChange: { limit: 1 } } });
    const agent = agentFor(app);
    const token = await signIn(agent, demo.admin);
    for (let i = 0; i < 3; i++) {
      const res = await agent.post('/api/auth/password').set('X-CSRF-Token', token).send({ currentPassword: demoPassword, newPassword: 'short' });
      expect(res.status).toBe(400);
    }
    await agent.post('/api/auth/password').set('X-CSRF-Token', token).send({ currentPassword: demoPassword, newPassword: 'a-long-new-password' }).expect(204);
    await agent.post('/api/auth/password').set('X-CSRF-Token', token).send({ currentPassword: 'a-long-new-password', newPassword: demoPassword }).expect(204);
  });
});

describe('public look-ups', () => {
  it('count per IP in PostgreSQL too: a new app instance keeps the count', async () => {
    const limits: LimitOverrides = { verify: { limit: 2 } };
    const first = makeTestApp(db.ds, { limits });
    await request(first).get('/api/verify/nothing').expect(404);
    await request(first).get('/api/verify/nothing').expect(404);
    const res = await request(makeTestApp(db.ds, { limits })).get('/api/verify/nothing').expect(429);
    expect(res.body.error.code).toBe('rate_limited');
  });
});
