// One member's path as tube: the straights between nodes, and at each interior node that carries a
// centreline radius, a circular bend tangent to both straights. Everything a bender or a rule needs
// follows from the corner points and radii alone:
//   deflection θ = angle between incoming and outgoing directions,
//   setback t = CLR·tan(θ/2) (node to tangent point), arc = CLR·θ,
//   developed length = Σ node-to-node segments − Σ 2t + Σ arc.
import type { Vec3 } from './vec.js';
import { add, angle, cross, distance, dot, normalize, scale, scaleAndAdd, sub, toDeg } from './vec.js';

/** A turn smaller than this at a node is "straight through"; a radius there is refused. */
export const STRAIGHT_THROUGH_DEG = 0.1;
/** A turn larger than this is a path doubling back on itself, never a tube. */
export const DOUBLES_BACK_DEG = 179;
/** Nodes closer than this are the same place (a zero-length segment). */
export const ZERO_SEGMENT_MM = 0.5;

export interface PathBend {
  /** Index of the node in the path. */
  index: number;
  clrMm: number;
  /** Deflection: 0° is straight on, 90° a square corner. */
  angleDeg: number;
  setbackMm: number;
  arcMm: number;
  /** Tangent points where the bend starts and ends, the arc centre, and the bend plane's normal (d_in × d_out). */
  startMm: Vec3;
  endMm: Vec3;
  centreMm: Vec3;
  planeNormal: Vec3;
  dirIn: Vec3;
  dirOut: Vec3;
}

export interface PathGeometry {
  points: readonly Vec3[];
  /** Node-to-node lengths, one per segment. */
  segmentsMm: number[];
  /** Each segment's straight tube: the segment less the setbacks at both ends. */
  straightsMm: number[];
  bends: PathBend[];
  /** Interior nodes where the path turns without a radius (a welded corner), with the turn. */
  corners: { index: number; angleDeg: number }[];
  developedLengthMm: number;
  /** Rotation of each bend's plane relative to the previous bend's (see `bendRotationDeg`); null when
   * an unradiused corner lies between them. One entry per bend after the first. */
  rotationsDeg: (number | null)[];
}

export type PathProblem = { index: number; field: 'nodeId' | 'clrMm'; message: string };

const round1 = (x: number) => Math.round(x * 10) / 10;

/**
 * Signed rotation, in degrees (−180, 180], of bend b's plane relative to bend a's plane about the
 * straight that joins them, by the right-hand rule about the direction of travel along the path
 * (from the earlier bend to the later): positive is counter-clockwise when looking back along the
 * tube from the later bend towards the earlier one. 0: both bend the same way in one plane (a hoop);
 * 180: an S in one plane. Mirroring a member flips the sign.
 */
export function bendRotationDeg(a: PathBend, b: PathBend): number {
  const s = a.dirOut;
  return toDeg(Math.atan2(dot(s, cross(a.planeNormal, b.planeNormal)), dot(a.planeNormal, b.planeNormal)));
}

/**
 * Analyses a path given its node positions and the radius at each node (undefined: no bend).
 * Returns every problem found (each at its path index) or the geometry.
 */
export function analysePath(points: readonly Vec3[], clrs: readonly (number | undefined)[], odMm: number):
  { ok: true; geometry: PathGeometry } | { ok: false; problems: PathProblem[] } {
  const problems: PathProblem[] = [];
  const n = points.length;
  const segmentsMm: number[] = [];
  for (let i = 0; i + 1 < n; i++) {
    const l = distance(points[i], points[i + 1]);
    segmentsMm.push(l);
    if (l < ZERO_SEGMENT_MM) problems.push({ index: i + 1, field: 'nodeId', message: 'This node is at the same place as the one before it in the path (a zero-length segment).' });
  }
  if (clrs[0] !== undefined) problems.push({ index: 0, field: 'clrMm', message: 'A path cannot bend at its first node; put the radius on an interior node.' });
  if (n > 1 && clrs[n - 1] !== undefined) problems.push({ index: n - 1, field: 'clrMm', message: 'A path cannot bend at its last node; put the radius on an interior node.' });
  if (problems.length > 0) return { ok: false, problems };

  const setbacks = new Array<number>(n).fill(0);
  const bends: PathBend[] = [];
  const corners: { index: number; angleDeg: number }[] = [];
  for (let i = 1; i + 1 < n; i++) {
    const dirIn = normalize(sub(points[i], points[i - 1]));
    const dirOut = normalize(sub(points[i + 1], points[i]));
    const theta = angle(dirIn, dirOut);
    const deg = toDeg(theta);
    const clr = clrs[i];
    if (deg > DOUBLES_BACK_DEG) {
      problems.push({ index: i, field: 'nodeId', message: `The path doubles back on itself at this node (it turns ${round1(deg)}°).` });
      continue;
    }
    if (clr === undefined) {
      if (deg >= STRAIGHT_THROUGH_DEG) corners.push({ index: i, angleDeg: deg });
      continue;
    }
    if (deg < STRAIGHT_THROUGH_DEG) {
      problems.push({ index: i, field: 'clrMm', message: 'The path runs straight through this node, so it cannot carry a bend radius.' });
      continue;
    }
    if (clr < odMm / 2) {
      problems.push({ index: i, field: 'clrMm', message: 'A centreline radius under half the OD is not a bend.' });
      continue;
    }
    const t = clr * Math.tan(theta / 2);
    setbacks[i] = t;
    // Unit vector in the bend plane, perpendicular to the incoming straight, towards the outgoing one.
    const inPlane = normalize(sub(dirOut, scale(dirIn, dot(dirIn, dirOut))));
    const startMm = scaleAndAdd(points[i], dirIn, -t);
    bends.push({
      index: i, clrMm: clr, angleDeg: deg, setbackMm: t, arcMm: clr * theta,
      startMm, endMm: scaleAndAdd(points[i], dirOut, t), centreMm: scaleAndAdd(startMm, inPlane, clr),
      planeNormal: normalize(cross(dirIn, dirOut)), dirIn, dirOut,
    });
  }
  // Tangents overlap when the two setbacks on one segment need more than the segment.
  for (let i = 0; i + 1 < n; i++) {
    const need = setbacks[i] + setbacks[i + 1];
    if (need > segmentsMm[i] + 1e-6) {
      const at = setbacks[i + 1] >= setbacks[i] ? i + 1 : i;
      problems.push({
        index: at, field: 'clrMm',
        message: `The bend radius is too large for its straights: the bends need ${round1(need)} mm of the ${round1(segmentsMm[i])} mm between these nodes (the tangents overlap).`,
      });
    }
  }
  if (problems.length > 0) return { ok: false, problems };

  const straightsMm = segmentsMm.map((l, i) => l - setbacks[i] - setbacks[i + 1]);
  const developedLengthMm = straightsMm.reduce((s, x) => s + x, 0) + bends.reduce((s, b) => s + b.arcMm, 0);
  const rotationsDeg: (number | null)[] = [];
  for (let k = 1; k < bends.length; k++) {
    const a = bends[k - 1];
    const b = bends[k];
    const between = corners.some((c) => c.index > a.index && c.index < b.index);
    rotationsDeg.push(between ? null : bendRotationDeg(a, b));
  }
  return { ok: true, geometry: { points, segmentsMm, straightsMm, bends, corners, developedLengthMm, rotationsDeg } };
}

/** A point on a bend's arc, φ radians from its start (0 … θ). */
export function arcPoint(b: PathBend, phi: number): Vec3 {
  const inPlane = normalize(sub(b.centreMm, b.startMm));
  return add(scaleAndAdd(b.centreMm, inPlane, -b.clrMm * Math.cos(phi)), scale(b.dirIn, b.clrMm * Math.sin(phi)));
}

/** How many chords draw an arc so that no chord strays more than a small fraction of the OD from it. */
function arcSteps(b: PathBend, odMm: number): number {
  const tol = Math.max(0.25, odMm / 40);
  const ratio = 1 - tol / b.clrMm;
  const step = ratio <= -1 ? Math.PI : 2 * Math.acos(Math.max(-1, ratio));
  return Math.min(64, Math.max(2, Math.ceil((b.angleDeg * Math.PI) / 180 / step)));
}

/** The tube's centreline as a polyline: straights, and each bend sampled along its arc. */
export function sampleCentreline(g: PathGeometry, odMm: number): Vec3[] {
  const out: Vec3[] = [g.points[0]];
  let k = 0;
  for (let i = 1; i + 1 < g.points.length; i++) {
    const b = g.bends[k];
    if (b === undefined || b.index !== i) {
      // A junction on a straight or an unradiused corner: the centreline passes through the node.
      out.push(g.points[i]);
      continue;
    }
    k += 1;
    const steps = arcSteps(b, odMm);
    const theta = (b.angleDeg * Math.PI) / 180;
    for (let s = 0; s <= steps; s++) out.push(s === 0 ? b.startMm : s === steps ? b.endMm : arcPoint(b, (theta * s) / steps));
  }
  out.push(g.points[g.points.length - 1]);
  return out;
}

/**
 * The exact largest value of u·p over the centreline (u a unit direction): straights reach their
 * extremes at their ends, an arc possibly inside it where the tangent is perpendicular to u.
 */
export function centrelineExtreme(g: PathGeometry, u: Vec3): { value: number; pointMm: Vec3 } {
  let best = { value: -Infinity, pointMm: g.points[0] };
  const consider = (p: Vec3) => {
    const v = dot(u, p);
    if (v > best.value) best = { value: v, pointMm: p };
  };
  consider(g.points[0]);
  consider(g.points[g.points.length - 1]);
  for (const b of g.bends) {
    consider(b.startMm);
    consider(b.endMm);
    const inPlane = normalize(sub(b.centreMm, b.startMm));
    // u·p(φ) = const − R cosφ (u·inPlane) + R sinφ (u·dirIn): stationary where tanφ = (u·dirIn)/(−u·inPlane).
    let phi = Math.atan2(dot(u, b.dirIn), -dot(u, inPlane));
    if (phi < 0) phi += 2 * Math.PI;
    if (phi <= (b.angleDeg * Math.PI) / 180) consider(arcPoint(b, phi));
  }
  return best;
}

/** Directions along the tube leaving path entry k (towards the previous and the next node). */
export function raysAt(g: PathGeometry, k: number): Vec3[] {
  const rays: Vec3[] = [];
  if (k > 0) rays.push(normalize(sub(g.points[k - 1], g.points[k])));
  if (k + 1 < g.points.length) rays.push(normalize(sub(g.points[k + 1], g.points[k])));
  return rays;
}

