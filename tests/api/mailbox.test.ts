// The development mailbox: only there while FAKE_SMTP is on (404 otherwise, like any unknown address),
// only for admins (of any club: it shows every club's mail), and cleared only with the CSRF token.
import type { Express } from 'express';
import { beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { createMailboxService } from '../../backend/src/services/mail';
import { hashPassword } from '../../backend/src/services/passwords';
import { agentFor, csrfToken, demo, hasErrorBody, makeTestApp, signIn, testConfig, useTestDatabase } from './helpers';
import { clearMailTables } from './mail-helpers';

const db = useTestDatabase();
let on: Express;
let off: Express;

const notFound = { error: { code: 'not_found', message: 'No such API route.' } };
const forbidden = { error: { code: 'forbidden', message: 'Your role does not allow this.' } };

beforeAll(async () => {
  on = makeTestApp(db.ds, { config: testConfig({ FAKE_SMTP: 'true' }) });
  off = makeTestApp(db.ds, { config: testConfig({ FAKE_SMTP: 'false' }) });
  // An admin of another club, who belongs to no club of the demo.
  const club: { id: string }[] = await db.ds.query(
    `INSERT INTO clubs (slug, name) VALUES ('fenwold-hill', 'Fenwold Hill Climb Club') RETURNING id`,
  );
  const user: { id: string }[] = await db.ds.query(
    `INSERT INTO users (email, display_name, password_hash) VALUES ('admin@fenwold.example', 'Wren Talley', $1) RETURNING id`,
    [await hashPassword('fenwold-admin-pass')],
  );
  await db.ds.query(`INSERT INTO memberships (user_id, club_id, roles) VALUES ($1, $2, '{admin}')`, [
    user[0]!.id,
    club[0]!.id,
  ]);
});

let ids: string[];
beforeEach(async () => {
  await clearMailTables(db.ds);
  const mailbox = createMailboxService(db.ds);
  ids = [];
  ids.push(
    await mailbox.store({
      to: 'robin@tarnwick.example',
      from: 'Cagewright <no-reply@cagewright.example>',
      subject: 'First',
      text: 'Hello one',
      html: null,
    }),
  );
  await new Promise((r) => setTimeout(r, 5)); // distinct received_at
  ids.push(
    await mailbox.store({
      to: 'imogen@tarnwick.example',
      from: 'Cagewright <no-reply@cagewright.example>',
      subject: 'Second',
      text: 'Hello two',
      html: '<p>Hello two</p>',
    }),
  );
});

describe('GET /api/meta', () => {
  it.each([
    ['on', () => on, true],
    ['off', () => off, false],
  ] as const)(
    'says whether the mailbox exists (FAKE_SMTP %s), signed out too',
    async (_label, app, enabled) => {
      const res = await agentFor(app()).get('/api/meta').expect(200);
      expect(res.body).toEqual({ mailboxEnabled: enabled, version: '0.1.0' });
    },
  );
});

describe('with FAKE_SMTP off', () => {
  it('answers 404 on every mailbox address, even to an admin', async () => {
    const agent = agentFor(off);
    const token = await signIn(agent, demo.admin);
    await agent.get('/api/dev/mailbox').expect(404).expect(hasErrorBody(notFound));
    await agent.get(`/api/dev/mailbox/${ids[0]}`).expect(404).expect(hasErrorBody(notFound));
    await agent.delete('/api/dev/mailbox').set('X-CSRF-Token', token).expect(404).expect(hasErrorBody(notFound));
    const rows: unknown[] = await db.ds.query('SELECT 1 FROM dev_mailbox');
    expect(rows).toHaveLength(2);
  });
});

describe('with FAKE_SMTP on', () => {
  it('lists newest first and shows one message to a club admin', async () => {
    const agent = agentFor(on);
    await signIn(agent, demo.admin);
    const list = await agent.get('/api/dev/mailbox').expect(200);
    expect(
      list.body.messages.map((m: { subject: string; to: string; hasHtml: boolean }) => [
        m.subject,
        m.to,
        m.hasHtml,
      ]),
    ).toEqual([
      ['Second', 'imogen@tarnwick.example', true],
      ['First', 'robin@tarnwick.example', false],
    ]);
    expect(list.body.messages[0]).not.toHaveProperty('text');

    const one = await agent.get(`/api/dev/mailbox/${ids[1]}`).expect(200);
    expect(one.body.message).toEqual({
      id: ids[1],
      to: 'imogen@tarnwick.example',
      from: 'Cagewright <no-reply@cagewright.example>',
      subject: 'Second',
      receivedAt: expect.stringMatching(/^\d{4}-\d\d-\d\dT/),
      hasHtml: true,
      text: 'Hello two',
      html: '<p>Hello two</p>',
    });
  });

  it('lets an admin of another club read it too', async () => {
    const agent = agentFor(on);
    await signIn(agent, 'admin@fenwold.example', 'fenwold-admin-pass');
    const res = await agent.get('/api/dev/mailbox').expect(200);
    expect(res.body.messages).toHaveLength(2);
  });

  it.each([demo.builder, demo.steward])('refuses %s (no admin role anywhere) with 403', async (email) => {
    const agent = agentFor(on);
    const token = await signIn(agent, email);
    await agent.get('/api/dev/mailbox').expect(403).expect(hasErrorBody(forbidden));
    await agent.get(`/api/dev/mailbox/${ids[0]}`).expect(403).expect(hasErrorBody(forbidden));
    await agent.delete('/api/dev/mailbox').set('X-CSRF-Token', token).expect(403).expect(hasErrorBody(forbidden));
    expect(await db.ds.query('SELECT 1 FROM dev_mailbox')).toHaveLength(2);
  });

  it('refuses the signed-out with 401', async () => {
    await agentFor(on)
      .get('/api/dev/mailbox')
      .expect(401).expect(hasErrorBody({ error: { code: 'unauthenticated', message: 'Please sign in.' } }));
  });

  it('gives 400 for a malformed id and 404 for an unknown one', async () => {
    const agent = agentFor(on);
    await signIn(agent, demo.admin);
    await agent
      .get('/api/dev/mailbox/not-a-uuid')
      .expect(400).expect(hasErrorBody({
        error: {
          code: 'validation_failed',
          message: 'Some fields are invalid.',
          details: [{ path: 'params.id', message: 'Must be an id' }],
        },
      }));
    await agent
      .get('/api/dev/mailbox/00000000-0000-4000-8000-000000000000')
      .expect(404).expect(hasErrorBody({ error: { code: 'not_found', message: 'No such message in the mailbox.' } }));
  });

  it('clears only with the CSRF token', async () => {
    const agent = agentFor(on);
    await signIn(agent, demo.admin);
    await agent.delete('/api/dev/mailbox').expect(403);
    expect(await db.ds.query('SELECT 1 FROM dev_mailbox')).toHaveLength(2);
    await agent
      .delete('/api/dev/mailbox')
      .set('X-CSRF-Token', await csrfToken(agent))
      .expect(204);
    const res = await agent.get('/api/dev/mailbox').expect(200);
    expect(res.body).toEqual({ messages: [] });
  });
});
