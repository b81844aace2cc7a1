// Check runs of build sheets and their PDF report. A run checks the sheet's latest revision against
// the ruleset version and class that revision names, is saved through the checks service (an
// immutable record with a verification code) in the same transaction that updates the sheet's
// latest verdict, and can be read back as a PDF by whoever may read the sheet.
import type { DataSource } from 'typeorm';
import type { CheckRunSummaryWire, SheetCheckRunWire } from '../contracts/garage';
import type { UnitSystem } from '../domain/units';
import { memberNames } from '../domain/geometry/names';
import { BuildSheet, BuildSheetRevision, CheckRun, User } from '../entities';
import { ConflictError, NotFoundError } from '../errors';
import { renderPdf } from '../pdf/pdf-engine';
import { buildReportDocument, type ReportPhoto, type ReportReview } from '../pdf/report-document';
import { cageFor } from '../pdf/report-cage';
import type { BuildSheetService } from './build-sheets.service';
import type { CheckService } from './checks.service';
import { sheetFor } from './garage.service';
import type { PhotoService } from './photos.service';
import { tubeDataFor } from './garage/tube-data';
import { verificationUrl } from './cage-records.service';
import { sheetFabrication } from '../domain/fabrication/sheet-fabrication';
import { asDomainSettings, type FabricationSettingsService } from './fabrication-settings.service';

export type ReportService = ReturnType<typeof createReportService>;

export function createReportService(
  ds: DataSource,
  deps: { checks: CheckService; sheets: BuildSheetService; photos: PhotoService; fabricationSettings?: FabricationSettingsService; publicUrl: string },
) {
  async function unitsOf(userId: string): Promise<UnitSystem> {
    return (await ds.getRepository(User).findOneBy({ id: userId }))?.preferredUnits ?? 'imperial';
  }

  return {
    /** Checks the latest revision and saves the run; the owner only (stewards read, never run). */
    async runCheck(sheetId: string, userId: string): Promise<SheetCheckRunWire> {
      const units = await unitsOf(userId);
      return ds.transaction(async (tx) => {
        const { sheet } = await sheetFor(tx, sheetId, userId, 'edit', true);
        if (sheet.archivedAt) throw new ConflictError('This build sheet is archived. Unarchive it before running a check.');
        const revision = await deps.sheets.latestRevision(tx, sheet);
        const run = await deps.checks.saveRun({
          rulesetVersionId: revision.rulesetVersionId,
          classId: revision.classId,
          specification: revision.specification,
          userId,
          unitSystem: units,
          buildSheetRevisionId: revision.id,
          manager: tx,
        });
        await tx.getRepository(BuildSheet).update(
          { id: sheet.id },
          { latestCheckRunId: run.id, latestVerdict: run.overallVerdict, latestCheckedRevision: revision.number },
        );
        return { ...run, buildSheetId: sheet.id, revisionNumber: revision.number };
      });
    },

    async list(sheetId: string, userId: string): Promise<CheckRunSummaryWire[]> {
      await sheetFor(ds.manager, sheetId, userId, 'read');
      const rows: { id: string; number: number; rulesetVersionId: string; classId: string; verdict: CheckRunSummaryWire['verdict']; code: string; createdAt: Date }[] =
        await ds.query(
          `SELECT c.id, r.number, c.ruleset_version_id AS "rulesetVersionId", c.class_id AS "classId", c.overall_verdict AS verdict,
                  c.verification_code AS code, c.created_at AS "createdAt"
           FROM check_runs c JOIN build_sheet_revisions r ON r.id = c.build_sheet_revision_id
           WHERE r.build_sheet_id = $1 ORDER BY c.created_at DESC, c.id`,
          [sheetId],
        );
      return rows.map((r) => ({
        id: r.id, buildSheetId: sheetId, revisionNumber: r.number, rulesetVersionId: r.rulesetVersionId, classId: r.classId,
        verdict: r.verdict, verificationCode: r.code, createdAt: new Date(r.createdAt).toISOString(),
      }));
    },

    /**
     * The PDF of a saved run, for whoever may read its build sheet (the owner, the club's stewards
     * and admins); a run without a sheet follows the checks service's rule. Units: `units`, else
     * the builder's preferred units.
     */
    async pdf(checkRunId: string, userId: string, units?: UnitSystem, review?: ReportReview): Promise<{ pdf: Buffer; verificationCode: string }> {
      const run = await ds.getRepository(CheckRun).findOneBy({ id: checkRunId });
      if (!run) throw new NotFoundError('Check run not found.');
      const revision = run.buildSheetRevisionId ? await ds.getRepository(BuildSheetRevision).findOneBy({ id: run.buildSheetRevisionId }) : null;
      let context: { car: Parameters<typeof buildReportDocument>[0]['car']; builderName: string | null; sheetName: string | null; photos: ReportPhoto[]; builderId: string };
      if (revision) {
        let found;
        try {
          found = await sheetFor(ds.manager, revision.buildSheetId, userId, 'read');
        } catch (err) {
          if (err instanceof NotFoundError) throw new NotFoundError('Check run not found.');
          throw err;
        }
        const builder = await ds.getRepository(User).findOneBy({ id: found.car.ownerId });
        const thumbs = await deps.photos.thumbnailsOf(found.sheet.id);
        // Photos name their member as the builder does (label, else the kind's words), never by id.
        const names = memberNames(run.specification.members);
        const nameOf = new Map(run.specification.members.map((m, i) => [m.id, names[i]!]));
        context = {
          car: found.car, builderName: builder?.displayName ?? null, sheetName: found.sheet.name, builderId: found.car.ownerId,
          photos: thumbs.map(({ photo, thumbnail }) => {
            const name = photo.memberId ? (nameOf.get(photo.memberId) ?? 'a member not in the checked revision') : undefined;
            const label = name ?? `${photo.area[0]!.toUpperCase()}${photo.area.slice(1)}`;
            return { thumbnail, caption: photo.caption, label };
          }),
        };
      } else {
        const wire = await deps.checks.getRun(checkRunId, userId);
        context = { car: null, builderName: wire.createdBy?.displayName ?? null, sheetName: null, photos: [], builderId: run.createdById };
      }
      const shownUnits = units ?? (await unitsOf(context.builderId));
      // "Checked on" is the date in the time zone of the club whose rulebook the run was checked against.
      const zone: { time_zone: string }[] = await ds.query(
        `SELECT cl.time_zone FROM ruleset_versions v JOIN rulebooks rb ON rb.id = v.rulebook_id JOIN clubs cl ON cl.id = rb.club_id WHERE v.id = $1`,
        [run.rulesetVersionId],
      );
      const doc = buildReportDocument({
        report: run.report,
        units: shownUnits,
        car: context.car,
        builderName: context.builderName,
        sheetName: context.sheetName,
        revisionNumber: revision?.number ?? null,
        verificationCode: run.verificationCode,
        lookUpUrl: verificationUrl(deps.publicUrl, run.verificationCode),
        checkedAt: run.createdAt,
        checkedTimeZone: zone[0]?.time_zone ?? 'UTC',
        tubeData: tubeDataFor(run.specification),
        photos: context.photos,
        ...(run.specification.cage ? { cageHistory: run.specification.cage } : {}),
        ...(review ? { review } : {}),
        // A sheet's report carries what to buy, with the builder's own stick length and kerf.
        ...(revision && deps.fabricationSettings
          ? { buyingList: sheetFabrication(run.specification, asDomainSettings(await deps.fabricationSettings.get(context.builderId))).buyingList }
          : {}),
        cage: cageFor(run.specification, run.report, shownUnits, review),
      });
      return { pdf: await renderPdf(doc), verificationCode: run.verificationCode };
    },
  };
}
