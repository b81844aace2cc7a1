// Rulebooks and their ruleset versions: the read side (lists, one version with its document), who
// may see a version, and the compiled form the checks run on (validated and compiled once per
// version, then cached: see compiled-ruleset-cache.ts). Editing and publishing come later.
import type { DataSource } from 'typeorm';
import type { RulebookWire, RulesetVersionSummaryWire, RulesetVersionWire } from '../contracts/checks';
import type { RulesetDocument } from '../contracts/ruleset';
import { compileRuleset, validateRulesetDocument, type CompiledRuleset } from '../domain';
import type { AccessFacts } from '../domain/access-policy';
import { Rulebook, RulesetVersion, type ClubRole, type RulesetStatus } from '../entities';
import { ConflictError, NotFoundError } from '../errors';
import { enforce } from './access';
import { compiledCacheKey, createCompiledRulesetCache, type CacheKeyParts, type CompiledRulesetCache } from './compiled-ruleset-cache';

/** What the access policy needs to know about a version and the person asking. */
export interface VersionAccess {
  id: string;
  status: RulesetStatus;
  lockVersion: number;
  clubId: string;
  /** The caller's roles in the owning club; null when they are not a member. */
  roles: ClubRole[] | null;
}

/** The facts of `version.read` / `version.admin` (members see published, superseded and retired versions; drafts only the club's admins). */
export function versionFacts(access: VersionAccess, userId: string): AccessFacts {
  return { actorId: userId, roles: access.roles, draft: access.status === 'draft' };
}

function summaryView(v: RulesetVersion): RulesetVersionSummaryWire {
  const doc = v.document;
  return {
    id: v.id,
    rulebookId: v.rulebookId,
    versionNumber: v.versionNumber,
    status: v.status,
    edition: v.edition,
    effectiveDate: v.effectiveDate,
    publishedAt: v.publishedAt ? v.publishedAt.toISOString() : null,
    classes: (doc.classes ?? []).map((c) => ({ id: c.id, name: c.name, weightBasis: c.weightBasis })),
    requirementCount: (doc.requirements ?? []).length,
  };
}

export type RulesetService = ReturnType<typeof createRulesetService>;

export function createRulesetService(ds: DataSource, options: { cache?: CompiledRulesetCache } = {}) {
  const cache = options.cache ?? createCompiledRulesetCache();

  /** The stored document of a version; a draft only while it still has the lock version asked for. */
  async function loadDocument(key: CacheKeyParts): Promise<RulesetDocument> {
    const row = await ds.getRepository(RulesetVersion).findOne({
      where: { id: key.id },
      select: { id: true, status: true, lockVersion: true, document: true },
    });
    if (!row) throw new NotFoundError('Ruleset version not found.');
    // A draft saved between reading its lock version and its document must not be cached under
    // the older key.
    if (key.status === 'draft' && (row.status !== 'draft' || row.lockVersion !== key.lockVersion)) {
      throw new ConflictError('This draft changed while it was being loaded. Try again.');
    }
    return row.document;
  }

  async function compileStored(key: CacheKeyParts): Promise<CompiledRuleset> {
    const document = await loadDocument(key);
    // Stored documents were validated when saved; validating again guards against rows written
    // around the service (and costs nothing after the first check, thanks to the cache).
    const validation = validateRulesetDocument(document);
    if (!validation.ok) {
      throw new ConflictError('This ruleset version cannot be used for checks: its document has problems an admin must fix.', {
        problems: validation.problems,
      });
    }
    return compileRuleset(validation.document);
  }

  return {
    /** The version's status and the caller's roles in its club, or null for an unknown version. */
    async access(versionId: string, userId: string): Promise<VersionAccess | null> {
      const rows: { id: string; status: RulesetStatus; lockVersion: number; clubId: string; roles: ClubRole[] | null }[] = await ds.query(
        `SELECT v.id, v.status, v.lock_version AS "lockVersion", r.club_id AS "clubId", m.roles
         FROM ruleset_versions v JOIN rulebooks r ON r.id = v.rulebook_id
         LEFT JOIN memberships m ON m.club_id = r.club_id AND m.user_id = $2
         WHERE v.id = $1`,
        [versionId, userId],
      );
      return rows[0] ?? null;
    },

    /** A club's rulebooks with their versions, newest first; drafts only when asked for (admins). */
    async listRulebooks(clubId: string, { includeDrafts }: { includeDrafts: boolean }): Promise<RulebookWire[]> {
      const books = await ds.getRepository(Rulebook).find({
        where: { clubId },
        relations: { versions: true },
        order: { title: 'ASC', slug: 'ASC', versions: { versionNumber: 'DESC' } },
      });
      return books.map((b) => ({
        id: b.id,
        clubId: b.clubId,
        slug: b.slug,
        title: b.title,
        publisher: b.publisher,
        createdAt: b.createdAt.toISOString(),
        versions: (b.versions ?? []).filter((v) => includeDrafts || v.status !== 'draft').map(summaryView),
      }));
    },

    /** One version with its document, for members of the owning club (drafts: admins); else 404. */
    async getVersion(versionId: string, userId: string): Promise<RulesetVersionWire> {
      const access = await this.access(versionId, userId);
      if (!access) throw new NotFoundError('Ruleset version not found.');
      enforce('version.read', versionFacts(access, userId), { notFound: 'Ruleset version not found.' });
      const v = await ds.getRepository(RulesetVersion).findOneOrFail({ where: { id: versionId }, relations: { rulebook: true } });
      const book = v.rulebook!;
      return {
        ...summaryView(v),
        rulebook: { id: book.id, clubId: book.clubId, slug: book.slug, title: book.title, publisher: book.publisher },
        document: v.document,
        lockVersion: v.lockVersion,
        createdAt: v.createdAt.toISOString(),
        updatedAt: v.updatedAt.toISOString(),
      };
    },

    /**
     * The version, validated and compiled, from the cache when possible. Pass what `access()`
     * returned to spare a query; without it the version's status is read first.
     */
    async loadCompiled(versionId: string, known?: Pick<CacheKeyParts, 'status' | 'lockVersion'>): Promise<CompiledRuleset> {
      let key = known ? { id: versionId, status: known.status, lockVersion: known.lockVersion } : undefined;
      if (!key) {
        const row = await ds.getRepository(RulesetVersion).findOne({ where: { id: versionId }, select: { id: true, status: true, lockVersion: true } });
        if (!row) throw new NotFoundError('Ruleset version not found.');
        key = row;
      }
      const parts = key;
      return cache.get(compiledCacheKey(parts), () => compileStored(parts));
    },

    /** The id of the rulebook's current published version, if any (for "use this one instead"). */
    async currentVersionOf(versionId: string): Promise<string | null> {
      const rows: { id: string }[] = await ds.query(
        `SELECT cur.id FROM ruleset_versions v JOIN ruleset_versions cur ON cur.rulebook_id = v.rulebook_id AND cur.status = 'published'
         WHERE v.id = $1`,
        [versionId],
      );
      return rows[0]?.id ?? null;
    },

    loadDocument,

    cacheStats: () => cache.stats(),
  };
}
