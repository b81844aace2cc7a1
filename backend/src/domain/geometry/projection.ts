// Orthographic projection of the cage model onto the three views a builder reads: side, top and
// front. Pure functions from centrelines in the model frame (x forward, y to the car's left, z up,
// millimetres) to 2D points in millimetres, so a drawing made from them is to scale. Each view is a
// true view (never mirrored): the side view looks from the car's left with the front to the left of
// the page, the top view looks down with the front to the left, the front view looks at the nose.
// Screen axes: u to the right, v up (the SVG builder flips v, since SVG's y runs down).

export interface Point3 {
  x: number;
  y: number;
  z: number;
}

export interface Point2 {
  u: number;
  v: number;
}

export const VIEW_NAMES = ['side', 'top', 'front'] as const;
export type ViewName = (typeof VIEW_NAMES)[number];

export const VIEW_TITLES: Readonly<Record<ViewName, string>> = {
  side: 'Side view, from the left (front of the car to the left)',
  top: 'Top view, from above (front of the car to the left)',
  front: 'Front view, from ahead of the car',
};

interface Axes {
  /** Model-frame unit vectors of the page's right, the page's up, and the direction toward the viewer. */
  u: Point3;
  v: Point3;
  toward: Point3;
}

// Each triple is right-handed (u × v = toward), which is what makes these views true, not mirrored.
export const VIEW_AXES: Readonly<Record<ViewName, Axes>> = {
  side: { u: { x: -1, y: 0, z: 0 }, v: { x: 0, y: 0, z: 1 }, toward: { x: 0, y: 1, z: 0 } },
  top: { u: { x: -1, y: 0, z: 0 }, v: { x: 0, y: -1, z: 0 }, toward: { x: 0, y: 0, z: 1 } },
  front: { u: { x: 0, y: 1, z: 0 }, v: { x: 0, y: 0, z: 1 }, toward: { x: 1, y: 0, z: 0 } },
};

const dot = (a: Point3, b: Point3): number => a.x * b.x + a.y * b.y + a.z * b.z;

/** A model point on the page of `view`, with its depth (larger is nearer the viewer). */
export function projectPoint(p: Point3, view: ViewName): Point2 & { depthMm: number } {
  const axes = VIEW_AXES[view];
  return { u: dot(p, axes.u), v: dot(p, axes.v), depthMm: dot(p, axes.toward) };
}

/** What the drawing needs of a member: its id, the name the builder gave it, its OD and its centreline. */
export interface DrawnMember {
  id: string;
  name: string;
  odMm: number;
  /** Sampled centreline in the model frame, bend arcs included (memberCentreline). */
  centreline: readonly Point3[];
}

export interface Segment2 {
  a: Point2;
  b: Point2;
}

export interface ProjectedMember {
  id: string;
  name: string;
  odMm: number;
  points: Point2[];
  /** Mean depth of the centreline; members are listed far to near, so nearer tubes are drawn over farther ones. */
  depthMm: number;
}

export interface Bounds {
  minU: number;
  maxU: number;
  minV: number;
  maxV: number;
}

export interface ProjectedView {
  view: ViewName;
  members: ProjectedMember[];
  /** The page area the tubes cover, each widened by half its OD; null when nothing is drawn. */
  bounds: Bounds | null;
}

export function segmentsOf(points: readonly Point2[]): Segment2[] {
  const out: Segment2[] = [];
  for (let i = 1; i < points.length; i += 1) out.push({ a: points[i - 1]!, b: points[i]! });
  return out;
}

/** Length of a polyline on the page, in millimetres. */
export function pageLengthMm(points: readonly Point2[]): number {
  let total = 0;
  for (let i = 1; i < points.length; i += 1) total += Math.hypot(points[i]!.u - points[i - 1]!.u, points[i]!.v - points[i - 1]!.v);
  return total;
}

/** The point halfway along a polyline on the page (where a member's mark and label go). */
export function pageMidpoint(points: readonly Point2[]): Point2 {
  if (points.length === 0) return { u: 0, v: 0 };
  const half = pageLengthMm(points) / 2;
  let run = 0;
  for (let i = 1; i < points.length; i += 1) {
    const a = points[i - 1]!;
    const b = points[i]!;
    const step = Math.hypot(b.u - a.u, b.v - a.v);
    if (run + step >= half && step > 0) {
      const t = (half - run) / step;
      return { u: a.u + (b.u - a.u) * t, v: a.v + (b.v - a.v) * t };
    }
    run += step;
  }
  return points[0]!;
}

export function widen(bounds: Bounds | null, u: number, v: number, r: number): Bounds {
  if (!bounds) return { minU: u - r, maxU: u + r, minV: v - r, maxV: v + r };
  return { minU: Math.min(bounds.minU, u - r), maxU: Math.max(bounds.maxU, u + r), minV: Math.min(bounds.minV, v - r), maxV: Math.max(bounds.maxV, v + r) };
}

/** Every member with a centreline, projected onto `view` and ordered far to near. */
export function projectView(members: readonly DrawnMember[], view: ViewName): ProjectedView {
  const { u: au, v: av, toward: at } = VIEW_AXES[view];
  let minU = Infinity;
  let maxU = -Infinity;
  let minV = Infinity;
  let maxV = -Infinity;
  const projected: ProjectedMember[] = [];
  for (const m of members) {
    if (m.centreline.length < 2) continue;
    let depth = 0;
    const r = m.odMm / 2;
    const points: Point2[] = new Array(m.centreline.length);
    for (let i = 0; i < m.centreline.length; i += 1) {
      const p = m.centreline[i]!;
      const u = dot(p, au);
      const v = dot(p, av);
      depth += dot(p, at);
      if (u - r < minU) minU = u - r;
      if (u + r > maxU) maxU = u + r;
      if (v - r < minV) minV = v - r;
      if (v + r > maxV) maxV = v + r;
      points[i] = { u, v };
    }
    projected.push({ id: m.id, name: m.name, odMm: m.odMm, points, depthMm: depth / m.centreline.length });
  }
  // Stable for equal depths, so the drawing does not flicker between two tubes at the same depth.
  projected.sort((a, b) => a.depthMm - b.depthMm);
  return { view, members: projected, bounds: projected.length ? { minU, maxU, minV, maxV } : null };
}
