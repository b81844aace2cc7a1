// The fact catalogue: every name a ruleset may test, with its dimension, scope and meaning, and
// the pure functions that compute the facts of one check from a specification. Derived facts
// (section properties, bend ratios, plate areas…) are computed here once, in plain code, so the
// rules engine only compares numbers.
import type { Specification, SpecMember, SpecPlate } from '../contracts/specification.js';
import type { Dimension } from './units.js';
import {
  bendRadiusRatio, ovalityRatio, plateArea, plateLeastSide, plateLongestSide, tubeSectionProperties, tubeMassKg,
} from './tube.js';
import type { Material } from './tube.js';
import {
  CHASSIS_TYPES, COCKPIT_TYPES, FUELS, MATERIALS, MEMBER_KINDS, PADDING_STANDARDS, PLATE_FIXINGS,
  PLATE_LOCATIONS, PROCESSES, WELDING_PROCESSES,
} from './vocabulary.js';
import type { MemberKind } from './vocabulary.js';

export type FactScope = 'vehicle' | 'member' | 'plate';
/** number: compared with a dimension; enum/text: strings; list: contains; counts: object keyed by member kind (use `path`). */
export type FactType = 'number' | 'boolean' | 'enum' | 'text' | 'list' | 'counts';

export interface FactDefinition {
  name: string;
  scope: FactScope;
  type: FactType;
  dimension?: Dimension;
  values?: readonly string[];
  label: string;
  description: string;
  derived: boolean;
  /** Facts computed by the engine from params (see `params` in the docs). */
  params?: 'kinds' | 'tableMinimumOdMm';
}

type Def = Omit<FactDefinition, 'derived'> & { derived?: boolean };
const num = (name: string, scope: FactScope, dimension: Dimension, label: string, description: string, derived = false): Def => ({
  name, scope, type: 'number', dimension, label, description, derived,
});
const en = (name: string, scope: FactScope, values: readonly string[], label: string, description: string, derived = false): Def => ({
  name, scope, type: 'enum', values, label, description, derived,
});
const bool = (name: string, scope: FactScope, label: string, description: string, derived = false): Def => ({
  name, scope, type: 'boolean', label, description, derived,
});

const DEFS: Def[] = [
  // Vehicle
  num('vehicle.weightKg', 'vehicle', 'mass', 'vehicle weight (class basis)', "The vehicle weight on the class's basis: with or without driver, as the class states.", true),
  num('vehicle.weightWithDriverKg', 'vehicle', 'mass', 'vehicle weight with driver', 'Weight as raced including the driver.'),
  num('vehicle.weightWithoutDriverKg', 'vehicle', 'mass', 'vehicle weight without driver', 'Weight as raced without the driver.'),
  en('vehicle.chassis', 'vehicle', CHASSIS_TYPES, 'chassis type', 'unibody (bodyshell) or tube_frame.'),
  en('vehicle.cockpit', 'vehicle', COCKPIT_TYPES, 'cockpit', 'open or closed cockpit.'),
  en('vehicle.fuel', 'vehicle', FUELS, 'fuel', 'Fuel the vehicle runs on.'),
  { name: 'vehicle.memberCounts', scope: 'vehicle', type: 'counts', dimension: 'count', label: 'number of members of a kind', description: 'How many members of each kind the cage has; give the kind as `path` (e.g. "rear_brace").', derived: true },
  { name: 'vehicle.memberCountOfKinds', scope: 'vehicle', type: 'number', dimension: 'count', label: 'number of members of these kinds', description: 'How many members of any of the kinds in `params.kinds` the cage has.', derived: true, params: 'kinds' },
  { name: 'vehicle.memberKindsPresent', scope: 'vehicle', type: 'list', values: MEMBER_KINDS, label: 'member kinds present', description: 'The member kinds the cage has; test with contains / doesNotContain.', derived: true },
  bool('vehicle.anyChromoly', 'vehicle', 'any member in 4130 chromoly', 'True when any member is 4130 chromoly; unknown when none is and some material is not stated.', true),
  num('vehicle.estimatedTubeMassKg', 'vehicle', 'mass', 'estimated tube mass of the cage', 'Sum of member masses; unknown unless every member has a length.', true),
  // Geometry
  num('geometry.rearBraceAttachBelowTopMm', 'vehicle', 'length', 'rear brace attachment below main hoop top', 'How far below the top of the main hoop the rear braces attach.'),
  num('geometry.rearBraceAngleFromVerticalDeg', 'vehicle', 'angle', 'rear brace angle from vertical', 'Angle of the rear braces from the vertical (the smaller, if they differ).'),
  num('geometry.rearBraceIncludedAngleDeg', 'vehicle', 'angle', 'included angle between rear brace and main hoop', 'Included angle between a rear brace and the main hoop where they meet (the smaller, if they differ).'),
  num('geometry.hoopAboveHelmetMm', 'vehicle', 'length', 'main hoop top above helmet top', 'Height of the main hoop top above the helmet top in the driving position (negative: helmet higher).'),
  num('geometry.helmetBelowHoopLineMm', 'vehicle', 'length', 'helmet below the line joining the hoop tops', 'Distance of the helmet top below the line from the main hoop top to the front hoop top (negative: above it).'),
  num('geometry.hoopBehindHelmetMm', 'vehicle', 'length', 'main hoop behind the helmet', 'Horizontal distance from the back of the helmet to the main hoop.'),
  num('geometry.mainHoopInsideWidthMm', 'vehicle', 'length', 'main hoop inside width at the feet', 'Inside width between the main hoop uprights where they attach.'),
  num('geometry.harnessBarBelowShouldersMm', 'vehicle', 'length', 'harness bar below the shoulders', "How far the harness bar is below the driver's shoulders (negative: above them)."),
  num('geometry.diagonalLowerEndFromNodeMm', 'vehicle', 'length', 'diagonal lower end from its node', 'Distance of the diagonal’s lower end from the mounting foot / node.'),
  num('geometry.diagonalUpperEndFromNodeMm', 'vehicle', 'length', 'diagonal upper end from its node', 'Distance of the diagonal’s upper end from the node it should meet.'),
  num('geometry.nearestTubeToHelmetMm', 'vehicle', 'length', 'nearest tube to the helmet', 'Distance from the helmet to the nearest tube.'),
  bool('padding.nearHelmet', 'vehicle', 'padding on tubes near the helmet', 'Energy-absorbing padding is fitted on the tubes the helmet could touch.'),
  en('padding.standard', 'vehicle', PADDING_STANDARDS, 'padding standard', 'Standard the padding is made to.'),
  en('welding.process', 'vehicle', WELDING_PROCESSES, 'welding process', 'Process used for the cage welds.'),
  // Member
  en('member.kind', 'member', MEMBER_KINDS, 'member kind', 'Kind of the member.'),
  num('member.odMm', 'member', 'length', 'outside diameter', 'Nominal outside diameter.'),
  num('member.wallMm', 'member', 'length', 'wall thickness', 'Nominal wall thickness.'),
  num('member.minMeasuredWallMm', 'member', 'length', 'thinnest measured wall', 'The thinnest wall reading (ultrasonic or at an inspection hole); unknown without readings.', true),
  num('member.wallReadingCount', 'member', 'count', 'number of wall readings', 'How many wall readings were taken.', true),
  en('member.material', 'member', MATERIALS, 'material', 'mild_steel, chromoly_4130 or other.'),
  { name: 'member.grade', scope: 'member', type: 'text', label: 'material grade', description: 'Grade as written (e.g. "1020", "AS 1163 C350").', derived: false },
  en('member.process', 'member', PROCESSES, 'tube process', 'dom, erw, seamless, cds or other.'),
  num('member.yieldMpa', 'member', 'stress', 'yield strength', 'Minimum yield strength from the mill certificate or standard.'),
  num('member.lengthMm', 'member', 'length', 'member length', 'Length of tube in the member.'),
  num('member.massKg', 'member', 'mass', 'member mass', 'Mass of the member from its length and section.', true),
  num('member.areaMm2', 'member', 'area', 'cross-section area', 'A = π(D² − d²)/4.', true),
  num('member.secondMomentMm4', 'member', 'second_moment', 'second moment of area', 'I = π(D⁴ − d⁴)/64.', true),
  num('member.sectionModulusMm3', 'member', 'section_modulus', 'section modulus', 'Z = I/(D/2).', true),
  num('member.radiusOfGyrationMm', 'member', 'length', 'radius of gyration', 'r = √(I/A).', true),
  num('member.torsionalConstantMm4', 'member', 'second_moment', 'torsional constant', 'J = π(D⁴ − d⁴)/32.', true),
  num('member.massPerMetreKg', 'member', 'mass_per_length', 'mass per length', 'Mass per metre from area and density.', true),
  { name: 'member.odMarginOverTableMinimumMm', scope: 'member', type: 'number', dimension: 'length', label: 'OD above the table minimum', description: 'Outside diameter minus `params.tableMinimumOdMm` (canonical mm). Tube tables use it for thin-wall allowances.', derived: true, params: 'tableMinimumOdMm' },
  num('member.bendCount', 'member', 'count', 'number of bends', 'How many bends the member has; unknown when bends were not listed.', true),
  num('member.minBendClrMm', 'member', 'length', 'tightest centreline bend radius', 'Smallest centreline radius of the member’s bends.', true),
  num('member.minBendRadiusOverOd', 'member', 'ratio', 'tightest bend radius ÷ OD', 'Smallest centreline radius divided by the OD.', true),
  num('member.minOvality', 'member', 'ratio', 'worst ovality (min ÷ max OD)', 'Smallest ratio of minor to major diameter measured at a bend.', true),
  bool('member.continuousPiece', 'member', 'one continuous piece', 'The member is one piece of tube without joints.'),
  num('member.jointCount', 'member', 'count', 'number of joints', 'Joints listed on the member.', true),
  bool('member.hasRemovableJoint', 'member', 'has a removable joint', 'Any joint is removable (demountable).', true),
  bool('member.hasBoltedJoint', 'member', 'has a bolted joint', 'Any joint is bolted.', true),
  num('member.inspectionHoleCount', 'member', 'count', 'number of inspection holes', 'Inspection holes listed on the member; unknown when none are listed for the cage.', true),
  num('member.maxInspectionHoleDiameterMm', 'member', 'length', 'largest inspection hole', 'Diameter of the largest inspection hole in the member.', true),
  num('member.minInspectionHoleDistanceMm', 'member', 'length', 'inspection hole distance from weld or bend', 'Smallest distance of an inspection hole from a weld or bend.', true),
  // Plate
  en('plate.location', 'plate', PLATE_LOCATIONS, 'plate location', 'Where the plate is.'),
  num('plate.thicknessMm', 'plate', 'length', 'plate thickness', 'Thickness of the mounting plate.'),
  num('plate.areaMm2', 'plate', 'area', 'plate area', 'Plate area (measured, or side × side).', true),
  num('plate.leastSideMm', 'plate', 'length', 'shortest plate side', 'Shorter side of the plate.', true),
  num('plate.longestSideMm', 'plate', 'length', 'longest plate side', 'Longer side of the plate.', true),
  en('plate.fixing', 'plate', PLATE_FIXINGS, 'plate fixing', 'welded or bolted.'),
  bool('plate.backingPlate', 'plate', 'backing plate fitted', 'A backing plate sits on the other side of the panel.'),
  num('plate.backingThicknessMm', 'plate', 'length', 'backing plate thickness', 'Thickness of the backing plate.'),
  num('plate.boltCount', 'plate', 'count', 'number of bolts', 'Bolts through the plate.'),
  num('plate.boltDiameterMm', 'plate', 'length', 'bolt diameter', 'Nominal bolt diameter.'),
  { name: 'plate.boltGrade', scope: 'plate', type: 'text', label: 'bolt grade', description: 'Bolt grade as written (e.g. "8.8", "Grade 8").', derived: false },
  num('plate.attachedWallMm', 'plate', 'length', 'wall of the attached member', 'Wall thickness of the member the plate carries (needs memberId).', true),
  num('plate.attachedOdMm', 'plate', 'length', 'OD of the attached member', 'Outside diameter of the member the plate carries (needs memberId).', true),
];

export const FACT_CATALOGUE: readonly FactDefinition[] = DEFS.map((d) => ({ ...d, derived: d.derived ?? false }));
export const FACTS_BY_NAME: ReadonlyMap<string, FactDefinition> = new Map(FACT_CATALOGUE.map((f) => [f.name, f]));

/** Facts a requirement of this scope may use: vehicle facts everywhere, member/plate facts in their own scope. */
export function factAvailableIn(fact: FactDefinition, scope: FactScope): boolean {
  return fact.scope === 'vehicle' || fact.scope === scope;
}

export type FactValue = number | string | boolean | readonly string[] | Readonly<Record<string, number>>;
export type FactSet = Record<string, FactValue | undefined>;

export interface ClassBasis {
  weightBasis: 'with_driver' | 'without_driver';
}

const minOf = (xs: number[]): number | undefined => (xs.length === 0 ? undefined : Math.min(...xs));
const maxOf = (xs: number[]): number | undefined => (xs.length === 0 ? undefined : Math.max(...xs));

export interface MemberTubeData {
  memberId: string;
  kind: MemberKind;
  index: number;
  odMm: number;
  wallMm: number;
  areaMm2: number;
  secondMomentMm4: number;
  sectionModulusMm3: number;
  radiusOfGyrationMm: number;
  torsionalConstantMm4: number;
  massPerMetreKg: number;
  lengthMm: number | null;
  massKg: number | null;
  /** True when the density is assumed (material "other" or not stated). */
  densityAssumed: boolean;
}

/** `modelLengthMm`: the developed length from the cage model, which is the member's when it has a path. */
export function memberTubeData(m: SpecMember, index: number, modelLengthMm?: number): MemberTubeData {
  const material: Material = m.material ?? 'mild_steel';
  const p = tubeSectionProperties({ odMm: m.odMm, wallMm: m.wallMm }, material);
  const lengthMm = modelLengthMm ?? m.lengthMm;
  const massKg = lengthMm === undefined ? null : tubeMassKg(p, lengthMm);
  return {
    memberId: m.id, kind: m.kind, index, odMm: m.odMm, wallMm: m.wallMm, areaMm2: p.areaMm2,
    secondMomentMm4: p.secondMomentMm4, sectionModulusMm3: p.sectionModulusMm3, radiusOfGyrationMm: p.radiusOfGyrationMm,
    torsionalConstantMm4: p.torsionalConstantMm4, massPerMetreKg: p.massPerMetreKg, lengthMm: lengthMm ?? null, massKg,
    densityAssumed: m.material === undefined || m.material === 'other',
  };
}

/** Vehicle-scope facts, shared by every run of a check. */
export function vehicleFacts(spec: Specification, cls: ClassBasis, tubes: readonly MemberTubeData[]): FactSet {
  const v = spec.vehicle;
  const g = spec.geometry ?? {};
  const counts: Record<string, number> = {};
  for (const k of MEMBER_KINDS) counts[k] = 0;
  for (const m of spec.members) counts[m.kind] += 1;
  const materials = spec.members.map((m) => m.material);
  const anyChromoly = materials.includes('chromoly_4130') ? true : materials.includes(undefined) ? undefined : false;
  const masses = tubes.map((t) => t.massKg);
  const estimated = masses.length > 0 && masses.every((x) => x !== null) ? masses.reduce<number>((s, x) => s + (x ?? 0), 0) : undefined;
  return {
    'vehicle.weightKg': cls.weightBasis === 'with_driver' ? v.weightWithDriverKg : v.weightWithoutDriverKg,
    'vehicle.weightWithDriverKg': v.weightWithDriverKg,
    'vehicle.weightWithoutDriverKg': v.weightWithoutDriverKg,
    'vehicle.chassis': v.chassis,
    'vehicle.cockpit': v.cockpit,
    'vehicle.fuel': v.fuel,
    'vehicle.memberCounts': counts,
    'vehicle.memberKindsPresent': MEMBER_KINDS.filter((k) => counts[k] > 0),
    'vehicle.anyChromoly': anyChromoly,
    'vehicle.estimatedTubeMassKg': estimated,
    'geometry.rearBraceAttachBelowTopMm': g.rearBraceAttachBelowTopMm,
    'geometry.rearBraceAngleFromVerticalDeg': g.rearBraceAngleFromVerticalDeg,
    'geometry.rearBraceIncludedAngleDeg': g.rearBraceIncludedAngleDeg,
    'geometry.hoopAboveHelmetMm': g.hoopAboveHelmetMm,
    'geometry.helmetBelowHoopLineMm': g.helmetBelowHoopLineMm,
    'geometry.hoopBehindHelmetMm': g.hoopBehindHelmetMm,
    'geometry.mainHoopInsideWidthMm': g.mainHoopInsideWidthMm,
    'geometry.harnessBarBelowShouldersMm': g.harnessBarBelowShouldersMm,
    'geometry.diagonalLowerEndFromNodeMm': g.diagonalLowerEndFromNodeMm,
    'geometry.diagonalUpperEndFromNodeMm': g.diagonalUpperEndFromNodeMm,
    'geometry.nearestTubeToHelmetMm': g.nearestTubeToHelmetMm,
    'padding.nearHelmet': spec.padding?.nearHelmet,
    'padding.standard': spec.padding?.standard,
    'welding.process': spec.welding?.process,
  };
}

/** Member-scope facts of one member (vehicle facts are merged in by the evaluator). */
export function memberFacts(spec: Specification, m: SpecMember, tube: MemberTubeData): FactSet {
  const readings = (m.wallReadings ?? []).map((r) => r.wallMm);
  const bends = m.bends;
  const clrs = (bends ?? []).map((b) => b.clrMm);
  const ovals = (bends ?? []).flatMap((b) => (b.minOdMm !== undefined && b.maxOdMm !== undefined ? [ovalityRatio(b.minOdMm, b.maxOdMm)] : []));
  const joints = m.joints;
  const holes = spec.inspectionHoles?.filter((h) => h.memberId === m.id);
  const holeDistances = (holes ?? []).flatMap((h) => (h.distanceFromWeldOrBendMm === undefined ? [] : [h.distanceFromWeldOrBendMm]));
  const minClr = minOf(clrs);
  return {
    'member.kind': m.kind,
    'member.odMm': m.odMm,
    'member.wallMm': m.wallMm,
    'member.minMeasuredWallMm': minOf(readings),
    'member.wallReadingCount': readings.length,
    'member.material': m.material,
    'member.grade': m.grade,
    'member.process': m.process,
    'member.yieldMpa': m.yieldMpa,
    'member.lengthMm': m.lengthMm,
    'member.massKg': tube.massKg ?? undefined,
    'member.areaMm2': tube.areaMm2,
    'member.secondMomentMm4': tube.secondMomentMm4,
    'member.sectionModulusMm3': tube.sectionModulusMm3,
    'member.radiusOfGyrationMm': tube.radiusOfGyrationMm,
    'member.torsionalConstantMm4': tube.torsionalConstantMm4,
    'member.massPerMetreKg': tube.massPerMetreKg,
    'member.bendCount': bends?.length,
    'member.minBendClrMm': minClr,
    'member.minBendRadiusOverOd': minClr === undefined ? undefined : bendRadiusRatio(minClr, m.odMm),
    // Ovality is unknown (not "fine") when a bent tube has no diameters measured.
    'member.minOvality': bends !== undefined && bends.length === 0 ? 1 : minOf(ovals),
    'member.continuousPiece': m.continuousPiece,
    'member.jointCount': joints?.length,
    'member.hasRemovableJoint': joints === undefined ? undefined : joints.some((j) => j.kind === 'removable'),
    'member.hasBoltedJoint': joints === undefined ? undefined : joints.some((j) => j.kind === 'bolted'),
    'member.inspectionHoleCount': holes?.length,
    'member.maxInspectionHoleDiameterMm': maxOf((holes ?? []).map((h) => h.diameterMm)),
    'member.minInspectionHoleDistanceMm': minOf(holeDistances),
  };
}

export function plateFacts(spec: Specification, p: SpecPlate): FactSet {
  const attached = p.memberId === undefined ? undefined : spec.members.find((m) => m.id === p.memberId);
  const shape = p.sidesMm ? { sidesMm: p.sidesMm, areaMm2: p.areaMm2 } : undefined;
  return {
    'plate.location': p.location,
    'plate.thicknessMm': p.thicknessMm,
    'plate.areaMm2': shape ? plateArea(shape) : p.areaMm2,
    'plate.leastSideMm': shape ? plateLeastSide(shape) : undefined,
    'plate.longestSideMm': shape ? plateLongestSide(shape) : undefined,
    'plate.fixing': p.fixing,
    'plate.backingPlate': p.backingPlate,
    'plate.backingThicknessMm': p.backingThicknessMm,
    'plate.boltCount': p.boltCount,
    'plate.boltDiameterMm': p.boltDiameterMm,
    'plate.boltGrade': p.boltGrade,
    'plate.attachedWallMm': attached?.wallMm,
    'plate.attachedOdMm': attached?.odMm,
  };
}

/** Whether a fact has a value in a run (dynamic facts depend on facts that are always present). */
export function factPresent(facts: FactSet, name: string): boolean {
  if (name === 'vehicle.memberCountOfKinds') return true;
  if (name === 'member.odMarginOverTableMinimumMm') return facts['member.odMm'] !== undefined;
  return facts[name] !== undefined;
}
