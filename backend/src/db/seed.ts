// The demo seed, as a function (tests and later seed steps call it) and as a CLI:
//   npx tsx backend/src/db/seed.ts
// Idempotent and respectful: rows are inserted only when missing (people by e-mail, the club by
// slug, memberships by user + club), so a re-seed never overwrites what someone changed since.
import type { DataSource, InsertResult } from 'typeorm';
import { loadConfig } from '../config';
import { Club, Membership, User } from '../entities';
import { hashPassword } from '../services/passwords';
import { createDataSource } from './data-source';
import { isMainModule } from './main-module';
import { demoGarageStep } from './seed-garage';
import { rulesetSeedStep } from './seed-rulesets';
import { secondClubStep } from './seed-second-club';
import { demoClub, demoPassword, demoPeople } from './seed-data';

export interface SeedContext {
  club: Club;
  usersByEmail: Map<string, User>;
}

/**
 * A later part of the seed (the demo club's rulesets, say). Steps run after the accounts, in
 * order, and must be insert-if-missing like the rest.
 */
export interface SeedStep {
  name: string;
  run(ds: DataSource, ctx: SeedContext): Promise<void>;
}

/**
 * The extension point for further demo data. The ruleset seed adds its step here, e.g.
 * `demoSeedSteps.push({ name: 'rulesets', run: seedDemoRulesets })`, or passes it to seedDemo.
 */
export const demoSeedSteps: SeedStep[] = [rulesetSeedStep];

/**
 * What `npm start` (and the browser tests' server) seeds: the above plus the demo builder's garage,
 * a hillclimb sheet with a full cage model, and a second club the builder races in, with its own
 * rulebook (to compare the sheet side by side). The API tests keep the garage empty and one club.
 */
export const cliSeedSteps: SeedStep[] = [...demoSeedSteps, secondClubStep, demoGarageStep];

export interface SeedSummary {
  created: { clubs: number; users: number; memberships: number };
  steps: string[];
}

/** Rows an INSERT … ON CONFLICT DO NOTHING actually wrote (PostgreSQL returns one row per insert). */
function insertedRows(res: InsertResult): number {
  return Array.isArray(res.raw) ? res.raw.length : 0;
}

export async function seedDemo(ds: DataSource, steps: SeedStep[] = demoSeedSteps): Promise<SeedSummary> {
  const summary: SeedSummary = { created: { clubs: 0, users: 0, memberships: 0 }, steps: [] };
  const ctx = await ds.transaction(async (tx) => {
    const clubs = tx.getRepository(Club);
    const users = tx.getRepository(User);
    const memberships = tx.getRepository(Membership);

    // ON CONFLICT DO NOTHING keeps two seeds running at once from failing on the unique keys.
    const clubInsert = await clubs.createQueryBuilder().insert().values(demoClub).orIgnore().execute();
    summary.created.clubs += insertedRows(clubInsert);
    const club = await clubs.findOneByOrFail({ slug: demoClub.slug });

    const usersByEmail = new Map<string, User>();
    for (const person of demoPeople) {
      let user = await users.findOneBy({ email: person.email });
      if (!user) {
        const passwordHash = await hashPassword(demoPassword);
        const res = await users
          .createQueryBuilder()
          .insert()
          .values({ email: person.email, displayName: person.displayName, passwordHash, preferredUnits: 'imperial' })
          .orIgnore()
          .execute();
        summary.created.users += insertedRows(res);
        user = await users.findOneByOrFail({ email: person.email });
      }
      usersByEmail.set(person.email, user);
      const res = await memberships
        .createQueryBuilder()
        .insert()
        .values({ userId: user.id, clubId: club.id, roles: person.roles })
        .orIgnore()
        .execute();
      summary.created.memberships += insertedRows(res);
    }
    return { club, usersByEmail };
  });
  for (const step of steps) {
    await step.run(ds, ctx);
    summary.steps.push(step.name);
  }
  return summary;
}

if (isMainModule(import.meta.url)) {
  const config = loadConfig();
  const ds = createDataSource({ databaseUrl: config.databaseUrl, poolSize: 2 });
  try {
    await ds.initialize();
    const summary = await seedDemo(ds, cliSeedSteps);
    const c = summary.created;
    console.log(`Demo seed done: ${c.clubs} club(s), ${c.users} user(s), ${c.memberships} membership(s) created; existing rows left as they were.`);
    if (summary.steps.length) console.log(`Further steps: ${summary.steps.join(', ')}`);
    console.log(`Demo accounts: ${demoPeople.map((p) => p.email).join(', ')} (password: ${demoPassword})`);
  } catch (err) {
    console.error('Seed failed:', err instanceof Error ? err.message : err);
    process.exitCode = 1;
  } finally {
    if (ds.isInitialized) await ds.destroy();
  }
}
