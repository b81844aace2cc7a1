// evaluateSpecification: runs a compiled ruleset against one specification for one class and
// builds the CheckReport. Member-scoped requirements run once per member, and each member only
// through the requirements for its kind; vehicle-scoped ones run once. One json-rules-engine
// Engine per check and scope group (never shared between checks: an Engine keeps run state on
// itself), property-walk path resolution, derived facts precomputed in plain code.
import { Engine, Fact } from 'json-rules-engine';
import type { Almanac, RuleProperties } from 'json-rules-engine';
import type { Specification } from '../../contracts/specification.js';
import type { CheckReport, Finding, FindingStrengthEquivalence, MeasuredValue, MissingFact, RequiredValue } from '../../contracts/report.js';
import { MEASURE_WORDS, judgeStrengthEquivalence } from '../strength-equivalence.js';
import type { StrengthEquivalence } from '../strength-equivalence.js';
import { PRE_CHECK_DISCLAIMER } from '../../contracts/report.js';
import { FACTS_BY_NAME, SIDE_COUNTS_FACT, countOnSide, factPresent, memberFacts, memberSides, memberTubeData, plateFacts, vehicleFacts } from '../facts.js';
import type { FactSet, MemberTubeData, SideParam } from '../facts.js';
import { formatIsoDate } from '../dates.js';
import { deriveCageGeometry } from '../geometry/derive.js';
import type { CageGeometry } from '../geometry/derive.js';
import { memberNames } from '../geometry/names.js';
import { modelAsks, type ModelAsk } from '../geometry/model-asks.js';
import { memberReadings, modelLengths, vehicleReadings } from '../model-facts.js';
import type { Disagreement } from '../model-facts.js';
import { formatQuantity } from '../units.js';
import type { Dimension, UnitSystem } from '../units.js';
import { MATERIAL_LABELS, MEMBER_KIND_LABELS, OTHER_VOCABULARY_WORDS, PROCESS_LABELS } from '../vocabulary.js';
import type { MemberKind, PlateLocation } from '../vocabulary.js';
import { customOperators } from './operators.js';
import { TEMPLATE_KINDS } from './template-kinds.js';
import { REF_FACT, describeReference, peerFacts, referenceLabel, referencedFact, referenceValue } from './references.js';
import type { RefParams } from './references.js';
import type { AlternativeMeta, CompiledRequirement, CompiledRuleset, CompiledVariant, LeafMeta } from './types.js';
import { leavesOf, namedPart, triState } from './verdict.js';
import { band as bandPart, bySystem, cmp, compact, distinguished, gap, renderReason, tubeSizeText } from './reason-text.js';
import type { ComparisonOp, ReasonSegment } from './reason-text.js';
import { tubeSectionProperties } from '../tube.js';
import type { ResultNode, Tri } from './verdict.js';

export interface EvaluateOptions {
  /** Units for the human-readable `reason` texts; default: the ruleset document's own. */
  unitSystem?: UnitSystem;
}

export class UnknownClassError extends Error {
  constructor(readonly classId: string, readonly known: readonly string[]) {
    super(`Unknown class "${classId}". This ruleset has: ${known.join(', ')}.`);
    this.name = 'UnknownClassError';
  }
}

/** Plain property walk ("a.b.c"); replaces the engine's default JSONPath resolver, its main cost. */
export function walkPath(value: object, path: string): unknown {
  let cur: unknown = value;
  for (const key of path.split('.')) {
    if (cur === null || typeof cur !== 'object' || !Object.prototype.hasOwnProperty.call(cur, key)) return undefined;
    cur = (cur as Record<string, unknown>)[key];
  }
  return cur;
}

const OPERATORS = customOperators();

function newEngine(rules: RuleProperties[]): Engine {
  const engine = new Engine(rules, { allowUndefinedFacts: true, pathResolver: walkPath });
  for (const op of OPERATORS) engine.addOperator(op);
  engine.addFact('member.odMarginOverTableMinimumMm', async (params: Record<string, unknown>, almanac: Almanac) => {
    const od = await almanac.factValue<number | undefined>('member.odMm');
    return typeof od === 'number' ? od - Number(params.tableMinimumOdMm) : undefined;
  }, { cache: false });
  // k × another value, or another member's size (references.ts): read at run time, never cached.
  engine.addFact(REF_FACT, async (params: Record<string, unknown>, almanac: Almanac) => {
    const p = params as unknown as RefParams;
    return referenceValue(p, await almanac.factValue(p.fact));
  }, { cache: false });
  engine.addFact('vehicle.memberCountOnSide', async (params: Record<string, unknown>, almanac: Almanac) => {
    const facts: FactSet = {
      [SIDE_COUNTS_FACT]: await almanac.factValue<Record<string, number>>(SIDE_COUNTS_FACT),
      'vehicle.driverSide': await almanac.factValue<string | undefined>('vehicle.driverSide'),
    };
    const r = countOnSide(facts, params.kinds as string[], params.side as SideParam);
    return 'count' in r ? r.count : undefined;
  }, { cache: false });
  engine.addFact('vehicle.memberCountOfKinds', async (params: Record<string, unknown>, almanac: Almanac) => {
    const counts = await almanac.factValue<Record<string, number>>('vehicle.memberCounts');
    return (params.kinds as string[]).reduce((s, k) => s + (counts[k] ?? 0), 0);
  }, { cache: false });
  return engine;
}

interface ClassPlan {
  vehicle: CompiledRequirement[];
  member: CompiledRequirement[];
  plate: CompiledRequirement[];
  byKind: Map<MemberKind, CompiledRequirement[]>;
  byLocation: Map<PlateLocation, CompiledRequirement[]>;
}

// Memoised per compiled ruleset object: a pure function of it, so safe to share between checks.
const plans = new WeakMap<CompiledRuleset, Map<string, ClassPlan>>();

function planFor(compiled: CompiledRuleset, classId: string): ClassPlan {
  let perClass = plans.get(compiled);
  if (!perClass) plans.set(compiled, (perClass = new Map()));
  const cached = perClass.get(classId);
  if (cached) return cached;
  const applicable = compiled.requirements.filter((r) => r.classes === null || r.classes.includes(classId));
  const plan: ClassPlan = { vehicle: [], member: [], plate: [], byKind: new Map(), byLocation: new Map() };
  for (const r of applicable) {
    if (r.scope.kind === 'vehicle') plan.vehicle.push(r);
    else if (r.scope.kind === 'member') {
      plan.member.push(r);
      for (const k of r.scope.memberKinds) plan.byKind.set(k, [...(plan.byKind.get(k) ?? []), r]);
    } else {
      plan.plate.push(r);
      for (const l of r.scope.locations) plan.byLocation.set(l, [...(plan.byLocation.get(l) ?? []), r]);
    }
  }
  perClass.set(classId, plan);
  return plan;
}

type Subject =
  | { kind: 'vehicle' }
  | { kind: 'member'; id: string; memberKind: MemberKind; index: number }
  | { kind: 'plate'; id: string; location: PlateLocation; index: number };

/** A subject's facts for one run, and which of them came from the model. */
interface SubjectRun {
  subject: Subject;
  facts: FactSet;
  fromModel: ReadonlySet<string>;
}

type Ordered = { order: [number, number]; finding: Finding };

const VERDICT_RANK: Record<Finding['verdict'], number> = { not_applicable: 0, pass: 1, needs_information: 2, fail: 3 };

/** The same requirements run on the model's and on the sheet's readings: the less favourable decides. */
function lessFavourable(a: readonly Ordered[], b: readonly Ordered[]): Ordered[] {
  return a.map((x, i) => (b[i] && VERDICT_RANK[b[i].finding.verdict] > VERDICT_RANK[x.finding.verdict] ? b[i] : x));
}

export type VariantChoice = { variant: CompiledVariant } | { missingWeight: true } | { outsideTable: true };

export function chooseVariant(req: CompiledRequirement, weightKg: number | undefined): VariantChoice {
  if (req.variants.length === 1 && req.variants[0].aboveKg === null && req.variants[0].upToKg === null) return { variant: req.variants[0] };
  if (weightKg === undefined) return { missingWeight: true };
  const v = req.variants.find((x) => (x.aboveKg === null || weightKg > x.aboveKg + 1e-9) && (x.upToKg === null || weightKg <= x.upToKg + 1e-9));
  return v ? { variant: v } : { outsideTable: true };
}

/**
 * A subject's facts on top of the vehicle's, through the prototype chain: V8 copies an object
 * spread of two ~25-key objects with dotted names very slowly (about 0.2 ms each, measured).
 */
function layered(base: FactSet, own: FactSet): FactSet {
  // `own` is a fresh object literal from memberFacts/plateFacts, so re-parenting it is safe.
  return Object.setPrototypeOf(own, base) as FactSet;
}

// A requirement's branch in a bundled rule. Without a `when` guard the branch is the `requires`
// node itself (fewer nodes for the engine to clone per run); the suffix says so.
const REQUIRES_ONLY = '|requires';
const branches = new WeakMap<RuleProperties, object>();

function branchOf(rule: RuleProperties): object {
  const cached = branches.get(rule);
  if (cached) return cached;
  const top = (rule.conditions as unknown as ResultNode).all ?? [];
  const branch = top.length === 1 && top[0].name === 'requires' ? { ...top[0], name: `${rule.name}${REQUIRES_ONLY}` } : { ...(rule.conditions as object), name: rule.name };
  branches.set(rule, branch);
  return branch;
}

/** Only the facts a group's rules read, so each run builds fewer engine facts. */
function pickFacts(all: FactSet, names: ReadonlySet<string>): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const n of names) {
    const v = all[n];
    if (v !== undefined) out[n] = v;
  }
  return out;
}

function factsNeeded(reqs: readonly CompiledRequirement[]): Set<string> {
  const names = new Set<string>();
  for (const r of reqs) for (const f of r.factsUsed) names.add(f);
  if (names.has('member.odMarginOverTableMinimumMm')) names.add('member.odMm');
  if (names.has('vehicle.memberCountOfKinds')) names.add('vehicle.memberCounts');
  if (names.has('vehicle.memberCountOnSide')) {
    names.add(SIDE_COUNTS_FACT);
    names.add('vehicle.driverSide');
  }
  names.delete('member.odMarginOverTableMinimumMm');
  names.delete('vehicle.memberCountOfKinds');
  names.delete('vehicle.memberCountOnSide');
  return names;
}

interface Ctx {
  compiled: CompiledRuleset;
  system: UnitSystem;
  weightKg: number | undefined;
  /** The builder's name for each member, by index (findings say it, never an id). */
  names: readonly string[];
  /** The maker's certificate on the sheet, for requirements that accept one in their place. */
  certificate?: { issuer?: string; number: string };
  /** The weight is the class's listed weight, not a measured one. */
  listedWeight: boolean;
  /** With a cage model: what to ask instead of a geometry fact it would give (model-asks.ts). */
  asks?: (fact: string) => ModelAsk[] | null;
}

export async function evaluateSpecification(
  compiled: CompiledRuleset,
  classId: string,
  spec: Specification,
  options: EvaluateOptions = {},
): Promise<CheckReport> {
  const cls = compiled.classes[classId];
  if (!cls) throw new UnknownClassError(classId, Object.keys(compiled.classes));
  const doc = compiled.document;
  const plan = planFor(compiled, classId);
  const geo = spec.model ? deriveCageGeometry(spec) : null;
  const lengths = modelLengths(spec, geo);
  const names = memberNames(spec.members);
  const tubes = spec.members.map((m, i) => memberTubeData(m, i, lengths.get(m.id), names[i]));
  const listedWeightKg = compiled.listedWeightsKg[classId];
  const vfacts = vehicleFacts(spec, { weightBasis: cls.weightBasis, ...(listedWeightKg !== undefined ? { listedWeightKg } : {}) }, tubes);
  Object.assign(vfacts, peerFacts(spec, peerNamesOf(compiled)));
  const vr = vehicleReadings(vfacts, geo);
  const certificate = spec.cage?.certificate;
  const ctx: Ctx = {
    compiled, system: options.unitSystem ?? doc.unitSystem, weightKg: vfacts['vehicle.weightKg'] as number | undefined,
    ...(certificate ? { certificate } : {}), listedWeight: listedWeightKg !== undefined, names,
    ...(spec.model ? { asks: (fact: string) => modelAsks(spec, fact) } : {}),
  };
  const findings: Ordered[] = [];
  const disagreements: Disagreement[] = [...vr.disagreements];

  // Runs one engine over several subjects of the same group, one after another (never concurrently).
  const runGroup = async (reqs: readonly CompiledRequirement[], subjects: SubjectRun[]): Promise<Ordered[]> => {
    const findings: Ordered[] = [];
    if (reqs.length === 0 || subjects.length === 0) return findings;
    const rules: RuleProperties[] = [];
    const direct: { req: CompiledRequirement; choice: VariantChoice }[] = [];
    const chosen = new Map<string, CompiledVariant>();
    const waived: CompiledRequirement[] = [];
    for (const req of reqs) {
      if (req.acceptsMakerCertificate && ctx.certificate) {
        waived.push(req);
        continue;
      }
      const choice = chooseVariant(req, ctx.weightKg);
      if ('variant' in choice) {
        rules.push(choice.variant.rule);
        chosen.set(req.id, choice.variant);
      } else direct.push({ req, choice });
    }
    // One engine rule per subject whose tree holds every requirement as a named branch: the
    // branches share one priority, so the engine evaluates all of them (no short-circuit across
    // requirements) and the per-rule overhead (result cloning, events) is paid once per run.
    const bundle: RuleProperties = {
      name: 'group',
      event: { type: 'group' },
      conditions: { all: rules.map(branchOf) } as unknown as RuleProperties['conditions'],
    };
    const engine = rules.length > 0 ? newEngine([bundle]) : undefined;
    const needed = factsNeeded(reqs);
    const seen = new Map<string, Map<string, ResultNode>>();
    for (const { subject, facts, fromModel } of subjects) {
      const order = subject.kind === 'vehicle' ? 0 : subject.index;
      for (const { req, choice } of direct) findings.push({ order: [req.index, order], finding: bandFinding(ctx, req, subject, choice) });
      for (const req of waived) findings.push({ order: [req.index, order], finding: certifiedFinding(ctx, req, subject) });
      if (!engine) continue;
      // Left/right pairs and repeated bars often have identical facts: run the engine once for
      // them (the result trees are only read, never changed).
      const runFacts = pickFacts(facts, needed);
      const key = subjects.length > 1 ? JSON.stringify(runFacts) : '';
      let trees = seen.get(key);
      if (!trees) {
        // Constant facts with caching off: the engine would otherwise hash every one per run.
        const engineFacts: Record<string, Fact> = {};
        for (const [id, value] of Object.entries(runFacts)) engineFacts[id] = new Fact(id, value, { cache: false });
        const { results, failureResults } = await engine.run(engineFacts);
        trees = new Map<string, ResultNode>();
        const root = [...results, ...failureResults][0].conditions as unknown as ResultNode;
        for (const branch of root.all ?? []) {
          const name = String(branch.name);
          // Re-wrap a requires-only branch so findings read every tree the same way.
          if (name.endsWith(REQUIRES_ONLY)) trees.set(name.slice(0, -REQUIRES_ONLY.length), { all: [{ ...branch, name: 'requires' }] });
          else trees.set(name, branch);
        }
        seen.set(key, trees);
      }
      for (const req of reqs) {
        const tree = trees.get(req.id);
        const variant = chosen.get(req.id);
        if (!tree || !variant) continue;
        findings.push({ order: [req.index, order], finding: buildFinding(ctx, req, variant, subject, tree, facts, fromModel) });
      }
    }
    return findings;
  };
  // With both a model reading and a sheet reading, run each; per finding the less favourable decides.
  const runReadings = async (reqs: readonly CompiledRequirement[], model: SubjectRun[], sheet: SubjectRun[] | null) => {
    const a = await runGroup(reqs, model);
    findings.push(...(sheet ? lessFavourable(a, await runGroup(reqs, sheet)) : a));
  };
  const vehicleSubject: Subject = { kind: 'vehicle' };
  await runReadings(
    plan.vehicle,
    [{ subject: vehicleSubject, facts: vr.model.facts, fromModel: vr.model.fromModel }],
    vr.sheet ? [{ subject: vehicleSubject, facts: vr.sheet.facts, fromModel: vr.sheet.fromModel }] : null,
  );

  const membersByKind = new Map<MemberKind, { model: SubjectRun[]; sheet: SubjectRun[]; differs: boolean }>();
  const derivedById = new Map((geo?.members ?? []).map((d) => [d.memberId, d]));
  const sides = memberSides(spec);
  spec.members.forEach((m, index) => {
    if (!plan.byKind.has(m.kind)) return;
    const group = membersByKind.get(m.kind) ?? { model: [], sheet: [], differs: false };
    const subject: Subject = { kind: 'member', id: m.id, memberKind: m.kind, index };
    const mr = memberReadings(memberFacts(spec, m, tubes[index], sides[index]), m, derivedById.get(m.id));
    disagreements.push(...mr.disagreements);
    const union = (a: ReadonlySet<string>, b: ReadonlySet<string>) => new Set([...a, ...b]);
    group.model.push({ subject, facts: layered(vr.model.facts, mr.model.facts), fromModel: union(vr.model.fromModel, mr.model.fromModel) });
    const vs = vr.sheet ?? vr.model;
    const ms = mr.sheet ?? mr.model;
    // A copy: `layered` re-parents its object, and the model run keeps its own.
    group.sheet.push({ subject, facts: layered({ ...vs.facts }, { ...ms.facts }), fromModel: union(vs.fromModel, ms.fromModel) });
    group.differs ||= vr.sheet !== null || mr.sheet !== null;
    membersByKind.set(m.kind, group);
  });
  for (const [kind, g] of membersByKind) await runReadings(plan.byKind.get(kind) ?? [], g.model, g.differs ? g.sheet : null);

  const platesByLocation = new Map<PlateLocation, SubjectRun[]>();
  (spec.plates ?? []).forEach((p, index) => {
    if (!plan.byLocation.has(p.location)) return;
    const list = platesByLocation.get(p.location) ?? [];
    list.push({ subject: { kind: 'plate', id: p.id, location: p.location, index }, facts: layered(vr.model.facts, plateFacts(spec, p)), fromModel: vr.model.fromModel });
    platesByLocation.set(p.location, list);
  });
  for (const [loc, subjects] of platesByLocation) findings.push(...(await runGroup(plan.byLocation.get(loc) ?? [], subjects)));

  // A typed value the model disagrees with: an advisory finding under each requirement that reads it.
  for (const d of disagreements) {
    const member = d.memberId === null ? null : spec.members.findIndex((m) => m.id === d.memberId);
    const reqs = member === null ? plan.vehicle : (plan.byKind.get(spec.members[member].kind) ?? []);
    for (const req of reqs) {
      if (!req.factsUsed.includes(d.fact)) continue;
      const subject: Subject = member === null ? vehicleSubject : { kind: 'member', id: d.memberId!, memberKind: spec.members[member].kind, index: member };
      findings.push({ order: [req.index, (member ?? 0) + 0.5], finding: disagreementFinding(ctx, req, subject, d) });
    }
  }

  // A scoped requirement with nothing to check still shows in the report, as not applicable.
  for (const req of [...plan.member, ...plan.plate]) {
    const covered = req.scope.kind === 'member'
      ? spec.members.some((m) => req.scope.kind === 'member' && req.scope.memberKinds.includes(m.kind))
      : (spec.plates ?? []).some((p) => req.scope.kind === 'plate' && req.scope.locations.includes(p.location));
    if (covered) continue;
    const what = req.scope.kind === 'member'
      ? `No ${req.scope.memberKinds.map((k) => MEMBER_KIND_LABELS[k]).join(' / ')} in this specification.`
      : `No mounting plate at ${req.scope.kind === 'plate' ? req.scope.locations.map((l) => l.replace(/_/g, ' ')).join(' / ') : ''} in this specification.`;
    findings.push({ order: [req.index, -1], finding: baseFinding(ctx, req, { kind: 'vehicle' }, 'not_applicable', what) });
  }

  findings.sort((a, b) => a.order[0] - b.order[0] || a.order[1] - b.order[1]);
  const list = findings.map((f) => f.finding);
  return assembleReport(ctx, cls.id, cls.name, list, tubes, geo, disagreements);
}

function disagreementFinding(ctx: Ctx, req: CompiledRequirement, subject: Subject, d: Disagreement): Finding {
  const q = (v: number) => display(v, d.dimension, ctx.system);
  const f = baseFinding(ctx, req, subject, 'fail',
    `The model gives ${q(d.modelValue)}, the sheet says ${q(d.sheetValue)} for the ${d.label} (they should agree within ${q(d.toleranceCanonical)}). ` +
    'The less favourable of the two decides; check the measurement or the model.');
  f.severity = 'advisory';
  f.title = `${req.title}: the model and the sheet disagree`;
  f.measured = [
    { fact: d.fact, label: d.label, value: d.modelValue, dimension: d.dimension, source: 'model' },
    { fact: d.fact, label: d.label, value: d.sheetValue, dimension: d.dimension, source: 'sheet' },
  ];
  return f;
}

function baseFinding(ctx: Ctx, req: CompiledRequirement, subject: Subject, verdict: Finding['verdict'], reason: string): Finding {
  const rb = ctx.compiled.document.rulebook;
  return {
    requirementId: req.id,
    title: req.title,
    citation: { publisher: rb.publisher, rulebookTitle: rb.title, edition: rb.edition, section: req.section },
    verdict,
    severity: req.severity,
    area: req.area,
    member: subject.kind === 'member' ? { id: subject.id, kind: subject.memberKind, index: subject.index, name: ctx.names[subject.index] } : null,
    plate: subject.kind === 'plate' ? { id: subject.id, location: subject.location, index: subject.index } : null,
    measured: [],
    required: [],
    missing: [],
    reason,
    explanation: req.explanation,
  };
}

/** Stores the reason as parts (written again in the reader's units when read) and as text in the run's units. */
function withReason(ctx: Ctx, f: Finding, parts: ReasonSegment[]): Finding {
  const c = compact(parts);
  f.reasonParts = c;
  f.reason = renderReason(c, ctx.system);
  return f;
}

/** The rulebook accepts a maker-certified cage in place of this rule: say so, with the certificate. */
function certifiedFinding(ctx: Ctx, req: CompiledRequirement, subject: Subject): Finding {
  const c = ctx.certificate!;
  const by = c.issuer ? ` from ${c.issuer}` : '';
  const f = baseFinding(ctx, req, subject, 'not_applicable',
    `Not checked: the sheet gives maker's certificate ${c.number}${by}, which this rulebook accepts in place of this rule. The inspector checks the certificate and the cage against it.`);
  f.acceptedOnCertificate = { number: c.number, ...(c.issuer ? { issuer: c.issuer } : {}) };
  return f;
}

/**
 * The missing facts in words. With a cage model, a geometry fact the model would derive becomes what
 * the model still needs (a path, the shoulder height, the helmet): the builder is never asked to
 * measure what the model gives.
 */
function missingList(names: Iterable<string>, ctx?: Pick<Ctx, 'asks'>): MissingFact[] {
  const out = new Map<string, MissingFact>();
  for (const fact of [...new Set(names)].sort()) {
    const instead = ctx?.asks?.(fact);
    if (instead) {
      for (const a of instead) out.set(a.fact, { fact: a.fact, label: a.label, dimension: a.dimension });
      continue;
    }
    const def = FACTS_BY_NAME.get(fact);
    const other = def ? undefined : referenceLabel(fact);
    out.set(fact, { fact, label: def?.label ?? other ?? fact, dimension: def?.dimension ?? (other ? 'length' : null) });
  }
  return [...out.values()];
}

// Other members' sizes a compiled ruleset compares with, found once per compiled ruleset.
const peerNames = new WeakMap<CompiledRuleset, string[]>();
export function peerNamesOf(compiled: CompiledRuleset): string[] {
  let names = peerNames.get(compiled);
  if (!names) {
    names = [...new Set(compiled.requirements.flatMap((r) => r.factsUsed.filter((f) => referenceLabel(f) !== undefined)))];
    peerNames.set(compiled, names);
  }
  return names;
}

function bandFinding(ctx: Ctx, req: CompiledRequirement, subject: Subject, choice: VariantChoice): Finding {
  if ('missingWeight' in choice) {
    const f = baseFinding(ctx, req, subject, 'needs_information', 'The tube sizes depend on the vehicle weight, which is not given (on this class’s basis).');
    f.missing = missingList(['vehicle.weightKg']);
    return f;
  }
  const w = ctx.weightKg ?? 0;
  const f = baseFinding(ctx, req, subject, 'fail', `The table lists no tube size for a ${ctx.listedWeight ? 'listed class weight' : 'vehicle weight'} of ${formatQuantity(w, 'mass', ctx.system).text}.`);
  f.measured = [{ fact: 'vehicle.weightKg', label: FACTS_BY_NAME.get('vehicle.weightKg')!.label, value: w, dimension: 'mass' }];
  return f;
}

/** A vocabulary value in the words people use ("mild steel", "DOM"), anything else as it is. */
function word(value: unknown): string {
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  const v = String(value);
  return (MATERIAL_LABELS as Record<string, string>)[v] ?? (PROCESS_LABELS as Record<string, string>)[v] ?? OTHER_VOCABULARY_WORDS[v] ?? (/^[a-z0-9]+(_[a-z0-9]+)+$/.test(v) ? v.replace(/_/g, ' ') : v);
}

function display(value: unknown, dimension: Dimension | null, system: UnitSystem, facts: FactSet = {}): string {
  if (typeof value === 'number' && dimension) return formatQuantity(value, dimension, system).text;
  if (Array.isArray(value)) return value.map(word).join(', ');
  if (typeof value === 'string' || typeof value === 'boolean') return word(value);
  if (typeof value === 'object' && value !== null && 'fact' in value) return describeReference(value as { fact: string; times?: number }, facts, dimension, system);
  return String(value);
}

const OP_WORDS: Record<string, string> = {
  atLeast: 'at least', atMost: 'at most', above: 'more than', below: 'less than', equals: 'equal to', notEquals: 'not', oneOf: 'one of',
  noneOf: 'none of', includes: 'including', excludes: 'without',
};

function factValueOf(facts: FactSet, leaf: ResultNode, meta: LeafMeta): unknown {
  if (meta.path) {
    const v = facts[meta.fact];
    return v && typeof v === 'object' && !Array.isArray(v) ? (v as Record<string, number>)[meta.path] : undefined;
  }
  if (meta.fact in facts) return facts[meta.fact];
  return leaf.factResult;
}

interface LeafSummary {
  required: RequiredValue[];
  /** Unique facts to report as measured: index into the subtree's leaves, and the leaf's metadata. */
  measured: { index: number; meta: LeafMeta }[];
}

// The required side of a subtree is static per compiled requirement; cache it so a check only
// looks up measured values. `key` names the subtree ("requires" or an alternative).
const summaries = new WeakMap<CompiledRequirement, Map<string, LeafSummary>>();

function summarise(req: CompiledRequirement, key: string, leaves: ResultNode[]): LeafSummary {
  let perReq = summaries.get(req);
  if (!perReq) summaries.set(req, (perReq = new Map()));
  const cached = perReq.get(key);
  if (cached) return cached;
  const required: RequiredValue[] = [];
  const measured: LeafSummary['measured'] = [];
  const seenM = new Set<string>();
  const seenR = new Set<string>();
  leaves.forEach((leaf, index) => {
    const meta = req.leaves[String(leaf.name)];
    if (!meta) return;
    const factKey = `${meta.fact}|${meta.path ?? ''}${meta.paramsKey ? `|${meta.paramsKey}` : ''}`;
    if (!seenM.has(factKey)) {
      seenM.add(factKey);
      measured.push({ index, meta });
    }
    const rkey = `${factKey}|${meta.operator}|${JSON.stringify(meta.value)}`;
    if (!seenR.has(rkey)) {
      seenR.add(rkey);
      required.push({ fact: meta.fact, label: meta.label, ...(meta.path ? { path: meta.path } : {}), operator: meta.operator, value: meta.value as RequiredValue['value'], dimension: meta.dimension });
    }
  });
  const summary = { required, measured };
  perReq.set(key, summary);
  return summary;
}

function copyRequired(summary: LeafSummary): RequiredValue[] {
  // Copies, so a caller editing a report never changes the cache.
  const out: RequiredValue[] = [];
  for (const r of summary.required) out.push({ ...r });
  return out;
}

function measuredValues(summary: LeafSummary, leaves: ResultNode[], facts: FactSet, fromModel: ReadonlySet<string>): MeasuredValue[] {
  const measured: MeasuredValue[] = [];
  for (const { index, meta } of summary.measured) {
    const value = factValueOf(facts, leaves[index], meta);
    if (typeof value === 'number' || typeof value === 'string' || typeof value === 'boolean')
      measured.push({ fact: meta.fact, label: meta.label, ...(meta.path ? { path: meta.path } : {}), value, dimension: meta.dimension, ...(fromModel.has(meta.fact) ? { source: 'model' as const } : {}) });
  }
  return measured;
}

/** "(… from the model)" after a reason, naming the values the model gave. */
function modelNote(measured: readonly MeasuredValue[]): string {
  const labels = [...new Set(measured.filter((m) => m.source === 'model').map((m) => m.label))];
  return labels.length === 0 ? '' : ` From the model: ${labels.join(', ')}.`;
}

const DATE_WORDS: Record<string, string> = { atLeast: 'on or after', atMost: 'on or before', above: 'after', below: 'before', equals: 'on', notEquals: 'not on' };

function describeLeaf(req: CompiledRequirement, leaf: ResultNode, facts: FactSet, system: UnitSystem, met = false): string {
  const meta = req.leaves[String(leaf.name)];
  const required = met ? '' : 'required ';
  if (meta.date) return `${meta.label} ${formatIsoDate(String(factValueOf(facts, leaf, meta)))} (${required}${DATE_WORDS[meta.operator]} ${formatIsoDate(String(meta.value))})`;
  return `${meta.label} ${display(factValueOf(facts, leaf, meta), meta.dimension, system)} (${required}${OP_WORDS[meta.operator]} ${display(meta.value, meta.dimension, system, facts)})`;
}

const NUMERIC_OPS: ReadonlySet<string> = new Set(['atLeast', 'atMost', 'above', 'below', 'equals', 'notEquals']);

/** The number a leaf was compared with: its own limit, or the value of the fact it refers to (× k). */
function limitOf(leaf: ResultNode, meta: LeafMeta): number | undefined {
  if (typeof meta.value === 'number') return meta.value;
  return typeof leaf.valueResult === 'number' ? leaf.valueResult : undefined;
}

/**
 * One leaf as reason parts. A number against a number becomes a comparison part, so it is written
 * in the reader's units with the digits that tell value and limit apart; a comparison with another
 * fact names that fact and its value; anything else is written as before, in both systems.
 */
function leafParts(req: CompiledRequirement, leaf: ResultNode, facts: FactSet, met: boolean): ReasonSegment[] {
  const meta = req.leaves[String(leaf.name)];
  const value = factValueOf(facts, leaf, meta);
  const limit = limitOf(leaf, meta);
  if (!meta.date && typeof value === 'number' && meta.dimension && limit !== undefined && NUMERIC_OPS.has(meta.operator)) {
    if (typeof meta.value === 'number') return [`${meta.label} `, cmp(value, limit, meta.dimension, meta.operator as ComparisonOp, met)];
    const dim = meta.dimension;
    return [
      `${meta.label} `,
      bySystem((s) => distinguished(value, limit, dim, s).valueText),
      ` (${met ? '' : 'required '}${OP_WORDS[meta.operator]} `,
      bySystem((s) => display(meta.value, dim, s, facts)),
      ')',
    ];
  }
  return [bySystem((s) => describeLeaf(req, leaf, facts, s, met))];
}

/** What to change, as one sentence: every failing limit the member or vehicle must reach. */
function toPassParts(req: CompiledRequirement, failing: ResultNode[], facts: FactSet): ReasonSegment[] {
  const items: ReasonSegment[][] = [];
  for (const leaf of failing) {
    const meta = req.leaves[String(leaf.name)];
    const limit = limitOf(leaf, meta);
    const op = meta.date ? DATE_WORDS[meta.operator] : OP_WORDS[meta.operator];
    if (meta.date) items.push([`${meta.label} ${op} ${formatIsoDate(String(meta.value))}`]);
    else if (meta.dimension && limit !== undefined) {
      const dim = meta.dimension;
      items.push([`${meta.label} ${op} `, typeof meta.value === 'number' ? { q: limit, d: dim } : bySystem((s) => display(meta.value, dim, s, facts))]);
    } else items.push([`${meta.label} ${op} `, bySystem((s) => display(meta.value, meta.dimension, s, facts))]);
  }
  if (items.length === 0) return [];
  const out: ReasonSegment[] = [' To pass: '];
  items.forEach((item, i) => out.push(...(i > 0 ? ['; '] : []), ...item));
  out.push('.');
  return out;
}

function buildFinding(
  ctx: Ctx, req: CompiledRequirement, variant: CompiledVariant, subject: Subject, tree: ResultNode, facts: FactSet, fromModel: ReadonlySet<string>,
): Finding {
  const when = namedPart(tree, 'when');
  const requires = namedPart(tree, 'requires');
  if (!requires) throw new Error(`Rule ${req.id} has no "requires" part`);
  if (when) {
    const whenMissing = new Set<string>();
    const w = triState(when, facts, whenMissing);
    if (w === false) return baseFinding(ctx, req, subject, 'not_applicable', 'Does not apply to this vehicle or member (its condition is not met).');
    if (w === 'unknown') {
      const f = baseFinding(ctx, req, subject, 'needs_information', `Whether this applies depends on: ${missingList(whenMissing, ctx).map((m) => m.label).join(', ')}.`);
      f.missing = missingList(whenMissing, ctx);
      return f;
    }
  }
  const missing = new Set<string>();
  const verdict: Tri = triState(requires, facts, missing);
  if (TEMPLATE_KINDS[req.template].findings === 'tube_sizes') return tubeTableFinding(ctx, req, variant, subject, requires, facts, verdict, missing);
  const leaves = leavesOf(requires);
  const summary = summarise(req, 'requires', leaves);
  const measured = measuredValues(summary, leaves, facts, fromModel);
  const required = copyRequired(summary);
  const v: Finding['verdict'] = verdict === 'unknown' ? 'needs_information' : verdict ? 'pass' : 'fail';
  const parts: ReasonSegment[] = [];
  const toPass: ReasonSegment[] = [];
  if (v === 'pass') {
    // A pass shows the numbers it passed on, not only that it passed.
    const passed = leaves.filter((l) => l.result === true && req.leaves[String(l.name)] && factPresentFor(facts, l));
    if (passed.length === 0) parts.push('Meets the requirement.');
    else {
      parts.push('Meets it: ');
      passed.forEach((l, i) => parts.push(...(i > 0 ? ['; '] : []), ...leafParts(req, l, facts, true)));
      parts.push('.');
    }
  } else if (v === 'needs_information') parts.push(`Cannot decide without: ${missingList(missing, ctx).map((m) => m.label).join(', ')}.`);
  else {
    const failing = leaves.filter((l) => l.result === false && req.leaves[String(l.name)] && factPresentFor(facts, l));
    if (failing.length > 0) {
      parts.push('Does not meet it: ');
      failing.forEach((l, i) => parts.push(...(i > 0 ? ['; '] : []), ...leafParts(req, l, facts, false)));
      parts.push('.');
    } else parts.push('Does not meet the requirement.');
    if (missing.size > 0) parts.push(` Also not given: ${missingList(missing, ctx).map((m) => m.label).join(', ')}.`);
    toPass.push(...toPassParts(req, failing, facts));
  }
  // Which values came from the cage model, then (for a fail) what to change, last.
  parts.push(modelNote(measured), ...toPass);
  const f = withReason(ctx, baseFinding(ctx, req, subject, v, ''), parts);
  f.measured = measured;
  f.required = required;
  if (v === 'needs_information') f.missing = missingList(missing, ctx);
  return f;
}

function factPresentFor(facts: FactSet, leaf: ResultNode): boolean {
  const refFact = referencedFact(leaf.value);
  return factPresent(facts, String(leaf.fact), leaf.params) && (refFact === undefined || factPresent(facts, refFact));
}


function tubeTableFinding(
  ctx: Ctx, req: CompiledRequirement, variant: CompiledVariant, subject: Subject, requires: ResultNode, facts: FactSet, verdict: Tri, missing: Set<string>,
): Finding {
  const alts = (requires.any ?? []).filter((n) => typeof n.name === 'string' && req.alternatives[n.name]);
  // Equivalents by strength are never "nearest" nor offered as sizes: they stand for listed sizes.
  const listedAlts = alts.filter((n) => req.alternatives[String(n.name)]!.source !== 'strength_equivalent');
  const od = facts['member.odMm'] as number;
  const wall = facts['member.wallMm'] as number;
  const material = facts['member.material'] as string | undefined;
  const process = facts['member.process'] as string | undefined;
  const approvedOn = facts['cage.approvedOn'] as string | undefined;
  const measured: MeasuredValue[] = [
    { fact: 'member.odMm', label: 'outside diameter', value: od, dimension: 'length' },
    { fact: 'member.wallMm', label: 'wall thickness', value: wall, dimension: 'length' },
  ];
  if (material !== undefined) measured.push({ fact: 'member.material', label: 'material', value: material, dimension: null });
  if (process !== undefined) measured.push({ fact: 'member.process', label: 'tube process', value: process, dimension: null });
  // With a measured-wall rule: the thinnest reading by its method, when there is one.
  const readingFact = Object.values(req.alternatives).find((a) => a.readingFact)?.readingFact;
  const reading = readingFact ? (facts[readingFact] as number | undefined) : undefined;
  if (readingFact && reading !== undefined) measured.push({ fact: readingFact, label: FACTS_BY_NAME.get(readingFact)?.label ?? readingFact, value: reading, dimension: 'length' });
  const docSystem = ctx.compiled.document.unitSystem;
  // The band in the reader's units: the rulebook's own label only for a reader in its units.
  const bandParts: ReasonSegment[] = variant.aboveKg === null && variant.upToKg === null
    ? []
    : [' for ', variant.bandLabel ? bySystem((s) => (s === docSystem ? variant.bandLabel! : bandTextIn(variant, s))) : bandPart(variant.aboveKg, variant.upToKg)];
  const matched = alts.find((a) => triState(a, facts, new Set()) === true);
  // Nearest: the smallest relative shortfall in OD plus wall, with a wrong material or process
  // counting as a full miss; ties go to the first listed.
  const score = (name: string): number => {
    const a = req.alternatives[name];
    const wallReq = a.requiredWallMm;
    let s = Math.max(0, a.odMm - od) / a.odMm + Math.max(0, wallReq - wall) / wallReq;
    if (a.requiredReadingMm !== undefined && reading !== undefined) s += Math.max(0, a.requiredReadingMm - reading) / a.requiredReadingMm;
    if (a.materials && material !== undefined && !a.materials.includes(material)) s += 1;
    if (a.processes && process !== undefined && !a.processes.includes(process)) s += 1;
    if (a.approvedBefore && approvedOn !== undefined && !(approvedOn < a.approvedBefore)) s += 1;
    return s;
  };
  const pick = matched ?? [...listedAlts].sort((x, y) => score(String(x.name)) - score(String(y.name)))[0];
  const pickMeta = pick ? req.alternatives[String(pick.name)] : undefined;
  const required: RequiredValue[] = pick ? copyRequired(summarise(req, String(pick.name), leavesOf(pick))) : [];
  const v: Finding['verdict'] = verdict === 'unknown' ? 'needs_information' : verdict ? 'pass' : 'fail';
  const materialWords = (list: readonly string[]) => list.map((m) => MATERIAL_LABELS[m as keyof typeof MATERIAL_LABELS] ?? m).join(' or ');
  const processWords = (list: readonly string[]) => list.map((x) => PROCESS_LABELS[x as keyof typeof PROCESS_LABELS] ?? x).join(', ');
  // A size as the reader reads it: the rulebook's printed label in its own units, else OD × wall in theirs.
  // A printed equivalent is the rulebook's size in the other system: each reader gets both in their own units.
  const sizeParts = (a: NonNullable<typeof pickMeta>): ReasonSegment =>
    bySystem((s) =>
      a.equivalentOf
        ? `${tubeSizeText(a.odMm, a.wallMm, s)} (printed equivalent of ${tubeSizeText(a.equivalentOf.odMm, a.equivalentOf.wallMm, s)})`
        : s === docSystem
          ? a.label
          : a.source === 'allowance'
            ? `${formatQuantity(a.odMm, 'length', s).text} OD or larger with ${formatQuantity(a.wallMm, 'length', s).text} wall`
            : tubeSizeText(a.odMm, a.wallMm, s));
  // The material before the size ("mild steel 1.750 × 0.095 in", never "0.095 in in mild steel"),
  // the process and approval date after it.
  const described = (a: NonNullable<typeof pickMeta>): ReasonSegment[] => [
    a.materials ? `${materialWords(a.materials)} ` : '',
    sizeParts(a),
    a.processes ? ` (${processWords(a.processes)})` : '',
    a.approvedBefore ? `, for cages approved before ${formatIsoDate(a.approvedBefore)}` : '',
  ];
  const readingLabel = (a: NonNullable<typeof pickMeta>) => (a.readingFact ? (FACTS_BY_NAME.get(a.readingFact)?.label ?? a.readingFact) : '');
  const parts: ReasonSegment[] = [];
  let equivalence: FindingStrengthEquivalence | undefined;
  const memberYield = (facts['member.yieldMpa'] ?? facts['member.gradeMinYieldMpa']) as number | undefined;
  if (v === 'pass' && pickMeta?.equivalence) {
    const eq = pickMeta.equivalence;
    const judged = judgeStrengthEquivalence({ odMm: od, wallMm: wall, ...(memberYield !== undefined ? { yieldMpa: memberYield } : {}) }, { odMm: pickMeta.odMm, wallMm: pickMeta.wallMm, ...(eq.listedYieldMpa !== undefined ? { yieldMpa: eq.listedYieldMpa } : {}) }, eq.measure, eq.minWallMm);
    equivalence = equivalenceWire(judged, eq.listedLabel, true);
    const valueFact = eq.measure === 'section_modulus' ? facts['member.sectionModulusMm3'] : facts['member.bendingStrengthNmm'];
    const d = eq.measure === 'section_modulus' ? 'section_modulus' : 'moment';
    // The listed size it stands for, described as a listed size is (material first).
    const listed: ReasonSegment[] = [
      pickMeta.materials ? `${materialWords(pickMeta.materials)} ` : '',
      bySystem((s) => (s === docSystem ? eq.listedLabel : tubeSizeText(pickMeta.odMm, pickMeta.wallMm, s))),
      pickMeta.processes ? ` (${processWords(pickMeta.processes)})` : '',
      pickMeta.approvedBefore ? `, for cages approved before ${formatIsoDate(pickMeta.approvedBefore)}` : '',
    ];
    parts.push(`Equivalent by ${MEASURE_WORDS[eq.measure]} to `, ...listed, ...bandParts, ': ',
      eq.measure === 'section_modulus' ? 'Z ' : 'yield × Z ', cmp(valueFact as number, eq.requiredValue, d, 'atLeast', true),
      '. This rulebook accepts a tube at least as strong as a listed size (equivalence by strength).');
  } else if (v === 'pass' && pickMeta) {
    parts.push('Matches ', ...described(pickMeta), ...bandParts);
    if (pickMeta.requiredReadingMm !== undefined && reading !== undefined && pickMeta.readingFact)
      parts.push(', with ', `${readingLabel(pickMeta)} `, { q: reading, d: 'length' }, ' (at least ', { q: pickMeta.requiredReadingMm, d: 'length' }, ' needed)');
    parts.push('.');
  } else if (v === 'needs_information') parts.push(`Cannot decide without: ${missingList(missing, ctx).map((m) => m.label).join(', ')}`, ...(bandParts.length ? [' (band ', bandParts[1]!, ')'] : []), '.');
  else if (pickMeta) {
    const gaps: ReasonSegment[][] = [];
    const wallReq = required.find((r) => r.fact === 'member.wallMm');
    if (od < pickMeta.odMm - 1e-9) gaps.push(['OD ', gap(od, pickMeta.odMm, 'length')]);
    if (wallReq && typeof wallReq.value === 'number' && wall < wallReq.value - 1e-9) gaps.push(['wall ', gap(wall, wallReq.value, 'length')]);
    if (pickMeta.requiredReadingMm !== undefined && reading !== undefined && reading < pickMeta.requiredReadingMm - 1e-9)
      gaps.push([`${readingLabel(pickMeta)} `, gap(reading, pickMeta.requiredReadingMm, 'length')]);
    if (pickMeta.materials && material !== undefined && !pickMeta.materials.includes(material)) gaps.push([`material ${materialWords([material])} is not ${materialWords(pickMeta.materials)}`]);
    if (pickMeta.processes && process !== undefined && !pickMeta.processes.includes(process)) gaps.push([`process ${processWords([process])} is not ${processWords(pickMeta.processes)}`]);
    if (pickMeta.approvedBefore && approvedOn !== undefined && !(approvedOn < pickMeta.approvedBefore))
      gaps.push([`the cage was approved on ${formatIsoDate(approvedOn)}, not before ${formatIsoDate(pickMeta.approvedBefore)}`]);
    parts.push('No listed size fits', ...bandParts, '. Nearest: ', ...described(pickMeta));
    if (gaps.length) {
      parts.push(' (');
      gaps.forEach((g, i) => parts.push(...(i > 0 ? ['; '] : []), ...g));
      parts.push(')');
    }
    parts.push('.', ...passingSizesParts(listedAlts.map((n) => req.alternatives[String(n.name)]!), { material, process, approvedOn }, described));
    const advice = strengthAdvice(ctx.compiled.policy.strength, listedAlts.map((n) => req.alternatives[String(n.name)]!), { odMm: od, wallMm: wall, ...(memberYield !== undefined ? { yieldMpa: memberYield } : {}) }, { material, process, approvedOn }, docSystem);
    if (advice) {
      equivalence = advice.equivalence;
      parts.push(...advice.parts);
    }
  } else parts.push('No listed size fits', ...bandParts, '.');
  const f = withReason(ctx, baseFinding(ctx, req, subject, v, ''), parts);
  if (equivalence) f.strengthEquivalence = equivalence;
  f.measured = measured;
  f.required = required;
  if (v === 'needs_information') f.missing = missingList(missing, ctx);
  return f;
}

function equivalenceWire(e: StrengthEquivalence, listedLabel: string, accepted: boolean): FindingStrengthEquivalence {
  const y = (x: number | undefined) => (x !== undefined ? { yieldMpa: x } : {});
  return {
    measure: e.measure, accepted, listed: { label: listedLabel, odMm: e.listed.odMm, wallMm: e.listed.wallMm, ...y(e.listed.yieldMpa) },
    candidate: { odMm: e.candidate.odMm, wallMm: e.candidate.wallMm, ...y(e.candidate.yieldMpa) },
    ...(e.minWallMm !== undefined ? { minWallMm: e.minWallMm } : {}), equivalent: e.equivalent,
  };
}

/**
 * A failing tube judged against the band's listed sizes by strength. Where the rulebook does not
 * accept equivalents, a tube at least as strong as a listed size is said to be so, as advice that
 * does not change the verdict. Where it does accept them (and the tube still failed), the closest
 * listed size by the measure is kept so the reader sees why not.
 */
function strengthAdvice(
  policy: CompiledRuleset['policy']['strength'], alts: AlternativeMeta[], tube: { odMm: number; wallMm: number; yieldMpa?: number },
  member: { material?: string; process?: string; approvedOn?: string }, docSystem: UnitSystem,
): { equivalence: FindingStrengthEquivalence; parts: ReasonSegment[] } | undefined {
  const listed = alts.filter(
    (a) => a.source === 'table'
      && (!a.materials || member.material === undefined || a.materials.includes(member.material))
      && (!a.processes || member.process === undefined || a.processes.includes(member.process))
      && (!a.approvedBefore || (member.approvedOn !== undefined && member.approvedOn < a.approvedBefore)),
  );
  if (listed.length === 0 || tube.wallMm <= 0 || tube.wallMm >= tube.odMm / 2) return undefined;
  const listedYield = policy.listedYieldMpa;
  const judged = listed.map((a) => ({ a, e: judgeStrengthEquivalence(tube, { odMm: a.odMm, wallMm: a.wallMm, ...(listedYield !== undefined ? { yieldMpa: listedYield } : {}) }, policy.measure, policy.minWallMm) }));
  const label = (a: AlternativeMeta): ReasonSegment => bySystem((s) => (s === docSystem ? a.label : tubeSizeText(a.odMm, a.wallMm, s)));
  if (!policy.accept) {
    const hit = judged.find((j) => j.e.equivalent === true);
    if (!hit) return undefined;
    const what = policy.measure === 'section_modulus'
      ? ['Z ', cmp(hit.e.candidate.sectionModulusMm3, hit.e.listed.sectionModulusMm3, 'section_modulus', 'atLeast', true)]
      : ['yield × Z ', cmp(hit.e.candidate.bendingStrengthNmm!, hit.e.listed.bendingStrengthNmm!, 'moment', 'atLeast', true)];
    return {
      equivalence: equivalenceWire(hit.e, hit.a.label, false),
      parts: [` Advisory only: by ${MEASURE_WORDS[policy.measure]} this tube is equivalent to `, label(hit.a), ': ', ...what, '. This rulebook does not accept equivalents by strength, so the finding stands; only the sanctioning body can accept it.'],
    };
  }
  const best = [...judged].sort((x, y) => (y.e.ratio ?? -1) - (x.e.ratio ?? -1))[0]!;
  return {
    equivalence: equivalenceWire(best.e, best.a.label, true),
    parts: best.e.equivalent === 'unknown'
      ? [` Nor can it be called equivalent by ${MEASURE_WORDS[policy.measure]} until its yield is known.`]
      : [` Nor is it equivalent by ${MEASURE_WORDS[policy.measure]}: the closest is `, label(best.a), ' at a ratio of ', { q: best.e.ratio ?? 0, d: 'ratio' }, '.'],
  };
}

/**
 * Every size the band lists that this member could use (its material, process and approval date
 * allow it), lightest first by mass per length, as one sentence saying what to change.
 */
function passingSizesParts(
  alts: AlternativeMeta[], member: { material?: string; process?: string; approvedOn?: string },
  described: (a: AlternativeMeta) => ReasonSegment[],
): ReasonSegment[] {
  const usable = alts.filter(
    (a) => (!a.materials || member.material === undefined || a.materials.includes(member.material))
      && (!a.processes || member.process === undefined || a.processes.includes(member.process))
      && (!a.approvedBefore || (member.approvedOn !== undefined && member.approvedOn < a.approvedBefore)),
  );
  const list = usable.length > 0 ? usable : alts;
  const mass = (a: AlternativeMeta) => (a.wallMm > 0 && a.wallMm < a.odMm / 2 ? tubeSectionProperties({ odMm: a.odMm, wallMm: a.wallMm }).massPerMetreKg : Infinity);
  const sorted = list.map((a, i) => ({ a, i, m: mass(a) })).sort((x, y) => x.m - y.m || x.i - y.i).map((x) => x.a);
  if (sorted.length === 0) return [];
  const out: ReasonSegment[] = [sorted.length === 1 ? ' To pass, use the size this band lists: ' : ' To pass, use one of the sizes this band lists, lightest first: '];
  sorted.forEach((a, i) => out.push(...(i > 0 ? ['; '] : []), ...described(a)));
  out.push(usable.length > 0 ? '.' : ' (each needs another material, process or approval date).');
  return out;
}

function bandTextIn(v: CompiledVariant, system: UnitSystem): string {
  return renderReason([bandPart(v.aboveKg, v.upToKg)], system);
}

function assembleReport(
  ctx: Ctx, classId: string, className: string, findings: Finding[], tubes: MemberTubeData[], geo: CageGeometry | null, disagreements: Disagreement[],
): CheckReport {
  const mandatory = findings.filter((f) => f.severity === 'mandatory');
  const verdict: CheckReport['verdict'] = mandatory.some((f) => f.verdict === 'fail')
    ? 'fail'
    : mandatory.some((f) => f.verdict === 'needs_information')
      ? 'needs_information'
      : 'pass';
  const next = new Map<string, { m: MissingFact; members: Set<string>; reqs: Set<string> }>();
  for (const f of mandatory) {
    if (f.verdict !== 'needs_information') continue;
    for (const m of f.missing) {
      const entry = next.get(m.fact) ?? { m, members: new Set<string>(), reqs: new Set<string>() };
      if (f.member) entry.members.add(f.member.id);
      entry.reqs.add(f.requirementId);
      next.set(m.fact, entry);
    }
  }
  const count = (v: Finding['verdict']) => findings.filter((f) => f.verdict === v).length;
  const withLength = tubes.filter((t) => t.massKg !== null);
  const doc = ctx.compiled.document;
  return {
    reportFormat: 1,
    rulebook: { ...doc.rulebook },
    classId,
    className,
    verdict,
    summary: {
      pass: count('pass'), fail: count('fail'), notApplicable: count('not_applicable'), needsInformation: count('needs_information'),
      advisoryFail: findings.filter((f) => f.severity === 'advisory' && f.verdict === 'fail').length,
    },
    findings,
    measureNext: [...next.values()]
      .sort((a, b) => (a.m.fact < b.m.fact ? -1 : a.m.fact > b.m.fact ? 1 : 0))
      .map((e) => {
        const memberIds = [...e.members].sort();
        const nameOf = new Map(tubes.map((t) => [t.memberId, t.name ?? t.memberId]));
        return { ...e.m, memberIds, memberNames: memberIds.map((id) => nameOf.get(id) ?? id), requirementIds: [...e.reqs].sort() };
      }),
    tubes: {
      members: tubes.map((t) => ({ ...t })),
      estimatedTubeMassKg: withLength.reduce((s, t) => s + (t.massKg ?? 0), 0),
      massComplete: withLength.length === tubes.length,
      membersWithoutLength: tubes.filter((t) => t.massKg === null).map((t) => t.memberId),
    },
    policy: {
      acceptPrintedEquivalents: ctx.compiled.policy.acceptPrintedEquivalents,
      strengthEquivalents: { accept: ctx.compiled.policy.strength.accept, measure: ctx.compiled.policy.strength.measure },
      measurementTolerance: { ...ctx.compiled.policy.tolerance },
    },
    ...(geo ? { geometry: { ...geo, disagreements } } : {}),
    disclaimer: PRE_CHECK_DISCLAIMER,
  };
}
