// Plain 3D vectors in millimetres, in the functional style of gl-matrix's vec3 but on `{ x, y, z }`
// objects: every function returns a new value and never mutates its arguments, so the same code
// runs in the browser and on the server and results can be shared freely.

export interface Vec3 {
  readonly x: number;
  readonly y: number;
  readonly z: number;
}

export const vec3 = (x: number, y: number, z: number): Vec3 => ({ x, y, z });
export const ZERO: Vec3 = { x: 0, y: 0, z: 0 };
export const UP: Vec3 = { x: 0, y: 0, z: 1 };

export const add = (a: Vec3, b: Vec3): Vec3 => ({ x: a.x + b.x, y: a.y + b.y, z: a.z + b.z });
export const sub = (a: Vec3, b: Vec3): Vec3 => ({ x: a.x - b.x, y: a.y - b.y, z: a.z - b.z });
export const scale = (a: Vec3, s: number): Vec3 => ({ x: a.x * s, y: a.y * s, z: a.z * s });
/** a + b·s, the usual "move along a direction" step. */
export const scaleAndAdd = (a: Vec3, b: Vec3, s: number): Vec3 => ({ x: a.x + b.x * s, y: a.y + b.y * s, z: a.z + b.z * s });
export const dot = (a: Vec3, b: Vec3): number => a.x * b.x + a.y * b.y + a.z * b.z;
export const cross = (a: Vec3, b: Vec3): Vec3 => ({ x: a.y * b.z - a.z * b.y, y: a.z * b.x - a.x * b.z, z: a.x * b.y - a.y * b.x });
export const length = (a: Vec3): number => Math.hypot(a.x, a.y, a.z);
export const distance = (a: Vec3, b: Vec3): number => Math.hypot(a.x - b.x, a.y - b.y, a.z - b.z);
export const lerp = (a: Vec3, b: Vec3, t: number): Vec3 => ({ x: a.x + (b.x - a.x) * t, y: a.y + (b.y - a.y) * t, z: a.z + (b.z - a.z) * t });

/** Unit vector along a; the zero vector stays zero (callers refuse zero-length segments first). */
export function normalize(a: Vec3): Vec3 {
  const l = length(a);
  return l === 0 ? ZERO : scale(a, 1 / l);
}

/** Angle between two directions in radians, 0…π; clamped so rounding never gives NaN. */
export function angle(a: Vec3, b: Vec3): number {
  const la = length(a);
  const lb = length(b);
  if (la === 0 || lb === 0) return 0;
  // atan2 of |a×b| and a·b stays accurate near 0 and π, where acos of the dot product does not.
  return Math.atan2(length(cross(a, b)), dot(a, b));
}

export const RAD_TO_DEG = 180 / Math.PI;
export const DEG_TO_RAD = Math.PI / 180;
export const toDeg = (rad: number): number => rad * RAD_TO_DEG;
export const toRad = (deg: number): number => deg * DEG_TO_RAD;

/** Distance from point p to the segment a–b. */
export function distanceToSegment(p: Vec3, a: Vec3, b: Vec3): number {
  const ab = sub(b, a);
  const l2 = dot(ab, ab);
  const t = l2 === 0 ? 0 : Math.max(0, Math.min(1, dot(sub(p, a), ab) / l2));
  return distance(p, scaleAndAdd(a, ab, t));
}
