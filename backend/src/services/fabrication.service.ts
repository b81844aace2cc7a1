// Fabrication use cases that need no saved data: the cope and its 1:1 template, the bend schedule from
// typed legs, the hoop leg trim. Inputs arrive parsed (contracts/fabrication.ts), so the domain's
// checks have already passed; the PDF is rendered fresh every time.
import type { BendScheduleBody, CopeBody, CopePdfBody, FabricationSettings, LegTrimBody } from '../contracts/fabrication';
import type { Specification } from '../contracts/specification';
import { planMember, type MemberPlan } from '../domain/fabrication/cut-schedule';
import { buyingListCsv } from '../domain/fabrication/nesting';
import { sheetFabrication, type SheetFabrication } from '../domain/fabrication/sheet-fabrication';
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
  return `Branch ${branch} on a ${len(body.runOdMm)} OD run, ${body.angleDeg}° between the axes, offset ${len(body.offsetMm)}`;
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
}

export function createFabricationService(deps: { buildSheets: BuildSheetService; settings: FabricationSettingsService }): FabricationService {
  const forSheet: FabricationService['forSheet'] = async (sheetId, userId) => {
    const detail = await deps.buildSheets.get(sheetId, userId);
    const settings = asDomainSettings(await deps.settings.get(userId));
    // Saved revisions were parsed on write, so the stored document is a specification.
    const fab = sheetFabrication(detail.revision.specification as Specification, settings);
    return { ...fab, sheetName: detail.buildSheet.name, revisionNumber: detail.revision.number };
  };
  return {
    forSheet,
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
