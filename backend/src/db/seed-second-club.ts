// A second invented club for the demo builder, with its own rulebook in force, so one build sheet
// can be checked against the rulebooks of two clubs side by side (issue 13 §5). Insert-if-missing
// like the rest of the seed: the club by slug, the membership by user + club, the rulebook by the
// ruleset seed's own rule (a rulebook with any version is left as it is).
import { resolve } from 'node:path';
import type { DataSource } from 'typeorm';
import { projectRoot } from '../config';
import { Club, Membership } from '../entities';
import type { SeedStep } from './seed';
import { demoPeople } from './seed-data';
import { seedDemoRulesets } from './seed-rulesets';

/** Sorts after the demo club by name, so "my first club" stays the demo club for everyone. */
export const secondDemoClub = { slug: 'wexcombe-hill-sprint', name: 'Wexcombe Hill & Sprint Association', timeZone: 'Europe/London' } as const;
export const secondClubRulesetsFolder = resolve(projectRoot, 'rulesets', 'other-clubs');

export const secondClubStep: SeedStep = {
  name: 'a second club for the demo builder (rulebooks side by side)',
  async run(ds: DataSource, ctx) {
    const builderEmail = demoPeople.find((p) => p.roles.includes('builder') && p.roles.length === 1)!.email;
    const builder = ctx.usersByEmail.get(builderEmail);
    if (!builder) return;
    await ds.getRepository(Club).createQueryBuilder().insert().values(secondDemoClub).orIgnore().execute();
    const club = await ds.getRepository(Club).findOneByOrFail({ slug: secondDemoClub.slug });
    await ds.getRepository(Membership).createQueryBuilder().insert().values({ userId: builder.id, clubId: club.id, roles: ['builder'] }).orIgnore().execute();
    // No one of the demo club published it: the rulebook has no publisher among the demo people.
    await seedDemoRulesets(ds, { club, usersByEmail: new Map() }, secondClubRulesetsFolder);
  },
};
