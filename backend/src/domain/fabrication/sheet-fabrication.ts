// A build sheet's fabrication sheets, from the cage model where a member has a path and from typed
// values where it does not: per member the cut and bend schedule, what each end meets (a cope with
// its inputs, a pad, nothing, or something that is not a two-tube saddle), the hoop leg cut heights,
// and the buying list over all members and plates. Pure: the same sheet and settings give the same
// numbers. Conventions are in docs/geometry.md, "Fabrication".
import type { Specification } from '../../contracts/specification';
import { nodeIndex, nodePoint, type CageNode } from '../geometry/model';
import { centrelineExtreme, type PathGeometry } from '../geometry/member-path';
import { pathGeometry } from '../geometry/centreline';
import { memberNames } from '../geometry/names';
import { cross, dot, normalize, scale, sub, toDeg, UP, type Vec3 } from '../geometry/vec';
import type { Material } from '../tube';
import type { MemberKind } from '../vocabulary';
import { computeCope, COPE_LIMITS, type CopeInput } from './cope';
import { planMember, type BenderDie, type MemberPlan } from './cut-schedule';
import { buyingList, type BuyingList, type CutPiece, type TubeGroupInput } from './nesting';
import { computeLegTrim, legTrimProblems, type HoopLeg, type LegTrim, type LegTrimProblem } from './leg-trim';

export interface FabricationSettingsInput {
  dies: BenderDie[];
  trimAllowanceMm: number;
  stickLengthMm: number;
  kerfMm: number;
}

export type EndFit =
  | { kind: 'free'; nodeId: string }
  | { kind: 'pad'; nodeId: string }
  | {
      kind: 'saddle'; nodeId: string; runMemberId: string; runName: string; cope: CopeInput; depthMm: number; lossMm: number;
      /** Roll of this end's 0° line from the reference given in `rotationReference`, about the tube's axis. */
      rotationDeg: number;
    }
  | { kind: 'not_a_saddle'; nodeId: string; reason: string; memberNames: string[] };

export interface LegCutFromModel {
  leanDeg: number;
  topHeightMm: number;
  /** In-plane height below the top's centreline at which each leg meets its pad (left first). */
  legs: { nodeId: string; padHeightMm: number; cutHeightMm: number }[];
}

/** A hoop's legs as the builder measured them (uncut legs, pads, lean), kept with the sheet. */
export interface MeasuredLegsInput {
  legs: [HoopLeg, HoopLeg];
  leanDeg: number;
  topHeightMm?: number;
  savedAt?: string;
  savedBy?: string | null;
}

/** The leg trim from measured values: each leg's cut, or why it cannot be made (the tube changed since). */
export interface MeasuredLegTrim {
  input: MeasuredLegsInput;
  result: LegTrim | null;
  problems: LegTrimProblem[];
}

export interface MemberFabrication {
  memberId: string;
  name: string;
  kind: MemberKind;
  odMm: number;
  wallMm: number;
  material: Material | 'unspecified';
  source: 'model' | 'typed' | 'none';
  cutLengthMm: number | null;
  plan: MemberPlan | null;
  ends: [EndFit, EndFit] | null;
  /** For a straight member coped at both ends: the roll from the start cope's 0° line to the end's. */
  copeRotationDeg: number | null;
  /** What the end copes' rotationDeg is measured from: the other end's cope (straight) or the nearest bend plane. */
  rotationReference: 'start_cope' | 'bend_plane' | null;
  legCut: LegCutFromModel | null;
  /** From the builder's measurements, when saved: these decide the leg cuts (not the model's pads). */
  measuredLegs: MeasuredLegTrim | null;
  notes: string[];
}

export interface SheetFabrication {
  members: MemberFabrication[];
  buyingList: BuyingList;
  settings: FabricationSettingsInput;
}


/** Signed angle from a to b about the axis (all perpendicular-ish; right-hand rule), degrees. */
function signedAngleDeg(a: Vec3, b: Vec3, axis: Vec3): number {
  return toDeg(Math.atan2(dot(axis, cross(a, b)), dot(a, b)));
}

interface Occupancy {
  memberIndex: number;
  position: number;
}

/** Direction of a path's tube at one of its path positions (for an interior position, along the straight through it). */
function axisAt(g: PathGeometry, position: number): Vec3 {
  const pts = g.points;
  if (position === 0) return normalize(sub(pts[1]!, pts[0]!));
  if (position === pts.length - 1) return normalize(sub(pts[position]!, pts[position - 1]!));
  return normalize(sub(pts[position + 1]!, pts[position - 1]!));
}

/** Hoops: bent from one tube, standing on two pads, so their legs are trimmed to the pads. */
export const HOOP_KINDS: ReadonlySet<MemberKind> = new Set(['main_hoop', 'front_hoop', 'halo_hoop', 'lateral_hoop']);

/** The leg trim a hoop of this OD gets from the legs as measured (or the problems that stop it). */
export function measuredLegTrim(input: MeasuredLegsInput, odMm: number): MeasuredLegTrim {
  const trimInput = { legs: input.legs, leanDeg: input.leanDeg, odMm, ...(input.topHeightMm !== undefined ? { topHeightMm: input.topHeightMm } : {}) };
  const problems = legTrimProblems(trimInput);
  return { input, result: problems.length === 0 ? computeLegTrim(trimInput) : null, problems };
}

/**
 * `measured`: hoops' legs as the builder measured them, by member id (only hoops use them). They
 * give the leg cuts instead of the model's pads, with or without a model.
 */
export function sheetFabrication(spec: Specification, settings: FabricationSettingsInput, measured: Readonly<Record<string, MeasuredLegsInput>> = {}): SheetFabrication {
  const nodes: readonly CageNode[] = spec.model?.nodes ?? [];
  const byId = nodeIndex(nodes);
  const names = memberNames(spec.members);
  const geoms = spec.members.map((m) => (m.path ? pathGeometry(byId, m.path, m.odMm) : null));
  const at = new Map<string, Occupancy[]>();
  spec.members.forEach((m, i) => {
    if (!geoms[i]) return;
    m.path!.forEach((e, position) => {
      const list = at.get(e.nodeId) ?? [];
      list.push({ memberIndex: i, position });
      at.set(e.nodeId, list);
    });
  });

  interface EndWork { fit: EndFit; w0?: Vec3; axis?: Vec3 }
  const endFit = (i: number, which: 0 | 1): EndWork => {
    const work = endFitOf(i, which);
    return 'fit' in work ? work : { fit: work };
  };
  const endFitOf = (i: number, which: 0 | 1): EndFit | EndWork => {
    const m = spec.members[i]!;
    const g = geoms[i]!;
    const position = which === 0 ? 0 : m.path!.length - 1;
    const nodeId = m.path![position]!.nodeId;
    const node = byId.get(nodeId)!;
    const others = (at.get(nodeId) ?? []).filter((o) => o.memberIndex !== i);
    if (others.length === 0) return node.role === 'foot' ? { kind: 'pad', nodeId } : { kind: 'free', nodeId };
    const otherNames = others.map((o) => names[o.memberIndex]!);
    if (others.length >= 2)
      return { kind: 'not_a_saddle', nodeId, memberNames: otherNames, reason: `Three or more tubes meet here (${[names[i], ...otherNames].join(', ')}): not a two-tube saddle. Fit and scribe it on the car.` };
    const o = others[0]!;
    const run = spec.members[o.memberIndex]!;
    const rg = geoms[o.memberIndex]!;
    const runEnds = o.position === 0 || o.position === run.path!.length - 1;
    if (runEnds) return { kind: 'not_a_saddle', nodeId, memberNames: otherNames, reason: `Both tubes end here (with ${otherNames[0]}): a mitre or a plate, not a saddle.` };
    if (rg.bends.some((b) => b.index === o.position) || rg.corners.some((c) => c.index === o.position))
      return { kind: 'not_a_saddle', nodeId, memberNames: otherNames, reason: `This end meets ${otherNames[0]} at a bend: not a two-tube saddle. Fit and scribe it on the car.` };
    // The branch's direction from the node into the member, and the run's axis through the node.
    const u = which === 0 ? axisAt(g, 0) : scale(axisAt(g, position), -1);
    let a = axisAt(rg, o.position);
    if (dot(a, u) < 0) a = scale(a, -1);
    const angleDeg = toDeg(Math.acos(Math.min(1, Math.max(-1, dot(a, u)))));
    const cope: CopeInput = { branchOdMm: m.odMm, runOdMm: run.odMm, angleDeg: Math.round(angleDeg * 1000) / 1000, offsetMm: 0 };
    if (m.odMm > run.odMm) return { kind: 'not_a_saddle', nodeId, memberNames: otherNames, reason: `The branch cannot be wider than the tube it meets (${otherNames[0]}); cope the other tube, or fit a plate.` };
    if (cope.angleDeg < COPE_LIMITS.minAngleDeg)
      return { kind: 'not_a_saddle', nodeId, memberNames: otherNames, reason: `The tubes meet at ${cope.angleDeg.toFixed(1)}°, shallower than ${COPE_LIMITS.minAngleDeg}°: no template is given.` };
    const c = computeCope(cope);
    // The 0° line: on the obtuse side, i.e. towards −a square to the branch (any side of a 90° joint).
    const w0raw = sub(scale(u, dot(a, u)), a);
    const w0 = Math.hypot(w0raw.x, w0raw.y, w0raw.z) > 1e-9 ? normalize(w0raw) : normalize(cross(u, cross(a, u)));
    const axis = axisAt(g, which === 0 ? 0 : position);
    const bend = which === 0 ? g.bends[0] : g.bends[g.bends.length - 1];
    // Reference for the roll: the nearest bend's plane normal, else the start end's 0° line (set later).
    const rotationDeg = bend ? signedAngleDeg(bend.planeNormal, w0, axis) : 0;
    return { fit: { kind: 'saddle', nodeId, runMemberId: run.id, runName: names[o.memberIndex]!, cope, depthMm: c.depthMm, lossMm: c.tipFromNodeMm, rotationDeg }, w0, axis };
  };

  const members: MemberFabrication[] = spec.members.map((m, i) => {
    const legs = HOOP_KINDS.has(m.kind) && Object.prototype.hasOwnProperty.call(measured, m.id) ? measuredLegTrim(measured[m.id]!, m.odMm) : null;
    const base = { memberId: m.id, name: names[i]!, kind: m.kind, odMm: m.odMm, wallMm: m.wallMm, material: (m.material ?? 'unspecified') as Material | 'unspecified', measuredLegs: legs };
    const trim = settings.trimAllowanceMm;
    const g = geoms[i];
    if (!g) {
      const notes = [m.path ? 'The member’s path is not a valid tube yet, so the typed length is used.' : 'No path in the model: the cut length is the typed length plus the trim allowances, without bend marks or copes.'];
      if (m.lengthMm === undefined) return { ...base, source: 'none', cutLengthMm: null, plan: null, ends: null, copeRotationDeg: null, rotationReference: null, legCut: null, notes: ['No length given and no path in the model: add either to get a cut length.'] };
      return { ...base, source: 'typed', cutLengthMm: m.lengthMm + 2 * trim, plan: null, ends: null, copeRotationDeg: null, rotationReference: null, legCut: null, notes };
    }
    const work = [endFit(i, 0), endFit(i, 1)] as const;
    const ends: [EndFit, EndFit] = [work[0].fit, work[1].fit];
    const loss = (e: EndFit) => (e.kind === 'saddle' ? e.lossMm : 0);
    const notes: string[] = [];
    if (g.corners.length) notes.push('The path has a welded corner (no radius), so this member is more than one tube; the schedule treats it as one length.');
    const plan = planMember({
      legsMm: g.segmentsMm,
      bends: g.segmentsMm.slice(1).map((_, k) => {
        const b = g.bends.find((x) => x.index === k + 1);
        return b ? { angleDeg: b.angleDeg, clrMm: b.clrMm } : null;
      }),
      rotationsDeg: g.rotationsDeg,
      endLossMm: [loss(ends[0]), loss(ends[1])],
      trimMm: [trim, trim],
    }, settings.dies);
    if (plan.bends.some((b) => !b.dieName)) notes.push('No bender die of this CLR is calibrated, so its bends are set at their own angle, without springback.');
    let copeRotationDeg: number | null = null;
    let rotationReference: MemberFabrication['rotationReference'] = null;
    const [s, e] = ends;
    if (g.bends.length === 0 && s.kind === 'saddle' && e.kind === 'saddle') {
      copeRotationDeg = signedAngleDeg(work[0].w0!, work[1].w0!, work[0].axis!);
      e.rotationDeg = copeRotationDeg;
      rotationReference = 'start_cope';
    } else if (g.bends.length > 0 && (s.kind === 'saddle' || e.kind === 'saddle')) rotationReference = 'bend_plane';
    return { ...base, source: 'model', cutLengthMm: plan.cutLengthMm, plan, ends, copeRotationDeg, rotationReference, legCut: HOOP_KINDS.has(m.kind) ? legCutFromModel(g, m.path!.map((p) => byId.get(p.nodeId)!)) : null, notes };
  });

  const groups = new Map<string, TubeGroupInput>();
  members.forEach((m) => {
    if (m.cutLengthMm === null) return;
    const key = `${m.material}|${m.odMm}|${m.wallMm}`;
    const group = groups.get(key) ?? { odMm: m.odMm, wallMm: m.wallMm, material: m.material, pieces: [] as CutPiece[] };
    group.pieces.push({ memberId: m.memberId, label: m.name, lengthMm: m.cutLengthMm });
    groups.set(key, group);
  });
  const ordered = [...groups.values()].sort((a, b) => b.odMm - a.odMm || b.wallMm - a.wallMm || a.material.localeCompare(b.material));
  const plates = (spec.plates ?? []).map((p) => ({ id: p.id, thicknessMm: p.thicknessMm, areaMm2: p.areaMm2 ?? (p.sidesMm ? p.sidesMm[0] * p.sidesMm[1] : undefined) }));
  return { members, buyingList: buyingList(ordered, plates, settings), settings };
}

/**
 * A hoop whose path starts and ends on foot nodes: its lean (the plane's angle from vertical) and,
 * for each leg, the in-plane height below the top's centreline where it meets its pad, so a hoop
 * bent with long legs can be marked and cut (docs/geometry.md, "Hoop leg trim").
 */
function legCutFromModel(g: PathGeometry, pathNodes: CageNode[]): LegCutFromModel | null {
  const first = pathNodes[0]!;
  const last = pathNodes[pathNodes.length - 1]!;
  if (first.role !== 'foot' || last.role !== 'foot') return null;
  const feet = [nodePoint(first), nodePoint(last)];
  const across = sub(feet[1]!, feet[0]!);
  const top = centrelineExtreme(g, UP);
  const mid = scale({ x: feet[0]!.x + feet[1]!.x, y: feet[0]!.y + feet[1]!.y, z: feet[0]!.z + feet[1]!.z }, 0.5);
  const normal = normalize(cross(across, sub(top.pointMm, mid)));
  // In-plane "up": vertical less its component along the plane's normal.
  const upInPlane = normalize(sub(UP, scale(normal, dot(UP, normal))));
  const cosLean = dot(upInPlane, UP);
  // Lean back (top behind the feet, −x) is positive.
  const leanSign = sub(top.pointMm, mid).x > 0 ? -1 : 1;
  const leanDeg = leanSign * toDeg(Math.acos(Math.min(1, cosLean)));
  const legs = [first, last].map((n) => ({ nodeId: n.id, padHeightMm: n.zMm, cutHeightMm: (top.value - n.zMm) / cosLean }));
  // Left first (larger y).
  if (legs[0]!.nodeId !== legs[1]!.nodeId && first.yMm < last.yMm) legs.reverse();
  return { leanDeg, topHeightMm: top.value, legs };
}
