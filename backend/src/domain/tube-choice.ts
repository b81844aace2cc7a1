// Lightest legal tube: a plain-code reading of a compiled ruleset's tube tables (bands by weight,
// rows by material and process, alternatives, thin-wall and wall allowances, measurement tolerance)
// and of every other requirement whose outcome depends on the tube (process, material, yield, bend
// radius over OD, section facts, plates that carry the member, "any chromoly"). It evaluates the same
// compiled condition trees the engine runs, so the two agree (tests run the real engine on every
// choice); it exists because an engine run per stock size would be far too slow for hundreds of sizes.
// Pure: canonical units in and out (mm, kg/m).
import type { Specification, SpecMember } from '../contracts/specification.js';
import { WALL_METHOD_FACTS, bendingStrengthNmm, memberFacts, memberSides, memberTubeData, plateFacts, vehicleFacts } from './facts.js';
import { deriveCageGeometry } from './geometry/derive.js';
import type { CageGeometry } from './geometry/derive.js';
import { memberReadings, modelLengths, vehicleReadings } from './model-facts.js';
import type { FactSet } from './facts.js';
import { chooseVariant, peerNamesOf } from './rules/evaluate.js';
import { peerFacts } from './rules/references.js';
import { findGrade } from './grades.js';
import { evaluatePlain } from './rules/plain.js';
import type { PlainNode } from './rules/plain.js';
import type { AlternativeMeta, CompiledRequirement, CompiledRuleset, CompiledVariant } from './rules/types.js';
import { tubeSectionProperties, tubeSizeProblems } from './tube.js';
import type { Material } from './tube.js';
import type { MemberKind, PROCESSES } from './vocabulary.js';

export type Process = (typeof PROCESSES)[number];

/** One size on a stock list. Yield is the grade's minimum (mill certificate or standard), if known. */
export interface StockTube {
  id?: string;
  label?: string;
  odMm: number;
  wallMm: number;
  material: Material;
  process: Process;
  grade?: string;
  yieldMpa?: number;
}

// ---------------------------------------------------------------------------------------------
// Listed sizes of a band

export interface ListedSize {
  requirementId: string;
  bandLabel?: string;
  /** The alternative as the rulebook prints it, e.g. "1.500 × 0.095 in". */
  label: string;
  odMm: number;
  /** The wall as printed. */
  wallMm: number;
  /** The least wall that meets it, after any wall allowance (before measurement tolerance). */
  minWallMm: number;
  source: AlternativeMeta['source'];
  /** A thin-wall allowance accepts this OD "or larger". */
  odOrLarger: boolean;
  materials?: readonly string[];
  processes?: readonly string[];
  /** A legacy size: only for cages approved before this date. */
  approvedBefore?: string;
  /** Of the printed size, steel density (F-ENG-1, F-ENG-6). */
  massPerMetreKg: number;
}

export interface BandQuery {
  classId: string;
  memberKind: MemberKind;
  /** On the class's weight basis (with or without driver), canonical kg. */
  weightKg?: number;
  material?: Material;
  process?: Process;
  /** The cage's approval date (YYYY-MM-DD): legacy rows count only for cages approved before theirs. */
  approvedOn?: string;
}

export type ListedSizes =
  | { status: 'listed'; requirementIds: string[]; sizes: ListedSize[] }
  | { status: 'no_table'; requirementIds: [] }
  | { status: 'needs_weight'; requirementIds: string[] }
  | { status: 'outside_table'; requirementIds: string[] };

const applies = (r: CompiledRequirement, classId: string) => r.classes === null || r.classes.includes(classId);

function tubeTablesFor(compiled: CompiledRuleset, classId: string, kind: MemberKind): CompiledRequirement[] {
  if (!compiled.classes[classId]) throw new RangeError(`Unknown class "${classId}". This ruleset has: ${Object.keys(compiled.classes).join(', ')}.`);
  return compiled.requirements.filter((r) => r.template === 'tube_table' && applies(r, classId) && r.scope.kind === 'member' && r.scope.memberKinds.includes(kind));
}

/** The `when` and `requires` parts of a compiled variant (compile.ts builds `{ all: [when?, requires] }`). */
function partsOf(v: CompiledVariant): { when?: PlainNode; requires: PlainNode } {
  const top = (v.rule.conditions as unknown as PlainNode).all ?? [];
  const when = top.find((n) => n.name === 'when');
  const requires = top.find((n) => n.name === 'requires');
  if (!requires) throw new Error(`Rule ${v.rule.name ?? ''} has no "requires" part`);
  return when ? { when, requires } : { requires };
}

const restrictionFits = (list: readonly string[] | undefined, value: string | undefined) => !list || value === undefined || list.includes(value);

/**
 * Every size the band for this weight lists, for this member kind and class (and material and
 * process when given), lightest first by mass per length. Where several tube tables apply, a size
 * is kept only when it also meets the others.
 */
export function listedSizesForBand(compiled: CompiledRuleset, query: BandQuery): ListedSizes {
  const tables = tubeTablesFor(compiled, query.classId, query.memberKind);
  const ids = tables.map((t) => t.id);
  if (tables.length === 0) return { status: 'no_table', requirementIds: [] };
  const chosen: { req: CompiledRequirement; variant: CompiledVariant }[] = [];
  for (const req of tables) {
    // A class with a listed weight bands on it, whatever the car weighs.
    const c = chooseVariant(req, compiled.listedWeightsKg[query.classId] ?? query.weightKg);
    if ('missingWeight' in c) return { status: 'needs_weight', requirementIds: ids };
    if ('outsideTable' in c) return { status: 'outside_table', requirementIds: ids };
    chosen.push({ req, variant: c.variant });
  }
  const sizes: ListedSize[] = [];
  for (const { req, variant } of chosen) {
    for (const alt of partsOf(variant).requires.any ?? []) {
      const meta = alt.name ? req.alternatives[alt.name] : undefined;
      // An equivalent by strength stands for a listed size; it is not a size of its own.
      if (!meta || meta.source === 'strength_equivalent') continue;
      if (!restrictionFits(meta.materials, query.material) || !restrictionFits(meta.processes, query.process)) continue;
      // A legacy row is a size only for a cage known to be approved before its date.
      if (meta.approvedBefore && !(query.approvedOn !== undefined && query.approvedOn < meta.approvedBefore)) continue;
      const size: ListedSize = {
        requirementId: req.id, ...(variant.bandLabel ? { bandLabel: variant.bandLabel } : {}), label: meta.label,
        odMm: meta.odMm, wallMm: meta.wallMm, minWallMm: meta.requiredWallMm, source: meta.source, odOrLarger: meta.source === 'allowance',
        ...(meta.materials ? { materials: meta.materials } : {}), ...(meta.processes ? { processes: meta.processes } : {}),
        ...(meta.approvedBefore ? { approvedBefore: meta.approvedBefore } : {}),
        massPerMetreKg: tubeSectionProperties({ odMm: meta.odMm, wallMm: meta.wallMm }, query.material ?? 'mild_steel').massPerMetreKg,
      };
      const others = chosen.filter((c) => c.req !== req);
      const facts: FactSet = { 'member.odMm': size.odMm, 'member.wallMm': size.wallMm, 'member.material': query.material, 'member.process': query.process, 'cage.approvedOn': query.approvedOn };
      // Unknown here only means "material or process not given": keep the size, its row says which.
      if (others.every((o) => evaluatePlain(partsOf(o.variant).requires, facts, new Set()) !== false)) sizes.push(size);
    }
  }
  sizes.sort((a, b) => a.massPerMetreKg - b.massPerMetreKg || a.odMm - b.odMm || a.wallMm - b.wallMm);
  return { status: 'listed', requirementIds: ids, sizes };
}

// ---------------------------------------------------------------------------------------------
// Sizes for a starting shape

/** Common practice sizes (not a rule): 45 × 2.5 mm for hoops and backstays, 38 × 2 mm for the rest. */
export const COMMON_STARTING_SIZES = { primary: { odMm: 45, wallMm: 2.5 }, secondary: { odMm: 38, wallMm: 2 } } as const;
const PRIMARY_KINDS: readonly MemberKind[] = ['main_hoop', 'front_hoop', 'halo_hoop', 'lateral_hoop', 'rear_brace'];

export const STARTING_SIZE_FALLBACK_WORDS: Readonly<Record<Exclude<ListedSizes['status'], 'listed'> | 'empty', string>> = {
  no_table: 'the rulebook lists no size for it',
  needs_weight: 'the car’s weight is not typed yet',
  outside_table: 'the car’s weight is outside the table',
  empty: 'the table lists no size in mild steel',
};

export interface StartingSizes {
  /** Per member kind: the lightest size the class's band lists in mild steel, else a common size. */
  sizeFor: (kind: MemberKind) => { odMm: number; wallMm: number };
  /** Kinds that got a common size because the table gave none, with why (filled as sizeFor is called). */
  fallbacks: Map<MemberKind, string>;
}

/**
 * Tube sizes for a starting shape: per member kind, the lightest size the class's tube table lists
 * for the car's weight band (listedSizesForBand, the table the tube chooser and the fabrication pages
 * read), on the class's own weight basis (with or without the driver). The seed's demo cage and the
 * browser's "Start from a shape" both use it, so the two can never pick differently.
 */
export function startingSizes(compiled: CompiledRuleset, classId: string, vehicle: { weightWithDriverKg?: number; weightWithoutDriverKg?: number }): StartingSizes {
  const cls = compiled.classes[classId];
  if (!cls) throw new RangeError(`Unknown class "${classId}". This ruleset has: ${Object.keys(compiled.classes).join(', ')}.`);
  const weightKg = cls.weightBasis === 'with_driver' ? vehicle.weightWithDriverKg : vehicle.weightWithoutDriverKg;
  const fallbacks = new Map<MemberKind, string>();
  const sizeFor = (kind: MemberKind) => {
    const listed = listedSizesForBand(compiled, { classId, memberKind: kind, weightKg, material: 'mild_steel' });
    const first = listed.status === 'listed' ? listed.sizes[0] : undefined;
    if (first) return { odMm: first.odMm, wallMm: first.wallMm };
    fallbacks.set(kind, STARTING_SIZE_FALLBACK_WORDS[listed.status === 'listed' ? 'empty' : listed.status]);
    return { ...(PRIMARY_KINDS.includes(kind) ? COMMON_STARTING_SIZES.primary : COMMON_STARTING_SIZES.secondary) };
  };
  return { sizeFor, fallbacks };
}

// ---------------------------------------------------------------------------------------------
// Candidates from a stock list

/**
 * Facts a different tube changes. Everything else on the sheet (bend radii, lengths, joints,
 * holes, geometry) stays as the builder gave it, so requirements on those alone are the same for
 * every candidate and are not part of the choice.
 */
export const TUBE_DEPENDENT_FACTS: ReadonlySet<string> = new Set([
  'member.odMm', 'member.wallMm', 'member.minMeasuredWallMm', 'member.material', 'member.grade', 'member.process', 'member.yieldMpa',
  'member.massKg', 'member.areaMm2', 'member.secondMomentMm4', 'member.sectionModulusMm3', 'member.bendingStrengthNmm', 'member.radiusOfGyrationMm',
  'member.torsionalConstantMm4', 'member.massPerMetreKg', 'member.odMarginOverTableMinimumMm', 'member.minBendRadiusOverOd',
  'vehicle.anyChromoly', 'vehicle.estimatedTubeMassKg', 'plate.attachedWallMm', 'plate.attachedOdMm',
  'member.minUltrasonicWallMm', 'member.minInspectionHoleWallMm', 'member.minCalliperWallMm',
  'member.gradeMinYieldMpa', 'member.gradeMinTensileMpa',
]);

export type CandidateStatus = 'legal' | 'fails' | 'undecided';

/** A tube being judged: a stock size, or the sheet's own tube, whose material or process may be unstated. */
export type CandidateTube = Omit<StockTube, 'material' | 'process'> & { material?: Material; process?: Process };

export interface RequirementOutcome {
  requirementId: string;
  title: string;
  section: string;
  verdict: 'pass' | 'fail' | 'not_applicable' | 'needs_information';
  /** The tube-table alternative that matched, e.g. "1.625 × 0.080 in". */
  matched?: string;
  /** Facts that would decide it (fact names). */
  missing?: string[];
  /** A plate requirement: which plate. */
  plateId?: string;
}

export interface RankedCandidate {
  tube: CandidateTube;
  massPerMetreKg: number;
  status: CandidateStatus;
  outcomes: RequirementOutcome[];
  /** The candidate's wall readings are taken as its catalogue wall; confirm them on the tube. */
  assumesCatalogueWall: boolean;
}

/**
 * One reading of the sheet's facts. With a cage model the engine checks the model's values and, where
 * the sheet types different ones, the sheet's too, the less favourable deciding (model-facts.ts); the
 * chooser judges each reading the same way.
 */
interface Reading {
  vfacts: FactSet;
  /** The member's own facts over the vehicle's; a candidate overrides only what a tube changes. */
  base: FactSet;
  minClrMm: number | undefined;
}

interface Prepared {
  spec: Specification;
  member: SpecMember;
  index: number;
  readings: Reading[];
  /** The member's length: the model's developed length where it has a path, else as typed. */
  lengthMm: number | undefined;
  memberReqs: ReadyRequirement[];
  vehicleReqs: ReadyRequirement[];
  plateReqs: { plateId: string; facts: FactSet; reqs: ReadyRequirement[] }[];
  otherMaterials: (Material | undefined)[];
  otherMassKg: number | undefined;
}

const dependsOnTube = (r: CompiledRequirement) => r.factsUsed.some((f) => TUBE_DEPENDENT_FACTS.has(f));

// The model's derived values, once per sheet object (a choice prepares every member of one sheet).
const geometries = new WeakMap<Specification, CageGeometry | null>();
function geometryOf(spec: Specification): CageGeometry | null {
  let geo = geometries.get(spec);
  if (geo === undefined) {
    geo = spec.model ? deriveCageGeometry(spec) : null;
    geometries.set(spec, geo);
  }
  return geo;
}

/** Each member's length as the check reads it: the model's developed length where it has a path, else as typed. */
export function memberLengthsMm(spec: Specification): (number | undefined)[] {
  const lengths = modelLengths(spec, geometryOf(spec));
  return spec.members.map((m) => lengths.get(m.id) ?? m.lengthMm);
}

function prepare(compiled: CompiledRuleset, classId: string, spec: Specification, index: number): Prepared {
  const cls = compiled.classes[classId];
  if (!cls) throw new RangeError(`Unknown class "${classId}". This ruleset has: ${Object.keys(compiled.classes).join(', ')}.`);
  const member = spec.members[index];
  // The same facts the engine reads (evaluate.ts): the model's lengths and bends, the class's listed weight, sides.
  const geo = geometryOf(spec);
  const lengths = modelLengths(spec, geo);
  const tubes = spec.members.map((m, i) => memberTubeData(m, i, lengths.get(m.id)));
  const listedWeightKg = compiled.listedWeightsKg[classId];
  const vfacts = vehicleFacts(spec, { weightBasis: cls.weightBasis, ...(listedWeightKg !== undefined ? { listedWeightKg } : {}) }, tubes);
  // Other members' sizes (member against member); a member is never compared with its own kind.
  Object.assign(vfacts, peerFacts(spec, peerNamesOf(compiled)));
  const vr = vehicleReadings(vfacts, geo);
  const derived = geo?.members.find((d) => d.memberId === member.id);
  const mr = memberReadings(memberFacts(spec, member, tubes[index], memberSides(spec)[index]), member, derived);
  const reading = (v: FactSet, m: FactSet): Reading => {
    const base = Object.setPrototypeOf({ ...m }, v) as FactSet;
    return { vfacts: v, base, minClrMm: base['member.minBendClrMm'] as number | undefined };
  };
  const readings = [reading(vr.model.facts, mr.model.facts)];
  if (vr.sheet || mr.sheet) readings.push(reading((vr.sheet ?? vr.model).facts, (mr.sheet ?? mr.model).facts));
  const reqs = compiled.requirements.filter((r) => applies(r, classId) && dependsOnTube(r));
  const memberReqs = reqs.filter((r) => r.scope.kind === 'member' && r.scope.memberKinds.includes(member.kind));
  const vehicleReqs = reqs.filter((r) => r.scope.kind === 'vehicle');
  const plateReqs = (spec.plates ?? [])
    .filter((p) => p.memberId === member.id)
    .map((p) => ({ plateId: p.id, facts: plateFacts(spec, p), reqs: reqs.filter((r) => r.scope.kind === 'plate' && r.scope.locations.includes(p.location)) }))
    .filter((p) => p.reqs.length > 0);
  const others = tubes.filter((_, i) => i !== index);
  const otherMassKg = others.every((t) => t.massKg !== null) ? others.reduce((s, t) => s + (t.massKg ?? 0), 0) : undefined;
  const weightKg = vfacts['vehicle.weightKg'] as number | undefined;
  // Tube tables first: most candidates fail there, and judging stops at the first failure.
  memberReqs.sort((a, b) => Number(b.template === 'tube_table') - Number(a.template === 'tube_table'));
  return {
    spec, member, index, readings, lengthMm: tubes[index]!.lengthMm ?? undefined,
    memberReqs: memberReqs.map((r) => ready(r, weightKg)), vehicleReqs: vehicleReqs.map((r) => ready(r, weightKg)),
    plateReqs: plateReqs.map((pl) => ({ ...pl, reqs: pl.reqs.map((r) => ready(r, weightKg)) })),
    otherMaterials: spec.members.filter((_, i) => i !== index).map((m) => m.material), otherMassKg,
  };
}

/** The member as it would be with this tube; readings re-taken on the new tube are its catalogue wall. */
export function memberWithTube(member: SpecMember, tube: CandidateTube): SpecMember {
  const { grade, yieldMpa, wallReadings, material, process, ...rest } = member;
  void grade; void yieldMpa; void material; void process;
  return {
    ...rest, odMm: tube.odMm, wallMm: tube.wallMm, ...(tube.material ? { material: tube.material } : {}), ...(tube.process ? { process: tube.process } : {}),
    ...(tube.grade !== undefined ? { grade: tube.grade } : {}), ...(tube.yieldMpa !== undefined ? { yieldMpa: tube.yieldMpa } : {}),
    ...(wallReadings ? { wallReadings: wallReadings.map((r) => ({ ...r, wallMm: tube.wallMm })) } : {}),
  };
}

/** A requirement made ready for many candidates: its band chosen and its parts found once. */
interface ReadyRequirement {
  req: CompiledRequirement;
  band: 'ok' | 'missingWeight' | 'outsideTable';
  when?: PlainNode;
  requires?: PlainNode;
  /** Tube-table alternatives in order, with the label of each. */
  alternatives: { node: PlainNode; label: string }[];
}

function ready(req: CompiledRequirement, weightKg: number | undefined): ReadyRequirement {
  const choice = chooseVariant(req, weightKg);
  if (!('variant' in choice)) return { req, band: 'missingWeight' in choice ? 'missingWeight' : 'outsideTable', alternatives: [] };
  const { when, requires } = partsOf(choice.variant);
  const alternatives = req.template === 'tube_table'
    ? (requires.any ?? []).flatMap((n) => (n.name && req.alternatives[n.name] ? [{ node: n, label: req.alternatives[n.name].label }] : []))
    : [];
  return { req, band: 'ok', ...(when ? { when } : {}), requires, alternatives };
}

// One scratch set for every evaluation (judging is synchronous); copied only when a fact is missing.
const scratch = new Set<string>();

function outcomeOf(r: ReadyRequirement, facts: FactSet, plateId?: string): RequirementOutcome {
  const { req } = r;
  const out: RequirementOutcome = { requirementId: req.id, title: req.title, section: req.section, verdict: 'pass' };
  if (plateId) out.plateId = plateId;
  if (r.band === 'missingWeight') return { ...out, verdict: 'needs_information', missing: ['vehicle.weightKg'] };
  if (r.band === 'outsideTable') return { ...out, verdict: 'fail' };
  scratch.clear();
  if (r.when) {
    const w = evaluatePlain(r.when, facts, scratch);
    if (w === false) return { ...out, verdict: 'not_applicable' };
    if (w === 'unknown') return { ...out, verdict: 'needs_information', missing: [...scratch].sort() };
  }
  const v = evaluatePlain(r.requires!, facts, scratch);
  if (v === 'unknown') return { ...out, verdict: 'needs_information', missing: [...scratch].sort() };
  if (!v) return { ...out, verdict: 'fail' };
  for (const alt of r.alternatives)
    if (evaluatePlain(alt.node, facts, scratch) === true) {
      out.matched = alt.label;
      break;
    }
  return out;
}

function statusOf(outcomes: readonly RequirementOutcome[]): CandidateStatus {
  let undecided = false;
  for (const o of outcomes) {
    if (o.verdict === 'fail') return 'fails';
    if (o.verdict === 'needs_information') undecided = true;
  }
  return undecided ? 'undecided' : 'legal';
}

/**
 * Judges one candidate. Requirements run tube tables first and stop at the first failure, so a
 * failing candidate lists the requirement that turned it away (not every one it breaks).
 */
function judge(p: Prepared, tube: CandidateTube): RankedCandidate {
  const props = tubeSectionProperties(tube, tube.material ?? 'mild_steel');
  const outcomes = judgeReading(p, p.readings[0]!, tube, props);
  // A second reading (the sheet's typed values beside the model's): the less favourable decides.
  if (p.readings.length > 1 && statusOf(outcomes) !== 'fails') {
    const other = judgeReading(p, p.readings[1]!, tube, props);
    const byId = new Map(other.map((o) => [`${o.requirementId}|${o.plateId ?? ''}`, o]));
    for (let i = 0; i < outcomes.length; i++) {
      const o = byId.get(`${outcomes[i]!.requirementId}|${outcomes[i]!.plateId ?? ''}`);
      if (o && VERDICT_RANK[o.verdict] > VERDICT_RANK[outcomes[i]!.verdict]) outcomes[i] = o;
    }
    for (const o of other) if (!outcomes.some((x) => x.requirementId === o.requirementId && x.plateId === o.plateId)) outcomes.push(o);
  }
  return { tube, massPerMetreKg: props.massPerMetreKg, status: statusOf(outcomes), outcomes, assumesCatalogueWall: (p.member.wallReadings?.length ?? 0) > 0 };
}

const VERDICT_RANK: Readonly<Record<RequirementOutcome['verdict'], number>> = { not_applicable: 0, pass: 1, needs_information: 2, fail: 3 };

function judgeReading(p: Prepared, r: Reading, tube: CandidateTube, props: ReturnType<typeof tubeSectionProperties>): RequirementOutcome[] {
  const massKg = p.lengthMm === undefined ? undefined : (props.massPerMetreKg * p.lengthMm) / 1000;
  // Only the facts a tube changes are set on the candidate; the rest come through the prototype
  // (spreading these dotted-key objects per candidate is slow, see evaluate.ts). Must match
  // memberFacts/vehicleFacts for the same member (the property test compares with the engine).
  const v = Object.create(r.vfacts) as FactSet;
  const mats = [...p.otherMaterials, tube.material];
  v['vehicle.anyChromoly'] = mats.includes('chromoly_4130') ? true : mats.includes(undefined) ? undefined : false;
  v['vehicle.estimatedTubeMassKg'] = p.otherMassKg !== undefined && massKg !== undefined ? p.otherMassKg + massKg : undefined;
  const mf = Object.create(r.base) as FactSet;
  mf['vehicle.anyChromoly'] = v['vehicle.anyChromoly'];
  mf['vehicle.estimatedTubeMassKg'] = v['vehicle.estimatedTubeMassKg'];
  mf['member.odMm'] = tube.odMm;
  mf['member.wallMm'] = tube.wallMm;
  mf['member.minMeasuredWallMm'] = (p.member.wallReadings?.length ?? 0) > 0 ? tube.wallMm : undefined;
  for (const [method, fact] of Object.entries(WALL_METHOD_FACTS))
    mf[fact] = p.member.wallReadings?.some((w) => w.method === method) ? tube.wallMm : undefined;
  const grade = findGrade('material', tube.grade);
  mf['member.gradeMinYieldMpa'] = grade?.minYieldMpa;
  mf['member.gradeMinTensileMpa'] = grade?.minTensileMpa;
  mf['member.material'] = tube.material;
  mf['member.grade'] = tube.grade;
  mf['member.process'] = tube.process;
  mf['member.yieldMpa'] = tube.yieldMpa;
  mf['member.massKg'] = massKg;
  mf['member.areaMm2'] = props.areaMm2;
  mf['member.secondMomentMm4'] = props.secondMomentMm4;
  mf['member.sectionModulusMm3'] = props.sectionModulusMm3;
  mf['member.bendingStrengthNmm'] = bendingStrengthNmm(tube.yieldMpa ?? grade?.minYieldMpa, props.sectionModulusMm3);
  mf['member.radiusOfGyrationMm'] = props.radiusOfGyrationMm;
  mf['member.torsionalConstantMm4'] = props.torsionalConstantMm4;
  mf['member.massPerMetreKg'] = props.massPerMetreKg;
  mf['member.minBendRadiusOverOd'] = r.minClrMm === undefined ? undefined : r.minClrMm / tube.odMm;
  const outcomes: RequirementOutcome[] = [];
  judgeAll(p, tube, v, mf, outcomes);
  return outcomes;
}

/** Fills `outcomes`, stopping at the first failure. */
function judgeAll(p: Prepared, tube: CandidateTube, v: FactSet, mf: FactSet, outcomes: RequirementOutcome[]): void {
  for (const r of p.memberReqs) {
    const o = outcomeOf(r, mf);
    outcomes.push(o);
    if (o.verdict === 'fail') return;
  }
  for (const r of p.vehicleReqs) {
    const o = outcomeOf(r, v);
    outcomes.push(o);
    if (o.verdict === 'fail') return;
  }
  for (const pl of p.plateReqs) {
    const pf = Object.create(v) as FactSet;
    for (const [k, val] of Object.entries(pl.facts)) pf[k] = val;
    pf['plate.attachedWallMm'] = tube.wallMm;
    pf['plate.attachedOdMm'] = tube.odMm;
    for (const r of pl.reqs) {
      const o = outcomeOf(r, pf, pl.plateId);
      outcomes.push(o);
      if (o.verdict === 'fail') return;
    }
  }
}

export interface RankOptions {
  /** Only stock of these materials; default: every material on the list. */
  materials?: readonly Material[];
}

const usable = (t: StockTube) => tubeSizeProblems(t).length === 0;

function rankPrepared(p: Prepared, stock: readonly StockTube[], materials: readonly Material[] | undefined): RankedCandidate[] {
  const out: RankedCandidate[] = [];
  for (const t of stock) if (usable(t) && (!materials || materials.includes(t.material))) out.push(judge(p, t));
  out.sort((a, b) => a.massPerMetreKg - b.massPerMetreKg || a.tube.odMm - b.tube.odMm || a.tube.wallMm - b.tube.wallMm);
  return out;
}

/** Every usable stock size judged for one member of a sheet, lightest first. */
export function rankStockForMember(compiled: CompiledRuleset, spec: Specification, memberIndex: number, stock: readonly StockTube[], options: RankOptions = {}): RankedCandidate[] {
  return rankPrepared(prepare(compiled, spec.vehicle.classId, spec, memberIndex), stock, options.materials);
}

/** The member's own tube as a candidate, with only what the sheet states (as the check reads it). */
export function currentTube(m: SpecMember): CandidateTube {
  return {
    odMm: m.odMm, wallMm: m.wallMm, ...(m.material ? { material: m.material } : {}), ...(m.process ? { process: m.process } : {}),
    ...(m.grade ? { grade: m.grade } : {}), ...(m.yieldMpa !== undefined ? { yieldMpa: m.yieldMpa } : {}),
  };
}

/** The current tube of a member judged the same way (so the saving compares like with like). */
export function judgeCurrentTube(compiled: CompiledRuleset, spec: Specification, memberIndex: number): RankedCandidate {
  return judge(prepare(compiled, spec.vehicle.classId, spec, memberIndex), currentTube(spec.members[memberIndex]));
}

/** One tube judged for one member of a sheet (the sheet as it is, other members included). */
export function judgeTubeForMember(compiled: CompiledRuleset, spec: Specification, memberIndex: number, tube: CandidateTube): RankedCandidate {
  return judge(prepare(compiled, spec.vehicle.classId, spec, memberIndex), tube);
}

// Usable stock lightest first, per stock list (the same order rankPrepared sorts its result in).
const byMass = new WeakMap<readonly StockTube[], StockTube[]>();
function lightestFirst(stock: readonly StockTube[]): StockTube[] {
  let sorted = byMass.get(stock);
  if (!sorted) {
    const mass = (t: StockTube) => tubeSectionProperties(t, t.material).massPerMetreKg;
    sorted = stock.filter(usable).map((t) => ({ t, m: mass(t) })).sort((a, b) => a.m - b.m || a.t.odMm - b.t.odMm || a.t.wallMm - b.t.wallMm).map((x) => x.t);
    byMass.set(stock, sorted);
  }
  return sorted;
}

/** Judges once per member of a sheet: the same work `rankStockForMember` does, kept for many tubes. */
export function memberJudge(compiled: CompiledRuleset, spec: Specification, memberIndex: number): {
  judge: (tube: CandidateTube) => RankedCandidate;
  rank: (stock: readonly StockTube[], materials?: readonly Material[]) => RankedCandidate[];
  /** The lightest legal stock size, judging lightest first and stopping there. */
  firstLegal: (stock: readonly StockTube[], materials?: readonly Material[]) => RankedCandidate | undefined;
} {
  const p = prepare(compiled, spec.vehicle.classId, spec, memberIndex);
  return {
    judge: (tube) => judge(p, tube),
    rank: (stock, materials) => rankPrepared(p, stock, materials),
    firstLegal: (stock, materials) => {
      for (const t of lightestFirst(stock)) {
        if (materials && !materials.includes(t.material)) continue;
        const c = judge(p, t);
        if (c.status === 'legal') return c;
      }
      return undefined;
    },
  };
}

export interface TubeQuery extends BandQuery {
  /** Facts of the member that do not depend on the tube (bends, length, joints…), when known. */
  member?: Omit<Partial<SpecMember>, 'id' | 'kind' | 'odMm' | 'wallMm'>;
  /** Facts of the car a tube-dependent requirement may read (e.g. welding when any member is 4130). */
  car?: Pick<Specification, 'welding' | 'geometry' | 'padding'>;
}

/** A one-member sheet for a query that has no sheet behind it (starting shapes, previews). */
export function sheetForQuery(compiled: CompiledRuleset, q: TubeQuery): Specification {
  const cls = compiled.classes[q.classId];
  if (!cls) throw new RangeError(`Unknown class "${q.classId}". This ruleset has: ${Object.keys(compiled.classes).join(', ')}.`);
  const weight = q.weightKg === undefined ? {} : cls.weightBasis === 'with_driver' ? { weightWithDriverKg: q.weightKg } : { weightWithoutDriverKg: q.weightKg };
  return {
    ...(q.car ?? {}),
    vehicle: { classId: q.classId, ...weight },
    members: [{ ...(q.member ?? {}), id: 'member', kind: q.memberKind, odMm: 40, wallMm: 2, ...(q.material ? { material: q.material } : {}), ...(q.process ? { process: q.process } : {}) }],
  };
}

/**
 * The lightest stock size that meets every tube-dependent requirement for this member kind, class,
 * weight and material (the stock's own material and process are used; `material` restricts the
 * stock to that material). Null when no stock size is legal. A requirement that reads a fact the
 * query does not give (a bend radius needs `member.bends`) is undecided, and an undecided size is
 * never "legal": give the member's facts, or use listedSizesForBand for the table alone.
 */
export function lightestLegalTube(stock: readonly StockTube[], compiled: CompiledRuleset, query: TubeQuery): RankedCandidate | null {
  const ranked = rankStockForMember(compiled, sheetForQuery(compiled, query), 0, stock, query.material ? { materials: [query.material] } : {});
  return ranked.find((c) => c.status === 'legal') ?? null;
}
