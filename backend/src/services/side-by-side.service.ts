// One build sheet against several rulebooks at once (issue 13 §5). The sheet's own rulebook edition
// is the home column; the others are editions in force (published) in clubs the builder belongs to,
// each in a class the builder picks. The comparison is one job of the check engine a builder's check
// uses (worker pool and compiled-ruleset cache): the sheet evaluated under each rulebook and the
// reports laid side by side by the pure domain, in the worker.
// Only the car's owner compares (sheet.edit: the club's stewards get 403, anyone else 404), and only
// against versions they may read (version.read: another club's rulebook is not found).
import type { DataSource } from 'typeorm';
import type { SideBySideBody, SideBySideOptionsWire, SideBySideOptionWire, SideBySideWire } from '../contracts/side-by-side';
import type { Specification } from '../contracts/specification';
import type { RulesetDocument } from '../contracts/ruleset';
import { formatIsoDate } from '../domain/dates';
import type { UnitSystem } from '../domain/units';
import type { ClubRole, RulesetStatus } from '../entities';
import { BuildSheetRevision, User } from '../entities';
import { ConflictError, NotFoundError, ValidationError } from '../errors';
import { enforce } from './access';
import type { CheckService } from './checks.service';
import { sheetFor } from './garage.service';
import { versionFacts } from './rulesets.service';

interface VersionRow {
  id: string;
  status: RulesetStatus;
  lockVersion: number;
  edition: string;
  effectiveDate: string;
  rulebookId: string;
  rulebookTitle: string;
  publisher: string;
  clubId: string;
  clubName: string;
  roles: ClubRole[] | null;
  document: RulesetDocument;
}

const VERSION_SELECT = `SELECT v.id, v.status, v.lock_version AS "lockVersion", v.edition, v.effective_date::text AS "effectiveDate",
  r.id AS "rulebookId", r.title AS "rulebookTitle", r.publisher, c.id AS "clubId", c.name AS "clubName", m.roles, v.document
  FROM ruleset_versions v JOIN rulebooks r ON r.id = v.rulebook_id JOIN clubs c ON c.id = r.club_id
  LEFT JOIN memberships m ON m.club_id = r.club_id AND m.user_id = $1`;

/** The class for this sheet: the same id, else the same name, else the only one; null: ask. */
export function suggestedClass(classes: readonly { id: string; name: string }[], sheetClass: { id: string; name: string }): string | null {
  const byId = classes.find((c) => c.id === sheetClass.id);
  if (byId) return byId.id;
  const name = sheetClass.name.trim().toLowerCase();
  const byName = classes.find((c) => c.name.trim().toLowerCase() === name);
  if (byName) return byName.id;
  return classes.length === 1 ? classes[0]!.id : null;
}

export type SideBySideService = ReturnType<typeof createSideBySideService>;

export function createSideBySideService(ds: DataSource, deps: { checks: CheckService }) {
  async function homeOf(sheetId: string, userId: string) {
    const { sheet } = await sheetFor(ds.manager, sheetId, userId, 'edit');
    const revision = await ds.getRepository(BuildSheetRevision).findOneOrFail({ where: { buildSheetId: sheet.id, number: sheet.currentRevision } });
    const rows: VersionRow[] = await ds.query(`${VERSION_SELECT} WHERE v.id = $2`, [userId, revision.rulesetVersionId]);
    const version = rows[0]!;
    const cls = version.document.classes.find((c) => c.id === revision.classId);
    return { sheet, revision, version, className: cls?.name ?? revision.classId };
  }

  return {
    /** The home rulebook and every other edition in force in the builder's clubs. */
    async options(sheetId: string, userId: string): Promise<SideBySideOptionsWire> {
      const { sheet, revision, version, className } = await homeOf(sheetId, userId);
      const rows: VersionRow[] = await ds.query(
        `${VERSION_SELECT} WHERE m.user_id IS NOT NULL AND v.status = 'published' AND r.id <> $2 ORDER BY c.name, r.title, v.version_number DESC`,
        [userId, sheet.rulebookId],
      );
      const sheetClass = { id: revision.classId, name: className };
      const options: SideBySideOptionWire[] = rows.map((v) => {
        const classes = v.document.classes.map((c) => ({ id: c.id, name: c.name }));
        return {
          rulesetVersionId: v.id, rulebookTitle: v.rulebookTitle, publisher: v.publisher, edition: v.edition, effectiveDate: v.effectiveDate,
          club: { id: v.clubId, name: v.clubName }, classes, suggestedClassId: suggestedClass(classes, sheetClass),
        };
      });
      return {
        home: {
          rulesetVersionId: version.id, rulebookTitle: version.rulebookTitle, publisher: version.publisher, edition: version.edition,
          club: { id: version.clubId, name: version.clubName }, classId: revision.classId, className,
        },
        options,
      };
    },

    /** The matrix of the sheet's latest revision under the home rulebook and the ones picked. */
    async compare(sheetId: string, userId: string, body: SideBySideBody): Promise<SideBySideWire> {
      const { sheet, revision, version: home } = await homeOf(sheetId, userId);
      const ids = body.columns.map((c) => c.rulesetVersionId);
      const rows: VersionRow[] = await ds.query(`${VERSION_SELECT} WHERE v.id = ANY($2::uuid[])`, [userId, ids]);
      const byId = new Map(rows.map((r) => [r.id, r]));
      const problems: { path: string; message: string }[] = [];
      const picked = body.columns.map((c, i) => {
        const v = byId.get(c.rulesetVersionId);
        if (!v) throw new NotFoundError('Ruleset version not found.');
        // Another club's rulebook: the same 404 as an unknown one.
        enforce('version.read', versionFacts(v, userId), { notFound: 'Ruleset version not found.' });
        if (v.rulebookId === sheet.rulebookId) problems.push({ path: `columns.${i}.rulesetVersionId`, message: 'This is the sheet’s own rulebook: it is always the first column.' });
        else if (v.status !== 'published') {
          throw new ConflictError(
            v.status === 'scheduled'
              ? `“${v.rulebookTitle}” ${v.edition} is not in force until ${formatIsoDate(v.effectiveDate)}: compare with the edition in force.`
              : `“${v.rulebookTitle}” ${v.edition} is no longer in force: compare with the edition in force.`,
            { rulesetVersionId: v.id },
          );
        }
        if (!v.document.classes.some((k) => k.id === c.classId)) {
          problems.push({ path: `columns.${i}.classId`, message: `Not a class of this rulebook; it has ${v.document.classes.map((k) => `"${k.id}"`).join(', ')}.` });
        }
        return { version: v, classId: c.classId };
      });
      if (problems.length > 0) throw new ValidationError(problems);

      const units: UnitSystem = body.unitSystem ?? (await ds.getRepository(User).findOneBy({ id: userId }))?.preferredUnits ?? 'imperial';
      const spec = revision.specification as Specification;
      const all = [{ version: home, classId: revision.classId, home: true }, ...picked.map((p) => ({ ...p, home: false }))];
      // One job: the sheet parsed once and evaluated under each rulebook where the reports are read,
      // so only the matrix crosses back (the worker pool keeps the event loop free meanwhile).
      const { comparison, line } = await deps.checks.compare({
        columns: all.map(({ version, classId, home: isHome }) => ({ version: { id: version.id, status: version.status, lockVersion: version.lockVersion }, classId, home: isHome })),
        specification: spec,
        unitSystem: units,
      });
      return {
        comparison,
        columns: all.map(({ version }) => ({ rulesetVersionId: version.id, clubName: version.clubName })),
        line,
        revision: revision.number,
      };
    },
  };
}
