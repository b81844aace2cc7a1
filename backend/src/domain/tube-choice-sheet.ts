// The tube chooser for a whole sheet: per member, the lightest legal stock size (domain/tube-choice.ts)
// and what choosing it does to the other members. A rule that compares one member with another
// (member_match: "rear braces the same OD and wall as the hoop", F-NHRA-G1) means a lighter hoop can
// leave braces that then fail. So each legal size of a member that others are compared with is tried
// on the sheet: the members that would fail get the lightest stock size that makes them legal again
// ("together with"), and a size that leaves a member failing with no stock size to fix it is never
// offered as the lightest: it says which member and which rule. Pure: canonical units in and out.
import type { Specification } from '../contracts/specification.js';
import type { Material } from './tube.js';
import type { MemberKind } from './vocabulary.js';
import type { CompiledRuleset } from './rules/types.js';
import { parsePeer } from './rules/reference-words.js';
import { TUBE_DEPENDENT_FACTS, currentTube, memberJudge, memberLengthsMm, memberWithTube } from './tube-choice.js';
import type { CandidateStatus, CandidateTube, RankedCandidate, StockTube } from './tube-choice.js';

export interface RequirementRef {
  requirementId: string;
  title: string;
  section: string;
}

/** Another member changed with the choice, so the sheet stays legal: the lightest stock size that does it. */
export interface Companion {
  memberId: string;
  memberIndex: number;
  /** The rule it would fail with its own tube beside the new one. */
  because: RequirementRef;
  tube: RankedCandidate;
}

/** A member the choice would leave failing, with no stock size to put it right. */
export interface LeftFailing {
  memberId: string;
  memberIndex: number;
  requirement: RequirementRef;
}

export interface Consequences {
  together: Companion[];
  leavesFailing: LeftFailing[];
}

/**
 * A legal size for a member, with what choosing it does to the rest of the sheet. `triedOnSheet` is
 * false for a size of a member others are compared with that was not tried (past the lightest and
 * the few after it): its consequences are not known, so it is not offered.
 */
export type SheetCandidate = RankedCandidate & Consequences & { triedOnSheet: boolean };

export interface MemberTubeChoice {
  memberId: string;
  memberKind: MemberKind;
  label?: string;
  /** The length masses are worked out on: the model's where the member has a path, else as typed. */
  lengthMm: number | null;
  current: RankedCandidate;
  /** The lightest legal stock size that leaves the sheet legal (with its companions); null when none is. */
  lightest: SheetCandidate | null;
  /** Lighter sizes that could be legal once the missing facts are known (lightest first). */
  undecided: RankedCandidate[];
  /** Legal stock sizes, lightest first; those tried on the sheet carry their consequences. */
  legal: SheetCandidate[];
  /** Current mass per metre less the lightest legal one's (positive: lighter); null without one. */
  savingPerMetreKg: number | null;
  /** Saving over the member's length, when the length is known. */
  savingKg: number | null;
  /** The saving with the companions changed too, when every length involved is known. */
  savingTogetherKg: number | null;
}

const NOTHING_ELSE: Consequences & { triedOnSheet: true } = Object.freeze({ together: Object.freeze([]) as unknown as Companion[], leavesFailing: Object.freeze([]) as unknown as LeftFailing[], triedOnSheet: true as const });

/** Sizes of a member tried on the sheet before giving up on one that keeps the others legal. */
export const SIZES_TRIED_ON_SHEET = 12;
/** Legal sizes after the lightest that are tried on the sheet too (the chooser shows them). */
export const SIZES_TRIED_AFTER_LIGHTEST = 5;

const applies = (classes: readonly string[] | null, classId: string) => classes === null || classes.includes(classId);

/**
 * For each member, the other members whose tube-dependent requirements compare with its size (a
 * member_match of their kind against its kind).
 */
export function peerDependents(compiled: CompiledRuleset, spec: Specification): number[][] {
  const classId = spec.vehicle.classId;
  const reading = new Map<MemberKind, Set<MemberKind>>();
  for (const r of compiled.requirements) {
    if (!applies(r.classes, classId) || r.scope.kind !== 'member' || !r.factsUsed.some((f) => TUBE_DEPENDENT_FACTS.has(f))) continue;
    for (const f of r.factsUsed) {
      const peer = parsePeer(f);
      if (!peer) continue;
      for (const k of peer.kinds) {
        const set = reading.get(k) ?? new Set<MemberKind>();
        for (const own of r.scope.memberKinds) set.add(own);
        reading.set(k, set);
      }
    }
  }
  return spec.members.map((m, i) => {
    const kinds = reading.get(m.kind);
    return kinds ? spec.members.flatMap((o, j) => (j !== i && kinds.has(o.kind) ? [j] : [])) : [];
  });
}

const refOf = (c: RankedCandidate): RequirementRef => {
  const o = c.outcomes.find((x) => x.verdict === 'fail')!;
  return { requirementId: o.requirementId, title: o.title, section: o.section };
};

const withTubes = (spec: Specification, tubes: ReadonlyMap<number, CandidateTube>): Specification => ({
  ...spec, members: spec.members.map((m, i) => (tubes.has(i) ? memberWithTube(m, tubes.get(i)!) : m)),
});

/**
 * What putting `tube` on member `index` does to the others: the members that would fail and the
 * stock size that puts each right (in its own material unless `anyMaterial`), then a check of every
 * member involved with all the changes made. `before`: each member's status with its own tube.
 */
export function consequencesOf(
  compiled: CompiledRuleset, spec: Specification, index: number, tube: CandidateTube, stock: readonly StockTube[],
  ctx: { dependents: readonly number[][]; before: readonly CandidateStatus[]; anyMaterial?: boolean },
): Consequences {
  const deps = ctx.dependents[index] ?? [];
  if (deps.length === 0) return { together: [], leavesFailing: [] };
  const changed = new Map<number, CandidateTube>([[index, tube]]);
  const first = withTubes(spec, changed);
  const together: Companion[] = [];
  const leavesFailing: LeftFailing[] = [];
  // Twins (left and right braces) have the same facts: judged once.
  const twins = new Map<string, { own: RankedCandidate; fix: RankedCandidate | undefined }>();
  for (const j of deps) {
    if (ctx.before[j] === 'fails') continue;
    const m = spec.members[j]!;
    const key = JSON.stringify({ ...m, id: '', label: '' });
    let found = twins.get(key);
    if (!found) {
      const judge = memberJudge(compiled, first, j);
      const own = judge.judge(currentTube(m));
      const materials: readonly Material[] | undefined = !ctx.anyMaterial && m.material ? [m.material] : undefined;
      found = { own, fix: own.status === 'fails' ? judge.firstLegal(stock, materials) : undefined };
      twins.set(key, found);
    }
    const { own, fix } = found;
    if (own.status !== 'fails') continue;
    if (fix) {
      together.push({ memberId: m.id, memberIndex: j, because: refOf(own), tube: fix });
      changed.set(j, fix.tube);
    } else leavesFailing.push({ memberId: m.id, memberIndex: j, requirement: refOf(own) });
  }
  // With every change made: the member itself, its companions and whoever is compared with them.
  const after = together.length > 0 ? withTubes(spec, changed) : first;
  const involved = new Set<number>([index, ...deps, ...together.flatMap((c) => ctx.dependents[c.memberIndex] ?? [])]);
  for (const k of involved) {
    if (leavesFailing.some((l) => l.memberIndex === k)) continue;
    const m = spec.members[k]!;
    const judged = memberJudge(compiled, after, k).judge(changed.get(k) ?? currentTube(m));
    if (judged.status === 'fails' && (changed.has(k) || ctx.before[k] !== 'fails')) leavesFailing.push({ memberId: m.id, memberIndex: k, requirement: refOf(judged) });
  }
  return { together, leavesFailing };
}

const massChangeKg = (length: number | undefined, from: RankedCandidate, to: RankedCandidate): number | null =>
  length === undefined ? null : ((from.massPerMetreKg - to.massPerMetreKg) * length) / 1000;

/** The chooser for a whole sheet: per member, legal stock sizes in the member's material. */
export function chooseTubesForSheet(compiled: CompiledRuleset, spec: Specification, stock: readonly StockTube[], options: { anyMaterial?: boolean } = {}): MemberTubeChoice[] {
  // Left/right pairs and repeated bars have the same facts: judge them once. A member's holes and
  // plates are part of what it is judged on, so they are part of the key.
  const seen = new Map<string, { ranked: RankedCandidate[]; current: RankedCandidate }>();
  const judged = spec.members.map((m, i) => {
    const key = JSON.stringify([
      { ...m, id: '', label: '' }, (spec.inspectionHoles ?? []).filter((h) => h.memberId === m.id), (spec.plates ?? []).filter((p) => p.memberId === m.id).map((p) => ({ ...p, id: '' })),
    ]);
    let found = seen.get(key);
    if (!found) {
      const judge = memberJudge(compiled, spec, i);
      const materials = !options.anyMaterial && m.material ? [m.material] : undefined;
      found = { ranked: judge.rank(stock, materials), current: judge.judge(currentTube(m)) };
      seen.set(key, found);
    }
    return found;
  });
  const dependents = peerDependents(compiled, spec);
  const before = judged.map((j) => j.current.status);
  const lengths = memberLengthsMm(spec);
  return spec.members.map((m, i) => {
    const { ranked, current } = judged[i]!;
    const legalRanked = ranked.filter((c) => c.status === 'legal');
    let legal: SheetCandidate[];
    if (dependents[i]!.length === 0) {
      // Members nobody is compared with change nothing else: no need to try them on the sheet (and no
      // copy of each candidate: they gain the same two empty lists, shared).
      legal = legalRanked.map((c) => Object.assign(c, NOTHING_ELSE));
    } else {
      // Tried lightest first until one keeps the sheet legal, then a few more; the rest stay untried.
      legal = [];
      let found = -1;
      for (const [k, c] of legalRanked.entries()) {
        const tryIt = found < 0 ? k < SIZES_TRIED_ON_SHEET : k <= found + SIZES_TRIED_AFTER_LIGHTEST;
        if (!tryIt) {
          legal.push({ ...c, together: [], leavesFailing: [], triedOnSheet: false });
          continue;
        }
        const tried = { ...c, ...consequencesOf(compiled, spec, i, c.tube, stock, { dependents, before, ...(options.anyMaterial ? { anyMaterial: true } : {}) }), triedOnSheet: true };
        if (found < 0 && tried.leavesFailing.length === 0) found = k;
        legal.push(tried);
      }
    }
    const lightest = legal.find((c) => c.triedOnSheet && c.leavesFailing.length === 0) ?? null;
    const saving = lightest ? current.massPerMetreKg - lightest.massPerMetreKg : null;
    const length = lengths[i];
    let savingTogetherKg: number | null = null;
    if (lightest && length !== undefined) {
      const parts = lightest.together.map((c) => massChangeKg(lengths[c.memberIndex], judged[c.memberIndex]!.current, c.tube));
      savingTogetherKg = parts.every((x) => x !== null) ? parts.reduce<number>((s, x) => s + x!, (saving! * length) / 1000) : null;
    }
    return {
      memberId: m.id, memberKind: m.kind, ...(m.label ? { label: m.label } : {}), lengthMm: length ?? null, current, lightest,
      undecided: ranked.filter((c) => c.status === 'undecided' && (!lightest || c.massPerMetreKg < lightest.massPerMetreKg)),
      legal, savingPerMetreKg: saving, savingKg: saving !== null && length !== undefined ? (saving * length) / 1000 : null, savingTogetherKg,
    };
  });
}
