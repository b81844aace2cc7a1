// The cope (saddle) where a branch tube butts against a run tube, in closed form. Both tubes are
// taken as cylinders at their outside diameters: the branch's outside surface meets the run's
// outside surface, which is what a template wrapped around the branch is traced from.
//
// Frame (docs/geometry.md, "Copes"): the run's axis is x; the common perpendicular of the two axes is
// y; the branch axis is u = (cos θ, 0, sin θ) through (0, e, 0), where θ is the angle between the
// axes and e the signed offset. s is the distance along the branch axis from that point (s = 0 on the
// node when e = 0), growing towards the branch's free end. Around the branch, ψ = 0° is the generator
// on the obtuse side of the joint (the toe of an angled cope), ψ = 90° is +y, and ψ increases
// clockwise when looking from the branch's free end towards the run.
//
// On the generator at ψ, y = e + r sin ψ is fixed and z grows with s, so the first contact with the
// run is on its near surface z = +√(R² − y²), which gives s(ψ) in closed form:
//   s(ψ) = (√(R² − (e + r sin ψ)²) − r cos ψ cos θ) / sin θ
// The tube stands for s ≥ s(ψ). Its longest point (its tip) is the smallest s; the cut back from the
// tip at ψ is s(ψ) − min s, and the depth of the cope is max s − min s.

export const COPE_LIMITS = { minAngleDeg: 15, maxAngleDeg: 90, maxOdMm: 300 } as const;

export interface CopeInput {
  branchOdMm: number;
  runOdMm: number;
  /** Angle between the two axes, 15–90°. */
  angleDeg: number;
  /** Distance between the axes along their common perpendicular; signed (the sign mirrors the curve). */
  offsetMm: number;
}

export interface CopePoint {
  /** Around the branch from the 0° line (see the header). */
  angleDeg: number;
  /** Distance along the branch's outside from the 0° line, at the outside circumference. */
  arcMm: number;
  /** How far back from the tube's tip (its longest point) the cut line lies, along the branch axis. */
  axialMm: number;
}

export interface Cope {
  input: CopeInput;
  /** One point every degree, 0° to 360° (the last repeats the first so the curve closes). */
  curve: CopePoint[];
  /** Longest point of the cut less the shortest, along the branch axis. */
  depthMm: number;
  /** The branch's outside circumference: the template's width. */
  unrolledLengthMm: number;
  /**
   * From the point where the branch axis crosses the common perpendicular (the node, for a zero
   * offset) to the tip of the cope, along the branch axis. A positive value is tube the branch loses
   * because it stops at the run's surface; negative when the toe of a shallow cope reaches past it.
   */
  tipFromNodeMm: number;
  /** Angle (0–360°) of the longest point and of the deepest point of the cut. */
  tipAngleDeg: number;
  deepestAngleDeg: number;
}

export interface CopeProblem {
  field: keyof CopeInput;
  message: string;
}

const rad = (deg: number) => (deg * Math.PI) / 180;

/** Every reason the input is not a two-tube saddle, at its field; empty when it is one. */
export function copeProblems(input: CopeInput): CopeProblem[] {
  const problems: CopeProblem[] = [];
  const { branchOdMm, runOdMm, angleDeg, offsetMm } = input;
  const positiveOd = (field: 'branchOdMm' | 'runOdMm', v: number) => {
    if (!Number.isFinite(v) || v <= 0) problems.push({ field, message: 'The outside diameter must be a positive number.' });
    else if (v > COPE_LIMITS.maxOdMm) problems.push({ field, message: `An outside diameter over ${COPE_LIMITS.maxOdMm} mm is not a cage tube; check the units.` });
  };
  positiveOd('branchOdMm', branchOdMm);
  positiveOd('runOdMm', runOdMm);
  if (!Number.isFinite(angleDeg) || angleDeg < COPE_LIMITS.minAngleDeg || angleDeg > COPE_LIMITS.maxAngleDeg)
    problems.push({ field: 'angleDeg', message: `The angle between the tubes must be from ${COPE_LIMITS.minAngleDeg}° to ${COPE_LIMITS.maxAngleDeg}°.` });
  if (!Number.isFinite(offsetMm)) problems.push({ field: 'offsetMm', message: 'The offset must be a number (0 when the axes meet).' });
  if (problems.some((p) => p.field === 'branchOdMm' || p.field === 'runOdMm')) return problems;
  if (branchOdMm > runOdMm) problems.push({ field: 'branchOdMm', message: 'The branch cannot be wider than the tube it meets.' });
  else if (Number.isFinite(offsetMm) && Math.abs(offsetMm) + branchOdMm / 2 > runOdMm / 2 + 1e-9) {
    const most = (runOdMm - branchOdMm) / 2;
    problems.push({ field: 'offsetMm', message: `An offset of ${Math.abs(offsetMm)} mm takes the branch off the run; at most ${Math.round(most * 100) / 100} mm for these tubes.` });
  }
  return problems;
}

export class CopeInputError extends Error {
  constructor(readonly problems: CopeProblem[]) {
    super(problems.map((p) => p.message).join(' '));
    this.name = 'CopeInputError';
  }
}

/** s(ψ) of the header: the cut line's position along the branch axis at one angle. */
export function copeAxialPosition(input: CopeInput, angleDeg: number): number {
  const r = input.branchOdMm / 2;
  const R = input.runOdMm / 2;
  const theta = rad(input.angleDeg);
  const psi = rad(angleDeg);
  const y = input.offsetMm + r * Math.sin(psi);
  // Clamped: at a tangent offset y reaches ±R within rounding.
  const surfaceZ = Math.sqrt(Math.max(0, R * R - y * y));
  return (surfaceZ - r * Math.cos(psi) * Math.cos(theta)) / Math.sin(theta);
}

/** The cope's curve, depth and template width. Throws CopeInputError on input that is not a saddle. */
export function computeCope(input: CopeInput): Cope {
  const problems = copeProblems(input);
  if (problems.length) throw new CopeInputError(problems);
  const r = input.branchOdMm / 2;
  const raw: number[] = [];
  for (let deg = 0; deg <= 360; deg++) raw.push(copeAxialPosition(input, deg));
  // The extremes between whole degrees matter to within 0.01 mm, so refine them on the exact function.
  const minS = refineExtreme(input, raw, 'min');
  const maxS = refineExtreme(input, raw, 'max');
  const curve = raw.map((s, deg) => ({ angleDeg: deg, arcMm: rad(deg) * r, axialMm: s - minS.value }));
  return {
    input,
    curve,
    depthMm: maxS.value - minS.value,
    unrolledLengthMm: 2 * Math.PI * r,
    tipFromNodeMm: minS.value,
    tipAngleDeg: minS.angleDeg,
    deepestAngleDeg: maxS.angleDeg,
  };
}

/** Golden-section search around the best whole degree: the curve is smooth, one extreme per bracket. */
function refineExtreme(input: CopeInput, raw: readonly number[], kind: 'min' | 'max'): { value: number; angleDeg: number } {
  const sign = kind === 'min' ? 1 : -1;
  let best = 0;
  for (let i = 1; i < 360; i++) if (sign * raw[i]! < sign * raw[best]!) best = i;
  const f = (deg: number) => sign * copeAxialPosition(input, deg);
  let a = best - 1;
  let b = best + 1;
  const g = (Math.sqrt(5) - 1) / 2;
  let c = b - g * (b - a);
  let d = a + g * (b - a);
  for (let i = 0; i < 60; i++) {
    if (f(c) < f(d)) b = d;
    else a = c;
    c = b - g * (b - a);
    d = a + g * (b - a);
  }
  const deg = (a + b) / 2;
  const value = Math.min(f(deg), f(best)) * sign;
  const angle = f(deg) <= f(best) ? deg : best;
  return { value, angleDeg: ((angle % 360) + 360) % 360 };
}

/** The curve's cut-back every `stepDeg` (15° for marking by hand), with the arc distance to measure round. */
export function copeMarkingTable(cope: Cope, stepDeg = 15): CopePoint[] {
  return cope.curve.filter((p) => p.angleDeg < 360 && p.angleDeg % stepDeg === 0);
}
