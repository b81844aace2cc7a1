// Build sheets and their revisions. A save names the revision it started from; it becomes revision
// N+1 only if N is still the latest (the sheet row is locked for the comparison, and the unique
// (sheet, number) key backs that up), otherwise the answer is 409 with the current number and the
// caller's draft is untouched. Every revision keeps the full specification, so history and diffs
// never depend on the order things were saved in.
import type { DataSource, EntityManager } from 'typeorm';
import type {
  BuildSheetDetailWire, BuildSheetWire, CreateSheetBody, RevisionDiffWire, RevisionSummaryWire, RevisionWire, SaveRevisionBody,
} from '../contracts/garage';
import type { Specification } from '../contracts/specification';
import type { UnitSystem } from '../domain/units';
import { BuildSheet, BuildSheetRevision, Car, Club, Rulebook, RulesetVersion, User } from '../entities';
import { ConflictError, NotFoundError, ValidationError } from '../errors';
import { parseSpecificationOrThrow, refuseImplausibleValues } from './checks.service';
import { enforce, rolesIn } from './access';
import { sheetFor, type SheetAccessResult } from './garage.service';
import { diffSpecifications } from './garage/revision-diff';
import { tubeDataFor } from './garage/tube-data';

const iso = (d: Date | null) => (d ? d.toISOString() : null);

/** PostgreSQL's unique_violation, as TypeORM wraps it. */
function isUniqueViolation(err: unknown, constraint: string): boolean {
  const e = err as { code?: string; constraint?: string; driverError?: { code?: string; constraint?: string } };
  const d = e.driverError ?? e;
  return d.code === '23505' && d.constraint === constraint;
}

function revisionSummary(r: BuildSheetRevision): RevisionSummaryWire {
  return {
    number: r.number,
    rulesetVersionId: r.rulesetVersionId,
    classId: r.classId,
    memberCount: r.specification.members.length,
    createdAt: r.createdAt.toISOString(),
    createdBy: r.createdBy ? { id: r.createdBy.id, displayName: r.createdBy.displayName } : null,
  };
}

function revisionView(r: BuildSheetRevision): RevisionWire {
  return { ...revisionSummary(r), specification: r.specification };
}

/**
 * A specification being written to a sheet: the schema, then every field's plausible range (a units
 * slip is refused at its path). Only writes pass through here: re-checking a stored revision parses
 * with the schema alone, so a revision saved before a range existed keeps checking.
 */
export function parseSheetSpecificationForWrite(json: unknown, classId: string): Specification {
  const specification = parseSpecificationOrThrow(json, classId);
  refuseImplausibleValues(specification);
  return specification;
}

export type BuildSheetService = ReturnType<typeof createBuildSheetService>;

export function createBuildSheetService(ds: DataSource) {
  /**
   * The version a sheet may use: one of the club's rulebooks, visible to builders (not a draft) and
   * not retired, and a class it defines.
   */
  async function usableVersion(em: EntityManager, clubId: string, versionId: string, classId: string): Promise<RulesetVersion> {
    const version = await em.getRepository(RulesetVersion).findOne({ where: { id: versionId }, relations: { rulebook: true } });
    if (!version || version.rulebook?.clubId !== clubId || version.status === 'draft') {
      throw new NotFoundError('Ruleset version not found in this club.');
    }
    if (version.status === 'retired') {
      throw new ConflictError('This ruleset version is retired; choose the rulebook’s current version.');
    }
    const classes = version.document.classes ?? [];
    if (!classes.some((c) => c.id === classId)) {
      throw new ValidationError([{ path: 'classId', message: `Not a class of this ruleset version; it has ${classes.map((c) => `"${c.id}"`).join(', ')}.` }]);
    }
    return version;
  }

  async function latestRevision(em: EntityManager, sheet: BuildSheet): Promise<BuildSheetRevision> {
    return em.getRepository(BuildSheetRevision).findOneOrFail({ where: { buildSheetId: sheet.id, number: sheet.currentRevision }, relations: { createdBy: true } });
  }

  async function sheetView(em: EntityManager, { sheet, car }: Pick<SheetAccessResult, 'sheet' | 'car'>): Promise<BuildSheetWire> {
    // One after the other: `em` may be a transaction's, whose one connection runs one query at a time.
    const owner = await em.getRepository(User).findOneByOrFail({ id: car.ownerId });
    const club = await em.getRepository(Club).findOneByOrFail({ id: sheet.clubId });
    const rulebook = await em.getRepository(Rulebook).findOneByOrFail({ id: sheet.rulebookId });
    const version = await em.getRepository(RulesetVersion).findOneOrFail({ where: { id: sheet.rulesetVersionId }, select: { id: true, edition: true } });
    return {
      id: sheet.id,
      name: sheet.name,
      car: { id: car.id, name: car.name, make: car.make, model: car.model, year: car.year, raceNumber: car.raceNumber, chassisType: car.chassisType },
      owner: { id: owner.id, displayName: owner.displayName },
      club: { id: club.id, name: club.name },
      rulebook: { id: rulebook.id, title: rulebook.title, edition: version.edition, publisher: rulebook.publisher },
      rulesetVersionId: sheet.rulesetVersionId,
      classId: sheet.classId,
      currentRevision: sheet.currentRevision,
      archivedAt: iso(sheet.archivedAt),
      latestCheckRunId: sheet.latestCheckRunId,
      latestVerdict: sheet.latestVerdict,
      latestCheckedRevision: sheet.latestCheckedRevision,
      createdAt: sheet.createdAt.toISOString(),
      updatedAt: sheet.updatedAt.toISOString(),
    };
  }

  async function detail(em: EntityManager, found: SheetAccessResult): Promise<BuildSheetDetailWire> {
    const revision = await latestRevision(em, found.sheet);
    return { buildSheet: await sheetView(em, found), revision: revisionView(revision), tubeData: tubeDataFor(revision.specification), access: found.access };
  }

  async function revisionByNumber(em: EntityManager, sheetId: string, number: number): Promise<BuildSheetRevision> {
    const r = await em.getRepository(BuildSheetRevision).findOne({ where: { buildSheetId: sheetId, number }, relations: { createdBy: true } });
    if (!r) throw new NotFoundError(`This build sheet has no revision ${number}.`);
    return r;
  }

  function refuseArchived(sheet: BuildSheet): void {
    if (sheet.archivedAt) throw new ConflictError('This build sheet is archived. Unarchive it before changing it.');
  }

  return {
    async create(carId: string, userId: string, body: CreateSheetBody): Promise<BuildSheetDetailWire> {
      return ds.transaction(async (tx) => {
        // The car row is locked so a concurrent delete of the car cannot slip between.
        const car = await tx.getRepository(Car).findOne({ where: { id: carId }, lock: { mode: 'pessimistic_write' } });
        if (!car) throw new NotFoundError('Car not found.');
        enforce('car.owner', { actorId: userId, ownerId: car.ownerId }, { notFound: 'Car not found.' });
        if (car.archivedAt) throw new ConflictError('This car is archived. Unarchive it before adding a build sheet.');
        // The owner passed; what `car.addSheet` still asks is the builder role in the sheet's club.
        enforce('car.addSheet', { actorId: userId, ownerId: car.ownerId, roles: await rolesIn(tx, userId, body.clubId) }, {
          notFound: 'Club not found.', forbidden: 'You need the builder role in this club to keep build sheets for it.',
        });
        const version = await usableVersion(tx, body.clubId, body.rulesetVersionId, body.classId);
        const specification: Specification =
          body.specification === undefined
            ? { vehicle: { classId: body.classId, chassis: car.chassisType }, members: [] }
            : parseSheetSpecificationForWrite(body.specification, body.classId);
        const sheet = await tx.getRepository(BuildSheet).save(
          tx.getRepository(BuildSheet).create({
            carId: car.id, name: body.name, clubId: body.clubId, rulebookId: version.rulebookId, rulesetVersionId: version.id,
            classId: body.classId, currentRevision: 1, archivedAt: null, latestCheckRunId: null, latestVerdict: null, latestCheckedRevision: null,
          }),
        );
        await tx.getRepository(BuildSheetRevision).insert({
          buildSheetId: sheet.id, number: 1, specification, rulesetVersionId: version.id, classId: body.classId, createdById: userId,
        });
        // Touch the car so its list shows recent work first when a client sorts by it.
        await tx.getRepository(Car).update({ id: car.id }, { updatedAt: new Date() });
        return detail(tx, { sheet, car, access: 'owner' });
      });
    },

    async get(sheetId: string, userId: string): Promise<BuildSheetDetailWire> {
      return detail(ds.manager, await sheetFor(ds.manager, sheetId, userId, 'read'));
    },

    async rename(sheetId: string, userId: string, name: string): Promise<BuildSheetDetailWire> {
      return ds.transaction(async (tx) => {
        const found = await sheetFor(tx, sheetId, userId, 'edit', true);
        found.sheet.name = name;
        await tx.getRepository(BuildSheet).save(found.sheet);
        return detail(tx, found);
      });
    },

    async setArchived(sheetId: string, userId: string, archived: boolean): Promise<BuildSheetDetailWire> {
      return ds.transaction(async (tx) => {
        const found = await sheetFor(tx, sheetId, userId, 'edit', true);
        if (archived && !found.sheet.archivedAt) found.sheet.archivedAt = new Date();
        if (!archived) found.sheet.archivedAt = null;
        await tx.getRepository(BuildSheet).save(found.sheet);
        return detail(tx, found);
      });
    },

    /** Saves revision baseRevision + 1, or 409 `{ currentRevision }` when someone saved meanwhile. */
    async saveRevision(sheetId: string, userId: string, body: SaveRevisionBody): Promise<BuildSheetDetailWire> {
      // Parse first: a malformed draft is refused with every field, whatever the revision numbers say.
      const specification = parseSheetSpecificationForWrite(body.specification, body.classId);
      try {
        return await ds.transaction(async (tx) => {
          const found = await sheetFor(tx, sheetId, userId, 'edit', true);
          const { sheet } = found;
          refuseArchived(sheet);
          if (body.baseRevision !== sheet.currentRevision) {
            throw new ConflictError(
              `This build sheet was saved as revision ${sheet.currentRevision} since you opened revision ${body.baseRevision}. Your changes are not saved yet: reload the sheet, then apply them again.`,
              { currentRevision: sheet.currentRevision },
            );
          }
          const version = await usableVersion(tx, sheet.clubId, body.rulesetVersionId, body.classId);
          const number = sheet.currentRevision + 1;
          await tx.getRepository(BuildSheetRevision).insert({
            buildSheetId: sheet.id, number, specification, rulesetVersionId: version.id, classId: body.classId, createdById: userId,
          });
          Object.assign(sheet, { currentRevision: number, rulesetVersionId: version.id, rulebookId: version.rulebookId, classId: body.classId });
          await tx.getRepository(BuildSheet).save(sheet);
          return detail(tx, found);
        });
      } catch (err) {
        if (isUniqueViolation(err, 'UQ_build_sheet_revisions_sheet_number')) {
          const current = await ds.getRepository(BuildSheet).findOneBy({ id: sheetId });
          throw new ConflictError('Someone saved this build sheet at the same moment. Reload it, then apply your changes again.', { currentRevision: current?.currentRevision ?? null });
        }
        throw err;
      }
    },

    /**
     * Saves an earlier revision's specification, ruleset version and class again as the next revision
     * (undo, and going back to a version): history keeps every revision in between. Same rules as a
     * save: the builder only, not on an archived sheet, 409 when `baseRevision` is not the latest.
     */
    async restoreRevision(sheetId: string, userId: string, number: number, baseRevision: number): Promise<BuildSheetDetailWire> {
      await sheetFor(ds.manager, sheetId, userId, 'edit');
      const r = await revisionByNumber(ds.manager, sheetId, number);
      return this.saveRevision(sheetId, userId, { baseRevision, rulesetVersionId: r.rulesetVersionId, classId: r.classId, specification: r.specification });
    },

    async revisions(sheetId: string, userId: string): Promise<RevisionSummaryWire[]> {
      await sheetFor(ds.manager, sheetId, userId, 'read');
      const list = await ds.getRepository(BuildSheetRevision).find({ where: { buildSheetId: sheetId }, relations: { createdBy: true }, order: { number: 'DESC' } });
      return list.map(revisionSummary);
    },

    async revision(sheetId: string, userId: string, number: number): Promise<RevisionWire> {
      await sheetFor(ds.manager, sheetId, userId, 'read');
      return revisionView(await revisionByNumber(ds.manager, sheetId, number));
    },

    /** The changes from revision `from` to `to`, written in the caller's preferred units. */
    async diff(sheetId: string, userId: string, from: number, to: number): Promise<RevisionDiffWire> {
      await sheetFor(ds.manager, sheetId, userId, 'read');
      const units: UnitSystem = (await ds.getRepository(User).findOneBy({ id: userId }))?.preferredUnits ?? 'imperial';
      const [a, b] = await Promise.all([revisionByNumber(ds.manager, sheetId, from), revisionByNumber(ds.manager, sheetId, to)]);
      const changes = diffSpecifications(a.specification, b.specification, units);
      // The ruleset a revision was meant for is part of what changed, though not in the specification.
      if (a.rulesetVersionId !== b.rulesetVersionId) {
        changes.unshift({
          kind: 'changed', section: 'vehicle', subjectId: null, subjectLabel: 'build sheet', field: 'rulesetVersionId', fieldLabel: 'ruleset version',
          before: a.rulesetVersionId, after: b.rulesetVersionId, dimension: null, text: 'build sheet: checked against another ruleset version',
        });
      }
      return { from, to, changes };
    },

    /** The latest revision, for a check run; the caller holds the transaction and the lock. */
    latestRevision,
  };
}
