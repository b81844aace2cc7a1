// Fabrication use cases that need no saved data: the cope and its 1:1 template, the bend schedule from
// typed legs, the hoop leg trim. Inputs arrive parsed (contracts/fabrication.ts), so the domain's
// checks have already passed; the PDF is rendered fresh every time.
import type { CopeBody, CopePdfBody, LegTrimBody } from '../contracts/fabrication';
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
}

export function createFabricationService(): FabricationService {
  return {
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
