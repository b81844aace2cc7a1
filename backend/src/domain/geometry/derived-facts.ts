// The geometry facts of the fact catalogue, derived from the model. Centrelines become surfaces by
// the conventions in docs/geometry.md: an inside width is the centreline width less one OD, a hoop's
// top is its highest centreline point plus half its OD. A fact about "the braces" or "the diagonals"
// reduces to the worst member, and is derived only when every member of that kind has a path (one
// unmodelled brace could be the worst one).
import type { MemberKind } from '../vocabulary.js';
import type { GeometryInput, MemberShape } from './derive.js';
import { centrelineExtreme, raysAt } from './member-path.js';
import type { Vec3 } from './vec.js';
import { UP, angle, distance, distanceToSegment, normalize, sub, toDeg } from './vec.js';

export const GEOMETRY_FACT_NAMES = [
  'geometry.rearBraceAttachBelowTopMm',
  'geometry.rearBraceAngleFromVerticalDeg',
  'geometry.rearBraceIncludedAngleDeg',
  'geometry.hoopAboveHelmetMm',
  'geometry.helmetBelowHoopLineMm',
  'geometry.hoopBehindHelmetMm',
  'geometry.mainHoopInsideWidthMm',
  'geometry.harnessBarBelowShouldersMm',
  'geometry.diagonalLowerEndFromNodeMm',
  'geometry.diagonalUpperEndFromNodeMm',
  'geometry.nearestTubeToHelmetMm',
] as const;
export type GeometryFactName = (typeof GEOMETRY_FACT_NAMES)[number];

export interface DerivedFact {
  value: number;
  /** The members it was read from, by the builder's names (the worst one first). */
  members: string[];
}
export type GeometryFactValues = Partial<Record<GeometryFactName, DerivedFact>>;

interface Candidate {
  value: number;
  members: string[];
}

/** The worst of several candidates: 'max' when a larger value is worse, 'min' when smaller is. */
function worst(cands: readonly Candidate[], worse: 'max' | 'min'): DerivedFact | undefined {
  let best: Candidate | undefined;
  for (const c of cands) if (!best || (worse === 'max' ? c.value > best.value : c.value < best.value)) best = c;
  return best && { value: best.value, members: best.members };
}

const ofKind = (input: GeometryInput, shapes: readonly MemberShape[], kinds: readonly MemberKind[]) => {
  const all = input.members.filter((m) => kinds.includes(m.kind));
  const modelled = shapes.filter((s) => kinds.includes(s.kind));
  return { modelled, complete: all.length > 0 && modelled.length === all.length };
};

const ends = (s: MemberShape) => {
  const p = s.geometry.points;
  const first = { point: p[0], nodeId: s.path[0].nodeId };
  const last = { point: p[p.length - 1], nodeId: s.path[p.length - 1].nodeId };
  return first.point.z >= last.point.z ? { upper: first, lower: last } : { upper: last, lower: first };
};

/** Highest surface point of a hoop: the highest centreline point, raised by half the OD. */
function hoopTop(s: MemberShape): Vec3 {
  const top = centrelineExtreme(s.geometry, UP);
  return { x: top.pointMm.x, y: top.pointMm.y, z: top.value + s.odMm / 2 };
}

function forwardTop(s: MemberShape): Vec3 {
  const p = centrelineExtreme(s.geometry, { x: 1, y: 0, z: 0 }).pointMm;
  return { x: p.x, y: p.y, z: p.z + s.odMm / 2 };
}

export function deriveGeometryFacts(input: GeometryInput, shapes: readonly MemberShape[]): GeometryFactValues {
  const out: GeometryFactValues = {};
  const hoops = ofKind(input, shapes, ['main_hoop']);
  // The first main hoop is the main hoop; a second one is unusual and would be a lateral or a halo.
  const hoop = hoops.modelled.length > 0 && input.members.find((m) => m.kind === 'main_hoop')?.id === hoops.modelled[0].memberId ? hoops.modelled[0] : undefined;
  const top = hoop ? hoopTop(hoop) : undefined;

  const braces = ofKind(input, shapes, ['rear_brace']);
  if (braces.complete) {
    const angles: Candidate[] = [];
    const drops: Candidate[] = [];
    const included: Candidate[] = [];
    let allIncluded = true;
    for (const b of braces.modelled) {
      const { upper, lower } = ends(b);
      // A brace's angle is its end-to-end line's; rulebooks want braces straight anyway.
      const a = toDeg(angle(sub(upper.point, lower.point), UP));
      angles.push({ value: Math.min(a, 180 - a), members: [b.name] });
      if (hoop && top) {
        drops.push({ value: top.z - upper.point.z, members: [b.name, hoop.name] });
        const k = hoop.path.findIndex((e) => e.nodeId === upper.nodeId);
        if (k < 0) allIncluded = false;
        else {
          // The hoop's direction leaving the junction downwards, towards its foot.
          const down = raysAt(hoop.geometry, k).reduce((lo, r) => (r.z < lo.z ? r : lo));
          included.push({ value: toDeg(angle(down, normalize(sub(lower.point, upper.point)))), members: [b.name, hoop.name] });
        }
      }
    }
    out['geometry.rearBraceAngleFromVerticalDeg'] = worst(angles, 'min');
    if (hoop) out['geometry.rearBraceAttachBelowTopMm'] = worst(drops, 'max');
    if (hoop && allIncluded) out['geometry.rearBraceIncludedAngleDeg'] = worst(included, 'min');
  }

  if (hoop) {
    const p = hoop.geometry.points;
    out['geometry.mainHoopInsideWidthMm'] = { value: distance(p[0], p[p.length - 1]) - hoop.odMm, members: [hoop.name] };
  }

  const shoulders = input.vehicle?.driverShoulderHeightMm;
  const bars = ofKind(input, shapes, ['harness_bar']);
  if (shoulders !== undefined && bars.complete) {
    // Belts run over the top of the bar: its highest surface point against the shoulders.
    out['geometry.harnessBarBelowShouldersMm'] = worst(bars.modelled.map((b) => ({ value: shoulders - hoopTop(b).z, members: [b.name] })), 'max');
  }

  const diagonals = ofKind(input, shapes, ['diagonal']);
  if (diagonals.complete) {
    const feet = footPoints(input, shapes);
    const junctions = braces.complete ? braces.modelled.map((b) => ends(b).upper.point) : [];
    if (feet.length > 0)
      out['geometry.diagonalLowerEndFromNodeMm'] = worst(diagonals.modelled.map((d) => ({ value: nearest(ends(d).lower.point, feet), members: [d.name] })), 'max');
    if (junctions.length > 0)
      out['geometry.diagonalUpperEndFromNodeMm'] = worst(diagonals.modelled.map((d) => ({ value: nearest(ends(d).upper.point, junctions), members: [d.name] })), 'max');
  }

  const helmet = input.vehicle?.helmet;
  if (helmet && hoop && top) Object.assign(out, helmetFacts(input, shapes, hoop, top, helmet));
  return out;
}

/** Feet of the main hoop and the rear braces: nodes of the role "foot" on their paths. */
function footPoints(input: GeometryInput, shapes: readonly MemberShape[]): Vec3[] {
  const roles = new Map((input.model?.nodes ?? []).map((n) => [n.id, n.role]));
  const out: Vec3[] = [];
  for (const s of shapes) {
    if (s.kind !== 'main_hoop' && s.kind !== 'rear_brace') continue;
    s.path.forEach((e, k) => {
      if (roles.get(e.nodeId) === 'foot') out.push(s.geometry.points[k]);
    });
  }
  return out;
}

const nearest = (p: Vec3, candidates: readonly Vec3[]) => Math.min(...candidates.map((c) => distance(p, c)));

function helmetFacts(
  input: GeometryInput, shapes: readonly MemberShape[], hoop: MemberShape, top: Vec3, h: { xMm: number; yMm: number; zMm: number; radiusMm: number },
): GeometryFactValues {
  const out: GeometryFactValues = {};
  const centre: Vec3 = { x: h.xMm, y: h.yMm, z: h.zMm };
  out['geometry.hoopAboveHelmetMm'] = { value: top.z - (h.zMm + h.radiusMm), members: [hoop.name] };

  // Behind the head: from the back of the helmet to the front surface of the hoop, level with the
  // helmet's centre (the hoop's nearest crossing of that height; its top if it never gets there).
  const line = hoop.centreline();
  let hoopX = -Infinity;
  for (let i = 0; i + 1 < line.length; i++) {
    const a = line[i];
    const b = line[i + 1];
    if ((a.z - h.zMm) * (b.z - h.zMm) > 0 || a.z === b.z) continue;
    hoopX = Math.max(hoopX, a.x + ((b.x - a.x) * (h.zMm - a.z)) / (b.z - a.z));
  }
  if (hoopX === -Infinity) hoopX = top.x;
  out['geometry.hoopBehindHelmetMm'] = { value: h.xMm - h.radiusMm - (hoopX + hoop.odMm / 2), members: [hoop.name] };

  // Below the line joining the hoop tops, in the side view: the helmet's perpendicular clearance
  // to that line (never more than the vertical gap, so the safer reading).
  const front = shapes.find((s) => s.kind === 'front_hoop') ?? shapes.find((s) => s.kind === 'halo_hoop');
  if (front) {
    // A front hoop's top is its highest point; a halo runs back to the main hoop, so its front
    // top is its most forward point (raised by half the OD).
    const ft = front.kind === 'front_hoop' ? hoopTop(front) : forwardTop(front);
    const dx = ft.x - top.x;
    const dz = ft.z - top.z;
    const len = Math.hypot(dx, dz);
    if (len > 0) {
      // Upward normal of the line in the x–z plane.
      const nx = dx >= 0 ? -dz / len : dz / len;
      const nz = dx >= 0 ? dx / len : -dx / len;
      const above = nx * (h.xMm - top.x) + nz * (h.zMm - top.z);
      out['geometry.helmetBelowHoopLineMm'] = { value: -above - h.radiusMm, members: [hoop.name, front.name] };
    }
  }

  // Nearest bare tube: only when every member is modelled, else an unmodelled tube could be nearer.
  if (shapes.length === input.members.length) {
    const cands = shapes.map((s) => {
      const pts = s.centreline();
      let d = Infinity;
      for (let i = 0; i + 1 < pts.length; i++) d = Math.min(d, distanceToSegment(centre, pts[i], pts[i + 1]));
      return { value: d - h.radiusMm - s.odMm / 2, members: [s.name] };
    });
    out['geometry.nearestTubeToHelmetMm'] = worst(cands, 'min');
  }
  return out;
}
