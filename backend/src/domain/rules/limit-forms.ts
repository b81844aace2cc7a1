// The `limit` template's value forms as plain data and rules, shared by the compiler, the compare
// view and the rulebook editor (no engine code here, so the browser can import it).
import type { LimitCheck, ProportionalValue } from '../../contracts/ruleset.js';
import type { GradeFamily } from '../grades.js';
import type { Dimension } from '../units.js';

/**
 * The dimension k must have so that `fact` (dimension a) can be k × `of` (dimension b): none (a plain
 * factor) when a = b, a length when an area is compared with a length. Anything else is refused.
 */
export function factorDimension(a: Dimension, b: Dimension): 'ratio' | 'length' | undefined {
  if (a === b) return 'ratio';
  if (a === 'area' && b === 'length') return 'length';
  return undefined;
}

export const isProportional = (v: LimitCheck['value']): v is ProportionalValue => typeof v === 'object' && v !== null;

/** Facts a rule may compare with a grade, the grade family and the derived strength facts. */
export const GRADE_FACTS: Readonly<Record<string, { family: GradeFamily; yieldFact: string; tensileFact: string }>> = {
  'member.grade': { family: 'material', yieldFact: 'member.gradeMinYieldMpa', tensileFact: 'member.gradeMinTensileMpa' },
  'plate.boltGrade': { family: 'bolt', yieldFact: 'plate.boltGradeMinYieldMpa', tensileFact: 'plate.boltGradeMinTensileMpa' },
};

