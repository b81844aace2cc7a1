// The one error shape on the wire: malformed and oversized bodies, unknown routes, every invalid
// field listed, and no stack traces (docs/api.md, "Errors"). Also the security headers.
import { describe, expect, it } from 'vitest';
import request from 'supertest';
import { agentFor, csrfToken, demo, demoClubId, errorBody, makeTestApp, signIn, useTestDatabase } from './helpers';

const db = useTestDatabase();

describe('error shape', () => {
  it('answers malformed JSON with 400 malformed_json', async () => {
    const agent = agentFor(makeTestApp(db.ds));
    const token = await csrfToken(agent);
    const res = await agent
      .post('/api/auth/login')
      .set('X-CSRF-Token', token)
      .set('Content-Type', 'application/json')
      .send('{"email": "builder@tarnwick.example", ')
      .expect(400);
    expect(res.body).toEqual(errorBody({ error: { code: 'malformed_json', message: 'The request body is not valid JSON.' } }));
    expect(JSON.stringify(res.body)).not.toMatch(/at |SyntaxError|node_modules/);
  });

  it('answers a JSON body over 100 kB with 413 payload_too_large', async () => {
    const agent = agentFor(makeTestApp(db.ds));
    const token = await signIn(agent, demo.builder);
    const res = await agent
      .patch('/api/account')
      .set('X-CSRF-Token', token)
      .send({ displayName: 'x'.repeat(101 * 1024) })
      .expect(413);
    expect(res.body).toEqual(errorBody({ error: { code: 'payload_too_large', message: 'The request body is larger than 100 kB.' } }));
  });

  it('accepts a body just under the limit (and then validates it)', async () => {
    const agent = agentFor(makeTestApp(db.ds));
    const token = await signIn(agent, demo.builder);
    const res = await agent.patch('/api/account').set('X-CSRF-Token', token).send({ displayName: 'x'.repeat(90 * 1024) }).expect(400);
    expect(res.body.error.details).toEqual([{ path: 'displayName', message: 'At most 120 characters' }]);
  });

  it.each([
    ['GET', '/api/nothing-here'],
    ['GET', '/api'],
    ['GET', '/api/clubs'],
  ])('answers an unknown API route (%s %s) with a JSON 404', async (_method, path) => {
    const res = await request(makeTestApp(db.ds)).get(path).expect(404).expect('Content-Type', /json/);
    expect(res.body).toEqual(errorBody({ error: { code: 'not_found', message: 'No such API route.' } }));
  });

  it('lists every invalid field, with nested paths', async () => {
    const agent = agentFor(makeTestApp(db.ds));
    const token = await signIn(agent, demo.admin);
    const clubId = await demoClubId(db.ds);
    const res = await agent
      .post(`/api/clubs/${clubId}/members`)
      .set('X-CSRF-Token', token)
      .send({ email: 'nope', roles: ['builder', 'pilot', 'builder'] })
      .expect(400);
    expect(res.body).toEqual(errorBody({
      error: {
        code: 'validation_failed',
        message: 'Some fields are invalid.',
        details: [
          { path: 'email', message: 'Must be an e-mail address' },
          { path: 'roles.1', message: 'Must be builder, steward or admin' },
        ],
      },
    }));
    const missing = await agent.post(`/api/clubs/${clubId}/members`).set('X-CSRF-Token', token).send({}).expect(400);
    expect(missing.body.error.details).toEqual([
      { path: 'email', message: 'Must be text' },
      { path: 'roles', message: 'Must be a list of roles' },
    ]);
    const dup = await agent.post(`/api/clubs/${clubId}/members`).set('X-CSRF-Token', token).send({ email: 'x@y.example', roles: ['builder', 'builder'] }).expect(400);
    expect(dup.body.error.details).toEqual([{ path: 'roles', message: 'Each role only once' }]);
  });

  it('validates route parameters too', async () => {
    const agent = agentFor(makeTestApp(db.ds));
    const token = await signIn(agent, demo.admin);
    const clubId = await demoClubId(db.ds);
    const res = await agent.patch(`/api/clubs/${clubId}/members/not-a-uuid`).set('X-CSRF-Token', token).send({ roles: ['builder'] }).expect(400);
    expect(res.body).toEqual(errorBody({
      error: { code: 'validation_failed', message: 'Some fields are invalid.', details: [{ path: 'params.userId', message: 'Must be an id' }] },
    }));
  });
});

describe('security headers', () => {
  it('sends a content security policy for our own assets and no framework banner', async () => {
    const res = await request(makeTestApp(db.ds)).get('/api/health').expect(200);
    const csp = String(res.headers['content-security-policy']);
    expect(csp).toContain("default-src 'self'");
    expect(csp).toContain("script-src 'self'");
    expect(csp).toContain("style-src 'self' 'unsafe-inline'");
    expect(csp).toContain("img-src 'self' data: blob:");
    expect(csp).toContain("frame-ancestors 'none'");
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['x-powered-by']).toBeUndefined();
    // One framing policy: the CSP says it, so X-Frame-Options is not sent beside it.
    expect(res.headers['x-frame-options']).toBeUndefined();
  });

  it('keeps personal JSON out of every cache', async () => {
    const agent = request.agent(makeTestApp(db.ds));
    await signIn(agent, demo.builder);
    for (const path of ['/api/auth/me', '/api/cars', '/api/not-a-route']) {
      const res = await agent.get(path);
      expect([path, res.headers['cache-control']]).toEqual([path, 'private, no-store']);
    }
  });
});
