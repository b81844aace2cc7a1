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
  CHASSIS_TYPES, COCKPIT_TYPES, DRIVER_SIDES, FUELS, MATERIALS, MEMBER_KINDS, MEMBER_SIDES, PADDING_STANDARDS, PLATE_FIXINGS,
  PLATE_LOCATIONS, PROCESSES, WELDING_PROCESSES,
} from './vocabulary.js';
import type { MemberKind, WallMethod } from './vocabulary.js';
import { findGrade } from './grades.js';
import { isIsoDate } from './dates.js';
import { memberShapes, memberSide } from './geometry/derive.js';
import { SIDED_MEMBER_KINDS } from './vocabulary.js';
import type { MemberSide } from './vocabulary.js';

/** The fact that holds the thinnest wall reading of each measuring method. */
export const WALL_METHOD_FACTS: Readonly<Record<WallMethod, string>> = {
  ultrasonic: 'member.minUltrasonicWallMm',
  inspection_hole: 'member.minInspectionHoleWallMm',
  callipers: 'member.minCalliperWallMm',
};

export type FactScope = 'vehicle' | 'member' | 'plate';
/**
 * number: compared with a dimension; enum/text: strings; list: contains; counts: object keyed by
 * member kind (use `path`); date: a calendar date "YYYY-MM-DD", compared before / after.
 */
export type FactType = 'number' | 'boolean' | 'enum' | 'text' | 'list' | 'counts' | 'date';

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
  params?: 'kinds' | 'tableMinimumOdMm' | 'kindsOnSide';
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
  { name: 'vehicle.memberCountOnSide', scope: 'vehicle', type: 'number', dimension: 'count', label: 'number of members on a side', description: 'How many members of the kinds in `params.kinds` are on `params.side` (left, right, driver or passenger); unknown while any of them has no side, or for driver/passenger without the driver\'s side.', derived: true, params: 'kindsOnSide' },
  en('vehicle.driverSide', 'vehicle', DRIVER_SIDES, "driver's side", 'Which side of the car the driver sits on.'),
  bool('vehicle.anyChromoly', 'vehicle', 'any member in 4130 chromoly', 'True when any member is 4130 chromoly; unknown when none is and some material is not stated.', true),
  num('vehicle.estimatedTubeMassKg', 'vehicle', 'mass', 'estimated tube mass of the cage', 'Sum of member masses; unknown unless every member has a length.', true),
  // Geometry
  num('geometry.rearBraceAttachBelowTopMm', 'vehicle', 'length', 'rear brace attachment below main hoop top', 'How far below the top of the main hoop the rear braces attach.'),
  num('geometry.rearBraceAngleFromVerticalDeg', 'vehicle', 'angle', 'rear brace angle from vertical', 'Angle of the rear braces from the vertical (the smaller, if they differ).'),
  num('geometry.rearBraceIncludedAngleDeg', 'vehicle', 'angle', 'included angle between rear brace and main hoop', 'Included angle between each rear brace and the main hoop where they meet (the smaller, if they differ).'),
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
  { name: 'cage.approvedOn', scope: 'vehicle', type: 'date', label: 'cage approval date', description: 'When the cage was approved by the sanctioning body (YYYY-MM-DD).', derived: false },
  { name: 'cage.builtOn', scope: 'vehicle', type: 'date', label: 'cage build date', description: 'When the cage was built (YYYY-MM-DD).', derived: false },
  bool('cage.hasMakerCertificate', 'vehicle', "maker's certificate on the sheet", "True when the sheet gives a maker's certificate or homologation number; false when it gives none.", true),
  // Member
  en('member.kind', 'member', MEMBER_KINDS, 'member kind', 'Kind of the member.'),
  en('member.side', 'member', MEMBER_SIDES, 'side of the car', 'left, right or centre; hoops and bars that span the car have none.'),
  num('member.odMm', 'member', 'length', 'outside diameter', 'Nominal outside diameter.'),
  num('member.wallMm', 'member', 'length', 'wall thickness', 'Nominal wall thickness.'),
  num('member.minMeasuredWallMm', 'member', 'length', 'thinnest measured wall', 'The thinnest wall reading (ultrasonic or at an inspection hole); unknown without readings.', true),
  num('member.minUltrasonicWallMm', 'member', 'length', 'thinnest ultrasonic wall reading', 'The thinnest wall reading taken with an ultrasonic (sonic) gauge; unknown without one.', true),
  num('member.minInspectionHoleWallMm', 'member', 'length', 'thinnest wall reading at an inspection hole', 'The thinnest wall reading taken at an inspection hole; unknown without one.', true),
  num('member.minCalliperWallMm', 'member', 'length', 'thinnest wall reading by callipers', 'The thinnest wall reading taken with callipers at a tube end; unknown without one.', true),
  num('member.wallReadingCount', 'member', 'count', 'number of wall readings', 'How many wall readings were taken.', true),
  en('member.material', 'member', MATERIALS, 'material', 'mild_steel, chromoly_4130 or other.'),
  { name: 'member.grade', scope: 'member', type: 'text', label: 'material grade', description: 'Grade as written (e.g. "1020", "AS 1163 C350").', derived: false },
  num('member.gradeMinYieldMpa', 'member', 'stress', 'minimum yield of the material grade', 'The minimum yield strength of `member.grade` in the grade vocabulary (docs: ordered grades); unknown for a grade not in it.', true),
  num('member.gradeMinTensileMpa', 'member', 'stress', 'minimum tensile strength of the material grade', 'The minimum tensile strength of `member.grade` in the grade vocabulary; unknown for a grade not in it.', true),
  en('member.process', 'member', PROCESSES, 'tube process', 'dom, erw, seamless, cds or other.'),
  num('member.yieldMpa', 'member', 'stress', 'yield strength', 'Minimum yield strength from the mill certificate or standard.'),
  num('member.lengthMm', 'member', 'length', 'member length', 'Length of tube in the member.'),
  num('member.massKg', 'member', 'mass', 'member mass', 'Mass of the member from its length and section.', true),
  num('member.areaMm2', 'member', 'area', 'cross-section area', 'A = π(D² − d²)/4.', true),
  num('member.secondMomentMm4', 'member', 'second_moment', 'second moment of area', 'I = π(D⁴ − d⁴)/64.', true),
  num('member.sectionModulusMm3', 'member', 'section_modulus', 'section modulus', 'Z = I/(D/2).', true),
  num('member.bendingStrengthNmm', 'member', 'moment', 'bending strength (yield × Z)', 'Yield × section modulus: the moment at which the tube starts to yield in bending. The yield is `member.yieldMpa`, else the minimum of `member.grade`; unknown without either.', true),
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
  en('plate.fixing', 'plate', PLATE_FIXINGS, 'plate fixing', 'welded or bolted: as older sheets give it, else the plate\'s fixing to the body.'),
  en('plate.plateFixing', 'plate', PLATE_FIXINGS, 'plate fixing to the body', 'How the plate is fixed to the body or chassis: welded or bolted through.'),
  en('plate.footFixing', 'plate', PLATE_FIXINGS, 'foot fixing to the plate', 'How the hoop or brace foot is fixed to the plate: welded or bolted.'),
  bool('plate.backingPlate', 'plate', 'backing plate fitted', 'A backing plate sits on the other side of the panel.'),
  num('plate.backingThicknessMm', 'plate', 'length', 'backing plate thickness', 'Thickness of the backing plate.'),
  num('plate.boltCount', 'plate', 'count', 'number of bolts', 'Bolts fixing the foot to the plate, or the plate through the body.'),
  num('plate.boltDiameterMm', 'plate', 'length', 'bolt diameter', 'Nominal bolt diameter.'),
  { name: 'plate.boltGrade', scope: 'plate', type: 'text', label: 'bolt grade', description: 'Bolt grade as written (e.g. "8.8", "Grade 8").', derived: false },
  num('plate.boltGradeMinYieldMpa', 'plate', 'stress', 'minimum yield of the bolt grade', 'The minimum yield strength of `plate.boltGrade` in the bolt grade vocabulary; unknown for a grade not in it.', true),
  num('plate.boltGradeMinTensileMpa', 'plate', 'stress', 'minimum tensile strength of the bolt grade', 'The minimum tensile strength of `plate.boltGrade` in the bolt grade vocabulary; unknown for a grade not in it.', true),
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
  /** The class's listed weight (canonical kg): when set, it is the class's weight instead of the measured one. */
  listedWeightKg?: number;
}

/** Internal fact (not in the catalogue): members per kind and side, keyed "kind:side" (side or "unstated"). */
export const SIDE_COUNTS_FACT = 'vehicle.memberSideCounts';

export type SideParam = 'left' | 'right' | 'driver' | 'passenger';
export const SIDE_PARAMS: readonly SideParam[] = ['left', 'right', 'driver', 'passenger'];

/**
 * How many members of `kinds` are on `side`, or the facts that must be given first: a member of
 * those kinds without a side, or the driver's side for "driver" / "passenger".
 */
export function countOnSide(facts: FactSet, kinds: readonly string[], side: SideParam): { count: number } | { absent: string[] } {
  const counts = facts[SIDE_COUNTS_FACT] as Readonly<Record<string, number>> | undefined;
  const absent: string[] = [];
  let actual: 'left' | 'right' | undefined;
  if (side === 'left' || side === 'right') actual = side;
  else {
    const driver = facts['vehicle.driverSide'];
    if (driver === 'left' || driver === 'right') actual = side === 'driver' ? driver : driver === 'left' ? 'right' : 'left';
    else absent.push('vehicle.driverSide');
  }
  if (kinds.some((k) => (counts?.[`${k}:unstated`] ?? 0) > 0)) absent.push('member.side');
  if (absent.length > 0 || actual === undefined) return { absent };
  return { count: kinds.reduce((s, k) => s + (counts?.[`${k}:${actual}`] ?? 0), 0) };
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
  /** The builder's name for the member (memberName): what a person reads, never the id. */
  name?: string;
}

/**
 * `modelLengthMm`: the developed length from the cage model, which is the member's when it has a path.
 * `name`: the builder's name for the member, carried for every output that names it.
 */
export function memberTubeData(m: SpecMember, index: number, modelLengthMm?: number, name?: string): MemberTubeData {
  const material: Material = m.material ?? 'mild_steel';
  const p = tubeSectionProperties({ odMm: m.odMm, wallMm: m.wallMm }, material);
  const lengthMm = modelLengthMm ?? m.lengthMm;
  const massKg = lengthMm === undefined ? null : tubeMassKg(p, lengthMm);
  return {
    memberId: m.id, kind: m.kind, index, odMm: m.odMm, wallMm: m.wallMm, areaMm2: p.areaMm2,
    secondMomentMm4: p.secondMomentMm4, sectionModulusMm3: p.sectionModulusMm3, radiusOfGyrationMm: p.radiusOfGyrationMm,
    torsionalConstantMm4: p.torsionalConstantMm4, massPerMetreKg: p.massPerMetreKg, lengthMm: lengthMm ?? null, massKg,
    densityAssumed: m.material === undefined || m.material === 'other',
    ...(name !== undefined ? { name } : {}),
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
  const sideCounts: Record<string, number> = {};
  const sides = memberSides(spec);
  for (const [i, m] of spec.members.entries()) {
    const key = `${m.kind}:${sides[i] ?? 'unstated'}`;
    sideCounts[key] = (sideCounts[key] ?? 0) + 1;
  }
  const measuredWeight = cls.weightBasis === 'with_driver' ? v.weightWithDriverKg : v.weightWithoutDriverKg;
  return {
    'vehicle.weightKg': cls.listedWeightKg ?? measuredWeight,
    'vehicle.weightWithDriverKg': v.weightWithDriverKg,
    'vehicle.weightWithoutDriverKg': v.weightWithoutDriverKg,
    'vehicle.chassis': v.chassis,
    'vehicle.cockpit': v.cockpit,
    'vehicle.fuel': v.fuel,
    'vehicle.memberCounts': counts,
    'vehicle.memberKindsPresent': MEMBER_KINDS.filter((k) => counts[k] > 0),
    [SIDE_COUNTS_FACT]: sideCounts,
    'vehicle.driverSide': v.driverSide,
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
    'cage.approvedOn': spec.cage?.approvedOn,
    'cage.builtOn': spec.cage?.builtOn,
    'cage.hasMakerCertificate': spec.cage?.certificate?.number !== undefined,
  };
}

/**
 * Each member's side: as typed on the sheet, else derived from its path in the cage model (y > 0 is
 * the car's left). Kinds that span the car never get one.
 */
export function memberSides(spec: Specification): (MemberSide | undefined)[] {
  const sides: (MemberSide | undefined)[] = spec.members.map((m) => (SIDED_MEMBER_KINDS.includes(m.kind) ? m.side : undefined));
  if (spec.model && spec.members.some((m, i) => m.path && sides[i] === undefined && SIDED_MEMBER_KINDS.includes(m.kind))) {
    for (const shape of memberShapes(spec)) {
      if (sides[shape.index] === undefined && SIDED_MEMBER_KINDS.includes(shape.kind)) sides[shape.index] = memberSide(shape.geometry.points);
    }
  }
  return sides;
}

/** Yield × section modulus (MPa × mm³ = N·mm); unknown without a yield. */
export function bendingStrengthNmm(yieldMpa: number | undefined, sectionModulusMm3: number): number | undefined {
  return yieldMpa === undefined ? undefined : yieldMpa * sectionModulusMm3;
}

/** Member-scope facts of one member (vehicle facts are merged in by the evaluator). */
export function memberFacts(spec: Specification, m: SpecMember, tube: MemberTubeData, side: MemberSide | undefined = m.side): FactSet {
  const readings = (m.wallReadings ?? []).map((r) => r.wallMm);
  const byMethod = (method: WallMethod) => minOf((m.wallReadings ?? []).filter((r) => r.method === method).map((r) => r.wallMm));
  const grade = findGrade('material', m.grade);
  const bends = m.bends;
  const clrs = (bends ?? []).map((b) => b.clrMm);
  const ovals = (bends ?? []).flatMap((b) => (b.minOdMm !== undefined && b.maxOdMm !== undefined ? [ovalityRatio(b.minOdMm, b.maxOdMm)] : []));
  const joints = m.joints;
  const holes = spec.inspectionHoles?.filter((h) => h.memberId === m.id);
  const holeDistances = (holes ?? []).flatMap((h) => (h.distanceFromWeldOrBendMm === undefined ? [] : [h.distanceFromWeldOrBendMm]));
  const minClr = minOf(clrs);
  return {
    'member.kind': m.kind,
    'member.side': side,
    'member.odMm': m.odMm,
    'member.wallMm': m.wallMm,
    'member.minMeasuredWallMm': minOf(readings),
    'member.minUltrasonicWallMm': byMethod('ultrasonic'),
    'member.minInspectionHoleWallMm': byMethod('inspection_hole'),
    'member.minCalliperWallMm': byMethod('callipers'),
    'member.wallReadingCount': readings.length,
    'member.material': m.material,
    'member.grade': m.grade,
    'member.gradeMinYieldMpa': grade?.minYieldMpa,
    'member.gradeMinTensileMpa': grade?.minTensileMpa,
    'member.process': m.process,
    'member.yieldMpa': m.yieldMpa,
    'member.lengthMm': m.lengthMm,
    'member.massKg': tube.massKg ?? undefined,
    'member.areaMm2': tube.areaMm2,
    'member.secondMomentMm4': tube.secondMomentMm4,
    'member.sectionModulusMm3': tube.sectionModulusMm3,
    'member.bendingStrengthNmm': bendingStrengthNmm(m.yieldMpa ?? grade?.minYieldMpa, tube.sectionModulusMm3),
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
  const boltGrade = findGrade('bolt', p.boltGrade);
  return {
    'plate.location': p.location,
    'plate.thicknessMm': p.thicknessMm,
    'plate.areaMm2': shape ? plateArea(shape) : p.areaMm2,
    'plate.leastSideMm': shape ? plateLeastSide(shape) : undefined,
    'plate.longestSideMm': shape ? plateLongestSide(shape) : undefined,
    // Older sheets gave one fixing; newer ones give two facts, and rulebooks that read the one
    // fixing (welded or bolted plates) mean the plate's fixing to the body.
    'plate.fixing': p.fixing ?? p.plateFixing,
    'plate.plateFixing': p.plateFixing ?? p.fixing,
    'plate.footFixing': p.footFixing,
    'plate.backingPlate': p.backingPlate,
    'plate.backingThicknessMm': p.backingThicknessMm,
    'plate.boltCount': p.boltCount,
    'plate.boltDiameterMm': p.boltDiameterMm,
    'plate.boltGrade': p.boltGrade,
    'plate.boltGradeMinYieldMpa': boltGrade?.minYieldMpa,
    'plate.boltGradeMinTensileMpa': boltGrade?.minTensileMpa,
    'plate.attachedWallMm': attached?.wallMm,
    'plate.attachedOdMm': attached?.odMm,
  };
}

/**
 * The facts a comparison still needs before it can be decided: empty when `name` has a value in
 * this run. Dynamic facts depend on their params (a per-side count needs every member's side).
 */
export function absentFacts(facts: FactSet, name: string, params?: unknown): string[] {
  if (name === 'vehicle.memberCountOfKinds') return [];
  if (name === 'member.odMarginOverTableMinimumMm') return facts['member.odMm'] !== undefined ? [] : [name];
  // What to measure is the yield, not the product.
  if (name === 'member.bendingStrengthNmm') return facts[name] !== undefined ? [] : ['member.yieldMpa'];
  if (name === 'vehicle.memberCountOnSide') {
    const p = (params ?? {}) as { kinds?: unknown; side?: unknown };
    const kinds = Array.isArray(p.kinds) ? (p.kinds as string[]) : [];
    const r = countOnSide(facts, kinds, (p.side as SideParam) ?? 'left');
    return 'absent' in r ? r.absent : [];
  }
  const v = facts[name];
  if (v === undefined) return [name];
  if (FACTS_BY_NAME.get(name)?.type === 'date' && !isIsoDate(v)) return [name];
  return [];
}

/** Whether a fact has a value in a run (dynamic facts depend on facts that are always present). */
export function factPresent(facts: FactSet, name: string, params?: unknown): boolean {
  return absentFacts(facts, name, params).length === 0;
}
