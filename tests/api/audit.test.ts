// The activity log: member changes are recorded in the same transaction as the change (a refused change
// leaves no entry), admins page and filter their club's log, other roles are refused, and the table is
// append-only at the database itself.
import type { Express } from 'express';
import { beforeAll, describe, expect, it } from 'vitest';
import { appendOnlySqlState } from '../../backend/src/db/migrations/1796083500000-outbox-and-audit';
import { type Agent, agentFor, demo, demoClubId, hasErrorBody, makeTestApp, signIn, useTestDatabase } from './helpers';

const db = useTestDatabase();
let app: Express;
let clubId: string;
let admin: Agent;
let token: string;
let adminId: string;

async function userId(email: string): Promise<string> {
  const rows: { id: string }[] = await db.ds.query('SELECT id FROM users WHERE email = $1', [email]);
  return rows[0]!.id;
}

async function log(
  query = '',
): Promise<{
  entries: {
    action: string;
    actor: { email: string } | null;
    details: Record<string, unknown>;
    entityId: string | null;
  }[];
  total: number;
  actions: string[];
}> {
  const res = await admin.get(`/api/clubs/${clubId}/audit${query}`).expect(200);
  return res.body;
}

beforeAll(async () => {
  await db.ds.query('TRUNCATE audit_entries');
  app = makeTestApp(db.ds);
  clubId = await demoClubId(db.ds);
  admin = agentFor(app);
  token = await signIn(admin, demo.admin);
  adminId = await userId(demo.admin);
});

describe('member changes are logged', () => {
  it('starts empty', async () => {
    expect(await log()).toMatchObject({ entries: [], page: 1, pageSize: 25, total: 0, actions: [] });
  });

  it('records adding, changing roles, and removing, with who did it', async () => {
    const added = await admin
      .post(`/api/clubs/${clubId}/members`)
      .set('X-CSRF-Token', token)
      .send({ email: 'wyn@tarnwick.example', roles: ['builder'] })
      .expect(201);
    const wynId: string = added.body.member.user.id;
    await admin
      .patch(`/api/clubs/${clubId}/members/${wynId}`)
      .set('X-CSRF-Token', token)
      .send({ roles: ['builder', 'steward'] })
      .expect(200);
    await admin.delete(`/api/clubs/${clubId}/members/${wynId}`).set('X-CSRF-Token', token).expect(204);

    const page = await log();
    expect(page.total).toBe(3);
    expect(page.entries.map((e) => [e.action, e.actor?.email, e.entityId, e.details])).toEqual([
      [
        'membership.removed',
        demo.admin,
        wynId,
        { email: 'wyn@tarnwick.example', roles: ['builder', 'steward'] },
      ],
      [
        'membership.roles_changed',
        demo.admin,
        wynId,
        { email: 'wyn@tarnwick.example', before: ['builder'], after: ['builder', 'steward'] },
      ],
      [
        'membership.added',
        demo.admin,
        wynId,
        { email: 'wyn@tarnwick.example', roles: ['builder'], invited: true, mailId: expect.any(String) },
      ],
    ]);
    expect(page.actions).toEqual(['membership.added', 'membership.removed', 'membership.roles_changed']);
  });

  it('records an accepted invitation, with the invited person as actor', async () => {
    const added = await admin
      .post(`/api/clubs/${clubId}/members`)
      .set('X-CSRF-Token', token)
      .send({ email: 'tamsin@tarnwick.example', roles: ['steward'] })
      .expect(201);
    const invitationToken = String(added.body.invitationUrl).split('/').pop()!;
    const newcomer = agentFor(app);
    const t = (await newcomer.get('/api/auth/csrf').expect(200)).body.token as string;
    await newcomer
      .post(`/api/invitations/${invitationToken}/accept`)
      .set('X-CSRF-Token', t)
      .send({ password: 'tamsin-strong-pass' })
      .expect(200);

    const { entries } = await log('?action=invitation.accepted');
    expect(entries.map((e) => [e.action, e.actor?.email, e.details])).toEqual([
      [
        'invitation.accepted',
        'tamsin@tarnwick.example',
        { email: 'tamsin@tarnwick.example', roles: ['steward'] },
      ],
    ]);
  });

  it('logs nothing when the change is refused (same transaction)', async () => {
    const before = (await log()).total;
    // The demo admin is the only admin: dropping their own admin role is refused.
    await admin
      .patch(`/api/clubs/${clubId}/members/${adminId}`)
      .set('X-CSRF-Token', token)
      .send({ roles: ['steward'] })
      .expect(409);
    await admin.delete(`/api/clubs/${clubId}/members/${adminId}`).set('X-CSRF-Token', token).expect(409);
    expect((await log()).total).toBe(before);
  });
});

describe('reading the log', () => {
  it('pages newest first and filters by action', async () => {
    const all = await log();
    const second = await log('?page=2&pageSize=1');
    expect(second).toMatchObject({ page: 2, pageSize: 1, total: all.total });
    expect(second.entries.map((e) => e.action)).toEqual([all.entries[1]!.action]);
    const added = await log('?action=membership.added');
    expect(added.entries.map((e) => e.action)).toEqual(['membership.added', 'membership.added']);
    expect(added.total).toBe(2);
    expect(await log('?page=99')).toMatchObject({ entries: [], total: all.total });
  });

  it('names every bad query field', async () => {
    const res = await admin
      .get(`/api/clubs/${clubId}/audit?page=0&pageSize=500&action=DROP TABLE`)
      .expect(400);
    expect(res.body.error.details).toEqual([
      { path: 'query.page', message: 'At least 1' },
      { path: 'query.pageSize', message: 'At most 100' },
      { path: 'query.action', message: 'Must look like area.event' },
    ]);
  });

  it.each([demo.builder, demo.steward])('refuses %s with 403', async (email) => {
    const agent = agentFor(app);
    await signIn(agent, email);
    await agent
      .get(`/api/clubs/${clubId}/audit`)
      .expect(403).expect(hasErrorBody({ error: { code: 'forbidden', message: 'Your role does not allow this.' } }));
  });

  it('hides a club from a non-member (404) and refuses the signed-out (401)', async () => {
    const other: { id: string }[] = await db.ds.query(
      `INSERT INTO clubs (slug, name) VALUES ('quarry-lane', 'Quarry Lane Kart Club') RETURNING id`,
    );
    await admin
      .get(`/api/clubs/${other[0]!.id}/audit`)
      .expect(404).expect(hasErrorBody({ error: { code: 'not_found', message: 'Club not found.' } }));
    await agentFor(app).get(`/api/clubs/${clubId}/audit`).expect(401);
  });
});

describe('append-only at the database', () => {
  it.each([
    ['UPDATE', `UPDATE audit_entries SET action = 'membership.forged'`],
    ['DELETE', `DELETE FROM audit_entries`],
  ])('refuses %s with the append-only error', async (op, sql) => {
    const before = (await log()).total;
    await expect(db.ds.query(sql)).rejects.toMatchObject({
      code: appendOnlySqlState,
      message: `audit_entries is append-only: ${op} refused`,
    });
    expect((await log()).total).toBe(before);
  });
});
