// A build sheet and the editions of its rulebook. A sheet stays pinned to the edition its revision
// names; when a newer edition is published (in force, or scheduled ahead of its date) the sheet page
// shows what the sheet's latest revision gets under it, and one action moves the sheet there as a new
// revision with the same specification. Earlier revisions and their check runs keep their edition.
import type { DataSource } from 'typeorm';
import type { EditionFindingWire, MoveEditionBody, SheetEditionRefWire, SheetEditionsWire, BuildSheetDetailWire } from '../contracts/garage';
import type { Finding } from '../contracts/report';
import type { RulesetDocument } from '../contracts/ruleset';
import type { Specification } from '../contracts/specification';
import { evaluateSpecification } from '../domain';
import { describeRulesetChanges } from '../domain/rulebook/diff';
import { findingKey } from '../domain/review/waivers';
import type { UnitSystem } from '../domain/units';
import { MEMBER_KIND_LABELS } from '../domain/vocabulary';
import { BuildSheet, BuildSheetRevision, RulesetVersion, User } from '../entities';
import { ConflictError, NotFoundError, ValidationError } from '../errors';
import type { BuildSheetService } from './build-sheets.service';
import { sheetFor } from './garage.service';
import { changesForClass } from './publish/republish-job';
import type { RulesetService } from './rulesets.service';

const ref = (v: RulesetVersion): SheetEditionRefWire => ({
  versionId: v.id, versionNumber: v.versionNumber, edition: v.edition, status: v.status, effectiveDate: v.effectiveDate,
});

function subjectOf(f: Finding): string {
  if (f.member) return f.member.name && f.member.name !== MEMBER_KIND_LABELS[f.member.kind] ? `${f.member.name} (${f.member.id})` : `${MEMBER_KIND_LABELS[f.member.kind]} ${f.member.id}`;
  if (f.plate) return `plate ${f.plate.id}`;
  return 'whole car';
}

/** Findings that block under `after` and did not block the same way under `before`. */
function newlyBlocking(before: readonly Finding[], after: readonly Finding[]): EditionFindingWire[] {
  const was = new Map(before.map((f) => [findingKey(f), f.verdict]));
  return after
    .filter((f) => f.severity === 'mandatory' && (f.verdict === 'fail' || f.verdict === 'needs_information') && was.get(findingKey(f)) !== f.verdict)
    .slice(0, 20)
    .map((f) => ({ requirementId: f.requirementId, title: f.title, section: f.citation.section, subject: subjectOf(f), verdict: f.verdict as 'fail' | 'needs_information' }));
}

export type SheetEditionService = ReturnType<typeof createSheetEditionService>;

export function createSheetEditionService(ds: DataSource, deps: { rulesets: RulesetService; buildSheets: BuildSheetService }) {
  const versions = () => ds.getRepository(RulesetVersion);

  /** The newest published or scheduled edition of the rulebook, and the one in force. */
  async function newestOf(rulebookId: string): Promise<{ newest: RulesetVersion | null; inForce: RulesetVersion | null }> {
    const rows = await versions().createQueryBuilder('v').where('v.rulebook_id = :rulebookId', { rulebookId })
      .andWhere(`v.status IN ('published', 'scheduled')`).orderBy('v.version_number', 'DESC').getMany();
    return { newest: rows[0] ?? null, inForce: rows.find((v) => v.status === 'published') ?? null };
  }

  return {
    async editions(sheetId: string, userId: string): Promise<SheetEditionsWire> {
      const { sheet } = await sheetFor(ds.manager, sheetId, userId, 'read');
      const pinned = await versions().findOneOrFail({ where: { id: sheet.rulesetVersionId }, relations: { rulebook: true } });
      const { newest, inForce } = await newestOf(sheet.rulebookId);
      const rulebookTitle = pinned.rulebook?.title ?? pinned.document.rulebook.title;
      const inForceRef = inForce && inForce.id !== pinned.id && inForce.id !== newest?.id ? ref(inForce) : null;
      if (!newest || newest.versionNumber <= pinned.versionNumber) return { pinned: ref(pinned), inForce: inForceRef, newer: null, rulebookTitle };

      const revision = await deps.buildSheets.latestRevision(ds.manager, sheet);
      const spec = revision.specification as Specification;
      const classId = revision.classId;
      const units: UnitSystem = (await ds.getRepository(User).findOneBy({ id: userId }))?.preferredUnits ?? 'imperial';
      const nowReport = await evaluateSpecification(await deps.rulesets.loadCompiled(pinned.id), classId, spec);
      const newerDoc: RulesetDocument = newest.document;
      const newerClass = newerDoc.classes.find((c) => c.id === classId);
      const underReport = newerClass ? await evaluateSpecification(await deps.rulesets.loadCompiled(newest.id), classId, spec) : null;
      const changes = changesForClass(describeRulesetChanges(pinned.document, newerDoc, { unitSystem: units }), classId).map((c) => c.text);
      return {
        pinned: ref(pinned),
        inForce: inForceRef,
        rulebookTitle,
        newer: {
          ...ref(newest),
          verdictNow: nowReport.verdict,
          verdictUnder: underReport?.verdict ?? null,
          classExists: newerClass !== undefined,
          className: newerClass?.name ?? pinned.document.classes.find((c) => c.id === classId)?.name ?? classId,
          changes: changes.slice(0, 30),
          newFindings: underReport ? newlyBlocking(nowReport.findings, underReport.findings) : [],
        },
      };
    },

    /** Saves the latest revision again, naming the newer edition; 409 when someone saved meanwhile. */
    async move(sheetId: string, userId: string, body: MoveEditionBody): Promise<BuildSheetDetailWire> {
      await ds.transaction(async (tx) => {
        const { sheet } = await sheetFor(tx, sheetId, userId, 'edit', true);
        if (sheet.archivedAt) throw new ConflictError('This build sheet is archived. Unarchive it before changing it.');
        if (body.baseRevision !== sheet.currentRevision) {
          throw new ConflictError(
            `This build sheet was saved as revision ${sheet.currentRevision} since you opened revision ${body.baseRevision}. Reload it, then move it to the newer edition.`,
            { currentRevision: sheet.currentRevision },
          );
        }
        // One after the other: the transaction's one connection runs one query at a time.
        const pinned = await tx.getRepository(RulesetVersion).findOneByOrFail({ id: sheet.rulesetVersionId });
        const target = await tx.getRepository(RulesetVersion).findOneBy({ id: body.rulesetVersionId });
        if (!target || target.rulebookId !== sheet.rulebookId || target.status === 'draft') {
          throw new NotFoundError('That edition is not one of this sheet’s rulebook.');
        }
        if (target.status !== 'published' && target.status !== 'scheduled') {
          throw new ConflictError(`Edition ${target.edition} is ${target.status === 'retired' ? 'withdrawn' : 'replaced'}; move the sheet to the edition in force or the scheduled one.`);
        }
        if (target.versionNumber <= pinned.versionNumber) {
          throw new ConflictError(`Edition ${target.edition} is not newer than edition ${pinned.edition}, which this sheet is checked against.`);
        }
        const revision = await tx.getRepository(BuildSheetRevision).findOneByOrFail({ buildSheetId: sheet.id, number: sheet.currentRevision });
        if (!target.document.classes.some((c) => c.id === revision.classId)) {
          throw new ValidationError([{ path: 'rulesetVersionId', message: `Edition ${target.edition} has no class "${revision.classId}"; start a new build sheet for one of its classes instead.` }]);
        }
        const number = sheet.currentRevision + 1;
        await tx.getRepository(BuildSheetRevision).insert({
          buildSheetId: sheet.id, number, specification: revision.specification, rulesetVersionId: target.id, classId: revision.classId, createdById: userId,
        });
        await tx.getRepository(BuildSheet).update({ id: sheet.id }, { currentRevision: number, rulesetVersionId: target.id, updatedAt: new Date() });
      });
      return deps.buildSheets.get(sheetId, userId);
    },
  };
}
