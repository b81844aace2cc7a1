// The submitted specification as rows of words for the steward's tables (ReviewSpecification.vue and
// ReviewSpecParts.vue): members with size, material, process, length and bends with their CLR; plates;
// inspection holes; padding and welding. Pure, so it is tested without mounting anything, and it reads
// the same whether the sheet has a cage model (bends from the model's path) or only typed values.
import type { Specification } from '@contracts/specification';
import type { CheckReport } from '@contracts/report';
import { formatQuantity, type UnitSystem } from '@domain/units';
import { MATERIAL_LABELS, MEMBER_KIND_LABELS, PROCESS_LABELS } from '@domain/vocabulary';
import { memberNames } from '@domain/geometry/names';
import { tubeSizeWords } from '@domain/geometry/cage-drawing';
import { valueLabel } from '@/components/sheet/sheetLabels';

export interface MemberRow { id: string; name: string; kind: string; size: string; material: string; process: string; length: string; bends: string; path: string }
export interface PlateRow { id: string; location: string; member: string; thickness: string; size: string; fixing: string; backing: string; bolts: string }
export interface HoleRow { key: string; member: string; diameter: string; distance: string }

const dash = '—';
const len = (mm: number | undefined, units: UnitSystem) => (mm === undefined ? dash : formatQuantity(mm, 'length', units).text);

/** "2: CLR 152 mm, 160 mm" (typed bends, else the bends of the model's path); "none" when straight. */
export function bendsText(member: Specification['members'][number], units: UnitSystem): string {
  const typed = (member.bends ?? []).map((b) => b.clrMm);
  const fromPath = (member.path ?? []).flatMap((p) => (p.clrMm === undefined ? [] : [p.clrMm]));
  const clrs = typed.length ? typed : fromPath;
  if (clrs.length === 0) return member.path && member.path.length > 2 ? 'bends without a CLR' : 'none';
  return `${clrs.length}: CLR ${clrs.map((c) => len(c, units)).join(', ')}${typed.length ? '' : ' (model)'}`;
}

export function memberRows(spec: Specification, units: UnitSystem, geometry?: CheckReport['geometry']): MemberRow[] {
  const names = memberNames(spec.members);
  const nodeNames = new Map((spec.model?.nodes ?? []).map((n) => [n.id, n.label ?? n.id]));
  const modelLengths = new Map((geometry?.members ?? []).map((m) => [m.memberId, m.developedLengthMm]));
  return spec.members.map((m, i) => {
    const model = modelLengths.get(m.id);
    const length = model === undefined ? len(m.lengthMm, units) : `${len(model, units)} (model)${m.lengthMm === undefined ? '' : `; typed ${len(m.lengthMm, units)}`}`;
    return {
      id: m.id,
      name: names[i]!,
      kind: MEMBER_KIND_LABELS[m.kind],
      size: tubeSizeWords(m.odMm, m.wallMm, units),
      material: [m.material && MATERIAL_LABELS[m.material], m.grade].filter(Boolean).join(', ') || dash,
      process: m.process ? PROCESS_LABELS[m.process] : dash,
      length,
      bends: bendsText(m, units),
      path: m.path?.map((p) => nodeNames.get(p.nodeId) ?? p.nodeId).join(' → ') ?? 'no path',
    };
  });
}

export function plateRows(spec: Specification, units: UnitSystem): PlateRow[] {
  const names = memberNames(spec.members);
  const nameOf = new Map(spec.members.map((m, i) => [m.id, names[i]!]));
  return (spec.plates ?? []).map((p) => {
    const sides = p.sidesMm ? `${len(p.sidesMm[0], units)} × ${len(p.sidesMm[1], units)}` : undefined;
    const area = p.areaMm2 !== undefined ? formatQuantity(p.areaMm2, 'area', units).text : undefined;
    const plateFixing = p.plateFixing ?? p.fixing;
    const fixing = [plateFixing && `plate ${valueLabel(plateFixing).toLowerCase()}`, p.footFixing && `foot ${valueLabel(p.footFixing).toLowerCase()}`].filter(Boolean).join(', ');
    // A welded plate has no bolts or backing plate to show (issue 13 §2: the sheet hides those fields).
    const bolted = plateFixing === 'bolted' || p.footFixing === 'bolted';
    return {
      id: p.id,
      location: valueLabel(p.location),
      member: p.memberId ? (nameOf.get(p.memberId) ?? p.memberId) : dash,
      thickness: len(p.thicknessMm, units),
      size: [sides, area && `area ${area}`].filter(Boolean).join('; ') || dash,
      fixing: fixing || dash,
      backing: !bolted ? dash : p.backingPlate ? `yes${p.backingThicknessMm !== undefined ? `, ${len(p.backingThicknessMm, units)}` : ''}` : p.backingPlate === false ? 'no' : dash,
      bolts: !bolted ? dash : [p.boltCount !== undefined && `${p.boltCount}`, p.boltDiameterMm !== undefined && `× ${len(p.boltDiameterMm, units)}`, p.boltGrade && `grade ${p.boltGrade}`].filter(Boolean).join(' ') || dash,
    };
  });
}

export function holeRows(spec: Specification, units: UnitSystem): HoleRow[] {
  const names = memberNames(spec.members);
  const nameOf = new Map(spec.members.map((m, i) => [m.id, names[i]!]));
  return (spec.inspectionHoles ?? []).map((h, i) => ({
    key: `${h.memberId}-${i}`,
    member: nameOf.get(h.memberId) ?? h.memberId,
    diameter: len(h.diameterMm, units),
    distance: len(h.distanceFromWeldOrBendMm, units),
  }));
}

/** Padding and welding as label/value pairs; "not given" where the builder left it empty. */
export function paddingWeldingRows(spec: Specification): { label: string; value: string }[] {
  const p = spec.padding;
  return [
    { label: 'Padding near the helmet', value: p?.nearHelmet === undefined ? 'not given' : p.nearHelmet ? 'yes' : 'no' },
    { label: 'Padding standard', value: p?.standard ? valueLabel(p.standard) : 'not given' },
    { label: 'Welding process', value: spec.welding?.process ? valueLabel(spec.welding.process) : 'not given' },
  ];
}
