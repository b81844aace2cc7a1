// Fabrication use cases: the cope and its 1:1 template, the bend schedule from typed legs, the hoop leg
// trim (no saved data), and a sheet's fabrication sheets from its latest revision with the builder's
// settings and the hoops' legs as measured (kept per sheet and member). Inputs arrive parsed
// (contracts/fabrication.ts), so the domain's checks have already passed; the PDF is rendered fresh
// every time.
import type { DataSource } from 'typeorm';
import type { BendScheduleBody, CopeBody, CopePdfBody, FabricationSettings, HoopLegsBody, LegTrimBody } from '../contracts/fabrication';
import type { Specification } from '../contracts/specification';
import { planMember, type MemberPlan } from '../domain/fabrication/cut-schedule';
import { buyingListCsv } from '../domain/fabrication/nesting';
import { HOOP_KINDS, measuredLegTrim, sheetFabrication, type MeasuredLegsInput, type MeasuredLegTrim, type SheetFabrication } from '../domain/fabrication/sheet-fabrication';
import { legTrimProblems } from '../domain/fabrication/leg-trim';
import { HoopLegMeasurement } from '../entities';
import { ConflictError, NotFoundError, ValidationError } from '../errors';
import { sheetFor } from './garage.service';
import { tubeSizeText } from '../pdf/report-document';
import type { BuildSheetService } from './build-sheets.service';
import { asDomainSettings, type FabricationSettingsService, type FabricationSettingsWire } from './fabrication-settings.service';
import { computeCope, copeMarkingTable, type Cope } from '../domain/fabrication/cope';
import { computeLegTrim, legTrimSideViewSvg, type LegTrim } from '../domain/fabrication/leg-trim';
import { formatQuantity, type UnitSystem } from '../domain/units';
import { buildCopeTemplateDocument } from '../pdf/cope-template';
import { renderPdf } from '../pdf/pdf-engine';

export interface CopeWire {
  curve: { angleDeg: number; arcMm: number; axialMm: number }[];
  depthMm: number;
  unrolledLengthMm: number;
  tipFromNodeMm: number;
  tipAngleDeg: number;
  deepestAngleDeg: number;
  markingTable: { angleDeg: number; arcMm: number; axialMm: number }[];
}

export function copeWire(cope: Cope): CopeWire {
  const { curve, depthMm, unrolledLengthMm, tipFromNodeMm, tipAngleDeg, deepestAngleDeg } = cope;
  return { curve, depthMm, unrolledLengthMm, tipFromNodeMm, tipAngleDeg, deepestAngleDeg, markingTable: copeMarkingTable(cope) };
}

export function copeTubeText(body: Pick<CopePdfBody, 'branchOdMm' | 'runOdMm' | 'angleDeg' | 'offsetMm' | 'branchWallMm'>, units: UnitSystem): string {
  const len = (mm: number) => formatQuantity(mm, 'length', units, units === 'metric' ? { decimals: 1 } : { decimals: 3 }).text;
  const branch = body.branchWallMm === undefined ? `${len(body.branchOdMm)} OD` : `${len(body.branchOdMm)} × ${len(body.branchWallMm)}`;
  return `Branch ${branch} on a ${len(body.runOdMm)} OD run, ${Math.round(body.angleDeg * 10) / 10}° between the axes, offset ${len(body.offsetMm)}`;
}

export interface FabricationService {
  cope(body: CopeBody): CopeWire;
  copePdf(body: CopePdfBody): Promise<Buffer>;
  legTrim(body: LegTrimBody, units: UnitSystem): LegTrim & { sideViewSvg: string };
  bendSchedule(body: BendScheduleBody, userId: string): Promise<MemberPlan>;
  settings(userId: string): Promise<FabricationSettingsWire>;
  saveSettings(userId: string, settings: FabricationSettings): Promise<FabricationSettingsWire>;
  /** The sheet's latest revision as fabrication sheets, with the caller's settings; access as reading the sheet. */
  forSheet(sheetId: string, userId: string): Promise<SheetFabrication & { sheetName: string; revisionNumber: number }>;
  buyingListCsv(sheetId: string, userId: string, units: UnitSystem): Promise<{ csv: string; sheetName: string }>;
  /** Keeps a hoop's measured legs with the sheet (its builder only); refused at the field when the legs cannot stand the hoop. */
  saveMeasuredLegs(sheetId: string, memberId: string, userId: string, body: HoopLegsBody): Promise<MeasuredLegTrim>;
  /** Forgets them: the leg cuts come from the model again. */
  clearMeasuredLegs(sheetId: string, memberId: string, userId: string): Promise<void>;
}

const asInput = (m: HoopLegMeasurement): MeasuredLegsInput => ({
  legs: m.legs, leanDeg: m.leanDeg, ...(m.topHeightMm !== null ? { topHeightMm: m.topHeightMm } : {}),
  savedAt: m.updatedAt.toISOString(), savedBy: m.updatedBy?.displayName ?? null,
});

export function createFabricationService(ds: DataSource, deps: { buildSheets: BuildSheetService; settings: FabricationSettingsService }): FabricationService {
  const forSheet: FabricationService['forSheet'] = async (sheetId, userId) => {
    const detail = await deps.buildSheets.get(sheetId, userId);
    const settings = asDomainSettings(await deps.settings.get(userId));
    const rows = await ds.getRepository(HoopLegMeasurement).find({ where: { buildSheetId: detail.buildSheet.id }, relations: { updatedBy: true } });
    const measured = Object.fromEntries(rows.map((r) => [r.memberId, asInput(r)]));
    // Saved revisions were parsed on write, so the stored document is a specification.
    const fab = sheetFabrication(detail.revision.specification as Specification, settings, measured);
    return { ...fab, sheetName: detail.buildSheet.name, revisionNumber: detail.revision.number };
  };

  /** The sheet (its builder, not archived) and the hoop of its latest revision named `memberId`. */
  async function hoopFor(sheetId: string, memberId: string, userId: string) {
    const found = await sheetFor(ds.manager, sheetId, userId, 'edit');
    if (found.sheet.archivedAt) throw new ConflictError('This build sheet is archived. Unarchive it before changing its measurements.');
    const detail = await deps.buildSheets.get(sheetId, userId);
    const member = (detail.revision.specification as Specification).members.find((m) => m.id === memberId);
    if (!member || !HOOP_KINDS.has(member.kind)) throw new NotFoundError(`Revision ${detail.revision.number} of this sheet has no hoop "${memberId}".`);
    return { sheet: found.sheet, member };
  }

  return {
    forSheet,
    async saveMeasuredLegs(sheetId, memberId, userId, body) {
      const { sheet, member } = await hoopFor(sheetId, memberId, userId);
      const input = { legs: body.legs, leanDeg: body.leanDeg, odMm: member.odMm, ...(body.topHeightMm !== undefined ? { topHeightMm: body.topHeightMm } : {}) };
      const problems = legTrimProblems(input);
      if (problems.length > 0) throw new ValidationError(problems.map((p) => ({ path: p.path, message: p.message })));
      const repo = ds.getRepository(HoopLegMeasurement);
      await repo.upsert(
        { buildSheetId: sheet.id, memberId, legs: body.legs, leanDeg: body.leanDeg, topHeightMm: body.topHeightMm ?? null, updatedById: userId, updatedAt: new Date() },
        { conflictPaths: ['buildSheetId', 'memberId'] },
      );
      const saved = await repo.findOneOrFail({ where: { buildSheetId: sheet.id, memberId }, relations: { updatedBy: true } });
      return measuredLegTrim(asInput(saved), member.odMm);
    },
    async clearMeasuredLegs(sheetId, memberId, userId) {
      const found = await sheetFor(ds.manager, sheetId, userId, 'edit');
      if (found.sheet.archivedAt) throw new ConflictError('This build sheet is archived. Unarchive it before changing its measurements.');
      await ds.getRepository(HoopLegMeasurement).delete({ buildSheetId: found.sheet.id, memberId });
    },
    async buyingListCsv(sheetId, userId, units) {
      const fab = await forSheet(sheetId, userId);
      return { csv: buyingListCsv(fab.buyingList, (g) => tubeSizeText(g.odMm, g.wallMm, units)), sheetName: fab.sheetName };
    },
    async bendSchedule(body, userId) {
      const settings = asDomainSettings(await deps.settings.get(userId));
      return planMember(body, settings.dies);
    },
    settings: (userId) => deps.settings.get(userId),
    saveSettings: (userId, settings) => deps.settings.put(userId, settings),
    cope: (body) => copeWire(computeCope(body)),
    async copePdf(body) {
      const cope = computeCope(body);
      return renderPdf(buildCopeTemplateDocument({ cope, pageSize: body.pageSize, units: body.units, memberName: body.memberName || 'Cope', tubeText: copeTubeText(body, body.units) }));
    },
    legTrim(body, units) {
      const trim = computeLegTrim(body);
      const len = (mm: number) => formatQuantity(mm, 'length', units).text;
      return { ...trim, sideViewSvg: legTrimSideViewSvg(trim, body.odMm, len) };
    },
  };
}
