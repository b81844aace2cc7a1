// Clubs and members: who may see and change a club's members, the last-admin rule, and the
// invitation flow (docs/api.md, "Clubs and members"). Tests in this file build on one another.
import { randomUUID } from 'node:crypto';
import { beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { type Agent, agentFor, csrfToken, demo, demoClubId, errorBody, hasErrorBody, makeTestApp, signIn, testPublicUrl, useTestDatabase } from './helpers';
import { hashPassword } from '../../backend/src/services/passwords';
import { hashToken } from '../../backend/src/services/members.service';
import { passwordMinLength } from '../../backend/src/contracts/password-rules';

const db = useTestDatabase();
const forbidden = { error: { code: 'forbidden', message: 'Your role does not allow this.' } };
const clubNotFound = { error: { code: 'not_found', message: 'Club not found.' } };
const unauthenticated = { error: { code: 'unauthenticated', message: 'Please sign in.' } };
const invitationGone = { error: { code: 'not_found', message: 'This invitation link is not valid any more. Ask the club admin for a new one.' } };
const lastAdmin = { error: { code: 'conflict', message: 'A club needs at least one admin. Give someone else the admin role first.' } };

let clubId: string;
let otherClubId: string;
let app: ReturnType<typeof makeTestApp>;

async function userId(email: string): Promise<string> {
  const rows: { id: string }[] = await db.ds.query('SELECT id FROM users WHERE email = $1', [email]);
  return rows[0]!.id;
}

beforeAll(async () => {
  app = makeTestApp(db.ds);
  clubId = await demoClubId(db.ds);
  // A second club with an admin of its own, who is no member of Tarnwick Vale.
  const rows: { id: string }[] = await db.ds.query(
    `INSERT INTO clubs (slug, name) VALUES ('harrowgate-sprint', 'Harrowgate Sprint Club') RETURNING id`,
  );
  otherClubId = rows[0]!.id;
  const hash = await hashPassword('other-admin-password');
  const u: { id: string }[] = await db.ds.query(
    `INSERT INTO users (email, display_name, password_hash) VALUES ('admin@harrowgate.example', 'Ola Brent', $1) RETURNING id`,
    [hash],
  );
  await db.ds.query(`INSERT INTO memberships (user_id, club_id, roles) VALUES ($1, $2, '{admin}')`, [u[0]!.id, otherClubId]);
});

describe('who may list members', () => {
  it('lets an admin of the club list its members, sorted by name', async () => {
    const agent = agentFor(app);
    await signIn(agent, demo.admin);
    const res = await agent.get(`/api/clubs/${clubId}/members`).expect(200);
    expect(res.body).toEqual({
      members: [
        { user: { id: await userId(demo.admin), email: demo.admin, displayName: 'Dara Quill' }, roles: ['admin', 'steward'], invitationPending: false },
        { user: { id: await userId(demo.steward), email: demo.steward, displayName: 'Imogen Feld' }, roles: ['steward'], invitationPending: false },
        { user: { id: await userId(demo.builder), email: demo.builder, displayName: 'Robin Ashcombe' }, roles: ['builder'], invitationPending: false },
      ],
    });
  });

  it.each([demo.builder, demo.steward])('refuses %s with 403 (member without the admin role)', async (email) => {
    const agent = agentFor(app);
    const token = await signIn(agent, email);
    await agent.get(`/api/clubs/${clubId}/members`).expect(403).expect(hasErrorBody(forbidden));
    await agent.post(`/api/clubs/${clubId}/members`).set('X-CSRF-Token', token).send({ email: 'x@y.example', roles: ['builder'] }).expect(403).expect(hasErrorBody(forbidden));
    const target = await userId(demo.builder);
    await agent.patch(`/api/clubs/${clubId}/members/${target}`).set('X-CSRF-Token', token).send({ roles: ['admin'] }).expect(403).expect(hasErrorBody(forbidden));
    await agent.delete(`/api/clubs/${clubId}/members/${target}`).set('X-CSRF-Token', token).expect(403).expect(hasErrorBody(forbidden));
  });

  it('answers 404 for a club the caller does not belong to, an unknown club and a malformed id', async () => {
    const agent = agentFor(app);
    const token = await signIn(agent, demo.admin);
    await agent.get(`/api/clubs/${otherClubId}/members`).expect(404).expect(hasErrorBody(clubNotFound));
    await agent.post(`/api/clubs/${otherClubId}/members`).set('X-CSRF-Token', token).send({ email: demo.builder, roles: ['admin'] }).expect(404).expect(hasErrorBody(clubNotFound));
    await agent.get(`/api/clubs/${randomUUID()}/members`).expect(404).expect(hasErrorBody(clubNotFound));
    await agent.get('/api/clubs/tarnwick-vale/members').expect(404).expect(hasErrorBody(clubNotFound));
    // And the other club's admin cannot see Tarnwick Vale either.
    const other = agentFor(app);
    await signIn(other, 'admin@harrowgate.example', 'other-admin-password');
    await other.get(`/api/clubs/${clubId}/members`).expect(404).expect(hasErrorBody(clubNotFound));
  });

  it('answers 401 when not signed in', async () => {
    await request(app).get(`/api/clubs/${clubId}/members`).expect(401).expect(hasErrorBody(unauthenticated));
  });
});

describe('adding and changing members', () => {
  let agent: Agent;
  let token: string;
  beforeAll(async () => {
    agent = agentFor(app);
    token = await signIn(agent, demo.admin);
  });

  it('adds a person who has an account directly, without an invitation', async () => {
    const res = await agent.post(`/api/clubs/${clubId}/members`).set('X-CSRF-Token', token).send({ email: 'Admin@Harrowgate.example', roles: ['steward'] }).expect(201);
    expect(res.body).toEqual({
      member: { user: { id: await userId('admin@harrowgate.example'), email: 'admin@harrowgate.example', displayName: 'Ola Brent' }, roles: ['steward'], invitationPending: false },
    });
    const again = await agent.post(`/api/clubs/${clubId}/members`).set('X-CSRF-Token', token).send({ email: 'admin@harrowgate.example', roles: ['builder'] }).expect(409);
    expect(again.body).toEqual(errorBody({ error: { code: 'conflict', message: 'This person is already a member of the club.' } }));
  });

  it('changes roles, and 404s for someone who is not a member', async () => {
    const id = await userId('admin@harrowgate.example');
    const res = await agent.patch(`/api/clubs/${clubId}/members/${id}`).set('X-CSRF-Token', token).send({ roles: ['builder', 'steward'] }).expect(200);
    expect(res.body.member.roles).toEqual(['builder', 'steward']);
    const other = agentFor(app);
    await signIn(other, 'admin@harrowgate.example', 'other-admin-password');
    const me = await other.get('/api/auth/me').expect(200);
    expect(me.body.memberships.map((m: { club: { slug: string }; roles: string[] }) => [m.club.slug, m.roles])).toEqual([
      ['harrowgate-sprint', ['admin']],
      ['tarnwick-vale', ['builder', 'steward']],
    ]);
    await agent.patch(`/api/clubs/${clubId}/members/${randomUUID()}`).set('X-CSRF-Token', token).send({ roles: ['builder'] }).expect(404).expect(hasErrorBody({
      error: { code: 'not_found', message: 'Member not found.' },
    }));
  });

  it('removes a member', async () => {
    const id = await userId('admin@harrowgate.example');
    await agent.delete(`/api/clubs/${clubId}/members/${id}`).set('X-CSRF-Token', token).expect(204);
    const list = await agent.get(`/api/clubs/${clubId}/members`).expect(200);
    expect(list.body.members.map((m: { user: { email: string } }) => m.user.email)).not.toContain('admin@harrowgate.example');
    await agent.delete(`/api/clubs/${clubId}/members/${id}`).set('X-CSRF-Token', token).expect(404);
  });
});

describe('the last admin', () => {
  it('cannot lose the admin role or be removed while no other admin exists', async () => {
    const agent = agentFor(app);
    const token = await signIn(agent, demo.admin);
    const self = await userId(demo.admin);
    await agent.patch(`/api/clubs/${clubId}/members/${self}`).set('X-CSRF-Token', token).send({ roles: ['steward'] }).expect(409).expect(hasErrorBody(lastAdmin));
    await agent.delete(`/api/clubs/${clubId}/members/${self}`).set('X-CSRF-Token', token).expect(409).expect(hasErrorBody(lastAdmin));

    // A pending (not yet accepted) admin does not count: they cannot sign in to run the club.
    const invited = await agent.post(`/api/clubs/${clubId}/members`).set('X-CSRF-Token', token).send({ email: 'future-admin@tarnwick.example', roles: ['admin'] }).expect(201);
    expect(invited.body.member.invitationPending).toBe(true);
    await agent.patch(`/api/clubs/${clubId}/members/${self}`).set('X-CSRF-Token', token).send({ roles: ['steward'] }).expect(409).expect(hasErrorBody(lastAdmin));
    await agent.delete(`/api/clubs/${clubId}/members/${invited.body.member.user.id}`).set('X-CSRF-Token', token).expect(204);

    // With a second active admin, the first may step down, and then loses access to the list.
    const steward = await userId(demo.steward);
    await agent.patch(`/api/clubs/${clubId}/members/${steward}`).set('X-CSRF-Token', token).send({ roles: ['steward', 'admin'] }).expect(200);
    await agent.patch(`/api/clubs/${clubId}/members/${self}`).set('X-CSRF-Token', token).send({ roles: ['steward'] }).expect(200);
    await agent.get(`/api/clubs/${clubId}/members`).expect(403).expect(hasErrorBody(forbidden));

    // Put things back for the tests below.
    const stewardAgent = agentFor(app);
    const t = await signIn(stewardAgent, demo.steward);
    await stewardAgent.patch(`/api/clubs/${clubId}/members/${self}`).set('X-CSRF-Token', t).send({ roles: ['admin', 'steward'] }).expect(200);
    await stewardAgent.patch(`/api/clubs/${clubId}/members/${steward}`).set('X-CSRF-Token', t).send({ roles: ['steward'] }).expect(200);
  });
});

describe('invitations', () => {
  it('invites an unknown e-mail, shows it pending, and accepting sets the password and signs in', async () => {
    const admin = agentFor(app);
    const token = await signIn(admin, demo.admin);
    const res = await admin.post(`/api/clubs/${clubId}/members`).set('X-CSRF-Token', token).send({ email: 'New.Builder@Tarnwick.example', roles: ['builder'] }).expect(201);
    expect(res.body).toEqual({
      member: { user: { id: expect.any(String), email: 'new.builder@tarnwick.example', displayName: 'new.builder' }, roles: ['builder'], invitationPending: true },
      invitationUrl: expect.stringMatching(new RegExp(`^${testPublicUrl}/invitations/[A-Za-z0-9_-]{43}$`)),
      invitationMailed: true,
    });
    // The same link goes out by e-mail through the outbox (tests/api/audit-sentences.test.ts follows it out).
    const mailed: { text_body: string }[] = await db.ds.query(`SELECT text_body FROM outbox_messages WHERE to_address = 'new.builder@tarnwick.example'`);
    expect(mailed).toHaveLength(1);
    expect(mailed[0]!.text_body).toContain(String(res.body.invitationUrl));
    const inviteToken = String(res.body.invitationUrl).split('/').pop()!;
    // Only the token's hash is stored.
    const stored: { token_hash: string; invited_by: string }[] = await db.ds.query('SELECT token_hash, invited_by FROM invitations WHERE email = $1', ['new.builder@tarnwick.example']);
    expect(stored).toEqual([{ token_hash: hashToken(inviteToken), invited_by: await userId(demo.admin) }]);
    const list = await admin.get(`/api/clubs/${clubId}/members`).expect(200);
    expect(list.body.members.find((m: { user: { email: string } }) => m.user.email === 'new.builder@tarnwick.example').invitationPending).toBe(true);

    const guest = agentFor(app);
    await guest.get(`/api/invitations/${inviteToken}`).expect(200, { email: 'new.builder@tarnwick.example', clubName: 'Tarnwick Vale Motor Club' });
    const t = await csrfToken(guest);
    const short = await guest.post(`/api/invitations/${inviteToken}/accept`).set('X-CSRF-Token', t).send({ password: 'short' }).expect(400);
    expect(short.body.error.details).toEqual([{ path: 'password', message: `At least ${passwordMinLength} characters` }]);
    const accepted = await guest.post(`/api/invitations/${inviteToken}/accept`).set('X-CSRF-Token', t).send({ password: 'my-own-password', displayName: 'Sam Ordell' }).expect(200);
    expect(accepted.body).toEqual({
      user: { id: res.body.member.user.id, email: 'new.builder@tarnwick.example', displayName: 'Sam Ordell', preferredUnits: 'imperial' },
      memberships: [{ club: { id: clubId, slug: 'tarnwick-vale', name: 'Tarnwick Vale Motor Club' }, roles: ['builder'] }],
    });
    await guest.get('/api/auth/me').expect(200);

    // The link works once.
    await guest.get(`/api/invitations/${inviteToken}`).expect(404).expect(hasErrorBody(invitationGone));
    const t2 = await csrfToken(guest);
    await guest.post(`/api/invitations/${inviteToken}/accept`).set('X-CSRF-Token', t2).send({ password: 'another-password' }).expect(404).expect(hasErrorBody(invitationGone));
    // And the new password signs in.
    await signIn(agentFor(app), 'new.builder@tarnwick.example', 'my-own-password');
    const after = await admin.get(`/api/clubs/${clubId}/members`).expect(200);
    expect(after.body.members.find((m: { user: { email: string } }) => m.user.email === 'new.builder@tarnwick.example').invitationPending).toBe(false);
  });

  it('refuses an expired, unknown or malformed invitation token with 404', async () => {
    const admin = agentFor(app);
    const token = await signIn(admin, demo.admin);
    const res = await admin.post(`/api/clubs/${clubId}/members`).set('X-CSRF-Token', token).send({ email: 'late@tarnwick.example', roles: ['steward'] }).expect(201);
    const inviteToken = String(res.body.invitationUrl).split('/').pop()!;
    await db.ds.query(`UPDATE invitations SET expires_at = now() - interval '1 minute' WHERE email = 'late@tarnwick.example'`);
    await request(app).get(`/api/invitations/${inviteToken}`).expect(404).expect(hasErrorBody(invitationGone));
    await request(app).get(`/api/invitations/${'b'.repeat(43)}`).expect(404).expect(hasErrorBody(invitationGone));
    await request(app).get('/api/invitations/short').expect(404).expect(hasErrorBody(invitationGone));
  });

  it('drops a pending invitation when the member is removed', async () => {
    const admin = agentFor(app);
    const token = await signIn(admin, demo.admin);
    const res = await admin.post(`/api/clubs/${clubId}/members`).set('X-CSRF-Token', token).send({ email: 'changed-mind@tarnwick.example', roles: ['builder'] }).expect(201);
    const inviteToken = String(res.body.invitationUrl).split('/').pop()!;
    await admin.delete(`/api/clubs/${clubId}/members/${res.body.member.user.id}`).set('X-CSRF-Token', token).expect(204);
    await request(app).get(`/api/invitations/${inviteToken}`).expect(404).expect(hasErrorBody(invitationGone));
  });
});
