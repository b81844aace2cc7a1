// Bend arithmetic for a tube bent on a die of centreline radius CLR (common shop formulas):
//   arc     = CLR · θ               (the centreline length inside the bend)
//   setback = CLR · tan(θ / 2)      (from the tangent point to where the two straights would meet)
//   gain    = 2 · setback − arc     (what the tube saves against the sharp corner)
// and springback: a bender die is calibrated once by bending to a set angle and measuring what the
// tube holds after release; the ratio scales every later bend on that die.

const rad = (deg: number) => (deg * Math.PI) / 180;

export interface BendArithmetic {
  angleDeg: number;
  clrMm: number;
  arcMm: number;
  setbackMm: number;
  gainMm: number;
}

export function bendArithmetic(angleDeg: number, clrMm: number): BendArithmetic {
  if (!(angleDeg > 0 && angleDeg < 180)) throw new RangeError('A bend angle must be between 0° and 180°.');
  if (!(clrMm > 0)) throw new RangeError('A centreline radius must be positive.');
  const arcMm = clrMm * rad(angleDeg);
  const setbackMm = clrMm * Math.tan(rad(angleDeg) / 2);
  return { angleDeg, clrMm, arcMm, setbackMm, gainMm: 2 * setbackMm - arcMm };
}

/** A calibration of one bender die: the angle set on the bender and the angle the tube held after. */
export interface DieCalibration {
  setDeg: number;
  heldDeg: number;
}

/** More springback than this (a quarter of the bend) is a misread calibration, not a die. */
export const MAX_SPRINGBACK_RATIO = 1.25;

export interface SpringbackProblem {
  field: 'setDeg' | 'heldDeg';
  message: string;
}

export function springbackProblems({ setDeg, heldDeg }: DieCalibration): SpringbackProblem[] {
  const problems: SpringbackProblem[] = [];
  if (!Number.isFinite(setDeg) || setDeg <= 0 || setDeg > 180) problems.push({ field: 'setDeg', message: 'The angle set on the bender must be more than 0° and at most 180°.' });
  if (!Number.isFinite(heldDeg) || heldDeg <= 0 || heldDeg > 180) problems.push({ field: 'heldDeg', message: 'The angle the tube held must be more than 0° and at most 180°.' });
  if (problems.length) return problems;
  if (heldDeg > setDeg)
    problems.push({ field: 'heldDeg', message: 'A tube cannot hold more than the bender set: that would be negative springback. Measure again.' });
  else if (setDeg / heldDeg > MAX_SPRINGBACK_RATIO)
    problems.push({ field: 'heldDeg', message: `That is ${(setDeg - heldDeg).toFixed(1)}° of springback on a ${setDeg}° bend, more than a quarter of the bend; check the reading.` });
  return problems;
}

/** The angle to set on the bender so the tube holds `targetDeg` (proportional springback). */
export function angleToSet(targetDeg: number, calibration: DieCalibration | null): number {
  if (!calibration) return targetDeg;
  return targetDeg * (calibration.setDeg / calibration.heldDeg);
}
