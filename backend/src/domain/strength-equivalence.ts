// Equivalence by strength: is a tube that is not a listed size at least as strong as one that is?
// By section modulus Z = π(D⁴ − d⁴)/(32·D) (F-ENG-1), or, where both yields are known, by bending
// strength: yield × Z, the moment at which the tube starts to yield in bending. Every step is kept as
// reason parts (canonical values, written in the reader's units when read), so a screen or a report
// shows the whole calculation with its units. Pure.
import type { StrengthMeasure } from '../contracts/ruleset.js';
import { bendingStrengthNmm } from './facts.js';
import { cmp, q, tube, type ReasonSegment } from './rules/reason-text.js';
import { tubeSectionProperties, tubeSizeProblems } from './tube.js';

export type { StrengthMeasure };

export interface EquivalenceTube {
  odMm: number;
  wallMm: number;
  /** Minimum yield (mill certificate, grade or standard); needed by bending strength. */
  yieldMpa?: number;
}

export interface EquivalenceSide {
  odMm: number;
  wallMm: number;
  idMm: number;
  sectionModulusMm3: number;
  yieldMpa?: number;
  bendingStrengthNmm?: number;
}

export interface StrengthEquivalence {
  measure: StrengthMeasure;
  candidate: EquivalenceSide;
  listed: EquivalenceSide;
  /** Candidate over listed by the measure; null when a yield it needs is unknown. */
  ratio: number | null;
  /** The least wall an equivalent may have, when the rulebook sets one. */
  minWallMm?: number;
  /** True / false, or unknown when a yield is missing (never a pass on a value nobody gave). */
  equivalent: boolean | 'unknown';
}

/** Floating-point slack only: a ratio of 1 within 1e-9 is equal (the engine compares the same way). */
const AT_LEAST_ONE = 1 - 1e-9;

function side(t: EquivalenceTube): EquivalenceSide {
  const z = tubeSectionProperties({ odMm: t.odMm, wallMm: t.wallMm }).sectionModulusMm3;
  const strength = bendingStrengthNmm(t.yieldMpa, z);
  return {
    odMm: t.odMm, wallMm: t.wallMm, idMm: t.odMm - 2 * t.wallMm, sectionModulusMm3: z,
    ...(t.yieldMpa !== undefined ? { yieldMpa: t.yieldMpa } : {}), ...(strength !== undefined ? { bendingStrengthNmm: strength } : {}),
  };
}

export interface EquivalenceProblem {
  field: string;
  message: string;
}

/** What makes an input unusable, per field (`candidate.wallMm`, `listed.yieldMpa`…). */
export function strengthEquivalenceProblems(candidate: EquivalenceTube, listed: EquivalenceTube, measure: StrengthMeasure): EquivalenceProblem[] {
  const out: EquivalenceProblem[] = [];
  for (const [name, t] of [['candidate', candidate], ['listed', listed]] as const) {
    for (const p of tubeSizeProblems(t)) out.push({ field: `${name}.${p.field}`, message: p.message });
    if (t.yieldMpa !== undefined && !(t.yieldMpa > 0 && t.yieldMpa <= 3000)) out.push({ field: `${name}.yieldMpa`, message: 'A yield must be more than 0 and at most 3000 MPa.' });
  }
  if (measure === 'bending_strength' && listed.yieldMpa === undefined) out.push({ field: 'listed.yieldMpa', message: 'Bending strength compares yield × Z: give the yield the listed size is taken at.' });
  return out;
}

/** Judges `candidate` against `listed` by `measure` (both tubes already valid sizes). */
export function judgeStrengthEquivalence(candidate: EquivalenceTube, listed: EquivalenceTube, measure: StrengthMeasure, minWallMm?: number): StrengthEquivalence {
  const c = side(candidate);
  const l = side(listed);
  let ratio: number | null;
  if (measure === 'section_modulus') ratio = c.sectionModulusMm3 / l.sectionModulusMm3;
  else ratio = c.bendingStrengthNmm !== undefined && l.bendingStrengthNmm !== undefined ? c.bendingStrengthNmm / l.bendingStrengthNmm : null;
  const wallOk = minWallMm === undefined || c.wallMm >= minWallMm - 1e-9 * Math.max(1, minWallMm);
  const equivalent = !wallOk ? false : ratio === null ? 'unknown' : ratio >= AT_LEAST_ONE;
  return { measure, candidate: c, listed: l, ratio, ...(minWallMm !== undefined ? { minWallMm } : {}), equivalent };
}

export const MEASURE_WORDS: Readonly<Record<StrengthMeasure, string>> = {
  section_modulus: 'section modulus',
  bending_strength: 'bending strength (yield × section modulus)',
};

function sectionSteps(name: string, s: EquivalenceSide): ReasonSegment[][] {
  return [
    [`${name}: `, tube(s.odMm, s.wallMm), '. Inside diameter d = D − 2t = ', q(s.odMm, 'length'), ' − 2 × ', q(s.wallMm, 'length'), ' = ', q(s.idMm, 'length'), '.'],
    [
      `Section modulus of the ${name.toLowerCase()}: Z = π(D⁴ − d⁴) / (32 × D) = π × ((`, q(s.odMm, 'length'), ')⁴ − (', q(s.idMm, 'length'), ')⁴) / (32 × ',
      q(s.odMm, 'length'), ') = ', q(s.sectionModulusMm3, 'section_modulus'), '.',
    ],
  ];
}

function strengthStep(name: string, s: EquivalenceSide): ReasonSegment[] {
  if (s.yieldMpa === undefined || s.bendingStrengthNmm === undefined) return [`Bending strength of the ${name.toLowerCase()}: its yield is not known, so yield × Z cannot be worked out.`];
  return [`Bending strength of the ${name.toLowerCase()}: M = yield × Z = `, q(s.yieldMpa, 'stress'), ' × ', q(s.sectionModulusMm3, 'section_modulus'), ' = ', q(s.bendingStrengthNmm, 'moment'), '.'];
}

/**
 * Every step of the calculation, one line per step, with its units: inside diameters, both
 * section moduli, the yields' bending strengths where the measure needs them, the ratio and the
 * verdict by that measure.
 */
export function strengthEquivalenceSteps(e: StrengthEquivalence, listedLabel = 'Listed size'): ReasonSegment[][] {
  const lines: ReasonSegment[][] = [...sectionSteps(listedLabel, e.listed), ...sectionSteps('Alternative', e.candidate)];
  if (e.measure === 'bending_strength') lines.push(strengthStep(listedLabel, e.listed), strengthStep('Alternative', e.candidate));
  const met = e.ratio !== null && e.ratio >= AT_LEAST_ONE;
  if (e.ratio === null) lines.push(['Ratio by bending strength: unknown until the alternative’s yield is known (a mill certificate or a grade).']);
  else if (e.measure === 'section_modulus')
    lines.push(['Ratio: Z of the alternative ÷ Z of the listed size = ', q(e.candidate.sectionModulusMm3, 'section_modulus'), ' ÷ ', q(e.listed.sectionModulusMm3, 'section_modulus'), ' = ', cmp(e.ratio, 1, 'ratio', 'atLeast', met), '.']);
  else
    lines.push(['Ratio: M of the alternative ÷ M of the listed size = ', q(e.candidate.bendingStrengthNmm!, 'moment'), ' ÷ ', q(e.listed.bendingStrengthNmm!, 'moment'), ' = ', cmp(e.ratio, 1, 'ratio', 'atLeast', met), '.']);
  if (e.minWallMm !== undefined)
    lines.push(['Wall of the alternative: ', cmp(e.candidate.wallMm, e.minWallMm, 'length', 'atLeast', e.candidate.wallMm >= e.minWallMm - 1e-9 * Math.max(1, e.minWallMm)), ', the least an equivalent may have.']);
  lines.push([
    e.equivalent === true
      ? `Equivalent by ${MEASURE_WORDS[e.measure]}: at least as strong as the listed size.`
      : e.equivalent === false
        ? `Not equivalent by ${MEASURE_WORDS[e.measure]}.`
        : `Not decided by ${MEASURE_WORDS[e.measure]} until the yield is known.`,
  ]);
  return lines;
}
