// The cut and bend schedule of one member: the length to cut the stick to, where to mark each bend,
// what to set on the bender, how far to roll the tube between bends and what straight is left after
// the last bend. It reads a member as corner-to-corner legs with a bend (or none) at each interior
// node, which is what the cage model gives and what a builder can type from a drawing.
//
// Conventions (docs/geometry.md, "Cut and bend schedule"):
// - the tube starts at its first path node's end: at the tip (longest point) of that end's cope, plus
//   the builder's trim allowance for that end;
// - a bend's mark is the centreline distance from the tube's start to the tangent point where the bend
//   begins; the bend's middle is half its arc further;
// - a rotation is the roll of the tube between one bend plane and the next, as the model gives it.
import { angleToSet, bendArithmetic, type DieCalibration } from './bends';

export interface PlanBend {
  angleDeg: number;
  clrMm: number;
}

export interface MemberPlanInput {
  /** Centreline distances between successive path nodes (corner to corner). */
  legsMm: number[];
  /** At each interior node, the bend there, or null where the tube runs straight through (a junction). */
  bends: (PlanBend | null)[];
  /** Roll between successive bend planes (one fewer than the bends); null where the model has none. */
  rotationsDeg: (number | null)[];
  /** What each end loses because it stops at the run's surface (a cope's tipFromNodeMm); 0 for a square end. */
  endLossMm: [number, number];
  /** Extra length the builder leaves at each end, to trim to fit. */
  trimMm: [number, number];
}

export interface BenderDie {
  name: string;
  clrMm: number;
  calibration: DieCalibration;
}

export interface ScheduledBend {
  /** 1-based, in order from the tube's start. */
  number: number;
  /** Index of the interior path node (0 is the second path node). */
  nodeIndex: number;
  angleDeg: number;
  /** The angle to set on the bender, from the die's springback calibration; the angle itself without one. */
  setDeg: number;
  dieName: string | null;
  clrMm: number;
  arcMm: number;
  setbackMm: number;
  /** From the tube's start to the tangent point where the bend begins. */
  markMm: number;
  /** From the tube's start to the middle of the bend. */
  centreMarkMm: number;
  /** Roll from this bend's plane to the next bend's; null for the last bend. */
  rotationToNextDeg: number | null;
}

export interface MemberPlan {
  developedLengthMm: number;
  cutLengthMm: number;
  bends: ScheduledBend[];
  /** Straight from the tube's start to the first bend (all of it for a straight tube). */
  straightBeforeFirstMm: number;
  /** Straight from the end of the last bend to the tube's end. */
  straightAfterLastMm: number;
}

export interface PlanProblem {
  /** Path inside MemberPlanInput, e.g. `legsMm.1` or `bends.0.clrMm`. */
  path: string;
  message: string;
}

/** A die fits a bend when its CLR is within this of the bend's (dies are made to round numbers). */
export const DIE_CLR_TOLERANCE_MM = 0.5;

/** Allowances beyond these are typing mistakes: no builder leaves 300 mm to trim off one end. */
export const MAX_TRIM_MM = 300;

export function planProblems(input: MemberPlanInput): PlanProblem[] {
  const problems: PlanProblem[] = [];
  if (input.legsMm.length < 1) problems.push({ path: 'legsMm', message: 'A member needs at least one straight.' });
  if (input.bends.length !== Math.max(0, input.legsMm.length - 1))
    problems.push({ path: 'bends', message: 'There is one bend entry (or none) between each pair of straights.' });
  input.legsMm.forEach((l, i) => {
    if (!Number.isFinite(l) || l <= 0) problems.push({ path: `legsMm.${i}`, message: 'Each straight must be longer than zero.' });
  });
  input.bends.forEach((b, i) => {
    if (!b) return;
    if (!Number.isFinite(b.angleDeg) || b.angleDeg <= 0 || b.angleDeg >= 180) problems.push({ path: `bends.${i}.angleDeg`, message: 'A bend angle must be more than 0° and less than 180°.' });
    if (!Number.isFinite(b.clrMm) || b.clrMm <= 0) problems.push({ path: `bends.${i}.clrMm`, message: 'A centreline radius must be positive.' });
  });
  input.trimMm.forEach((t, i) => {
    if (!Number.isFinite(t) || t < 0) problems.push({ path: `trimMm.${i}`, message: 'A trim allowance cannot be negative.' });
    else if (t > MAX_TRIM_MM) problems.push({ path: `trimMm.${i}`, message: `A trim allowance over ${MAX_TRIM_MM} mm is not an allowance; check the units.` });
  });
  if (problems.length) return problems;
  // Each leg must hold the setbacks of the bends at both of its ends, or the tangents overlap.
  const setback = (b: PlanBend | null | undefined) => (b ? bendArithmetic(b.angleDeg, b.clrMm).setbackMm : 0);
  input.legsMm.forEach((l, i) => {
    const used = setback(input.bends[i - 1]) + setback(input.bends[i]);
    if (used > l + 1e-6) problems.push({ path: `legsMm.${i}`, message: `This straight is ${l.toFixed(1)} mm but its bends need ${used.toFixed(1)} mm: the bends overlap.` });
  });
  return problems;
}

export class PlanInputError extends Error {
  constructor(readonly problems: PlanProblem[]) {
    super(problems.map((p) => p.message).join(' '));
    this.name = 'PlanInputError';
  }
}

function dieFor(clrMm: number, dies: readonly BenderDie[]): BenderDie | null {
  let best: BenderDie | null = null;
  for (const d of dies) if (Math.abs(d.clrMm - clrMm) <= DIE_CLR_TOLERANCE_MM && (!best || Math.abs(d.clrMm - clrMm) < Math.abs(best.clrMm - clrMm))) best = d;
  return best;
}

export function planMember(input: MemberPlanInput, dies: readonly BenderDie[] = []): MemberPlan {
  const problems = planProblems(input);
  if (problems.length) throw new PlanInputError(problems);
  const maths = input.bends.map((b) => (b ? bendArithmetic(b.angleDeg, b.clrMm) : null));
  const setbackAt = (i: number) => maths[i]?.setbackMm ?? 0;
  // Centreline distance from the first node to the tube's start (negative: the tube starts before it).
  const startOffset = input.endLossMm[0] - input.trimMm[0];
  let along = 0;
  let developed = 0;
  const bends: ScheduledBend[] = [];
  let lastBendEnd: number | null = null;
  let firstBendStart: number | null = null;
  input.legsMm.forEach((leg, i) => {
    const straight = leg - setbackAt(i - 1) - setbackAt(i);
    along += straight;
    developed += straight;
    const m = maths[i];
    if (i < maths.length && m) {
      const die = dieFor(m.clrMm, dies);
      firstBendStart ??= along;
      bends.push({
        number: bends.length + 1, nodeIndex: i, angleDeg: m.angleDeg, setDeg: angleToSet(m.angleDeg, die?.calibration ?? null), dieName: die?.name ?? null,
        clrMm: m.clrMm, arcMm: m.arcMm, setbackMm: m.setbackMm, markMm: along - startOffset, centreMarkMm: along + m.arcMm / 2 - startOffset, rotationToNextDeg: null,
      });
      along += m.arcMm;
      developed += m.arcMm;
      lastBendEnd = along;
    }
  });
  const rotations = input.rotationsDeg;
  bends.forEach((b, k) => {
    if (k < bends.length - 1) b.rotationToNextDeg = rotations[k] ?? null;
  });
  const cutLengthMm = developed - input.endLossMm[0] - input.endLossMm[1] + input.trimMm[0] + input.trimMm[1];
  const tubeEnd = developed - input.endLossMm[1] + input.trimMm[1];
  return {
    developedLengthMm: developed,
    cutLengthMm,
    bends,
    straightBeforeFirstMm: (firstBendStart ?? tubeEnd) - startOffset,
    straightAfterLastMm: tubeEnd - (lastBendEnd ?? startOffset),
  };
}
