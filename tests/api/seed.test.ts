// The demo seed is idempotent and never overwrites what people changed since.
import { describe, expect, it } from 'vitest';
import { seedDemo } from '../../backend/src/db/seed';
import { agentFor, demo, makeTestApp, signIn, useTestDatabase } from './helpers';

const db = useTestDatabase();

async function snapshot() {
  return {
    clubs: await db.ds.query('SELECT id, slug, name FROM clubs ORDER BY slug'),
    users: await db.ds.query('SELECT id, email, display_name, password_hash, preferred_units FROM users ORDER BY email'),
    memberships: await db.ds.query('SELECT id, user_id, club_id, roles FROM memberships ORDER BY id'),
  };
}

describe('seedDemo', () => {
  it('creates the invented club and three accounts with their roles', async () => {
    const rows = await db.ds.query(
      `SELECT u.email, u.display_name, m.roles, c.name FROM memberships m
       JOIN users u ON u.id = m.user_id JOIN clubs c ON c.id = m.club_id ORDER BY u.email`,
    );
    expect(rows).toEqual([
      { email: demo.admin, display_name: 'Dara Quill', roles: ['admin', 'steward'], name: 'Tarnwick Vale Motor Club' },
      { email: demo.builder, display_name: 'Robin Ashcombe', roles: ['builder'], name: 'Tarnwick Vale Motor Club' },
      { email: demo.steward, display_name: 'Imogen Feld', roles: ['steward'], name: 'Tarnwick Vale Motor Club' },
    ]);
  });

  it('run twice gives the same rows', async () => {
    const before = await snapshot();
    const summary = await seedDemo(db.ds);
    expect(summary.created).toEqual({ clubs: 0, users: 0, memberships: 0 });
    expect(await snapshot()).toEqual(before);
  });

  it('keeps a changed display name, units, roles and password through a re-seed', async () => {
    const app = makeTestApp(db.ds);
    const agent = agentFor(app);
    const token = await signIn(agent, demo.builder);
    await agent.patch('/api/account').set('X-CSRF-Token', token).send({ displayName: 'Robin the Welder', preferredUnits: 'metric' }).expect(200);
    await agent.post('/api/auth/password').set('X-CSRF-Token', token).send({ currentPassword: 'cagewright-demo', newPassword: 'robins-own-password' }).expect(204);
    await db.ds.query(`UPDATE memberships SET roles = '{builder,steward}' WHERE user_id = (SELECT id FROM users WHERE email = $1)`, [demo.builder]);

    await seedDemo(db.ds);

    const [row] = await db.ds.query(
      `SELECT u.display_name, u.preferred_units, m.roles FROM users u JOIN memberships m ON m.user_id = u.id WHERE u.email = $1`,
      [demo.builder],
    );
    expect(row).toEqual({ display_name: 'Robin the Welder', preferred_units: 'metric', roles: ['builder', 'steward'] });
    await signIn(agentFor(app), demo.builder, 'robins-own-password');
  });

  it('puts back only what is missing, and runs further seed steps after the accounts', async () => {
    await db.ds.query('DELETE FROM users WHERE email = $1', [demo.steward]);
    const seen: string[] = [];
    const summary = await seedDemo(db.ds, [{ name: 'probe', run: async (_ds, ctx) => void seen.push(ctx.club.slug, ...ctx.usersByEmail.keys()) }]);
    expect(summary).toEqual({ created: { clubs: 0, users: 1, memberships: 1 }, steps: ['probe'] });
    expect(seen).toEqual(['tarnwick-vale', demo.builder, demo.steward, demo.admin]);
  });
});
