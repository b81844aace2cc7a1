// deriveCageGeometry: every value the model gives, from nodes and member paths alone. Per member:
// developed length, bends, bend-plane rotations, CLR/OD, side. Per node: the members meeting there
// and the angles between them. And the geometry facts the rules already read (docs/geometry.md has
// each formula and the centreline-to-surface conventions).
import type { MemberKind } from '../vocabulary.js';
import type { PathGeometry } from './member-path.js';
import { raysAt, sampleCentreline } from './member-path.js';
import type { CageNode, DriverSide, MemberSide, NodeRole, PathEntry } from './model.js';
import { nodeIndex } from './model.js';
import { pathGeometry } from './centreline.js';
import { memberNames } from './names.js';
import type { Vec3 } from './vec.js';
import { angle, distance, toDeg } from './vec.js';
import { deriveGeometryFacts } from './derived-facts.js';
import type { GeometryFactValues } from './derived-facts.js';

export interface GeometryInput {
  vehicle?: {
    driverSide?: DriverSide;
    driverShoulderHeightMm?: number;
    helmet?: { xMm: number; yMm: number; zMm: number; radiusMm: number };
  };
  members: readonly { id: string; kind: MemberKind; label?: string; odMm: number; path?: readonly PathEntry[] }[];
  model?: { nodes: readonly CageNode[] };
}

export interface DerivedBend {
  nodeId: string;
  angleDeg: number;
  clrMm: number;
  clrOverOd: number;
  setbackMm: number;
  arcMm: number;
}

export interface DerivedMember {
  memberId: string;
  name: string;
  kind: MemberKind;
  index: number;
  odMm: number;
  developedLengthMm: number;
  /** Straight-line distance between the path's ends. */
  chordMm: number;
  bends: DerivedBend[];
  /** Rotation between successive bend planes (sign convention in docs/geometry.md); null across a corner. */
  bendRotationsDeg: (number | null)[];
  side: MemberSide;
  /** The side in the driver's terms, when the vehicle says where the driver sits. */
  driverSide: 'driver' | 'passenger' | null;
}

export interface DerivedNode {
  nodeId: string;
  label: string | null;
  role: NodeRole;
  members: { memberId: string; name: string }[];
  /** Smallest angle between the two members' tube directions leaving the node, 0…180°. */
  angles: { memberIds: [string, string]; names: [string, string]; angleDeg: number }[];
}

/** One member's path analysed, for the fact derivations. */
export interface MemberShape {
  index: number;
  memberId: string;
  name: string;
  kind: MemberKind;
  odMm: number;
  path: readonly PathEntry[];
  geometry: PathGeometry;
  /** Lazily sampled centreline (bend arcs included). */
  centreline: () => Vec3[];
}

export interface CageGeometry {
  members: DerivedMember[];
  nodes: DerivedNode[];
  facts: GeometryFactValues;
}

/** y within this of the centreline counts as on it when deciding a member's side. */
const SIDE_TOLERANCE_MM = 1;

export function memberSide(points: readonly Vec3[]): MemberSide {
  let minY = Infinity;
  let maxY = -Infinity;
  for (const p of points) {
    if (p.y < minY) minY = p.y;
    if (p.y > maxY) maxY = p.y;
  }
  if (minY >= -SIDE_TOLERANCE_MM && maxY > SIDE_TOLERANCE_MM) return 'left';
  if (maxY <= SIDE_TOLERANCE_MM && minY < -SIDE_TOLERANCE_MM) return 'right';
  return 'centre';
}

function inDriverTerms(side: MemberSide, driver: DriverSide | undefined): 'driver' | 'passenger' | null {
  if (driver === undefined || side === 'centre') return null;
  return side === driver ? 'driver' : 'passenger';
}

/** Analyses every member that has a valid path. */
export function memberShapes(input: GeometryInput): MemberShape[] {
  const nodes = nodeIndex(input.model?.nodes ?? []);
  const names = memberNames(input.members);
  const out: MemberShape[] = [];
  input.members.forEach((m, index) => {
    if (!m.path) return;
    const g = pathGeometry(nodes, m.path, m.odMm);
    if (!g) return;
    let sampled: Vec3[] | undefined;
    out.push({
      index, memberId: m.id, name: names[index], kind: m.kind, odMm: m.odMm, path: m.path, geometry: g,
      centreline: () => (sampled ??= sampleCentreline(g, m.odMm)),
    });
  });
  return out;
}

function derivedMember(s: MemberShape, driver: DriverSide | undefined): DerivedMember {
  const g = s.geometry;
  const side = memberSide(g.points);
  return {
    memberId: s.memberId, name: s.name, kind: s.kind, index: s.index, odMm: s.odMm,
    developedLengthMm: g.developedLengthMm,
    chordMm: distance(g.points[0], g.points[g.points.length - 1]),
    bends: g.bends.map((b) => ({
      nodeId: s.path[b.index].nodeId, angleDeg: b.angleDeg, clrMm: b.clrMm, clrOverOd: b.clrMm / s.odMm, setbackMm: b.setbackMm, arcMm: b.arcMm,
    })),
    bendRotationsDeg: g.rotationsDeg,
    side,
    driverSide: inDriverTerms(side, driver),
  };
}

function derivedNodes(input: GeometryInput, shapes: readonly MemberShape[]): DerivedNode[] {
  const at = new Map<string, { shape: MemberShape; rays: Vec3[] }[]>();
  for (const s of shapes) {
    s.path.forEach((e, k) => {
      const list = at.get(e.nodeId) ?? [];
      const mine = list.find((x) => x.shape === s);
      if (mine) mine.rays.push(...raysAt(s.geometry, k));
      else list.push({ shape: s, rays: raysAt(s.geometry, k) });
      at.set(e.nodeId, list);
    });
  }
  return (input.model?.nodes ?? []).map((n) => {
    const list = at.get(n.id) ?? [];
    const angles: DerivedNode['angles'] = [];
    for (let i = 0; i < list.length; i++)
      for (let j = i + 1; j < list.length; j++) {
        let best = Infinity;
        for (const a of list[i].rays) for (const b of list[j].rays) best = Math.min(best, toDeg(angle(a, b)));
        if (best !== Infinity) angles.push({ memberIds: [list[i].shape.memberId, list[j].shape.memberId], names: [list[i].shape.name, list[j].shape.name], angleDeg: best });
      }
    return { nodeId: n.id, label: n.label ?? null, role: n.role, members: list.map((x) => ({ memberId: x.shape.memberId, name: x.shape.name })), angles };
  });
}

/** Every derived value of the model; members without a (valid) path are simply absent. */
export function deriveCageGeometry(input: GeometryInput): CageGeometry {
  const shapes = memberShapes(input);
  const driver = input.vehicle?.driverSide;
  return {
    members: shapes.map((s) => derivedMember(s, driver)),
    nodes: derivedNodes(input, shapes),
    facts: deriveGeometryFacts(input, shapes),
  };
}
