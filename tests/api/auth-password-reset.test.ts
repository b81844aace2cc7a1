// Password reset by e-mail (docs/api.md, "Authentication and account"): the same answer, in about the
// same time, for an address with or without an account; a single-use link through the outbox that
// expires after an hour, stored only as a hash; the password rules of every password form; the user's
// other sessions end; and requests limited per e-mail and per IP.
import { createHash } from 'node:crypto';
import { beforeEach, describe, expect, it } from 'vitest';
import request from 'supertest';
import { demoPassword } from '../../backend/src/db/seed-data';
import { passwordMinLength } from '../../backend/src/contracts/auth';
import { resetAnswerFloorMs, resetRequested } from '../../backend/src/routes/password-reset.routes';
import type { LimitOverrides } from '../../backend/src/services/limits';
import { agentFor, clearLimits, csrfToken, demo, errorBody, hasErrorBody, makeTestApp, signIn, testConfig, testPublicUrl, useTestDatabase } from './helpers';
import { clearMailTables } from './mail-helpers';

const db = useTestDatabase();
const deadLink = { error: { code: 'not_found', message: 'This link has expired or was already used. Ask for a new one.' } };
const linkPattern = new RegExp(`${testPublicUrl}/reset-password/([A-Za-z0-9_-]{43})`);

beforeEach(async () => {
  await clearLimits(db.ds);
  await clearMailTables(db.ds);
  await db.ds.query('DELETE FROM password_resets');
});

function appWith(limits: LimitOverrides = {}) {
  return makeTestApp(db.ds, { config: testConfig({ TRUST_PROXY: '1' }), limits });
}

async function ask(app: ReturnType<typeof makeTestApp>, email: string, ip = '198.51.100.30') {
  const agent = agentFor(app);
  const token = await csrfToken(agent);
  const started = Date.now();
  const res = await agent.post('/api/auth/password-reset').set('X-Forwarded-For', ip).set('X-CSRF-Token', token).send({ email });
  return { status: res.status, body: res.body as unknown, ms: Date.now() - started };
}

interface ResetMail {
  to_address: string;
  subject: string;
  text_body: string;
  html_body: string;
  kind: string;
}

async function resetMails(): Promise<ResetMail[]> {
  return db.ds.query(`SELECT to_address, subject, text_body, html_body, kind FROM outbox_messages WHERE kind = 'account.password_reset' ORDER BY created_at`);
}

async function linkTokenFor(email: string): Promise<string> {
  const mails = (await resetMails()).filter((m) => m.to_address === email);
  const token = linkPattern.exec(mails.at(-1)?.text_body ?? '')?.[1];
  if (!token) throw new Error(`no reset mail for ${email}`);
  return token;
}

async function setPassword(app: ReturnType<typeof makeTestApp>, token: string, password: string) {
  const agent = agentFor(app);
  const csrf = await csrfToken(agent);
  return agent.post(`/api/auth/password-reset/${token}`).set('X-CSRF-Token', csrf).send({ password });
}

async function signInStatus(app: ReturnType<typeof makeTestApp>, email: string, password: string): Promise<number> {
  const agent = agentFor(app);
  const token = await csrfToken(agent);
  return (await agent.post('/api/auth/login').set('X-CSRF-Token', token).send({ email, password })).status;
}

describe('asking for a reset', () => {
  it('answers the same, in about the same time, whether or not the address has an account', async () => {
    const app = appWith();
    // An account still waiting for its invitation cannot sign in: it gets no reset either.
    await db.ds.query(`INSERT INTO users (email, display_name, password_hash) VALUES ('pending-reset@tarnwick.example', 'Pending', NULL)`);
    const known = [];
    const unknown = [];
    const pending = [];
    for (let i = 0; i < 3; i++) {
      known.push(await ask(app, demo.builder, `198.51.100.${40 + i}`));
      unknown.push(await ask(app, `nobody-${i}@tarnwick.example`, `198.51.100.${50 + i}`));
      pending.push(await ask(app, 'pending-reset@tarnwick.example', `198.51.100.${60 + i}`));
    }
    for (const answer of [...known, ...unknown, ...pending]) {
      expect(answer.status).toBe(202);
      expect(answer.body).toEqual(resetRequested);
      expect(answer.ms).toBeGreaterThanOrEqual(resetAnswerFloorMs - 5);
    }
    const mean = (xs: { ms: number }[]) => xs.reduce((sum, x) => sum + x.ms, 0) / xs.length;
    expect(Math.abs(mean(known) - mean(unknown))).toBeLessThan(100);
    expect(Math.abs(mean(known) - mean(pending))).toBeLessThan(100);
    // Only the real account got mail.
    expect((await resetMails()).map((m) => m.to_address)).toEqual([demo.builder, demo.builder, demo.builder]);
  });

  it('mails a link through the outbox and stores only its hash, valid for an hour', async () => {
    const app = appWith();
    await ask(app, ' Builder@Tarnwick.EXAMPLE ');
    const [mail] = await resetMails();
    expect(mail).toMatchObject({ to_address: demo.builder, subject: 'Choose a new Cagewright password', kind: 'account.password_reset' });
    expect(mail!.text_body).toContain('Hello Robin Ashcombe,');
    expect(mail!.text_body).toContain('The link works once, within an hour.');
    expect(mail!.text_body).toContain("The sanctioning body's inspector decides");
    const token = await linkTokenFor(demo.builder);
    expect(mail!.html_body).toContain(`href="${testPublicUrl}/reset-password/${token}"`);
    const rows: { token_hash: string; lifetime_s: number }[] = await db.ds.query(
      `SELECT token_hash, extract(epoch FROM expires_at - created_at)::int AS lifetime_s FROM password_resets`,
    );
    expect(rows).toEqual([{ token_hash: createHash('sha256').update(token).digest('hex'), lifetime_s: 3600 }]);
    const stored = JSON.stringify(await db.ds.query(`SELECT * FROM password_resets`));
    expect(stored).not.toContain(token);
  });

  it('is limited per e-mail (the same answer, no more mail) and per IP (429)', async () => {
    const app = appWith({ passwordReset: { perEmail: 2, perIp: 4 } });
    for (let i = 0; i < 3; i++) expect((await ask(app, demo.steward, `198.51.100.${70 + i}`)).body).toEqual(resetRequested);
    expect(await resetMails()).toHaveLength(2);
    // Four from one IP, then it is refused, whatever the address.
    await clearLimits(db.ds);
    for (let i = 0; i < 4; i++) expect((await ask(app, `someone-${i}@tarnwick.example`, '198.51.100.80')).status).toBe(202);
    const refused = await ask(app, demo.admin, '198.51.100.80');
    expect(refused.status).toBe(429);
    expect(refused.body).toEqual(errorBody({ error: { code: 'rate_limited', message: 'Too many reset requests from here. Wait a while and try again.' } }));
    // The limit is in PostgreSQL: another app instance on the database holds it too.
    expect((await ask(appWith({ passwordReset: { perEmail: 2, perIp: 4 } }), demo.admin, '198.51.100.80')).status).toBe(429);
  });

  it('needs a CSRF token, stores no session, and checks the address', async () => {
    const app = appWith();
    const before: { n: number }[] = await db.ds.query(`SELECT count(*)::int AS n FROM "session"`);
    await request(app).post('/api/auth/password-reset').send({ email: demo.builder }).expect(403);
    const agent = agentFor(app);
    const token = await csrfToken(agent);
    const bad = await agent.post('/api/auth/password-reset').set('X-CSRF-Token', token).send({ email: 'not-an-address' }).expect(400);
    expect(bad.body.error.details).toEqual([{ path: 'email', message: 'Must be an e-mail address' }]);
    await agent.post('/api/auth/password-reset').set('X-CSRF-Token', token).send({ email: demo.builder }).expect(202);
    expect(await db.ds.query(`SELECT count(*)::int AS n FROM "session"`)).toEqual(before);
  });
});

describe('using the link', () => {
  it('sets the new password once, ends the user’s sessions, and is refused a second time', async () => {
    const app = appWith();
    const elsewhere = agentFor(app);
    await signIn(elsewhere, demo.builder);
    await ask(app, demo.builder);
    const token = await linkTokenFor(demo.builder);

    expect((await request(app).get(`/api/auth/password-reset/${token}`).expect(200)).body).toEqual({ email: demo.builder });
    const short = await setPassword(app, token, 'short');
    expect(short.status).toBe(400);
    expect(short.body.error.details).toEqual([{ path: 'password', message: `At least ${passwordMinLength} characters` }]);

    expect((await setPassword(app, token, 'a-brand-new-password')).status).toBe(204);
    await elsewhere.get('/api/auth/me').expect(401);
    expect(await signInStatus(app, demo.builder, demoPassword)).toBe(401);
    expect(await signInStatus(app, demo.builder, 'a-brand-new-password')).toBe(200);

    await request(app).get(`/api/auth/password-reset/${token}`).expect(404).expect(hasErrorBody(deadLink));
    expect((await setPassword(app, token, 'yet-another-password')).body).toEqual(errorBody(deadLink));
    expect(await signInStatus(app, demo.builder, 'a-brand-new-password')).toBe(200);
    // Back to the demo password for the files after this one.
    await ask(app, demo.builder, '198.51.100.31');
    expect((await setPassword(app, await linkTokenFor(demo.builder), demoPassword)).status).toBe(204);
  });

  it('is refused after an hour', async () => {
    const app = appWith();
    await ask(app, demo.steward);
    const token = await linkTokenFor(demo.steward);
    // An hour and a second later, as far as the link is concerned.
    await db.ds.query(`UPDATE password_resets SET expires_at = now() - interval '1 second', created_at = now() - interval '3601 seconds'`);
    await request(app).get(`/api/auth/password-reset/${token}`).expect(404).expect(hasErrorBody(deadLink));
    expect((await setPassword(app, token, 'a-brand-new-password')).status).toBe(404);
    expect(await signInStatus(app, demo.steward, demoPassword)).toBe(200);
  });

  it('voids the user’s other open links once one is used', async () => {
    const app = appWith();
    await ask(app, demo.admin, '198.51.100.32');
    const older = await linkTokenFor(demo.admin);
    await ask(app, demo.admin, '198.51.100.33');
    const newer = await linkTokenFor(demo.admin);
    expect(newer).not.toBe(older);
    expect((await setPassword(app, older, 'the-admins-new-password')).status).toBe(204);
    expect((await setPassword(app, newer, 'someone-elses-password')).status).toBe(404);
    expect(await signInStatus(app, demo.admin, 'the-admins-new-password')).toBe(200);
    await ask(app, demo.admin, '198.51.100.34');
    expect((await setPassword(app, await linkTokenFor(demo.admin), demoPassword)).status).toBe(204);
  });

  it('gives one 404 for an unknown and a malformed token', async () => {
    const app = appWith();
    await request(app).get(`/api/auth/password-reset/${'a'.repeat(43)}`).expect(404).expect(hasErrorBody(deadLink));
    await request(app).get('/api/auth/password-reset/short').expect(404).expect(hasErrorBody(deadLink));
    expect((await setPassword(app, 'x'.repeat(43), 'a-brand-new-password')).body).toEqual(errorBody(deadLink));
  });

  it('lets only one of two uses at the same moment win', async () => {
    const app = appWith();
    await ask(app, demo.steward, '198.51.100.35');
    const token = await linkTokenFor(demo.steward);
    const results = await Promise.all([setPassword(app, token, 'first-new-password'), setPassword(app, token, 'second-new-password')]);
    expect(results.map((r) => r.status).sort()).toEqual([204, 404]);
    const winner = results[0]!.status === 204 ? 'first-new-password' : 'second-new-password';
    expect(await signInStatus(app, demo.steward, winner)).toBe(200);
    await ask(app, demo.steward, '198.51.100.36');
    expect((await setPassword(app, await linkTokenFor(demo.steward), demoPassword)).status).toBe(204);
  });
});
