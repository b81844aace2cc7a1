// The demo club's rulebooks: every rulesets/*.json (written as data, never executed) is checked
// with validateRulesetDocument and, when its rulebook is missing, stored as a rulebook with a
// published version 1. Insert-if-missing like the rest of the seed: a rulebook that already has
// any version is left exactly as it is. A document with problems stops the seed and names them.
import { readdir, readFile } from 'node:fs/promises';
import { basename, join, resolve } from 'node:path';
import type { DataSource, InsertResult, QueryDeepPartialEntity } from 'typeorm';
import type { RulesetDocument } from '../contracts/ruleset';
import { projectRoot } from '../config';
import { validateRulesetDocument } from '../domain';
import { calendarDateIn } from '../domain/dates';
import { inForceOn } from '../domain/rulebook/lifecycle';
import { Rulebook, RulesetVersion } from '../entities';
import type { SeedContext, SeedStep } from './seed';
import { demoPeople } from './seed-data';

export const demoRulesetsFolder = resolve(projectRoot, 'rulesets');

export interface DemoRuleset {
  /** The file name without `.json`; the rulebook's slug in the demo club. */
  slug: string;
  file: string;
  document: RulesetDocument;
}

export class RulesetSeedError extends Error {
  constructor(file: string, problems: { path: string; message: string }[]) {
    const lines = problems.map((p) => `  ${p.path || '(document)'}: ${p.message}`);
    super(`${file} is not a valid ruleset document (${problems.length} problem${problems.length === 1 ? '' : 's'}):\n${lines.join('\n')}`);
    this.name = 'RulesetSeedError';
  }
}

/** Reads and validates every *.json in `folder`, in file-name order. Throws on the first bad one. */
export async function loadDemoRulesets(folder = demoRulesetsFolder): Promise<DemoRuleset[]> {
  const files = (await readdir(folder)).filter((f) => f.endsWith('.json')).sort();
  const out: DemoRuleset[] = [];
  for (const name of files) {
    const file = join(folder, name);
    const shown = `rulesets/${name}`;
    let json: unknown;
    try {
      json = JSON.parse(await readFile(file, 'utf8'));
    } catch (err) {
      throw new RulesetSeedError(shown, [{ path: '', message: `Not readable JSON: ${err instanceof Error ? err.message : String(err)}` }]);
    }
    const slug = basename(name, '.json');
    if (!/^[a-z0-9]+(-[a-z0-9]+)*$/.test(slug) || slug.length > 80) {
      throw new RulesetSeedError(shown, [{ path: '', message: 'The file name must be a slug: lower-case letters, digits and single hyphens (at most 80).' }]);
    }
    const validation = validateRulesetDocument(json);
    if (!validation.ok) throw new RulesetSeedError(shown, validation.problems);
    out.push({ slug, file: shown, document: validation.document });
  }
  return out;
}

function insertedRows(res: InsertResult): number {
  return Array.isArray(res.raw) ? res.raw.length : 0;
}

export interface RulesetSeedSummary {
  rulebooks: number;
  versions: number;
}

/** Adds the demo rulebooks that are missing to the demo club (version 1 each, in force or scheduled by its date). */
export async function seedDemoRulesets(ds: DataSource, ctx: SeedContext, folder = demoRulesetsFolder): Promise<RulesetSeedSummary> {
  // Validate everything before writing anything, so a bad file leaves the database as it was.
  const rulesets = await loadDemoRulesets(folder);
  const adminEmail = demoPeople.find((p) => p.roles.includes('admin'))?.email;
  const publisherId = (adminEmail && ctx.usersByEmail.get(adminEmail)?.id) || null;
  const summary: RulesetSeedSummary = { rulebooks: 0, versions: 0 };
  await ds.transaction(async (tx) => {
    for (const { slug, document } of rulesets) {
      const books = tx.getRepository(Rulebook);
      const res = await books
        .createQueryBuilder()
        .insert()
        .values({ clubId: ctx.club.id, slug, title: document.rulebook.title, publisher: document.rulebook.publisher })
        .orIgnore()
        .execute();
      summary.rulebooks += insertedRows(res);
      const book = await books.findOneByOrFail({ clubId: ctx.club.id, slug });
      const versions = tx.getRepository(RulesetVersion);
      if (await versions.existsBy({ rulebookId: book.id })) continue;
      const now = new Date();
      // An edition dated after the club's today is scheduled, as publishing it would make it.
      const status = inForceOn(document.rulebook.effectiveDate, calendarDateIn(now, ctx.club.timeZone)) ? 'published' : 'scheduled';
      const inserted = await versions
        .createQueryBuilder()
        .insert()
        .values({
          rulebookId: book.id,
          versionNumber: 1,
          status,
          edition: document.rulebook.edition,
          effectiveDate: document.rulebook.effectiveDate,
          document,
          createdById: publisherId,
          publishedAt: now,
          publishedById: publisherId,
          // TypeORM's deep-partial type cannot follow the document's open records (jsonb); the value is the validated document.
        } as QueryDeepPartialEntity<RulesetVersion>)
        .orIgnore()
        .execute();
      summary.versions += insertedRows(inserted);
    }
  });
  return summary;
}

export const rulesetSeedStep: SeedStep = {
  name: 'rulesets',
  run: async (ds, ctx) => {
    await seedDemoRulesets(ds, ctx);
  },
};
